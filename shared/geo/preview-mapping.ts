// The field-mapping step's preview: the first features of a file read through the planner's
// mapping by the very readers the import uses, one feature at a time, so the map shows the class,
// lanes and capacity (roads), population (zones) or capacity (shelters) each will get, and what
// will be dropped or refused and why. Pure; the client runs it on every change of the form.
import type { FeatureCollection } from 'geojson';
import type { CapacityTable } from '../api/capacity-table';
import type { RoadClass } from '../api/road-attributes';
import type { DropReason, FileField, PreviewFeature, PropertyMapping, ShelterFieldMapping, SourceFormat, ZoneFieldMapping } from '../api/road-import';
import { capacityRowFor, defaultCapacityTable } from '../model/capacity-defaults';
import { applyShelterFields, applyZoneFields } from './apply-field-mapping';
import { readRoadFeatures } from './read-road-features';
import { readShelters } from './read-shelters';
import { readZones } from './read-zones';
import { RoadImportError } from './road-import-error';

export type PreviewKind = 'roads' | 'zones' | 'shelters';

/** One feature as the import would take it: kept with its figures, dropped (roads: left out of
 *  the network, the import goes on) or refused (a bad feature refuses the whole file). */
export type PreviewOutcome =
  | { index: number; geometry: PreviewFeature['geometry']; state: 'kept'; label: string; roadClass?: RoadClass; lanes?: number; capacityVehPerHour?: number; population?: number; capacityPersons?: number | null }
  | { index: number; geometry: PreviewFeature['geometry']; state: 'dropped'; reason: DropReason; label: string }
  | { index: number; geometry: PreviewFeature['geometry']; state: 'refused'; problem: string; label: string };

/** Why a road is left out, in the planner's words. */
export const DROP_REASON_TEXT: Record<DropReason, string> = {
  notDrivableClass: 'a class cars do not use',
  noRoadClass: 'no road class',
  unknownClass: 'a class value the table does not map (or maps to "leave out")',
  noMotorVehicles: 'closed to cars',
  area: 'drawn as an area',
  notALine: 'not a line',
  noGeometry: 'no geometry',
  reversibleOneway: 'reversible one-way',
  zeroLength: 'zero length',
};

function collectionOf(features: readonly PreviewFeature[]): FeatureCollection {
  return { type: 'FeatureCollection', features: features.map((f) => ({ type: 'Feature', geometry: f.geometry, properties: f.properties })) as FeatureCollection['features'] };
}

function problemOf(e: unknown): string {
  if (e instanceof RoadImportError) return e.failure.badFeatures[0]?.problem ?? e.failure.message;
  return e instanceof Error ? e.message : String(e);
}

function previewRoad(f: PreviewFeature, mapping: PropertyMapping | null, table: Pick<CapacityTable, 'rows' | 'capacityFactor'>): PreviewOutcome {
  const base = { index: f.index, geometry: f.geometry };
  try {
    const reading = readRoadFeatures(collectionOf([f]), mapping);
    const line = reading.lines[0];
    if (!line) {
      const [key] = [...reading.dropped.keys()];
      const [reason, roadClass] = (key ?? 'noRoadClass\u0000').split('\u0000') as [DropReason, string];
      return { ...base, state: 'dropped', reason, label: `left out: ${DROP_REASON_TEXT[reason]}${roadClass && roadClass !== '(none)' ? ` (${roadClass})` : ''}` };
    }
    const a = line.attributes;
    const row = capacityRowFor(table, a.roadClass);
    const lanes = a.lanesForward ?? row.lanesPerDirection;
    const capacity = Math.round(lanes * row.capacityVehPerHourPerLane * table.capacityFactor);
    const way = a.oneway ? 'one-way' : 'each way';
    return { ...base, state: 'kept', roadClass: a.roadClass, lanes, capacityVehPerHour: capacity, label: `${a.roadClass}, ${lanes} lane${lanes === 1 ? '' : 's'} ${way}, ${capacity} veh/h` };
  } catch (e) {
    return { ...base, state: 'refused', problem: problemOf(e), label: `refuses the file: ${problemOf(e)}` };
  }
}

/**
 * @param format the file's format: a CSV table's points are zones (small squares), as on import.
 * @param table the plan's capacity table (its defaults when not given).
 */
export function previewMapping(
  kind: PreviewKind,
  features: readonly PreviewFeature[],
  mapping: { roads?: PropertyMapping | null; zones?: ZoneFieldMapping; shelters?: ShelterFieldMapping },
  format: SourceFormat,
  table: Pick<CapacityTable, 'rows' | 'capacityFactor'> = defaultCapacityTable(),
): PreviewOutcome[] {
  if (kind === 'roads') return features.map((f) => previewRoad(f, mapping.roads ?? null, table));
  return features.map((f): PreviewOutcome => {
    const base = { index: f.index, geometry: f.geometry };
    try {
      if (kind === 'zones') {
        const mapped = applyZoneFields(collectionOf([f]), mapping.zones ?? {}, format === 'csv');
        const zone = readZones(mapped)[0]!;
        return { ...base, geometry: (mapped.features[0]?.geometry as PreviewFeature['geometry']) ?? f.geometry, state: 'kept', population: zone.attributes.population, label: `${zone.attributes.name}: ${zone.attributes.population} residents` };
      }
      const shelter = readShelters(applyShelterFields(collectionOf([f]), mapping.shelters ?? {}))[0]!;
      const cap = shelter.attributes.capacityPersons;
      return { ...base, state: 'kept', capacityPersons: cap, label: `${shelter.attributes.name}: ${cap === null ? 'no limit' : `${cap} persons`}` };
    } catch (e) {
      return { ...base, state: 'refused', problem: problemOf(e), label: `refuses the file: ${problemOf(e)}` };
    }
  });
}

/** Counts of the preview: kept, and dropped or refused per reason (the form's summary). */
export function previewSummary(outcomes: readonly PreviewOutcome[]): { kept: number; reasons: { text: string; features: number; refuses: boolean }[] } {
  const reasons = new Map<string, { text: string; features: number; refuses: boolean }>();
  let kept = 0;
  for (const o of outcomes) {
    if (o.state === 'kept') {
      kept += 1;
      continue;
    }
    const text = o.state === 'dropped' ? DROP_REASON_TEXT[o.reason] : o.problem;
    const entry = reasons.get(text) ?? { text, features: 0, refuses: o.state === 'refused' };
    entry.features += 1;
    reasons.set(text, entry);
  }
  return { kept, reasons: [...reasons.values()].sort((a, b) => b.features - a.features) };
}

/** The distinct values of a column among the previewed features and the schema's samples, for
 *  the value table (a county's own class codes → our classes). */
export function distinctValues(features: readonly PreviewFeature[], field: FileField | undefined, limit = 60): string[] {
  if (!field) return [];
  const seen = new Set<string>();
  for (const f of features) {
    const v = f.properties[field.name];
    if (v === null || v === undefined || String(v).trim() === '') continue;
    seen.add(String(v).trim());
    if (seen.size >= limit) break;
  }
  for (const s of field.samples) if (seen.size < limit && s.trim() !== '') seen.add(s.trim());
  return [...seen].sort((a, b) => a.localeCompare(b, 'en', { numeric: true }));
}

const GUESSES: { key: string; pattern: RegExp }[] = [
  { key: 'roadClass', pattern: /^(highway|road_?class|rd_?class|func_?class|fclass|fcc|class|cfcc|road_?type|type)$/i },
  { key: 'lanes', pattern: /^(lanes|num_?lanes|lane_?count|lane_?cnt|no_?lanes)$/i },
  { key: 'lanesForward', pattern: /^(lanes_?(fwd|forward|ft))$/i },
  { key: 'lanesBackward', pattern: /^(lanes_?(bwd|backward|tf))$/i },
  // speed_kmh / speed_mph: the road files Cutline writes (their unit in the name).
  { key: 'speed', pattern: /^(maxspeed|speed|spd|speed_?lim(it)?|spd_?lim(it)?|posted_?speed|speed_?(kmh|mph))$/i },
  { key: 'oneway', pattern: /^(oneway|one_?way|dir|direction|flow_?dir)$/i },
  { key: 'name', pattern: /^(name|full_?name|st_?name|street|street_?name|rd_?name|road_?name|label)$/i },
  { key: 'bridge', pattern: /^(bridge|is_?bridge|brdg)$/i },
  { key: 'tunnel', pattern: /^(tunnel|is_?tunnel|tunl)$/i },
  { key: 'layer', pattern: /^(layer|level|z_?lev(el)?|grade_?level)$/i },
  { key: 'closed', pattern: /^(closed|is_?closed)$/i },
  { key: 'capacityPerLane', pattern: /^(cap_?lane|capacity_?per_?lane|lane_?capacity)$/i },
  { key: 'population', pattern: /^(population|pop|pop_?total|total_?pop|residents|pop\d*)$/i },
  { key: 'participationRate', pattern: /^(participation(_?rate)?|particip|evac_?rate|compliance)$/i },
  { key: 'personsPerVehicle', pattern: /^(persons_?per_?vehicle|ppv|occupancy|veh_?occ)$/i },
  { key: 'capacityPersons', pattern: /^(capacity_?persons|capacity|cap|max_?occ(upancy)?|beds|spaces)$/i },
];

/** A first guess of which column means what, from common column names; the planner corrects it. */
export function guessColumns(fields: readonly FileField[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const { key, pattern } of GUESSES) {
    const hit = fields.find((f) => pattern.test(f.name.trim()));
    if (hit) out[key] = hit.name;
  }
  return out;
}
