// A finished run's results as export tables: each road with its flow, capacity, utilisation,
// static-cut flags, share of the time-expanded cut and how long it limits arrivals; each zone
// and shelter with its figures; the evacuation curve. Lengths follow the organisation's units.
import type { Geometry } from 'geojson';
import type { RoadResult, RunResult } from '../api/runs';
import type { UnitSystem } from '../api/units';
import type { ZoneGeometry } from '../api/zones-shelters';
import { field, tableOf, type ExportTable } from './export-tables';
import { unitColumns } from './inputs-export';

export type RoadOfRun = { id: number; coordinates: [number, number][]; name: string | null; roadClass: string; lengthMeters: number };

type RoadRow = { result: RoadResult; road: RoadOfRun | undefined };

export function roadResultsTable(results: readonly RoadResult[], roads: ReadonlyMap<number, RoadOfRun>, timeStepSeconds: number, system: UnitSystem): ExportTable {
  const u = unitColumns(system);
  const f = field<RoadRow>;
  return tableOf(
    { name: 'roads', title: 'Roads with their flows in the run', geometry: 'line' },
    [
      f('seg_id', 'integer', null, 'Cutline road segment id', (x) => x.result.segmentId),
      f('name', 'text', null, 'road name', (x) => x.road?.name ?? null),
      f('road_class', 'text', null, 'road class (OpenStreetMap highway values)', (x) => x.road?.roadClass ?? null),
      f('flow_fwd', 'real', 'veh/h', 'steady-state flow along the drawing direction', (x) => x.result.forward?.flowVehiclesPerHour ?? 0),
      f('flow_bwd', 'real', 'veh/h', 'steady-state flow against the drawing direction', (x) => x.result.backward?.flowVehiclesPerHour ?? 0),
      f('cap_fwd', 'real', 'veh/h', 'capacity along the drawing direction (empty: no lane that way)', (x) => x.result.forward?.capacityVehiclesPerHour ?? null),
      f('cap_bwd', 'real', 'veh/h', 'capacity against the drawing direction (empty: no lane that way)', (x) => x.result.backward?.capacityVehiclesPerHour ?? null),
      f('util', 'real', 'share 0-1', 'utilisation of the busier direction: flow ÷ capacity', (x) => x.result.utilisation),
      f('cut_fwd', 'boolean', null, 'along the drawing direction in the steady-state minimum cut', (x) => x.result.forward?.inStaticCut ?? false),
      f('cut_bwd', 'boolean', null, 'against the drawing direction in the steady-state minimum cut', (x) => x.result.backward?.inStaticCut ?? false),
      f('cut_share', 'real', 'share 0-1', 'share of the time-expanded minimum cut (both directions)', (x) => x.result.shareOfCut),
      f('limit_min', 'real', 'minutes', 'minutes this road is part of the time-expanded cut (limits arrivals)', (x) => x.result.limitingMinutes),
      f('limit_stp', 'integer', 'time steps', `time steps of ${timeStepSeconds} s this road is part of the time-expanded cut`, (x) => Math.round((x.result.limitingMinutes * 60) / timeStepSeconds)),
      f(u.length, 'real', u.lengthUnit, 'geodesic length', (x) => (x.road ? u.toLength(x.road.lengthMeters) : null)),
    ],
    results.map((result) => ({ result, road: roads.get(result.segmentId) })),
    (x) => (x.road ? { type: 'LineString', coordinates: x.road.coordinates } : null),
  );
}

export function zoneResultsTable(result: RunResult, geometryOf: (zoneId: number) => ZoneGeometry | null): ExportTable {
  const f = field<RunResult['zones'][number]>;
  return tableOf(
    { name: 'zones', title: 'Evacuation zones in the run', geometry: 'polygon' },
    [
      f('zone_id', 'integer', null, 'Cutline zone id', (z) => z.zoneId),
      f('name', 'text', null, 'zone name', (z) => z.name),
      f('demand_v', 'real', 'vehicles', 'vehicles the zone sends', (z) => z.demandVehicles),
      f('demand_p', 'real', 'persons', 'persons who leave', (z) => z.demandPersons),
      f('arrived_v', 'real', 'vehicles', "of the zone's vehicles, those at a shelter by the end of the horizon", (z) => z.deliveredVehicles),
      f('rate_vph', 'real', 'veh/h', 'steady-state rate out of the zone', (z) => z.steadyStateVehiclesPerHour),
      f('clear_min', 'real', 'minutes', 'clearance time (empty: not within the horizon)', (z) => z.clearanceMinutes),
    ],
    result.zones,
    (z) => geometryOf(z.zoneId) as Geometry | null,
  );
}

export function shelterResultsTable(result: RunResult, positionOf: (shelterId: number) => [number, number] | null): ExportTable {
  const f = field<RunResult['shelters'][number]>;
  return tableOf(
    { name: 'shelters', title: 'Shelters and exits in the run', geometry: 'point' },
    [
      f('shel_id', 'integer', null, 'Cutline shelter id', (s) => s.shelterId),
      f('name', 'text', null, 'shelter or exit name', (s) => s.name),
      f('capacity', 'integer', 'persons', 'persons the shelter takes (empty: an exit without a limit)', (s) => s.capacityPersons),
      f('arrived_v', 'real', 'vehicles', 'vehicles arrived by the end of the horizon', (s) => s.arrivedVehicles),
      f('arrived_p', 'real', 'persons', 'persons arrived by the end of the horizon', (s) => s.arrivedPersons),
      f('rate_vph', 'real', 'veh/h', 'steady-state rate into the shelter', (s) => s.steadyStateVehiclesPerHour),
    ],
    result.shelters,
    (s) => {
      const p = positionOf(s.shelterId);
      return p ? { type: 'Point', coordinates: p } : null;
    },
  );
}

/** The curve as in curve.csv: step i at i × the step's minutes. */
export function curveTable(result: RunResult): ExportTable {
  const { stepMinutes, deliveredVehicles } = result.curve;
  const demand = result.headline.demandVehicles;
  const f = field<number>;
  return tableOf(
    { name: 'curve', title: 'Vehicles arrived at shelters over time', geometry: null },
    [
      f('step', 'integer', null, 'time step', (i) => i),
      f('minutes', 'real', 'minutes', 'minutes after the evacuation order', (i) => Number((i * stepMinutes).toFixed(3))),
      f('arrived_v', 'real', 'vehicles', 'vehicles arrived by then', (i) => deliveredVehicles[i]!),
      f('share', 'real', 'share 0-1', 'share of all vehicles', (i) => (demand > 0 ? deliveredVehicles[i]! / demand : null)),
    ],
    deliveredVehicles.map((_, i) => i),
    () => null,
  );
}
