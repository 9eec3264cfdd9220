// The assumptions form: defaults from the server's contract pass, limits come back as the
// schema's own messages, empty fields in plain words, presets map both ways.
import { describe, expect, it } from 'vitest';
import { defaultRunParameters } from '../../shared/api/runs';
import { CAPACITY_FACTOR_PRESETS } from '../../shared/model/capacity-factors';
import {
  capacityPresetItems,
  customPresetId,
  defaultParameterValues,
  describeRunParameters,
  factorForPreset,
  presetForFactor,
  runParameterFields,
  validateRunParameters,
} from '../../src/forms/run-parameters';

describe('run parameters form', () => {
  it('starts from defaultRunParameters, which validate', () => {
    const result = validateRunParameters(defaultParameterValues());
    expect(result).toEqual({ ok: true, value: defaultRunParameters });
  });

  it('reads numbers typed as text', () => {
    const result = validateRunParameters({ horizonMinutes: '240', timeStepSeconds: '30', capacityFactor: '0.86', algorithm: 'dinic' });
    expect(result).toEqual({ ok: true, value: { horizonMinutes: 240, timeStepSeconds: 30, capacityFactor: 0.86, algorithm: 'dinic' } });
  });

  it('reports limits with the schema messages and empty or fractional fields in plain words', () => {
    const result = validateRunParameters({ horizonMinutes: '5', timeStepSeconds: '', capacityFactor: '2', algorithm: 'auto' });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors.horizonMinutes).toBe('At least 10 minutes.');
    expect(result.errors.timeStepSeconds).toBe('Enter a number.');
    expect(result.errors.capacityFactor).toBeDefined();
    const fractional = validateRunParameters({ horizonMinutes: '90.5', timeStepSeconds: '60', capacityFactor: '1', algorithm: 'auto' });
    expect(fractional.ok ? '' : fractional.errors.horizonMinutes).toBe('Enter a whole number.');
  });

  it('has a unit and a help line for every field, with limits matching the schema', () => {
    for (const field of runParameterFields) {
      expect(field.unit).not.toBe('');
      expect(field.help.length).toBeGreaterThan(20);
      const at = (v: number) => validateRunParameters({ ...defaultParameterValues(), [field.key]: v }).ok;
      expect(at(field.min)).toBe(true);
      expect(at(field.max)).toBe(true);
    }
  });

  it('offers every capacity preset plus a custom value, and maps factors back to presets', () => {
    expect(capacityPresetItems).toHaveLength(CAPACITY_FACTOR_PRESETS.length + 1);
    expect(presetForFactor(0.86)).toBe('heavyRain65');
    expect(presetForFactor('1')).toBe('none');
    expect(presetForFactor(0.8587)).toBe('rainMean');
    expect(presetForFactor(0.5)).toBe(customPresetId);
    expect(factorForPreset('heavySnow75')).toBe(0.72);
    expect(factorForPreset(customPresetId)).toBeNull();
  });

  it('reads the horizon and step back in words', () => {
    expect(describeRunParameters(defaultParameterValues())).toBe('6 h after the order, 360 time steps');
    expect(describeRunParameters({ ...defaultParameterValues(), timeStepSeconds: '' })).toBe('');
  });
});
