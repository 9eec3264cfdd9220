// The map's data by tile and by road: tile URL templates for the vector-tile layer (it fetches
// them itself, with the session cookie), one road's figures in a run, and a few roads' geometry.
import { roadResultAnswerSchema, segmentGeometrySchema } from '@shared/api/runs';
import { request } from './http';

type Coordinates = [number, number][];

/** `{z}/{x}/{y}` template of the plan's road tiles; `version` makes an edited layer a new URL. */
export const roadTileUrl = (planId: string, version: number) => `/api/plans/${planId}/tiles/roads/{z}/{x}/{y}?v=${version}`;
/** The same with a run's figures on its roads. */
export const runTileUrl = (planId: string, runId: string, version: number) => `/api/plans/${planId}/runs/${runId}/tiles/{z}/{x}/{y}?v=${version}`;

export const getRoadResult = async (planId: string, runId: string, segmentId: number) =>
  (await request('GET', `/plans/${planId}/runs/${runId}/roads/${segmentId}`, roadResultAnswerSchema)).road;

const toMap = (segments: { id: number; coordinates: Coordinates }[]) => new Map(segments.map((s) => [s.id, s.coordinates] as const));

/** Geometry of a run's choke points and fixes, by segment id. */
export const getChokePointGeometry = async (planId: string, runId: string) =>
  toMap((await request('GET', `/plans/${planId}/runs/${runId}/choke-point-geometry`, segmentGeometrySchema)).segments);

/** Geometry of a few roads of the plan's active layer (at most 500 per call). */
export async function getSegmentGeometry(planId: string, ids: readonly number[]): Promise<Map<number, Coordinates>> {
  const all = new Map<number, Coordinates>();
  for (let i = 0; i < ids.length; i += 500) {
    const part = ids.slice(i, i + 500);
    for (const [id, c] of toMap((await request('GET', `/plans/${planId}/segment-geometry?ids=${part.join(',')}`, segmentGeometrySchema)).segments)) all.set(id, c);
  }
  return all;
}
