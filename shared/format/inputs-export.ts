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
import { field, tableOf, type ExportField, type ExportTable } from './export-tables';
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

/** A road with what the model makes of it under the capacity table (buildEvacuationProblem's arithmetic). */
type ModelledRoad = { road: RoadInput; speedUsedKmh: number; perLane: number; capacityForward: number; capacityBackward: number };

function modelledRoad(road: RoadInput, table: Pick<CapacityTable, 'rows' | 'capacityFactor'>): ModelledRoad {
  const a = road.attributes;
  const row = capacityRowFor(table, a.roadClass);
  // lanes × veh/h/lane × factor; closed roads carry nothing.
  const perLane = (a.capacityOverrideVehPerHourPerLane ?? row.capacityVehPerHourPerLane) * table.capacityFactor;
  const open = a.closed ? 0 : 1;
  return {
    road,
    speedUsedKmh: a.speedKmh ?? row.speedKmh,
    perLane,
    capacityForward: open * (a.lanesForward ?? row.lanesPerDirection) * perLane,
    capacityBackward: open * (a.oneway ? 0 : (a.lanesBackward ?? row.lanesPerDirection)) * perLane,
  };
}

/** The road table's columns in a unit system, each with its value. */
export function roadInputColumns(system: UnitSystem): ExportField<ModelledRoad>[] {
  const u = unitColumns(system);
  const f = field<ModelledRoad>;
  return [
    f('seg_id', 'integer', null, 'Cutline road segment id', (m) => m.road.id),
    f('name', 'text', null, 'road name', (m) => m.road.attributes.name),
    f('road_class', 'text', null, 'road class (OpenStreetMap highway values)', (m) => m.road.attributes.roadClass),
    f('oneway', 'boolean', null, 'one-way in the direction the line is drawn', (m) => m.road.attributes.oneway),
    f('lanes_fwd', 'integer', 'lanes', 'lanes along the drawing direction as stored; empty: the class default', (m) => m.road.attributes.lanesForward),
    f('lanes_bwd', 'integer', 'lanes', 'lanes against the drawing direction as stored (0 on a one-way road); empty: the class default', (m) => m.road.attributes.lanesBackward),
    f(u.speed, 'real', u.speedUnit, 'free-flow speed as stored; empty: the class default', (m) => (m.road.attributes.speedKmh === null ? null : speedFromKmh(m.road.attributes.speedKmh, system))),
    f(u.speedUsed, 'real', u.speedUnit, 'free-flow speed the model uses (stored, else the class default)', (m) => speedFromKmh(m.speedUsedKmh, system)),
    f('cap_lane', 'real', 'veh/h per lane', "capacity override per lane (a planner's edit); empty: the class value", (m) => m.road.attributes.capacityOverrideVehPerHourPerLane),
    f('cap_ln_use', 'real', 'veh/h per lane', 'capacity per lane the model uses (override, else the class value), times the capacity factor', (m) => m.perLane),
    f('cap_fwd', 'real', 'veh/h', 'capacity along the drawing direction the model uses (0 when closed)', (m) => m.capacityForward),
    f('cap_bwd', 'real', 'veh/h', 'capacity against the drawing direction the model uses (0 when closed or one-way)', (m) => m.capacityBackward),
    f('closed', 'boolean', null, 'closed to traffic in every scenario of the plan', (m) => m.road.attributes.closed),
    f('bridge', 'boolean', null, 'bridge', (m) => m.road.attributes.bridge),
    f('tunnel', 'boolean', null, 'tunnel', (m) => m.road.attributes.tunnel),
    f('level', 'integer', null, 'vertical level: roads on different levels cross without meeting', (m) => m.road.attributes.layer),
    f(u.length, 'real', u.lengthUnit, 'geodesic length', (m) => u.toLength(m.road.lengthMeters)),
    f('source_id', 'text', null, "the feature's id in the file the layer was imported from", (m) => m.road.sourceId),
  ];
}

/** The road rows as the model would read them: stored values, and lanes, speed and capacity used. */
export function roadInputsTable(roads: readonly RoadInput[], table: Pick<CapacityTable, 'rows' | 'capacityFactor'>, system: UnitSystem): ExportTable {
  return tableOf(
    { name: 'roads', title: 'Road layer (after edits and closures)', geometry: 'line' },
    roadInputColumns(system),
    roads.map((r) => modelledRoad(r, table)),
    (m) => ({ type: 'LineString', coordinates: m.road.coordinates }),
  );
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
  const f = field<ZoneInput>;
  return tableOf(
    { name: 'zones', title: 'Evacuation zones', geometry: 'polygon' },
    [
      f('zone_id', 'integer', null, 'Cutline zone id', (z) => z.id),
      f('name', 'text', null, 'zone name', (z) => z.name),
      f('population', 'integer', 'persons', 'resident population', (z) => z.population),
      f('share_out', 'real', 'share 0-1', 'share of residents who leave', (z) => z.participationRate),
      f('pers_veh', 'real', 'persons per vehicle', 'persons per evacuating vehicle', (z) => z.personsPerVehicle),
      f('vehicles', 'integer', 'vehicles', 'vehicles the zone sends: population × share ÷ persons per vehicle, rounded up', (z) => zoneVehicles(z)),
      f('departure', 'text', null, 'departure curve (JSON: kind and its parameters in hours)', (z) => JSON.stringify(z.departureCurve)),
    ],
    zones,
    (z) => z.geometry as Geometry,
  );
}

export function shelterInputsTable(shelters: readonly ShelterInput[]): ExportTable {
  const f = field<ShelterInput>;
  return tableOf(
    { name: 'shelters', title: 'Shelters and exits', geometry: 'point' },
    [
      f('shel_id', 'integer', null, 'Cutline shelter id', (s) => s.id),
      f('name', 'text', null, 'shelter or exit name', (s) => s.name),
      f('capacity', 'integer', 'persons', 'persons the shelter takes; empty: an exit without a limit', (s) => s.capacityPersons),
    ],
    shelters,
    (s) => ({ type: 'Point', coordinates: [s.lon, s.lat] }),
  );
}
