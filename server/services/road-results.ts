// A run's per-road figures (run_road_results, written by server/run-execution/road-results.ts)
// read back: one road for its popup, all of them for the arcs export.
import { sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import type { RoadResult } from '../../shared/api/runs';

type Row = {
  segment_id: string | number;
  flow_forward: number;
  flow_backward: number;
  capacity_forward: number | null;
  capacity_backward: number | null;
  utilisation: number;
  cut_forward: boolean;
  cut_backward: boolean;
  share_of_cut: number;
  limiting_minutes: number;
};

function toRoadResult(row: Row): RoadResult {
  const direction = (capacity: number | null, flow: number, cut: boolean) =>
    capacity === null ? null : { capacityVehiclesPerHour: capacity, flowVehiclesPerHour: flow, utilisation: capacity > 0 ? flow / capacity : 0, inStaticCut: cut };
  return {
    segmentId: Number(row.segment_id),
    forward: direction(row.capacity_forward, row.flow_forward, row.cut_forward),
    backward: direction(row.capacity_backward, row.flow_backward, row.cut_backward),
    utilisation: row.utilisation,
    shareOfCut: row.share_of_cut,
    limitingMinutes: row.limiting_minutes,
  };
}

/** One road's figures in a run, or null when the run did not use it. */
export async function roadResultOf(db: Database, runId: string, segmentId: number): Promise<RoadResult | null> {
  const { rows } = await db.execute<Row>(sql`SELECT * FROM run_road_results WHERE run_id = ${runId}::uuid AND segment_id = ${segmentId}`);
  return rows[0] ? toRoadResult(rows[0]) : null;
}

/** Every road's figures in a run, in segment order (for exports). */
export async function roadResultsOf(db: Database, runId: string): Promise<RoadResult[]> {
  const { rows } = await db.execute<Row>(sql`SELECT * FROM run_road_results WHERE run_id = ${runId}::uuid ORDER BY segment_id`);
  return rows.map(toRoadResult);
}
