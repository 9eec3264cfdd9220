// Zones and shelters of a plan: create, edit, delete, and bulk upload from GeoJSON (all or
// nothing). Every change moves the plan's data version on.
import { and, asc, eq } from 'drizzle-orm';
import type { Database, Tx } from '../db/client';
import { shelters, zones } from '../db/schema';
import type { Shelter, ShelterCreate, ShelterUpdate, Zone, ZoneCreate, ZoneUpdate } from '../../shared/api/zones-shelters';
import { NotFoundError } from '../errors';
import { recordAudit, type Actor } from './audit';
import { assertPlanInOrganization, bumpDataVersion } from './plan-access';
import { limitPlusOne, type Page } from '../../shared/api/pagination';

type ZoneRow = typeof zones.$inferSelect;
type ShelterRow = typeof shelters.$inferSelect;

function toZone(r: ZoneRow): Zone {
  const { planId: _p, updatedAt: _u, ...zone } = r;
  return zone;
}
function toShelter(r: ShelterRow): Shelter {
  const { planId: _p, updatedAt: _u, ...shelter } = r;
  return shelter;
}

/** Every zone and shelter of a plan, unpaged: what a model is built from. */
export async function zonesAndSheltersOfPlan(db: Database, planId: string): Promise<{ zones: Zone[]; shelters: Shelter[] }> {
  const zoneRows = await db.select().from(zones).where(eq(zones.planId, planId)).orderBy(asc(zones.id));
  const shelterRows = await db.select().from(shelters).where(eq(shelters.planId, planId)).orderBy(asc(shelters.id));
  return { zones: zoneRows.map(toZone), shelters: shelterRows.map(toShelter) };
}

export async function listZones(db: Database, organizationId: string, planId: string, page: Page): Promise<Zone[]> {
  await assertPlanInOrganization(db, organizationId, planId);
  const rows = await db.select().from(zones).where(eq(zones.planId, planId)).orderBy(asc(zones.id)).limit(limitPlusOne(page)).offset(page.offset);
  return rows.map(toZone);
}

export async function listShelters(db: Database, organizationId: string, planId: string, page: Page): Promise<Shelter[]> {
  await assertPlanInOrganization(db, organizationId, planId);
  const rows = await db.select().from(shelters).where(eq(shelters.planId, planId)).orderBy(asc(shelters.id)).limit(limitPlusOne(page)).offset(page.offset);
  return rows.map(toShelter);
}

export async function createZones(db: Database, actor: Actor, planId: string, input: ZoneCreate[], source: string, beforeCommit?: (tx: Tx) => Promise<void>): Promise<Zone[]> {
  return db.transaction(async (tx) => {
    await bumpDataVersion(tx, actor.organizationId, planId);
    const rows = input.length ? await tx.insert(zones).values(input.map((z) => ({ ...z, planId }))).returning() : [];
    await recordAudit(tx, actor, 'zone.create', 'zone', rows.length === 1 ? String(rows[0]!.id) : null, { planId, count: rows.length, source });
    // An import job's last word: a cancel that came in meanwhile rolls everything back.
    await beforeCommit?.(tx);
    return rows.map(toZone);
  });
}

export async function updateZone(db: Database, actor: Actor, planId: string, zoneId: number, patch: ZoneUpdate): Promise<Zone> {
  return db.transaction(async (tx) => {
    await bumpDataVersion(tx, actor.organizationId, planId);
    const [row] = await tx
      .update(zones)
      .set({ ...patch, updatedAt: new Date() })
      .where(and(eq(zones.id, zoneId), eq(zones.planId, planId)))
      .returning();
    if (!row) throw new NotFoundError('zone');
    const { geometry: _g, ...logged } = patch;
    await recordAudit(tx, actor, 'zone.update', 'zone', String(zoneId), { planId, ...logged, geometryChanged: patch.geometry !== undefined });
    return toZone(row);
  });
}

export async function deleteZone(db: Database, actor: Actor, planId: string, zoneId: number): Promise<void> {
  await db.transaction(async (tx) => {
    await bumpDataVersion(tx, actor.organizationId, planId);
    const [row] = await tx.delete(zones).where(and(eq(zones.id, zoneId), eq(zones.planId, planId))).returning({ name: zones.name });
    if (!row) throw new NotFoundError('zone');
    await recordAudit(tx, actor, 'zone.delete', 'zone', String(zoneId), { planId, name: row.name });
  });
}

export async function createShelters(db: Database, actor: Actor, planId: string, input: ShelterCreate[], source: string, beforeCommit?: (tx: Tx) => Promise<void>): Promise<Shelter[]> {
  return db.transaction(async (tx) => {
    await bumpDataVersion(tx, actor.organizationId, planId);
    const rows = input.length ? await tx.insert(shelters).values(input.map((s) => ({ ...s, planId }))).returning() : [];
    await recordAudit(tx, actor, 'shelter.create', 'shelter', rows.length === 1 ? String(rows[0]!.id) : null, { planId, count: rows.length, source });
    // An import job's last word: a cancel that came in meanwhile rolls everything back.
    await beforeCommit?.(tx);
    return rows.map(toShelter);
  });
}

export async function updateShelter(db: Database, actor: Actor, planId: string, shelterId: number, patch: ShelterUpdate): Promise<Shelter> {
  return db.transaction(async (tx) => {
    await bumpDataVersion(tx, actor.organizationId, planId);
    const [row] = await tx
      .update(shelters)
      .set({ ...patch, updatedAt: new Date() })
      .where(and(eq(shelters.id, shelterId), eq(shelters.planId, planId)))
      .returning();
    if (!row) throw new NotFoundError('shelter');
    await recordAudit(tx, actor, 'shelter.update', 'shelter', String(shelterId), { planId, ...patch });
    return toShelter(row);
  });
}

export async function deleteShelter(db: Database, actor: Actor, planId: string, shelterId: number): Promise<void> {
  await db.transaction(async (tx) => {
    await bumpDataVersion(tx, actor.organizationId, planId);
    const [row] = await tx.delete(shelters).where(and(eq(shelters.id, shelterId), eq(shelters.planId, planId))).returning({ name: shelters.name });
    if (!row) throw new NotFoundError('shelter');
    await recordAudit(tx, actor, 'shelter.delete', 'shelter', String(shelterId), { planId, name: row.name });
  });
}
