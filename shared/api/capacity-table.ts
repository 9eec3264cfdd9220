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
