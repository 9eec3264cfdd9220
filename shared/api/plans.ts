// Plans: a plan gathers one area's road layer, zones, shelters, scenarios, runs and briefings.
import { z } from 'zod';

/** `:planId` in every plan-scoped route. */
export const planParamsSchema = z.object({ planId: z.string().uuid('Not a valid identifier.') });

const planName = z.string().trim().min(1, 'Give the plan a name.').max(120);
const planDescription = z.string().trim().max(2000);

export const planCreateSchema = z.object({ name: planName, description: planDescription.default('') });
export type PlanCreate = z.infer<typeof planCreateSchema>;

export const planUpdateSchema = z.object({ name: planName.optional(), description: planDescription.optional() }).refine((v) => Object.keys(v).length > 0, {
  message: 'Nothing to change.',
});
export type PlanUpdate = z.infer<typeof planUpdateSchema>;

export const planSchema = z.object({
  id: z.string().uuid(),
  organizationId: z.string().uuid(),
  name: z.string(),
  description: z.string(),
  createdBy: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Plan = z.infer<typeof planSchema>;

export const planListSchema = z.object({ plans: z.array(planSchema) });

export const idParamsSchema = z.object({ id: z.string().uuid('Not a valid identifier.') });
