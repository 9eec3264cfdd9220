// Sweeps: the values from, to and step give (without floating-point drift), the sweep form's
// checks against the shared schema, the progress count, and the summary series.
import { describe, expect, it } from 'vitest';
import type { Sweep } from '../../shared/api/sweeps';
import { defaultRunParameters } from '../../shared/api/runs';
import { sweepProgress, formatSweepValue, sweepSeries, sweepValues } from '../../src/format/sweep';
import { sweepFormValues, validateSweepForm } from '../../src/forms/sweep-form';
import { defaultParameterValues } from '../../src/forms/run-parameters';

describe('sweepValues', () => {
  it('turns per cent into shares and includes the last value when the steps land on it', () => {
    expect(sweepValues('participationRate', 50, 100, 10)).toEqual([0.5, 0.6, 0.7, 0.8, 0.9, 1]);
    expect(sweepValues('participationRate', 50, 100, 20)).toEqual([0.5, 0.7, 0.9]);
  });

  it('steps capacity factors without drift: 0.7 + 6 × 0.05 is 1', () => {
    expect(sweepValues('capacityFactor', 0.7, 1, 0.05)).toEqual([0.7, 0.75, 0.8, 0.85, 0.9, 0.95, 1]);
    expect(sweepValues('capacityFactor', 0.7, 1, 0.1)).toEqual([0.7, 0.8, 0.9, 1]);
  });

  it('gives nothing for an unusable range', () => {
    expect(sweepValues('capacityFactor', 1, 0.7, 0.1)).toEqual([]);
    expect(sweepValues('capacityFactor', 0.7, 1, 0)).toEqual([]);
    expect(sweepValues('capacityFactor', Number.NaN, 1, 0.1)).toEqual([]);
  });

  it('shows stored values in the planner units', () => {
    expect(formatSweepValue('participationRate', 0.65)).toBe('65 %');
    expect(formatSweepValue('capacityFactor', 0.85)).toBe('× 0.85');
  });
});

describe('validateSweepForm', () => {
  it('builds the request the server takes', () => {
    const checked = validateSweepForm(sweepFormValues('participationRate', defaultParameterValues()));
    expect(checked.ok).toBe(true);
    if (checked.ok) {
      expect(checked.value.sweep).toEqual({ parameter: 'participationRate', values: [0.5, 0.6, 0.7, 0.8, 0.9, 1] });
      expect(checked.value.parameters).toEqual(defaultRunParameters);
      expect(checked.value.scenarioId).toBeNull();
    }
  });

  it('names the field at fault: a range out of bounds, a reversed range, too many values', () => {
    const v = sweepFormValues('participationRate', defaultParameterValues());
    const out = validateSweepForm({ ...v, to: 120 });
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.errors.to).toBe('Between 0 and 100.');
    const reversed = validateSweepForm({ ...v, from: 90, to: 60 });
    if (!reversed.ok) expect(reversed.errors.to).toBe('At least the first value.');
    expect(reversed.ok).toBe(false);
    const many = validateSweepForm({ ...v, from: 0, to: 100, step: 1 });
    expect(many.ok).toBe(false);
    if (!many.ok) expect(many.errors.step).toBe('At most 25 values in one sweep.');
    const one = validateSweepForm({ ...v, from: 50, to: 50 });
    if (!one.ok) expect(one.errors.step).toBe('Sweep at least two values.');
    expect(one.ok).toBe(false);
  });

  it('reports a bad run assumption too', () => {
    const v = sweepFormValues('capacityFactor', { ...defaultParameterValues(), horizonMinutes: 5 });
    const checked = validateSweepForm(v);
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(checked.errors.horizonMinutes).toBe('At least 10 minutes.');
  });
});

describe('sweep progress and series', () => {
  const run = (sweepValue: number, status: Sweep['runs'][number]['status'], personsPerHour: number | null, clearance: number | null = 200) =>
    ({
      sweepValue,
      status,
      headline:
        personsPerHour === null
          ? null
          : { steadyStatePersonsPerHour: personsPerHour, steadyStateVehiclesPerHour: personsPerHour / 2, clearanceMinutes: clearance, horizonMinutes: 360 },
    }) as unknown as Sweep['runs'][number];

  it('counts finished, working and waiting runs', () => {
    const p = sweepProgress({ runs: [run(0.5, 'succeeded', 100), run(0.6, 'running', null), run(0.7, 'queued', null), run(0.8, 'failed', null)] });
    expect(p).toMatchObject({ total: 4, finished: 2, succeeded: 1, failed: 1, active: 2, done: false });
    expect(sweepProgress({ runs: [run(0.5, 'succeeded', 100)] }).done).toBe(true);
  });

  it('charts finished runs only, in order of the swept value', () => {
    const series = sweepSeries({ runs: [run(0.9, 'succeeded', 300, null), run(0.5, 'succeeded', 100), run(0.7, 'running', null)] });
    expect(series.map((p) => [p.x, p.personsPerHour, p.clearanceMinutes])).toEqual([
      [0.5, 100, 200],
      [0.9, 300, null],
    ]);
  });
});
