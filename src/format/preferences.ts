// The signed-in organisation's unit system and time zone, as every screen formats with them.
// The organisation-settings store fills this in when the organisation is known; formatters below
// read it inside templates and computeds, so a change redraws what depends on it. Until then:
// metric, and the viewer's own zone (named with every time).
import { reactive } from 'vue';
import type { UnitSystem } from '@shared/api/units';
import {
  densityFromPerKm,
  densityToPerKm,
  densityUnit,
  formatDensity,
  formatLength,
  formatSpeed,
  speedFromKmh,
  speedToKmh,
  speedUnit,
} from '@shared/format/units';

export const preferences = reactive<{ unitSystem: UnitSystem; timeZone: string | null }>({ unitSystem: 'metric', timeZone: null });

export function setPreferences(p: { unitSystem: UnitSystem; timeZone: string | null }): void {
  preferences.unitSystem = p.unitSystem;
  preferences.timeZone = p.timeZone;
}

export const screenLength = (meters: number) => formatLength(meters, preferences.unitSystem);
export const screenSpeed = (kmh: number) => formatSpeed(kmh, preferences.unitSystem);
export const screenDensity = (perKm: number) => formatDensity(perKm, preferences.unitSystem);
export const screenSpeedUnit = () => speedUnit(preferences.unitSystem);
export const screenDensityUnit = () => densityUnit(preferences.unitSystem);
/** A stored km/h value as the form shows it (35 mph reads back as 35). */
export const speedForForm = (kmh: number) => speedFromKmh(kmh, preferences.unitSystem);
/** What a form took, in km/h for the API. */
export const speedFromForm = (value: number) => speedToKmh(value, preferences.unitSystem);
export const densityForForm = (perKm: number) => densityFromPerKm(perKm, preferences.unitSystem);
export const densityFromForm = (value: number) => densityToPerKm(value, preferences.unitSystem);
