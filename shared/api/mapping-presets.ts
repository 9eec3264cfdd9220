// Field-mapping presets: a planner's column choices for a kind of file, saved per organisation
// under a name, with the file's column names so the next file with the same columns is offered
// the same choices.
import { z } from 'zod';
import { fieldMappingSchema } from './road-import';

export const mappingPresetKindSchema = z.enum(['roads', 'zones', 'shelters']);
export type MappingPresetKind = z.infer<typeof mappingPresetKindSchema>;

export const mappingPresetCreateSchema = z.object({
  name: z.string().trim().min(1, 'Give the preset a name.').max(120, 'At most 120 characters.'),
  kind: mappingPresetKindSchema,
  /** The columns of the file the mapping was made for. */
  fieldNames: z.array(z.string().max(200)).max(500),
  mapping: fieldMappingSchema,
});
export type MappingPresetCreate = z.infer<typeof mappingPresetCreateSchema>;

export const mappingPresetSchema = mappingPresetCreateSchema.extend({
  id: z.string().uuid(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type MappingPreset = z.infer<typeof mappingPresetSchema>;

export const mappingPresetListSchema = z.object({ presets: z.array(mappingPresetSchema) });
export const mappingPresetParamsSchema = z.object({ presetId: z.string().uuid('Not a valid identifier.') });

/** The columns a preset's mapping names (for its kind and the file's position columns). */
export function columnsUsed(p: Pick<MappingPreset, 'kind' | 'mapping'>): string[] {
  const m = p.mapping;
  const picked: (string | undefined)[] = [m.source?.xColumn, m.source?.yColumn];
  if (p.kind === 'roads' && m.roads) {
    const r = m.roads;
    picked.push(r.roadClass, r.lanes, r.lanesForward, r.lanesBackward, r.oneway, r.speed, r.name, r.bridge, r.tunnel, r.layer, r.id);
  }
  if (p.kind === 'zones') picked.push(...Object.values(m.zones ?? {}));
  if (p.kind === 'shelters') picked.push(...Object.values(m.shelters ?? {}));
  return [...new Set(picked.filter((c): c is string => typeof c === 'string' && c !== ''))];
}

/**
 * The presets that fit a file, best first: those made for exactly the same columns, then those
 * whose chosen columns the file all has. A preset that names a column the file lacks is left out.
 */
export function presetsForFile<P extends Pick<MappingPreset, 'kind' | 'mapping' | 'fieldNames'>>(presets: readonly P[], kind: MappingPresetKind, fieldNames: readonly string[]): P[] {
  const have = new Set(fieldNames);
  const same = (p: P) => p.fieldNames.length === have.size && p.fieldNames.every((n) => have.has(n));
  return presets
    .filter((p) => p.kind === kind && columnsUsed(p).every((c) => have.has(c)))
    .sort((a, b) => Number(same(b)) - Number(same(a)));
}
