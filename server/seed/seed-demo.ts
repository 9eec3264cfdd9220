// The demo organization, its accounts and its ready plan: Veltmoor, an invented river town
// (server/seed/demo-town/), with its roads, zones and shelters, so a new user sees the main
// job working at once. Made once: when the demo organization exists it is left as it is, so
// accounts its administrator removed, demoted or gave new passwords stay that way.
import { readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { and, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { memberships, organizations, plans, users } from '../db/schema';
import { readShelters } from '../../shared/geo/read-shelters';
import { readZones } from '../../shared/geo/read-zones';
import { importRoadLayerFile } from '../import/import-road-layer';
import { readGeoJsonUpload } from '../import/decode-upload';
import { saveRoadLayer } from '../services/road-layers';
import { createShelters, createZones } from '../services/zones-shelters';
import { demoAccounts, demoOrganization } from './demo-accounts';
import { seedOrganization } from './seed-organization';

export const demoPlanName = 'Veltmoor river crossings';
const townFile = (name: string) => fileURLToPath(new URL(`./demo-town/${name}`, import.meta.url));

export async function seedDemo(db: Database, rounds: number) {
  const [organization] = await db.select({ id: organizations.id }).from(organizations).where(eq(organizations.slug, demoOrganization.slug));
  if (organization) {
    const members = await db
      .select({ id: users.id, email: users.email })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(eq(memberships.organizationId, organization.id));
    const [plan] = await db
      .select({ id: plans.id })
      .from(plans)
      .where(and(eq(plans.organizationId, organization.id), eq(plans.name, demoPlanName)));
    return { organizationId: organization.id, userIds: Object.fromEntries(members.map((m) => [m.email, m.id])), planId: plan?.id ?? null, created: false };
  }
  const { organizationId, userIds } = await seedOrganization(db, demoOrganization, demoAccounts, rounds);

  const plannerId = userIds['planner@cutline.example'] ?? null;
  const [plan] = await db
    .insert(plans)
    .values({
      organizationId,
      name: demoPlanName,
      description:
        'Veltmoor is an invented river town: six residential zones on the west bank of the Sable River, ' +
        'shelters and exits to the east, four bridges between them. Its residents, participation rates, persons per vehicle ' +
        'and departure curves are illustrative values for trying the product, not data about any real place.',
      createdBy: plannerId,
    })
    .returning({ id: plans.id });
  const planId = plan!.id;
  const actor = { userId: plannerId, organizationId };
  const network = await importRoadLayerFile(townFile('roads.geojson'));
  await saveRoadLayer(db, actor, planId, network, {
    name: 'Veltmoor roads',
    sourceFileName: 'roads.geojson',
    importOptions: { propertyMapping: null, snapToleranceMeters: 3, tinySegmentMeters: 1 },
  });
  const zoneFeatures = readZones(readGeoJsonUpload(await readFile(townFile('zones.geojson')), 'zones.geojson'));
  await createZones(db, actor, planId, zoneFeatures.map((z) => ({ ...z.attributes, geometry: z.geometry as never })), 'zones.geojson');
  const shelterFeatures = readShelters(readGeoJsonUpload(await readFile(townFile('shelters.geojson')), 'shelters.geojson'));
  await createShelters(
    db,
    actor,
    planId,
    shelterFeatures.map((s) => ({ ...s.attributes, lon: s.coordinates[0], lat: s.coordinates[1] })),
    'shelters.geojson',
  );
  return { organizationId, userIds, planId: planId as string | null, created: true };
}
