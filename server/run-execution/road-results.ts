// Each road's figures in a finished run, one row per segment in run_road_results: the engine's
// directed roads folded onto their segments (flow, capacity and static-cut flag per direction,
// the busier direction's utilisation, the share of the time-expanded cut and how long the road
// is part of it). Written with the run's result and copied when a result is reused; read by
// server/services/road-results.ts (by road, for the arcs export) and map-tiles.ts (by tile).
import { sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import type { RunInput } from '../../shared/model/run-input';
import { steadyCapacities, type SolvedRun } from './to-run-result';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

/** Columns, one entry per segment the run used. */
export type RoadResultColumns = {
  segmentId: number[];
  flowForward: number[];
  flowBackward: number[];
  capacityForward: (number | null)[];
  capacityBackward: (number | null)[];
  utilisation: number[];
  cutForward: boolean[];
  cutBackward: boolean[];
  shareOfCut: number[];
  limitingMinutes: number[];
};

export function toRoadResults(input: RunInput, done: SolvedRun): RoadResultColumns {
  const r = done.result;
  const minutesPerStep = r.timeStepSeconds / 60;
  const capacity = steadyCapacities(input);
  const staticCut = new Set(r.steadyState.cutRoads);
  const share = new Map<number, number>();
  const steps = new Map<number, number>();
  for (const b of r.bottlenecks.roads) {
    share.set(b.road, b.share);
    steps.set(b.road, b.stepRanges.reduce((sum, [first, last]) => sum + last - first + 1, 0));
  }
  const rowOf = new Map<number, number>();
  const c: RoadResultColumns = {
    segmentId: [],
    flowForward: [],
    flowBackward: [],
    capacityForward: [],
    capacityBackward: [],
    utilisation: [],
    cutForward: [],
    cutBackward: [],
    shareOfCut: [],
    limitingMinutes: [],
  };
  input.problem.roads.forEach((_road, i) => {
    const origin = input.roadOrigins[i]!;
    const segmentId = input.segments[origin.segment]!.id;
    let row = rowOf.get(segmentId);
    if (row === undefined) {
      row = c.segmentId.length;
      rowOf.set(segmentId, row);
      c.segmentId.push(segmentId);
      c.flowForward.push(0);
      c.flowBackward.push(0);
      c.capacityForward.push(null);
      c.capacityBackward.push(null);
      c.utilisation.push(0);
      c.cutForward.push(false);
      c.cutBackward.push(false);
      c.shareOfCut.push(0);
      c.limitingMinutes.push(0);
    }
    const flow = r.steadyState.roadFlowVehPerHour[i] ?? 0;
    const cap = capacity[i]!;
    const forward = origin.direction === 'forward';
    (forward ? c.flowForward : c.flowBackward)[row] = flow;
    (forward ? c.capacityForward : c.capacityBackward)[row] = cap;
    // A closed road crosses the cut with nothing on it: a candidate to reopen, not a choke point.
    (forward ? c.cutForward : c.cutBackward)[row] = staticCut.has(i) && cap > 0;
    c.utilisation[row] = Math.max(c.utilisation[row]!, cap > 0 ? flow / cap : 0);
    c.shareOfCut[row]! += share.get(i) ?? 0;
    c.limitingMinutes[row] = Math.max(c.limitingMinutes[row]!, (steps.get(i) ?? 0) * minutesPerStep);
  });
  return c;
}

// PostgreSQL arrays as text literals: one parameter per column however many roads there are.
const numbers = (values: readonly (number | null)[]) => `{${values.map((v) => (v === null ? 'NULL' : String(v))).join(',')}}`;
const booleans = (values: readonly boolean[]) => `{${values.map((v) => (v ? 't' : 'f')).join(',')}}`;
const rowsPerStatement = 50_000;

export async function saveRoadResults(tx: Tx | Database, runId: string, c: RoadResultColumns): Promise<void> {
  for (let start = 0; start < c.segmentId.length; start += rowsPerStatement) {
    const part = <T>(values: T[]) => values.slice(start, start + rowsPerStatement);
    await tx.execute(sql`
      INSERT INTO run_road_results (run_id, segment_id, flow_forward, flow_backward, capacity_forward, capacity_backward,
                                    utilisation, cut_forward, cut_backward, share_of_cut, limiting_minutes)
      SELECT ${runId}::uuid, * FROM unnest(${numbers(part(c.segmentId))}::bigint[], ${numbers(part(c.flowForward))}::real[],
        ${numbers(part(c.flowBackward))}::real[], ${numbers(part(c.capacityForward))}::real[], ${numbers(part(c.capacityBackward))}::real[],
        ${numbers(part(c.utilisation))}::real[], ${booleans(part(c.cutForward))}::boolean[], ${booleans(part(c.cutBackward))}::boolean[],
        ${numbers(part(c.shareOfCut))}::real[], ${numbers(part(c.limitingMinutes))}::real[])`);
  }
}

/** A reused result brings its roads' figures along. */
export async function copyRoadResults(tx: Tx, fromRunId: string, toRunId: string): Promise<void> {
  await tx.execute(sql`
    INSERT INTO run_road_results (run_id, segment_id, flow_forward, flow_backward, capacity_forward, capacity_backward,
                                  utilisation, cut_forward, cut_backward, share_of_cut, limiting_minutes)
    SELECT ${toRunId}::uuid, segment_id, flow_forward, flow_backward, capacity_forward, capacity_backward,
           utilisation, cut_forward, cut_backward, share_of_cut, limiting_minutes
    FROM run_road_results WHERE run_id = ${fromRunId}::uuid`);
}
