// The order in which a briefing lists choke points and fixes. Choke points are ranked by the
// same function as the workspace (shared/format/choke-points.ts), so "rank 1" is the same road
// on the screen, in the tables, the map badges and the summary.
import { cutShare } from '../../../shared/model/cut-share';
import { rankChokePoints } from '../../../shared/format/choke-points';
import type { ChokePoint, Fix, RunResult } from '../../../shared/api/runs';

/** A choke point's share of the limit, as the workspace shows it. */
export function shareOfLimit(result: RunResult, b: ChokePoint): number {
  return cutShare(b, result.headline.steadyStateVehiclesPerHour);
}

/** The result's choke points in the one shared order. */
export function rankedChokePoints(result: RunResult): ChokePoint[] {
  return rankChokePoints(result.bottlenecks, result.headline.steadyStateVehiclesPerHour);
}

/** The most valuable fix first: the largest gain in vehicles per hour. Fixes gaining nothing are left out. */
export function rankFixes(result: RunResult): Fix[] {
  return [...result.fixes]
    .filter((f) => f.gainVehiclesPerHour > 0)
    .sort((a, b) => b.gainVehiclesPerHour - a.gainVehiclesPerHour || a.segmentId - b.segmentId || a.direction.localeCompare(b.direction));
}

/** Map badges: each ranked choke point's segment with its rank (1-based). */
export function chokePointRanks(result: RunResult): { segmentId: number; rank: number }[] {
  return rankedChokePoints(result).map((b, i) => ({ segmentId: b.segmentId, rank: i + 1 }));
}
