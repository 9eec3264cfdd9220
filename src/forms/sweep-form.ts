// The form that starts a sweep: a name, the scenario (or the base plan), the swept parameter
// with from, to and step in the planner's units, and the run assumptions; checked with the
// server's sweepCreateSchema.
import { sweepCreateSchema, type SweepCreate, type SweepParameter } from '@shared/api/sweeps';
import { sweepMeta, sweepValues } from '@/format/sweep';
import { validateRunParameters, type RunParameterValues } from './run-parameters';
import { numberFrom, parseForm, type FieldErrors } from './zod-errors';

export type SweepFormValues = {
  name: string;
  scenarioId: string | null;
  parameter: SweepParameter;
  from: string | number;
  to: string | number;
  step: string | number;
  run: RunParameterValues;
};

export function sweepFormValues(parameter: SweepParameter, run: RunParameterValues, scenarioId: string | null = null): SweepFormValues {
  const d = sweepMeta[parameter].defaults;
  return { name: `${sweepMeta[parameter].label} sweep`, scenarioId, parameter, from: d.from, to: d.to, step: d.step, run };
}

export const formSweepValues = (v: SweepFormValues) => sweepValues(v.parameter, numberFrom(v.from), numberFrom(v.to), numberFrom(v.step));

export function validateSweepForm(v: SweepFormValues): { ok: true; value: SweepCreate } | { ok: false; errors: FieldErrors } {
  const errors: FieldErrors = {};
  const run = validateRunParameters(v.run);
  if (!run.ok) Object.assign(errors, run.errors);
  const [from, to, step] = [numberFrom(v.from), numberFrom(v.to), numberFrom(v.step)];
  const { min, max } = sweepMeta[v.parameter].limits;
  if (!Number.isFinite(from) || from < min || from > max) errors.from = `Between ${min} and ${max}.`;
  if (!Number.isFinite(to) || to < min || to > max) errors.to = `Between ${min} and ${max}.`;
  else if (Number.isFinite(from) && to < from) errors.to = 'At least the first value.';
  if (!Number.isFinite(step) || step <= 0) errors.step = 'A step above zero.';
  if (Object.keys(errors).length > 0 || !run.ok) return { ok: false, errors };
  const parsed = parseForm(sweepCreateSchema, {
    name: v.name,
    scenarioId: v.scenarioId,
    parameters: run.value,
    sweep: { parameter: v.parameter, values: sweepValues(v.parameter, from, to, step) },
  });
  if (parsed.ok) return parsed;
  // The count of values is the step's doing: say so on the step field.
  const sweepError = parsed.errors['sweep.values'];
  return { ok: false, errors: sweepError ? { ...parsed.errors, step: sweepError } : parsed.errors };
}
