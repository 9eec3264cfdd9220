// The order in which a briefing lists limiting roads and fixes, shared by the tables, the map
// badges and the summary so that "rank 1" means the same road everywhere.
import { cutShare } from '../../../shared/model/cut-share';
import type { Bottleneck, Fix, RunResult } from '../../../shared/api/runs';

/** A limiting road's share of the limit, as the workspace shows it. */
export function shareOfLimit(result: RunResult, b: Bottleneck): number {
  return cutShare(b, result.headline.steadyStateVehiclesPerHour);
}

/** Largest share of the limit first; ties by lower capacity, then segment id (stable output). */
export function rankBottlenecks(result: RunResult): Bottleneck[] {
  return [...result.bottlenecks].sort(
    (a, b) =>
      shareOfLimit(result, b) - shareOfLimit(result, a) ||
      a.capacityVehiclesPerHour - b.capacityVehiclesPerHour ||
      a.segmentId - b.segmentId ||
      a.direction.localeCompare(b.direction),
  );
}

/** The most valuable fix first: the largest gain in vehicles per hour. Fixes gaining nothing are left out. */
export function rankFixes(result: RunResult): Fix[] {
  return [...result.fixes]
    .filter((f) => f.gainVehiclesPerHour > 0)
    .sort((a, b) => b.gainVehiclesPerHour - a.gainVehiclesPerHour || a.segmentId - b.segmentId || a.direction.localeCompare(b.direction));
}

/** Map badges: each ranked bottleneck's segment with its rank (1-based). */
export function chokePointRanks(result: RunResult): { segmentId: number; rank: number }[] {
  return rankBottlenecks(result).map((b, i) => ({ segmentId: b.segmentId, rank: i + 1 }));
}
