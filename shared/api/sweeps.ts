// Sweeps: one scenario run over a sweep of a parameter, queued as many runs that the workers share.
import { z } from 'zod';
import { runParametersSchema, runSchema, runHeadlineSchema } from './runs';

export const sweepParameterSchema = z.enum(['participationRate', 'capacityFactor']);
export type SweepParameter = z.infer<typeof sweepParameterSchema>;

export const sweepCreateSchema = z
  .object({
    name: z.string().trim().min(1).max(120),
    scenarioId: z.string().uuid().nullable().default(null),
    parameters: runParametersSchema,
    sweep: z.object({
      parameter: sweepParameterSchema,
      values: z.array(z.number()).min(2, 'Sweep at least two values.').max(25, 'At most 25 values in one sweep.'),
    }),
  })
  .superRefine((b, ctx) => {
    const [lo, hi] = b.sweep.parameter === 'participationRate' ? [0, 1] : [0.05, 1.5];
    b.sweep.values.forEach((v, i) => {
      if (v < lo || v > hi) ctx.addIssue({ code: 'custom', path: ['sweep', 'values', i], message: `Between ${lo} and ${hi}.` });
    });
  });
export type SweepCreate = z.input<typeof sweepCreateSchema>;

export const sweepSchema = z.object({
  id: z.string().uuid(),
  planId: z.string().uuid(),
  name: z.string(),
  scenarioId: z.string().uuid().nullable(),
  parameter: sweepParameterSchema,
  values: z.array(z.number()),
  createdAt: z.string(),
  runs: z.array(runSchema.extend({ sweepValue: z.number(), headline: runHeadlineSchema.nullable() })),
});
export type Sweep = z.infer<typeof sweepSchema>;
export const sweepListSchema = z.object({ sweeps: z.array(sweepSchema.omit({ runs: true })) });
