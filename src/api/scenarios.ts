// Scenarios of a plan: list, read, create, change, delete (runs under a scenario start in api/runs.ts).
import { z } from 'zod';
import { scenarioListSchema, scenarioSchema, type ScenarioCreate, type ScenarioOverlay } from '@shared/api/scenarios';
import { request } from './http';

const base = (planId: string) => `/plans/${planId}/scenarios`;

export type ScenarioChange = { name?: string; description?: string; overlay?: ScenarioOverlay };

export const listScenarios = async (planId: string) => (await request('GET', base(planId), scenarioListSchema)).scenarios;
export const getScenario = (planId: string, scenarioId: string) => request('GET', `${base(planId)}/${scenarioId}`, scenarioSchema);
export const createScenario = (planId: string, input: ScenarioCreate) => request('POST', base(planId), scenarioSchema, input);
export const updateScenario = (planId: string, scenarioId: string, change: ScenarioChange) =>
  request('PATCH', `${base(planId)}/${scenarioId}`, scenarioSchema, change);
export const deleteScenario = (planId: string, scenarioId: string) => request('DELETE', `${base(planId)}/${scenarioId}`, z.undefined());
