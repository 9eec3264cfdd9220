// A choke point's share of what limits the evacuation, as the workspace and the briefing both
// show it. The engine gives the share in the time-expanded cut; a road only in the steady-state
// cut comes with 0 there, and its share of that cut is its capacity over the steady-state
// throughput (the cut's capacity equals the maximum flow, max-flow min-cut theorem).
import type { ChokePoint } from '../api/runs';

export function cutShare(b: Pick<ChokePoint, 'shareOfCut' | 'inStaticCut' | 'capacityVehiclesPerHour'>, steadyStateVehiclesPerHour: number): number {
  if (b.shareOfCut > 0) return b.shareOfCut;
  if (b.inStaticCut && steadyStateVehiclesPerHour > 0) return Math.min(1, b.capacityVehiclesPerHour / steadyStateVehiclesPerHour);
  return 0;
}
