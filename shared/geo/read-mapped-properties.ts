// GIS properties named by the planner's mapping → the OSM tag form read-road-tags.ts reads.
import { drivableRoadClasses } from '../api/road-attributes';
import { type PropertyMapping } from '../api/road-import';
import type { RoadReading, Tags } from './read-road-tags';
import { readRoadTags } from './read-road-tags';
import { parseFlag, parseText } from './parse-tag-values';

const drivable = new Set<string>(drivableRoadClasses);

const TAG_FOR_FIELD = {
  lanes: 'lanes',
  lanesForward: 'lanes:forward',
  lanesBackward: 'lanes:backward',
  oneway: 'oneway',
  speed: 'maxspeed',
  name: 'name',
  bridge: 'bridge',
  tunnel: 'tunnel',
  layer: 'layer',
} as const satisfies Partial<Record<keyof PropertyMapping, string>>;

/** Reads one feature's properties through the mapping; unread values name the property. */
export function readMappedProperties(properties: Tags, mapping: PropertyMapping): RoadReading {
  const raw = parseText(properties[mapping.roadClass]);
  if (raw === undefined) return { kind: 'drop', reason: 'noRoadClass', roadClass: '(none)' };
  const mapped = mapping.classValues[raw];
  if (mapped === 'drop') return { kind: 'drop', reason: 'unknownClass', roadClass: raw };
  const roadClass = mapped ?? (drivable.has(raw) ? raw : undefined);
  if (roadClass === undefined) return { kind: 'drop', reason: 'unknownClass', roadClass: raw };

  const tags: Record<string, unknown> = { highway: roadClass };
  const labels: Record<string, string> = {};
  for (const [field, tag] of Object.entries(TAG_FOR_FIELD)) {
    const property = mapping[field as keyof typeof TAG_FOR_FIELD];
    if (property === undefined) continue;
    let value = properties[property];
    // A bare number in the speed property is in the mapping's unit.
    if (field === 'speed' && mapping.speedUnit === 'mph' && (typeof value === 'number' || /^\s*\d+(\.\d+)?\s*$/.test(String(value ?? 'x')))) {
      value = `${String(value).trim()} mph`;
    }
    // The file's own one-way codes, in the spelling the tag reader knows.
    if (field === 'oneway' && value !== undefined && value !== null) {
      const own = mapping.onewayValues?.[String(value).trim()];
      if (own) value = own === 'forward' ? 'yes' : own === 'backward' ? '-1' : 'no';
    }
    tags[tag] = value;
    labels[tag] = property;
  }
  const reading = readRoadTags(tags, (key) => labels[key] ?? key);
  if (reading.kind === 'keep') readEdits(properties, mapping, reading);
  return reading;
}

/** A closure and a per-lane capacity override, as a file Cutline wrote carries them (no OSM tag
 *  holds either). A capacity that is not a number in the schema's range is listed as unread. */
function readEdits(properties: Tags, mapping: PropertyMapping, reading: Extract<RoadReading, { kind: 'keep' }>): void {
  if (mapping.closed !== undefined) reading.attributes.closed = parseFlag(properties[mapping.closed]) ?? false;
  if (mapping.capacityPerLane === undefined) return;
  const raw = parseText(properties[mapping.capacityPerLane]);
  if (raw === undefined) return;
  const n = Number(raw);
  if (Number.isFinite(n) && n > 0 && n <= 5000) reading.attributes.capacityOverrideVehPerHourPerLane = n;
  else reading.unread.push({ key: mapping.capacityPerLane, value: raw });
}

/** Properties read as OSM tags: osmtogeojson nests them under `tags`, other tools flatten them. */
export function tagsOf(properties: Tags | null | undefined): Tags {
  const nested = properties?.['tags'];
  if (nested !== null && typeof nested === 'object' && !Array.isArray(nested)) return nested as Tags;
  return properties ?? {};
}
