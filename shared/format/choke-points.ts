// The one order of choke points: the workspace's table and map, the briefing's table, map
// badges and summary all rank with this, so "rank 1" is the same road everywhere.
import { cutShare } from '../model/cut-share';
import type { ChokePoint } from '../api/runs';

/**
 * Largest share of the limit first; equal shares by what one more lane gains (more first),
 * then by lower capacity, then segment id and direction so that the order is stable.
 */
export function rankChokePoints<T extends ChokePoint>(chokePoints: readonly T[], steadyStateVehiclesPerHour: number): T[] {
  const share = (b: ChokePoint) => cutShare(b, steadyStateVehiclesPerHour);
  return [...chokePoints].sort(
    (a, b) =>
      share(b) - share(a) ||
      b.gainPerExtraLaneVehiclesPerHour - a.gainPerExtraLaneVehiclesPerHour ||
      a.capacityVehiclesPerHour - b.capacityVehiclesPerHour ||
      a.segmentId - b.segmentId ||
      a.direction.localeCompare(b.direction),
  );
}
