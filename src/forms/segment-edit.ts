// Editing road segments: the form's values, the patch of what changed, and validation with the
// server's schemas (the patch schema, then the merged attributes, which catch a one-way road
// that still has lanes backward). Empty lane, speed and capacity fields mean "class default".
// The speed field is in the organisation's unit (km/h or mph); the patch carries km/h.
import { roadClassSchema, segmentAttributesPatchSchema, segmentAttributesSchema, type RoadClass, type SegmentAttributesPatch } from '@shared/api/road-attributes';
import type { Segment } from '@shared/api/road-layers';
import { roadClassLooks } from '@/map/road-style';
import { speedForForm, speedFromForm } from '@/format/preferences';
import { optionalNumberFrom, parseForm, type FieldErrors } from './zod-errors';

export type SegmentFormValues = {
  roadClass: RoadClass;
  oneway: boolean;
  lanesForward: string | number | null;
  lanesBackward: string | number | null;
  speedKmh: string | number | null;
  capacityOverrideVehPerHourPerLane: string | number | null;
  closed: boolean;
};

export const roadClassItems = roadClassSchema.options.map((value) => ({ value, title: `${roadClassLooks[value].label} (${value})` }));

/** A stored speed as the form shows it: in the organisation's unit, to two decimals at most
 *  (35 mph entered reads back as 35; 50 km/h reads 31.07 mph). */
export function speedFieldValue(kmh: number | null): number | null {
  return kmh === null ? null : Math.round(speedForForm(kmh) * 100) / 100;
}

/** The speed field read as km/h (null: class default). */
function speedFieldKmh(value: string | number | null): number | null {
  const n = optionalNumberFrom(value);
  return n === null || Number.isNaN(n) ? n : speedFromForm(n);
}

export function segmentFormValues(segment: Segment): SegmentFormValues {
  return {
    roadClass: segment.roadClass,
    oneway: segment.oneway,
    lanesForward: segment.lanesForward,
    lanesBackward: segment.lanesBackward,
    speedKmh: speedFieldValue(segment.speedKmh),
    capacityOverrideVehPerHourPerLane: segment.capacityOverrideVehPerHourPerLane,
    closed: segment.closed,
  };
}

type Editable = keyof SegmentFormValues;
const numericKeys = ['lanesForward', 'lanesBackward', 'speedKmh', 'capacityOverrideVehPerHourPerLane'] as const;

/** The form read as attribute values (numbers, or null for "class default"). */
function readValues(values: SegmentFormValues): SegmentAttributesPatch {
  const read: SegmentAttributesPatch = { roadClass: values.roadClass, oneway: values.oneway, closed: values.closed };
  for (const key of numericKeys) read[key] = optionalNumberFrom(values[key]);
  read.speedKmh = speedFieldKmh(values.speedKmh);
  // A one-way road has no lanes against its direction: the form says so rather than refusing.
  if (values.oneway && read.lanesBackward === null) read.lanesBackward = 0;
  return read;
}

/** Only the attributes that differ from the stored segment. */
export function segmentPatch(segment: Segment, values: SegmentFormValues): SegmentAttributesPatch {
  const read = readValues(values);
  const patch: SegmentAttributesPatch = {};
  for (const key of Object.keys(read) as Editable[]) {
    // A speed left as shown is unchanged, whatever rounding the unit's display took.
    if (key === 'speedKmh' && optionalNumberFrom(values.speedKmh) === speedFieldValue(segment.speedKmh)) continue;
    const next = read[key];
    if (next !== segment[key] && !(Number.isNaN(next) && Number.isNaN(segment[key]))) (patch as Record<string, unknown>)[key] = next;
  }
  return patch;
}

export function validateSegmentEdit(
  segment: Segment,
  values: SegmentFormValues,
): { ok: true; patch: SegmentAttributesPatch } | { ok: false; errors: FieldErrors } {
  const patch = segmentPatch(segment, values);
  const parsed = parseForm(segmentAttributesPatchSchema, patch);
  if (!parsed.ok) return parsed;
  if (Object.keys(parsed.value).length === 0) return { ok: false, errors: { form: 'Nothing changed.' } };
  const merged = parseForm(segmentAttributesSchema, { ...attributesOf(segment), ...parsed.value });
  if (!merged.ok) return merged;
  return { ok: true, patch: parsed.value };
}

function attributesOf(segment: Segment) {
  const { id: _id, fromNode: _f, toNode: _t, lengthMeters: _l, component: _c, sourceId: _s, ...attributes } = segment;
  return attributes;
}

/** The bulk edit: each field is applied only if the planner ticked it. */
export type BulkEditValues = {
  apply: Partial<Record<'roadClass' | 'lanesForward' | 'lanesBackward' | 'speedKmh' | 'capacityOverrideVehPerHourPerLane' | 'closed', boolean>>;
  values: Omit<SegmentFormValues, 'oneway'>;
};

export function validateBulkEdit(input: BulkEditValues): { ok: true; patch: SegmentAttributesPatch } | { ok: false; errors: FieldErrors } {
  const patch: SegmentAttributesPatch = {};
  if (input.apply.roadClass) patch.roadClass = input.values.roadClass;
  if (input.apply.closed) patch.closed = input.values.closed;
  for (const key of numericKeys) if (input.apply[key]) patch[key] = key === 'speedKmh' ? speedFieldKmh(input.values[key]) : optionalNumberFrom(input.values[key]);
  if (Object.keys(patch).length === 0) return { ok: false, errors: { form: 'Tick at least one attribute to change.' } };
  const parsed = parseForm(segmentAttributesPatchSchema, patch);
  return parsed.ok ? { ok: true, patch: parsed.value } : parsed;
}
