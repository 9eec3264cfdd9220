// OpenStreetMap tags → segment attributes, or the reason the way is left out. GIS data with
// a property mapping is first turned into the same tag form (read-mapped-properties.ts), so
// one set of rules decides for both.
import { drivableRoadClasses, type RoadClass, type SegmentAttributes } from '../api/road-attributes';
import { type DropReason } from '../api/road-import';
import { preview } from './check-feature-collection';
import { parseFlag, parseLaneCount, parseLayer, parseOneway, parseSpeedKmh, parseText, type OnewayValue } from './parse-tag-values';

export type Tags = Readonly<Record<string, unknown>>;

export interface UnreadValue {
  key: string;
  value: string;
}

export type RoadReading =
  | {
      kind: 'keep';
      /** Attributes with "forward" meaning the travel direction of one-way roads. */
      attributes: SegmentAttributes;
      /** True for oneway=-1: store the geometry reversed. */
      reverse: boolean;
      unread: UnreadValue[];
    }
  | { kind: 'drop'; reason: DropReason; roadClass: string };

const drivable = new Set<string>(drivableRoadClasses);

/** Access values that keep private cars out (OSM Key:access); private/destination stay in,
 *  because in an evacuation the residents behind them drive out too. */
const NO_CAR_ACCESS = new Set(['no', 'agricultural', 'forestry', 'bus', 'psv']);

/** OSM's access hierarchy: the most specific key that is set decides. */
const ACCESS_KEYS_MOST_SPECIFIC_FIRST = ['motorcar', 'motor_vehicle', 'vehicle', 'access'] as const;

/** Ways that are one-way without an oneway tag (OSM wiki Key:oneway; docs/model.md §3, M). */
function impliedOneway(tags: Tags, roadClass: RoadClass): boolean {
  const junction = parseText(tags['junction']);
  return roadClass === 'motorway' || junction === 'roundabout' || junction === 'circular';
}

function show(value: unknown): string {
  return typeof value === 'string' ? value : preview(value);
}

/**
 * Decides whether a way is a drivable road and resolves its attributes.
 * Lanes follow the OSM wiki (Key:lanes): `lanes` counts all motor lanes of the way;
 * `lanes:forward`/`lanes:backward` say how they split, `lanes:both_ways` (a shared centre
 * turn lane) belongs to neither direction; without a split, a two-way road's lanes are
 * halved, rounding down, at least one each way (an odd lane is usually a turn lane, CP).
 */
export function readRoadTags(tags: Tags, keyLabel: (key: string) => string = (k) => k): RoadReading {
  const unread: UnreadValue[] = [];
  const note = (key: string) => unread.push({ key: keyLabel(key), value: show(tags[key]) });

  const highway = parseText(tags['highway']);
  if (highway === undefined) return { kind: 'drop', reason: 'noRoadClass', roadClass: '(none)' };
  if (!drivable.has(highway)) return { kind: 'drop', reason: 'notDrivableClass', roadClass: highway };
  const roadClass = highway as RoadClass;

  if (parseFlag(tags['area']) === true) return { kind: 'drop', reason: 'area', roadClass };
  for (const key of ACCESS_KEYS_MOST_SPECIFIC_FIRST) {
    const v = parseText(tags[key])?.toLowerCase();
    if (v === undefined) continue;
    if (NO_CAR_ACCESS.has(v)) return { kind: 'drop', reason: 'noMotorVehicles', roadClass };
    break;
  }

  let direction: OnewayValue;
  const oneway = parseOneway(tags['oneway']);
  if (oneway === 'reversible') return { kind: 'drop', reason: 'reversibleOneway', roadClass };
  if (oneway === null) note('oneway');
  if (oneway === undefined || oneway === null) direction = impliedOneway(tags, roadClass) ? 'forward' : 'both';
  else direction = oneway;

  const lane = (key: string) => {
    const n = parseLaneCount(tags[key]);
    if (n === null) note(key);
    return n ?? undefined;
  };
  const total = lane('lanes');
  const forward = lane('lanes:forward');
  const backward = lane('lanes:backward');
  const bothWays = lane('lanes:both_ways') ?? 0;

  let lanesForward: number | null;
  let lanesBackward: number | null;
  if (direction !== 'both') {
    const along = direction === 'forward' ? forward : backward;
    const travel = along ?? (total !== undefined ? total - bothWays : undefined);
    lanesForward = travel !== undefined && travel > 0 ? travel : null;
    lanesBackward = 0;
  } else if (forward !== undefined && backward !== undefined) {
    lanesForward = forward;
    lanesBackward = backward;
  } else if (total !== undefined) {
    const directional = total - bothWays;
    if (forward !== undefined) {
      lanesForward = forward;
      lanesBackward = Math.max(1, directional - forward);
    } else if (backward !== undefined) {
      lanesBackward = backward;
      lanesForward = Math.max(1, directional - backward);
    } else {
      lanesForward = Math.max(1, Math.floor(directional / 2));
      lanesBackward = lanesForward;
    }
  } else {
    lanesForward = forward ?? null;
    lanesBackward = backward ?? null;
  }
  // A two-way road tagged with 0 lanes one way is in effect one-way.
  if (direction === 'both' && lanesBackward === 0) direction = 'forward';
  if (direction === 'both' && lanesForward === 0) {
    direction = 'backward';
    lanesForward = lanesBackward;
    lanesBackward = 0;
  }
  if (direction === 'backward' && lanesForward === 0) lanesForward = null;

  const speed = parseSpeedKmh(tags['maxspeed']);
  if (speed === null) note('maxspeed');

  const bridge = parseFlag(tags['bridge']) ?? false;
  const tunnel = parseFlag(tags['tunnel']) ?? false;
  const layerTag = parseLayer(tags['layer']);
  if (layerTag === null) note('layer');
  const layer = layerTag ?? (bridge ? 1 : tunnel ? -1 : 0);

  return {
    kind: 'keep',
    reverse: direction === 'backward',
    unread,
    attributes: {
      roadClass,
      lanesForward,
      lanesBackward,
      oneway: direction !== 'both',
      speedKmh: speed ?? null,
      name: parseText(tags['name']) ?? parseText(tags['ref']) ?? null,
      bridge,
      tunnel,
      layer,
      closed: false,
      capacityOverrideVehPerHourPerLane: null,
    },
  };
}
