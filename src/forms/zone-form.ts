// The zone form: people, participation, vehicles and departure curve, validated with the
// server's zoneCreateSchema; defaults and their sources from shared/model/zone-defaults.
import { departureCurveSchema, type DepartureCurve } from '@shared/api/zone-shelter-attributes';
import { zoneCreateSchema, type Zone, type ZoneCreate, type ZoneGeometry } from '@shared/api/zones-shelters';
import { ZONE_DEFAULTS } from '@shared/model/zone-defaults';
import { numberFrom, parseForm, type FieldErrors } from './zod-errors';

type Curvekind = DepartureCurve['kind'];

export type ZoneFormValues = {
  name: string;
  population: string | number;
  /** Percent in the form (0–100); the schema holds a share (0–1). */
  participationPercent: string | number;
  personsPerVehicle: string | number;
  curveKind: Curvekind;
  durationHours: string | number;
  responseRatePerHour: string | number;
  halfLoadingHours: string | number;
  sigmaHours: string | number;
};

export const departureCurveItems: { value: Curvekind; title: string; subtitle: string }[] = [
  { value: 'logistic', title: 'S-curve (logistic)', subtitle: 'Slow start, a rush around the half-way time, then a tail.' },
  { value: 'rayleigh', title: 'Early rush (Rayleigh)', subtitle: 'Many leave soon after the order, the rest trickle out.' },
  { value: 'uniform', title: 'Evenly over a period', subtitle: 'The same number leaves in every minute of the period.' },
  { value: 'allAtOnce', title: 'All at the order', subtitle: 'Everyone is ready at once: the hardest test of the roads.' },
];

const logisticDefault = ZONE_DEFAULTS.departureCurve.kind === 'logistic' ? ZONE_DEFAULTS.departureCurve : { responseRatePerHour: 1, halfLoadingHours: 3 };

export function newZoneValues(index: number): ZoneFormValues {
  return {
    name: `Zone ${index}`,
    population: '',
    participationPercent: Math.round(ZONE_DEFAULTS.participationRate * 100),
    personsPerVehicle: ZONE_DEFAULTS.personsPerVehicle,
    curveKind: ZONE_DEFAULTS.departureCurve.kind,
    durationHours: 2,
    responseRatePerHour: logisticDefault.responseRatePerHour,
    halfLoadingHours: logisticDefault.halfLoadingHours,
    sigmaHours: 1.5,
  };
}

export function zoneValues(zone: Zone): ZoneFormValues {
  const values = newZoneValues(1);
  values.name = zone.name;
  values.population = zone.population;
  values.participationPercent = Math.round(zone.participationRate * 1000) / 10;
  values.personsPerVehicle = zone.personsPerVehicle;
  values.curveKind = zone.departureCurve.kind;
  const c = zone.departureCurve;
  if (c.kind === 'uniform') values.durationHours = c.durationHours;
  if (c.kind === 'logistic') {
    values.responseRatePerHour = c.responseRatePerHour;
    values.halfLoadingHours = c.halfLoadingHours;
  }
  if (c.kind === 'rayleigh') values.sigmaHours = c.sigmaHours;
  return values;
}

function curveOf(values: ZoneFormValues): unknown {
  switch (values.curveKind) {
    case 'allAtOnce':
      return { kind: 'allAtOnce' };
    case 'uniform':
      return { kind: 'uniform', durationHours: numberFrom(values.durationHours) };
    case 'logistic':
      return { kind: 'logistic', responseRatePerHour: numberFrom(values.responseRatePerHour), halfLoadingHours: numberFrom(values.halfLoadingHours) };
    case 'rayleigh':
      return { kind: 'rayleigh', sigmaHours: numberFrom(values.sigmaHours) };
  }
}

// Errors come back under the schema's paths; the form shows them under its own fields.
const formKeyOf: Record<string, string> = {
  participationRate: 'participationPercent',
  'departureCurve.durationHours': 'durationHours',
  'departureCurve.responseRatePerHour': 'responseRatePerHour',
  'departureCurve.halfLoadingHours': 'halfLoadingHours',
  'departureCurve.sigmaHours': 'sigmaHours',
};

function renameKeys(errors: FieldErrors): FieldErrors {
  return Object.fromEntries(Object.entries(errors).map(([k, v]) => [formKeyOf[k] ?? k, v]));
}

export function validateZone(values: ZoneFormValues, geometry: ZoneGeometry): { ok: true; value: ZoneCreate } | { ok: false; errors: FieldErrors } {
  const percent = numberFrom(values.participationPercent);
  const parsed = parseForm(zoneCreateSchema, {
    name: values.name.trim(),
    population: numberFrom(values.population),
    participationRate: Number.isNaN(percent) ? percent : Math.round(percent * 10) / 1000,
    personsPerVehicle: numberFrom(values.personsPerVehicle),
    departureCurve: curveOf(values),
    geometry,
  });
  return parsed.ok ? parsed : { ok: false, errors: renameKeys(parsed.errors) };
}

/** The curve alone, for the preview under the fields; null while a field is invalid. */
export function previewCurve(values: ZoneFormValues): DepartureCurve | null {
  const parsed = departureCurveSchema.safeParse(curveOf(values));
  return parsed.success ? parsed.data : null;
}

/** Evacuating vehicles a zone sends (persons × participation ÷ persons per vehicle). */
export function zoneVehicleEstimate(values: ZoneFormValues): number | null {
  const persons = numberFrom(values.population) * (numberFrom(values.participationPercent) / 100);
  const perVehicle = numberFrom(values.personsPerVehicle);
  if (!(persons >= 0) || !(perVehicle >= 1)) return null;
  return Math.ceil(persons / perVehicle);
}
