// Lengths, speeds and densities in the organisation's unit system: metric or US customary. The
// model and the database keep SI-style values (metres, km/h, vehicles per km); this module is the
// one place that converts them for people, both ways, for the screens, the exports and the
// briefing alike.
//
// Factors: 1 international foot = 0.3048 m and 1 international mile = 5,280 ft = 1,609.344 m,
// exact by definition under the international yard and pound agreement of 1959 (also NIST
// Handbook 44, Appendix C).
import type { UnitSystem } from '../api/units';

export { unitSystems, type UnitSystem } from '../api/units';

export const unitSystemLabels: Record<UnitSystem, string> = {
  metric: 'Metric (km, km/h, m)',
  'us-customary': 'US customary (mi, mph, ft)',
};

/** Metres in one international foot (exact, 1959 agreement). */
export const METERS_PER_FOOT = 0.3048;
/** Metres in one international mile, 5,280 ft (exact, 1959 agreement). */
export const METERS_PER_MILE = 5280 * METERS_PER_FOOT; // 1,609.344
/** Kilometres in one mile: km/h per mph. */
export const KM_PER_MILE = METERS_PER_MILE / 1000;

const locale = 'en-US';
const whole = new Intl.NumberFormat(locale, { maximumFractionDigits: 0 });
const oneDecimal = new Intl.NumberFormat(locale, { maximumFractionDigits: 1 });
const twoDecimals = new Intl.NumberFormat(locale, { maximumFractionDigits: 2 });

/**
 * A converted value as a person typed it: float64 keeps some 16 significant digits, so 35 mph
 * stored as 56.32704 km/h comes back as 35.000000000000004; rounding to 9 decimals gives the
 * entered number back for any speed a form accepts.
 */
function asEntered(n: number): number {
  return Math.round(n * 1e9) / 1e9;
}

export function speedUnit(system: UnitSystem): 'km/h' | 'mph' {
  return system === 'metric' ? 'km/h' : 'mph';
}

/** km/h → the system's speed unit, as entered (35 mph reads back as 35). */
export function speedFromKmh(kmh: number, system: UnitSystem): number {
  return system === 'metric' ? kmh : asEntered(kmh / KM_PER_MILE);
}

/** A speed in the system's unit → km/h, for storage and the model. */
export function speedToKmh(value: number, system: UnitSystem): number {
  return system === 'metric' ? value : value * KM_PER_MILE;
}

/** 56.32704 km/h → "35 mph"; up to one decimal. */
export function formatSpeed(kmh: number, system: UnitSystem): string {
  return `${oneDecimal.format(speedFromKmh(kmh, system))} ${speedUnit(system)}`;
}

/** A length: metric "850 m" / "253.4 km"; US customary feet below a tenth of a mile
 *  ("528 ft"), else miles with a decimal ("157.5 mi"). */
export function formatLength(meters: number, system: UnitSystem): string {
  if (system === 'metric') return meters >= 1000 ? `${oneDecimal.format(meters / 1000)} km` : `${whole.format(meters)} m`;
  const miles = meters / METERS_PER_MILE;
  return miles >= 0.1 ? `${oneDecimal.format(miles)} mi` : `${whole.format(meters / METERS_PER_FOOT)} ft`;
}

/** The long-distance unit: "km" or "mi". */
export function distanceUnit(system: UnitSystem): 'km' | 'mi' {
  return system === 'metric' ? 'km' : 'mi';
}

/** Metres → the long-distance unit (km or mi). */
export function distanceFromMeters(meters: number, system: UnitSystem): number {
  return system === 'metric' ? meters / 1000 : meters / METERS_PER_MILE;
}

/** Vehicles per km (per lane) → per the system's distance unit. */
export function densityFromPerKm(perKm: number, system: UnitSystem): number {
  return system === 'metric' ? perKm : asEntered(perKm * KM_PER_MILE);
}

/** Vehicles per the system's distance unit → per km. */
export function densityToPerKm(value: number, system: UnitSystem): number {
  return system === 'metric' ? value : value / KM_PER_MILE;
}

export function densityUnit(system: UnitSystem): 'veh/km per lane' | 'veh/mi per lane' {
  return system === 'metric' ? 'veh/km per lane' : 'veh/mi per lane';
}

/** 118.06 veh/km per lane → "118.06 veh/km per lane" or "190 veh/mi per lane" (two decimals at
 *  most: the HCM's 190 per mile is 118.06 per km). */
export function formatDensity(perKm: number, system: UnitSystem): string {
  return `${twoDecimals.format(densityFromPerKm(perKm, system))} ${densityUnit(system)}`;
}
