// Editing one road class of the plan's capacity table: the form in the organisation's units
// (speed in km/h or mph, jam density per km or per mile), values left as shown kept exactly as
// stored, and a changed value refused until its source changes too (the server checks the same).
import { capacityTableSchema, valuesMissingNewSource, type CapacityTable, type CapacityTableRow } from '@shared/api/capacity-table';
import { densityForForm, densityFromForm, speedForForm, speedFromForm } from '@/format/preferences';
import { numberFrom, type FieldErrors } from './zod-errors';

export type CapacityRowForm = {
  lanesPerDirection: string | number;
  lanesSource: string;
  speed: string | number;
  speedSource: string;
  capacityVehPerHourPerLane: string | number;
  capacitySource: string;
  jamDensity: string | number;
  jamDensitySource: string;
};

const shown = (n: number) => Math.round(n * 100) / 100;

export function capacityRowForm(row: CapacityTableRow): CapacityRowForm {
  return {
    lanesPerDirection: row.lanesPerDirection,
    lanesSource: row.lanesSource,
    speed: shown(speedForForm(row.speedKmh)),
    speedSource: row.speedSource,
    capacityVehPerHourPerLane: row.capacityVehPerHourPerLane,
    capacitySource: row.capacitySource,
    jamDensity: shown(densityForForm(row.jamDensityVehPerKmPerLane)),
    jamDensitySource: row.jamDensitySource,
  };
}

/** A field left as the form showed it keeps the stored value (no drift through the unit). */
function converted(typed: string | number, stored: number, toForm: (n: number) => number, fromForm: (n: number) => number): number {
  const n = numberFrom(typed);
  return n === shown(toForm(stored)) ? stored : fromForm(n);
}

const formField: Record<string, keyof CapacityRowForm> = { speedKmh: 'speed', jamDensityVehPerKmPerLane: 'jamDensity' };

export function validateCapacityRowEdit(
  table: CapacityTable,
  roadClass: CapacityTableRow['roadClass'],
  form: CapacityRowForm,
): { ok: true; table: CapacityTable } | { ok: false; errors: FieldErrors } {
  const index = table.rows.findIndex((r) => r.roadClass === roadClass);
  const stored = table.rows[index]!;
  const row: CapacityTableRow = {
    roadClass,
    lanesPerDirection: numberFrom(form.lanesPerDirection),
    lanesSource: form.lanesSource.trim(),
    speedKmh: converted(form.speed, stored.speedKmh, speedForForm, speedFromForm),
    speedSource: form.speedSource.trim(),
    capacityVehPerHourPerLane: numberFrom(form.capacityVehPerHourPerLane),
    capacitySource: form.capacitySource.trim(),
    jamDensityVehPerKmPerLane: converted(form.jamDensity, stored.jamDensityVehPerKmPerLane, densityForForm, densityFromForm),
    jamDensitySource: form.jamDensitySource.trim(),
  };
  const next: CapacityTable = { ...table, rows: table.rows.map((r, i) => (i === index ? row : r)) };
  const parsed = capacityTableSchema.safeParse(next);
  if (!parsed.success) {
    const errors: FieldErrors = {};
    for (const issue of parsed.error.issues) {
      const key = String(issue.path[2] ?? issue.path[0] ?? 'form');
      const words = issue.code === 'invalid_type' ? 'Enter a number.' : key.endsWith('Source') ? 'Say where this value comes from.' : issue.message;
      errors[formField[key] ?? key] ??= words;
    }
    return { ok: false, errors };
  }
  const errors: FieldErrors = {};
  for (const m of valuesMissingNewSource(table, parsed.data)) errors[m.sourceField] = 'The value changed: say where the new one comes from.';
  if (Object.keys(errors).length) return { ok: false, errors };
  if (JSON.stringify(parsed.data.rows[index]) === JSON.stringify(stored)) return { ok: false, errors: { form: 'Nothing changed.' } };
  return { ok: true, table: parsed.data };
}
