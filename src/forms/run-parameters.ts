// The analysis assumptions form: what each field means, in which unit, its help line, the
// weather presets for the capacity factor, and validation with the server's schema.
import { algorithmSchema, defaultRunParameters, runParametersSchema, type AlgorithmChoice, type RunParameters } from '@shared/api/runs';
import { CAPACITY_FACTOR_PRESETS } from '@shared/model/capacity-factors';
import { formatDuration } from '@shared/format/numbers';
import { numberFrom, parseForm, type FieldErrors } from './zod-errors';

export type RunParameterKey = 'horizonMinutes' | 'timeStepSeconds' | 'capacityFactor';

export type NumberFieldMeta = { key: RunParameterKey; label: string; unit: string; help: string; step: number; min: number; max: number };

export const runParameterFields: readonly NumberFieldMeta[] = [
  {
    key: 'horizonMinutes',
    label: 'Time horizon',
    unit: 'min',
    help: 'How long after the order the analysis looks; people still on the road after it count as not evacuated.',
    step: 30,
    min: 10,
    max: 72 * 60,
  },
  {
    key: 'timeStepSeconds',
    label: 'Time step',
    unit: 's',
    help: 'The clock tick of the model. Shorter steps follow short roads more closely but take longer to solve.',
    step: 10,
    min: 10,
    max: 3600,
  },
  {
    key: 'capacityFactor',
    label: 'Capacity factor',
    unit: '× lane capacity',
    help: 'Multiplies every lane capacity: below 1 for rain, snow or the slower flows seen in real evacuations.',
    step: 0.01,
    min: 0.05,
    max: 1.5,
  },
];

export const algorithmItems: { value: AlgorithmChoice; title: string; subtitle: string }[] = algorithmSchema.options.map((value) => ({
  value,
  title: value === 'auto' ? 'Chosen by size (recommended)' : value === 'dinic' ? 'Dinic' : 'Edmonds–Karp',
  subtitle:
    value === 'auto'
      ? 'Cutline picks the faster method for the network at hand.'
      : value === 'dinic'
        ? 'Blocking flows (Dinic 1970); fast on large networks.'
        : 'Shortest augmenting paths (Edmonds & Karp 1972); simple, slower on large networks.',
}));

export const algorithmHelp = 'The maximum-flow method. Every method gives the same figures; only the solving time differs.';

export type RunParameterValues = Record<RunParameterKey, string | number> & { algorithm: AlgorithmChoice };

export const defaultParameterValues = (): RunParameterValues => ({ ...defaultRunParameters });

export function validateRunParameters(values: RunParameterValues): { ok: true; value: RunParameters } | { ok: false; errors: FieldErrors } {
  return parseForm(runParametersSchema, {
    horizonMinutes: numberFrom(values.horizonMinutes),
    timeStepSeconds: numberFrom(values.timeStepSeconds),
    capacityFactor: numberFrom(values.capacityFactor),
    algorithm: values.algorithm,
  });
}

export const customPresetId = 'custom';

export const capacityPresetItems = [
  ...CAPACITY_FACTOR_PRESETS.map((p) => ({ value: p.id, title: `${p.label} (× ${roundFactor(p.factor)})`, subtitle: p.source })),
  { value: customPresetId, title: 'Custom factor', subtitle: 'a value of your own, typed below' },
];

function roundFactor(f: number): number {
  return Math.round(f * 1000) / 1000;
}

/** The preset a factor belongs to, or 'custom' when none has it. */
export function presetForFactor(factor: unknown): string {
  const f = numberFrom(factor);
  const match = CAPACITY_FACTOR_PRESETS.find((p) => Math.abs(p.factor - f) < 5e-4);
  return match?.id ?? customPresetId;
}

/** The factor of a preset, rounded to what the field shows; null for 'custom'. */
export function factorForPreset(presetId: string): number | null {
  const preset = CAPACITY_FACTOR_PRESETS.find((p) => p.id === presetId);
  return preset ? roundFactor(preset.factor) : null;
}

/** A live reading of the values, shown under the fields: "6 h, 360 time steps". */
export function describeRunParameters(values: RunParameterValues): string {
  const horizon = numberFrom(values.horizonMinutes);
  const step = numberFrom(values.timeStepSeconds);
  if (!(horizon > 0) || !(step > 0)) return '';
  const steps = Math.ceil((horizon * 60) / step);
  return `${formatDuration(horizon)} after the order, ${steps.toLocaleString('en-US')} time steps`;
}
