// The plan's inputs as export tables: the road layer as it stands after edits and closures
// (stored lanes, speed, class, name, overrides, and what the model makes of them with the
// capacity table), the zones and the shelters. Lengths and speeds are in the organisation's
// unit system, and each column's name and description say which unit it holds.
import type { Geometry } from 'geojson';
import type { CapacityTable } from '../api/capacity-table';
import type { PropertyMapping } from '../api/road-import';
import type { SegmentAttributes } from '../api/road-attributes';
import type { DepartureCurve } from '../api/zone-shelter-attributes';
import type { ZoneGeometry } from '../api/zones-shelters';
import type { UnitSystem } from '../api/units';
import { METERS_PER_FOOT, speedFromKmh } from './units';
import { capacityRowFor } from '../model/capacity-defaults';
import type { ExportColumn, ExportTable } from './export-tables';
import { zoneVehicles } from '../model/vehicles';

export type RoadInput = {
  id: number;
  /** WGS84 [lon, lat] in the stored direction (forward = travel direction of a one-way road). */
  coordinates: [number, number][];
  lengthMeters: number;
  sourceId: string | null;
  attributes: SegmentAttributes;
};

export type ZoneInput = { id: number; name: string; population: number; participationRate: number; personsPerVehicle: number; departureCurve: DepartureCurve; geometry: ZoneGeometry };
export type ShelterInput = { id: number; name: string; capacityPersons: number | null; lon: number; lat: number };

/** The speed and length columns of a unit system. */
export function unitColumns(system: UnitSystem) {
  return system === 'metric'
    ? { speed: 'speed_kmh', speedUsed: 'used_kmh', speedUnit: 'km/h' as const, length: 'length_m', lengthUnit: 'm' as const, toLength: (m: number) => m }
    : { speed: 'speed_mph', speedUsed: 'used_mph', speedUnit: 'mph' as const, length: 'length_ft', lengthUnit: 'ft' as const, toLength: (m: number) => m / METERS_PER_FOOT };
}

const col = (name: string, type: ExportColumn['type'], unit: string | null, description: string): ExportColumn => ({ name, type, unit, description });

export function roadInputColumns(system: UnitSystem): ExportColumn[] {
  const u = unitColumns(system);
  return [
    col('seg_id', 'integer', null, 'Cutline road segment id'),
    col('name', 'text', null, 'road name'),
    col('road_class', 'text', null, 'road class (OpenStreetMap highway values)'),
    col('oneway', 'boolean', null, 'one-way in the direction the line is drawn'),
    col('lanes_fwd', 'integer', 'lanes', 'lanes along the drawing direction as stored; empty: the class default'),
    col('lanes_bwd', 'integer', 'lanes', 'lanes against the drawing direction as stored (0 on a one-way road); empty: the class default'),
    col(u.speed, 'real', u.speedUnit, 'free-flow speed as stored; empty: the class default'),
    col(u.speedUsed, 'real', u.speedUnit, 'free-flow speed the model uses (stored, else the class default)'),
    col('cap_lane', 'real', 'veh/h per lane', "capacity override per lane (a planner's edit); empty: the class value"),
    col('cap_ln_use', 'real', 'veh/h per lane', 'capacity per lane the model uses (override, else the class value), times the capacity factor'),
    col('cap_fwd', 'real', 'veh/h', 'capacity along the drawing direction the model uses (0 when closed)'),
    col('cap_bwd', 'real', 'veh/h', 'capacity against the drawing direction the model uses (0 when closed or one-way)'),
    col('closed', 'boolean', null, 'closed to traffic in every scenario of the plan'),
    col('bridge', 'boolean', null, 'bridge'),
    col('tunnel', 'boolean', null, 'tunnel'),
    col('level', 'integer', null, 'vertical level: roads on different levels cross without meeting'),
    col(u.length, 'real', u.lengthUnit, 'geodesic length'),
    col('source_id', 'text', null, "the feature's id in the file the layer was imported from"),
  ];
}

/** The road rows as the model would read them: stored values, and lanes, speed and capacity used. */
export function roadInputsTable(roads: readonly RoadInput[], table: Pick<CapacityTable, 'rows' | 'capacityFactor'>, system: UnitSystem): ExportTable {
  const u = unitColumns(system);
  return {
    name: 'roads',
    title: 'Road layer (after edits and closures)',
    geometry: 'line',
    columns: roadInputColumns(system),
    rows: roads.map((r) => {
      const a = r.attributes;
      const row = capacityRowFor(table, a.roadClass);
      // The same arithmetic as buildEvacuationProblem: lanes × veh/h/lane × factor; closed roads carry nothing.
      const perLane = (a.capacityOverrideVehPerHourPerLane ?? row.capacityVehPerHourPerLane) * table.capacityFactor;
      const lanesForward = a.lanesForward ?? row.lanesPerDirection;
      const lanesBackward = a.oneway ? 0 : (a.lanesBackward ?? row.lanesPerDirection);
      const open = a.closed ? 0 : 1;
      return {
        geometry: { type: 'LineString', coordinates: r.coordinates },
        values: [
          r.id,
          a.name,
          a.roadClass,
          a.oneway,
          a.lanesForward,
          a.lanesBackward,
          a.speedKmh === null ? null : speedFromKmh(a.speedKmh, system),
          speedFromKmh(a.speedKmh ?? row.speedKmh, system),
          a.capacityOverrideVehPerHourPerLane,
          perLane,
          open * lanesForward * perLane,
          open * lanesBackward * perLane,
          a.closed,
          a.bridge,
          a.tunnel,
          a.layer,
          u.toLength(r.lengthMeters),
          r.sourceId,
        ],
      };
    }),
  };
}

/** How to read the road table back in (the upload's field mapping), in the same unit system. */
export function roadInputsMapping(system: UnitSystem): PropertyMapping {
  return {
    roadClass: 'road_class',
    classValues: {},
    lanesForward: 'lanes_fwd',
    lanesBackward: 'lanes_bwd',
    oneway: 'oneway',
    onewayValues: {},
    speed: unitColumns(system).speed,
    speedUnit: system === 'metric' ? 'kmh' : 'mph',
    name: 'name',
    bridge: 'bridge',
    tunnel: 'tunnel',
    layer: 'level',
    closed: 'closed',
    capacityPerLane: 'cap_lane',
  };
}

export function zoneInputsTable(zones: readonly ZoneInput[]): ExportTable {
  return {
    name: 'zones',
    title: 'Evacuation zones',
    geometry: 'polygon',
    columns: [
      col('zone_id', 'integer', null, 'Cutline zone id'),
      col('name', 'text', null, 'zone name'),
      col('population', 'integer', 'persons', 'resident population'),
      col('share_out', 'real', 'share 0-1', 'share of residents who leave'),
      col('pers_veh', 'real', 'persons per vehicle', 'persons per evacuating vehicle'),
      col('vehicles', 'integer', 'vehicles', 'vehicles the zone sends: population × share ÷ persons per vehicle, rounded up'),
      col('departure', 'text', null, 'departure curve (JSON: kind and its parameters in hours)'),
    ],
    rows: zones.map((z) => ({
      geometry: z.geometry as Geometry,
      values: [z.id, z.name, z.population, z.participationRate, z.personsPerVehicle, zoneVehicles(z), JSON.stringify(z.departureCurve)],
    })),
  };
}

export function shelterInputsTable(shelters: readonly ShelterInput[]): ExportTable {
  return {
    name: 'shelters',
    title: 'Shelters and exits',
    geometry: 'point',
    columns: [
      col('shel_id', 'integer', null, 'Cutline shelter id'),
      col('name', 'text', null, 'shelter or exit name'),
      col('capacity', 'integer', 'persons', 'persons the shelter takes; empty: an exit without a limit'),
    ],
    rows: shelters.map((s) => ({ geometry: { type: 'Point', coordinates: [s.lon, s.lat] }, values: [s.id, s.name, s.capacityPersons] })),
  };
}
