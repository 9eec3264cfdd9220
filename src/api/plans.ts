import { z } from 'zod';
import { planListSchema, planSchema, type PlanCreate, type PlanUpdate } from '@shared/api/plans';
import { request } from './http';

export const listPlans = async () => (await request('GET', '/plans', planListSchema)).plans;
export const getPlan = (id: string) => request('GET', `/plans/${id}`, planSchema);
export const createPlan = (input: PlanCreate) => request('POST', '/plans', planSchema, input);
export const updatePlan = (id: string, input: PlanUpdate) => request('PATCH', `/plans/${id}`, planSchema, input);
export const deletePlan = (id: string) => request('DELETE', `/plans/${id}`, z.undefined());

/** The plan's inputs as files (server/routes/plan-exports.ts); plain links the browser downloads with the session cookie. */
export type PlanInputsFile = 'plan-inputs.gpkg' | 'plan-inputs.zip' | 'roads.geojson' | 'zones.geojson' | 'shelters.geojson';
export const planInputsUrl = (id: string, file: PlanInputsFile) => `/api/plans/${id}/export/${file}`;
