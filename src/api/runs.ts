// Runs: start one, poll it while it works, cancel it, list earlier ones; export links.
import { runSchema, runWithResultSchema, type RunParameters } from '@shared/api/runs';
import { z } from 'zod';
import { request } from './http';

const base = (planId: string) => `/plans/${planId}/runs`;

export const startRun = (planId: string, parameters: RunParameters) => request('POST', base(planId), runSchema, { parameters });
export const listRuns = async (planId: string) => (await request('GET', base(planId), z.object({ runs: z.array(runSchema) }))).runs;
export const getRun = (planId: string, runId: string, signal?: AbortSignal) =>
  request('GET', `${base(planId)}/${runId}`, runWithResultSchema, undefined, { signal });
export const cancelRun = (planId: string, runId: string) => request('POST', `${base(planId)}/${runId}/cancel`, runSchema);

export type RunExport = 'arcs.geojson' | 'bottlenecks.csv' | 'curve.csv';
/** A plain link: the browser downloads it with the session cookie. */
export const runExportUrl = (planId: string, runId: string, file: RunExport) => `/api${base(planId)}/${runId}/export/${file}`;
