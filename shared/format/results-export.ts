// A finished run's results as export tables: each road with its flow, capacity, utilisation,
// static-cut flags, share of the time-expanded cut and how long it limits arrivals; each zone
// and shelter with its figures; the evacuation curve. Lengths follow the organisation's units.
import type { Geometry } from 'geojson';
import type { RoadResult, RunResult } from '../api/runs';
import type { UnitSystem } from '../api/units';
import type { ZoneGeometry } from '../api/zones-shelters';
import type { ExportColumn, ExportTable } from './export-tables';
import { unitColumns } from './inputs-export';

const col = (name: string, type: ExportColumn['type'], unit: string | null, description: string): ExportColumn => ({ name, type, unit, description });

export type RoadOfRun = { id: number; coordinates: [number, number][]; name: string | null; roadClass: string; lengthMeters: number };

export function roadResultsTable(results: readonly RoadResult[], roads: ReadonlyMap<number, RoadOfRun>, timeStepSeconds: number, system: UnitSystem): ExportTable {
  const u = unitColumns(system);
  return {
    name: 'roads',
    title: 'Roads with their flows in the run',
    geometry: 'line',
    columns: [
      col('seg_id', 'integer', null, 'Cutline road segment id'),
      col('name', 'text', null, 'road name'),
      col('road_class', 'text', null, 'road class (OpenStreetMap highway values)'),
      col('flow_fwd', 'real', 'veh/h', 'steady-state flow along the drawing direction'),
      col('flow_bwd', 'real', 'veh/h', 'steady-state flow against the drawing direction'),
      col('cap_fwd', 'real', 'veh/h', 'capacity along the drawing direction (empty: no lane that way)'),
      col('cap_bwd', 'real', 'veh/h', 'capacity against the drawing direction (empty: no lane that way)'),
      col('util', 'real', 'share 0-1', 'utilisation of the busier direction: flow ÷ capacity'),
      col('cut_fwd', 'boolean', null, 'along the drawing direction in the steady-state minimum cut'),
      col('cut_bwd', 'boolean', null, 'against the drawing direction in the steady-state minimum cut'),
      col('cut_share', 'real', 'share 0-1', 'share of the time-expanded minimum cut (both directions)'),
      col('limit_min', 'real', 'minutes', 'minutes this road is part of the time-expanded cut (limits arrivals)'),
      col('limit_stp', 'integer', 'time steps', `time steps of ${timeStepSeconds} s this road is part of the time-expanded cut`),
      col(u.length, 'real', u.lengthUnit, 'geodesic length'),
    ],
    rows: results.map((r) => {
      const road = roads.get(r.segmentId);
      return {
        geometry: road ? { type: 'LineString', coordinates: road.coordinates } : null,
        values: [
          r.segmentId,
          road?.name ?? null,
          road?.roadClass ?? null,
          r.forward?.flowVehiclesPerHour ?? 0,
          r.backward?.flowVehiclesPerHour ?? 0,
          r.forward?.capacityVehiclesPerHour ?? null,
          r.backward?.capacityVehiclesPerHour ?? null,
          r.utilisation,
          r.forward?.inStaticCut ?? false,
          r.backward?.inStaticCut ?? false,
          r.shareOfCut,
          r.limitingMinutes,
          Math.round((r.limitingMinutes * 60) / timeStepSeconds),
          road ? u.toLength(road.lengthMeters) : null,
        ],
      };
    }),
  };
}

export function zoneResultsTable(result: RunResult, geometryOf: (zoneId: number) => ZoneGeometry | null): ExportTable {
  return {
    name: 'zones',
    title: 'Evacuation zones in the run',
    geometry: 'polygon',
    columns: [
      col('zone_id', 'integer', null, 'Cutline zone id'),
      col('name', 'text', null, 'zone name'),
      col('demand_v', 'real', 'vehicles', 'vehicles the zone sends'),
      col('demand_p', 'real', 'persons', 'persons who leave'),
      col('arrived_v', 'real', 'vehicles', "of the zone's vehicles, those at a shelter by the end of the horizon"),
      col('rate_vph', 'real', 'veh/h', 'steady-state rate out of the zone'),
      col('clear_min', 'real', 'minutes', 'clearance time (empty: not within the horizon)'),
    ],
    rows: result.zones.map((z) => ({
      geometry: geometryOf(z.zoneId) as Geometry | null,
      values: [z.zoneId, z.name, z.demandVehicles, z.demandPersons, z.deliveredVehicles, z.steadyStateVehiclesPerHour, z.clearanceMinutes],
    })),
  };
}

export function shelterResultsTable(result: RunResult, positionOf: (shelterId: number) => [number, number] | null): ExportTable {
  return {
    name: 'shelters',
    title: 'Shelters and exits in the run',
    geometry: 'point',
    columns: [
      col('shel_id', 'integer', null, 'Cutline shelter id'),
      col('name', 'text', null, 'shelter or exit name'),
      col('capacity', 'integer', 'persons', 'persons the shelter takes (empty: an exit without a limit)'),
      col('arrived_v', 'real', 'vehicles', 'vehicles arrived by the end of the horizon'),
      col('arrived_p', 'real', 'persons', 'persons arrived by the end of the horizon'),
      col('rate_vph', 'real', 'veh/h', 'steady-state rate into the shelter'),
    ],
    rows: result.shelters.map((s) => {
      const p = positionOf(s.shelterId);
      return {
        geometry: p ? { type: 'Point', coordinates: p } : null,
        values: [s.shelterId, s.name, s.capacityPersons, s.arrivedVehicles, s.arrivedPersons, s.steadyStateVehiclesPerHour],
      };
    }),
  };
}

/** The curve as in curve.csv: step i at i × the step's minutes. */
export function curveTable(result: RunResult): ExportTable {
  const { stepMinutes, deliveredVehicles } = result.curve;
  const demand = result.headline.demandVehicles;
  return {
    name: 'curve',
    title: 'Vehicles arrived at shelters over time',
    geometry: null,
    columns: [
      col('step', 'integer', null, 'time step'),
      col('minutes', 'real', 'minutes', 'minutes after the evacuation order'),
      col('arrived_v', 'real', 'vehicles', 'vehicles arrived by then'),
      col('share', 'real', 'share 0-1', 'share of all vehicles'),
    ],
    rows: deliveredVehicles.map((v, i) => ({ geometry: null, values: [i, Number((i * stepMinutes).toFixed(3)), v, demand > 0 ? v / demand : null] })),
  };
}
