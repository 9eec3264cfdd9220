// The unit systems an organisation can work in; conversions and wording in shared/format/units.ts.
import { z } from 'zod';

export const unitSystems = ['metric', 'us-customary'] as const;
export const unitSystemSchema = z.enum(unitSystems);
export type UnitSystem = z.infer<typeof unitSystemSchema>;
