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

// Only what the map needs from the arcs export: each segment's geometry, in stored direction.
const arcGeometrySchema = z.object({
  features: z.array(
    z.object({
      geometry: z.object({ coordinates: z.array(z.tuple([z.number(), z.number()])) }),
      properties: z.object({ segmentId: z.number().int(), direction: z.enum(['forward', 'backward']) }),
    }),
  ),
});

/** Geometry of the roads a run used, by segment id (for choke points outside the loaded view). */
export async function getRunSegmentGeometry(planId: string, runId: string): Promise<Map<number, [number, number][]>> {
  const collection = await request('GET', `${base(planId)}/${runId}/export/arcs.geojson`, arcGeometrySchema);
  const geometry = new Map<number, [number, number][]>();
  for (const f of collection.features) {
    const { segmentId, direction } = f.properties;
    if (geometry.has(segmentId) || f.geometry.coordinates.length < 2) continue;
    geometry.set(segmentId, direction === 'forward' ? f.geometry.coordinates : [...f.geometry.coordinates].reverse());
  }
  return geometry;
}
