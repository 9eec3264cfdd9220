// Runs: start one (of the plan, or under a scenario), read one, cancel it, list them; export links.
// Only the runs store (stores/runs.ts) calls these: it owns run state and the one poll loop.
import { runSchema, runWithResultSchema, type RunParameters } from '@shared/api/runs';
import { z } from 'zod';
import { request } from './http';

const base = (planId: string) => `/plans/${planId}/runs`;

/** Queues a run of the plan with the scenario's overlay applied (null: the base plan). */
export const startRun = (planId: string, parameters: RunParameters, scenarioId: string | null = null) =>
  request('POST', base(planId), runSchema, { parameters, scenarioId });
export const listRuns = async (planId: string, signal?: AbortSignal) =>
  (await request('GET', base(planId), z.object({ runs: z.array(runSchema) }), undefined, { signal })).runs;
export const getRun = (planId: string, runId: string, signal?: AbortSignal) =>
  request('GET', `${base(planId)}/${runId}`, runWithResultSchema, undefined, { signal });
export const cancelRun = (planId: string, runId: string) => request('POST', `${base(planId)}/${runId}/cancel`, runSchema);

export type RunExport = 'arcs.geojson' | 'choke-points.csv' | 'curve.csv' | 'results.gpkg' | 'results.kml';
/** A plain link: the browser downloads it with the session cookie. */
export const runExportUrl = (planId: string, runId: string, file: RunExport) => `/api${base(planId)}/${runId}/export/${file}`;
