// CSV forms of a run's tables, shared so the server's downloads and any client preview agree.
// Cells go through shared/model/csv.ts (formula guard, quoting).
import type { RunResult } from '../api/runs';
import { toCsv } from './csv';

export { toCsv };

const windows = (w: [number, number][]) => w.map(([a, b]) => `${a}-${b}`).join(' ');

export function chokePointsCsv(result: RunResult): string {
  return toCsv(
    ['rank', 'segment_id', 'direction', 'name', 'road_class', 'capacity_veh_per_h', 'share_of_cut', 'in_static_cut', 'cut_windows_min', 'gain_per_extra_lane_veh_per_h'],
    result.bottlenecks.map((b, i) => [
      i + 1,
      b.segmentId,
      b.direction,
      b.name,
      b.roadClass,
      Math.round(b.capacityVehiclesPerHour),
      Number(b.shareOfCut.toFixed(4)),
      b.inStaticCut,
      windows(b.cutWindows),
      Math.round(b.gainPerExtraLaneVehiclesPerHour),
    ]),
  );
}

export function curveCsv(result: RunResult): string {
  const { stepMinutes, deliveredVehicles } = result.curve;
  const demand = result.headline.demandVehicles;
  return toCsv(
    ['step', 'minutes', 'arrived_vehicles', 'share_of_demand'],
    deliveredVehicles.map((v, i) => [i, Number(((i) * stepMinutes).toFixed(3)), v, demand > 0 ? Number((v / demand).toFixed(4)) : null]),
  );
}
