// A plan's capacity table: defaults per road class, each value with its source.
import { z } from 'zod';
import { drivableRoadClasses, roadClassSchema } from './road-attributes';

// ---------------------------------------------------------------------------------------------
// Capacity table (per plan)

const source = z.string().min(1).max(500);

/** Defaults for one road class. Each value carries where it comes from. */
export const capacityTableRowSchema = z.object({
  roadClass: roadClassSchema,
  lanesPerDirection: z.int().min(1).max(8),
  lanesSource: source,
  speedKmh: z.number().positive().max(200),
  speedSource: source,
  capacityVehPerHourPerLane: z.number().positive().max(5000),
  capacitySource: source,
  jamDensityVehPerKmPerLane: z.number().positive().max(300),
  jamDensitySource: source,
});
export type CapacityTableRow = z.infer<typeof capacityTableRowSchema>;

/** Multiplies every arc capacity (weather, incidents, evacuation conditions). */
export const capacityFactorSchema = z.number().gt(0).max(2);

export const capacityTableSchema = z
  .object({
    rows: z.array(capacityTableRowSchema),
    capacityFactor: capacityFactorSchema,
    /** Why this factor (e.g. "heavy rain, HCM 7th ed. Exhibit 11-20"). */
    capacityFactorNote: z.string().max(500),
  })
  .refine((t) => drivableRoadClasses.every((c) => t.rows.filter((r) => r.roadClass === c).length === 1), {
    message: 'the table needs exactly one row per drivable road class',
    path: ['rows'],
  });
export type CapacityTable = z.infer<typeof capacityTableSchema>;

// ---------------------------------------------------------------------------------------------
// Changes to the table, as its audit trail records them

/** The values of a row, each with the field that says where it comes from. */
export const capacityValueSources = {
  lanesPerDirection: 'lanesSource',
  speedKmh: 'speedSource',
  capacityVehPerHourPerLane: 'capacitySource',
  jamDensityVehPerKmPerLane: 'jamDensitySource',
} as const;
export type CapacityValueField = keyof typeof capacityValueSources;

export const capacityTableFieldSchema = z.enum([
  'lanesPerDirection',
  'lanesSource',
  'speedKmh',
  'speedSource',
  'capacityVehPerHourPerLane',
  'capacitySource',
  'jamDensityVehPerKmPerLane',
  'jamDensitySource',
  'capacityFactor',
  'capacityFactorNote',
]);

/** One changed cell: a road class's value or source, or (roadClass null) the table's factor. */
export const capacityTableChangeSchema = z.object({
  roadClass: roadClassSchema.nullable(),
  field: capacityTableFieldSchema,
  from: z.union([z.number(), z.string()]),
  to: z.union([z.number(), z.string()]),
});
export type CapacityTableChange = z.infer<typeof capacityTableChangeSchema>;

export const capacityTableHistoryEntrySchema = z.object({
  id: z.number(),
  at: z.string(),
  actorName: z.string().nullable(),
  changes: z.array(capacityTableChangeSchema),
});
export type CapacityTableHistoryEntry = z.infer<typeof capacityTableHistoryEntrySchema>;
export const capacityTableHistorySchema = z.object({ entries: z.array(capacityTableHistoryEntrySchema) });

/** Every cell that differs between two tables, rows matched by road class. */
export function capacityTableChanges(before: CapacityTable, after: CapacityTable): CapacityTableChange[] {
  const changes: CapacityTableChange[] = [];
  const fields = capacityTableFieldSchema.options.filter((f) => f !== 'capacityFactor' && f !== 'capacityFactorNote') as (keyof CapacityTableRow)[];
  for (const next of after.rows) {
    const prev = before.rows.find((r) => r.roadClass === next.roadClass);
    for (const field of fields) {
      const from = prev?.[field] as number | string | undefined;
      const to = next[field] as number | string;
      if (from !== to) changes.push({ roadClass: next.roadClass, field: field as CapacityTableChange['field'], from: from ?? '', to });
    }
  }
  if (before.capacityFactor !== after.capacityFactor) changes.push({ roadClass: null, field: 'capacityFactor', from: before.capacityFactor, to: after.capacityFactor });
  if (before.capacityFactorNote !== after.capacityFactorNote) changes.push({ roadClass: null, field: 'capacityFactorNote', from: before.capacityFactorNote, to: after.capacityFactorNote });
  return changes;
}

/**
 * A value changed with its source left as it was would print the old source beside a number it
 * no longer explains: each such value is named, so the form (and the API) can ask for its source.
 */
export function valuesMissingNewSource(before: CapacityTable, after: CapacityTable): { index: number; sourceField: (typeof capacityValueSources)[CapacityValueField] }[] {
  const missing: { index: number; sourceField: (typeof capacityValueSources)[CapacityValueField] }[] = [];
  after.rows.forEach((next, index) => {
    const prev = before.rows.find((r) => r.roadClass === next.roadClass);
    if (!prev) return;
    for (const [value, source] of Object.entries(capacityValueSources) as [CapacityValueField, (typeof capacityValueSources)[CapacityValueField]][]) {
      if (prev[value] !== next[value] && prev[source].trim() === next[source].trim()) missing.push({ index, sourceField: source });
    }
  });
  return missing;
}
