// Editing segments: only what changed is sent, empty fields mean "class default", and the
// merged attributes are checked with the server's schema (a one-way road has no lanes back).
import { describe, expect, it } from 'vitest';
import type { Segment } from '../../shared/api/road-layers';
import { afterEach } from 'vitest';
import { speedToKmh } from '../../shared/format/units';
import { segmentFormValues, segmentPatch, validateBulkEdit, validateSegmentEdit } from '../../src/forms/segment-edit';
import { setPreferences } from '../../src/format/preferences';

const segment: Segment = {
  id: 7,
  fromNode: 1,
  toNode: 2,
  lengthMeters: 150,
  component: 0,
  sourceId: 'way/7',
  roadClass: 'secondary',
  lanesForward: 1,
  lanesBackward: 1,
  oneway: false,
  speedKmh: null,
  name: 'Quay Street',
  bridge: false,
  tunnel: false,
  layer: 0,
  closed: false,
  capacityOverrideVehPerHourPerLane: null,
};

describe('segment edit', () => {
  it('sends nothing for an untouched form', () => {
    expect(segmentPatch(segment, segmentFormValues(segment))).toEqual({});
    expect(validateSegmentEdit(segment, segmentFormValues(segment))).toEqual({ ok: false, errors: { form: 'Nothing changed.' } });
  });

  it('sends only the changed attributes, typed text read as numbers', () => {
    const values = { ...segmentFormValues(segment), lanesForward: '2', speedKmh: '45', closed: true };
    expect(validateSegmentEdit(segment, values)).toEqual({ ok: true, patch: { lanesForward: 2, speedKmh: 45, closed: true } });
  });

  it('reads an emptied field as "class default" (null)', () => {
    const values = { ...segmentFormValues(segment), lanesForward: '' };
    expect(segmentPatch(segment, values)).toEqual({ lanesForward: null });
  });

  it('makes a road one-way with no lanes against it', () => {
    const values = { ...segmentFormValues(segment), oneway: true, lanesBackward: null };
    expect(validateSegmentEdit(segment, values)).toEqual({ ok: true, patch: { oneway: true, lanesBackward: 0 } });
  });

  it('refuses a one-way road that keeps lanes against it, as the server would', () => {
    const values = { ...segmentFormValues(segment), oneway: true, lanesBackward: '2' };
    const result = validateSegmentEdit(segment, values);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors.lanesBackward).toMatch(/one-way/);
  });

  it('refuses values outside the schema limits', () => {
    const result = validateSegmentEdit(segment, { ...segmentFormValues(segment), lanesForward: '40', capacityOverrideVehPerHourPerLane: '-5' });
    expect(result.ok).toBe(false);
    if (!result.ok) {
      expect(result.errors.lanesForward).toBeDefined();
      expect(result.errors.capacityOverrideVehPerHourPerLane).toBeDefined();
    }
  });

  it('bulk edit applies only ticked attributes and needs one', () => {
    const values = { roadClass: 'primary' as const, lanesForward: '3', lanesBackward: '', speedKmh: '', capacityOverrideVehPerHourPerLane: '', closed: true };
    expect(validateBulkEdit({ apply: {}, values })).toEqual({ ok: false, errors: { form: 'Tick at least one attribute to change.' } });
    expect(validateBulkEdit({ apply: { lanesForward: true, closed: true }, values })).toEqual({ ok: true, patch: { lanesForward: 3, closed: true } });
    expect(validateBulkEdit({ apply: { speedKmh: true }, values })).toEqual({ ok: true, patch: { speedKmh: null } });
    const bad = validateBulkEdit({ apply: { lanesForward: true }, values: { ...values, lanesForward: '2.5' } });
    expect(bad.ok ? '' : bad.errors.lanesForward).toBe('Enter a whole number.');
  });
});

describe('segment edit in US customary units', () => {
  afterEach(() => setPreferences({ unitSystem: 'metric', timeZone: null }));

  it('takes the speed in mph, sends km/h, and shows the entered mph back', () => {
    setPreferences({ unitSystem: 'us-customary', timeZone: null });
    const values = { ...segmentFormValues(segment), speedKmh: '35' };
    const checked = validateSegmentEdit(segment, values);
    expect(checked).toEqual({ ok: true, patch: { speedKmh: speedToKmh(35, 'us-customary') } });
    // 1 mph = 1.609344 km/h exactly (international yard and pound agreement, 1959).
    expect(checked.ok && checked.patch.speedKmh).toBeCloseTo(56.32704, 10);
    const stored = { ...segment, speedKmh: checked.ok ? checked.patch.speedKmh! : null };
    expect(segmentFormValues(stored).speedKmh).toBe(35);
    expect(segmentPatch(stored, segmentFormValues(stored))).toEqual({});
  });

  it('leaves a metric speed it only showed in mph unchanged', () => {
    setPreferences({ unitSystem: 'us-customary', timeZone: null });
    const stored = { ...segment, speedKmh: 50 };
    expect(segmentFormValues(stored).speedKmh).toBe(31.07);
    expect(segmentPatch(stored, segmentFormValues(stored))).toEqual({});
  });

  it('converts a bulk edit speed', () => {
    setPreferences({ unitSystem: 'us-customary', timeZone: null });
    const result = validateBulkEdit({ apply: { speedKmh: true }, values: { roadClass: 'residential', lanesForward: '', lanesBackward: '', speedKmh: '25', capacityOverrideVehPerHourPerLane: '', closed: false } });
    expect(result).toEqual({ ok: true, patch: { speedKmh: speedToKmh(25, 'us-customary') } });
  });
});
