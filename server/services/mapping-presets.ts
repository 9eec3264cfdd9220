// Field-mapping presets of an organisation: listed, saved under a name (the same name and kind
// replaces the earlier one), deleted. Each write has its audit row in the same transaction.
import { and, asc, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { mappingPresets } from '../db/schema';
import type { MappingPreset, MappingPresetCreate } from '../../shared/api/mapping-presets';
import { limitPlusOne, type Page } from '../../shared/api/pagination';
import { NotFoundError } from '../errors';
import { recordAudit, type Actor } from './audit';

type Row = typeof mappingPresets.$inferSelect;
const toPreset = (r: Row): MappingPreset => ({
  id: r.id,
  name: r.name,
  kind: r.kind,
  fieldNames: r.fieldNames,
  mapping: r.mapping,
  createdAt: r.createdAt.toISOString(),
  updatedAt: r.updatedAt.toISOString(),
});

export async function listMappingPresets(db: Database, organizationId: string, page: Page): Promise<MappingPreset[]> {
  const rows = await db
    .select()
    .from(mappingPresets)
    .where(eq(mappingPresets.organizationId, organizationId))
    .orderBy(asc(mappingPresets.kind), asc(mappingPresets.name), asc(mappingPresets.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map(toPreset);
}

export async function saveMappingPreset(db: Database, actor: Actor, input: MappingPresetCreate): Promise<MappingPreset> {
  return db.transaction(async (tx) => {
    const now = new Date();
    const [row] = await tx
      .insert(mappingPresets)
      .values({ ...input, organizationId: actor.organizationId, createdBy: actor.userId, createdAt: now, updatedAt: now })
      .onConflictDoUpdate({
        target: [mappingPresets.organizationId, mappingPresets.kind, mappingPresets.name],
        set: { fieldNames: input.fieldNames, mapping: input.mapping, updatedAt: now },
      })
      .returning();
    await recordAudit(tx, actor, 'mapping-preset.save', 'mapping-preset', row!.id, { name: input.name, kind: input.kind });
    return toPreset(row!);
  });
}

export async function deleteMappingPreset(db: Database, actor: Actor, presetId: string): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx
      .delete(mappingPresets)
      .where(and(eq(mappingPresets.id, presetId), eq(mappingPresets.organizationId, actor.organizationId)))
      .returning({ id: mappingPresets.id, name: mappingPresets.name });
    if (!row) throw new NotFoundError('mapping preset');
    await recordAudit(tx, actor, 'mapping-preset.delete', 'mapping-preset', row.id, { name: row.name });
  });
}
