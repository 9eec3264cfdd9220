// Every source text the model's defaults carry, in one list: the documentation, the tests
// that check them, and the screens that show them read it from here.
import { DEFAULT_CAPACITY_ROWS } from './capacity-defaults';
import { CAPACITY_FACTOR_PRESETS } from './capacity-factors';
import { DEPARTURE_CURVE_SOURCES } from './departure-curves';
import { ZONE_DEFAULTS } from './zone-defaults';

export function modelSourceTexts(): string[] {
  return [
    ...DEFAULT_CAPACITY_ROWS.flatMap((r) => [r.capacitySource, r.lanesSource, r.speedSource, r.jamDensitySource]),
    ...CAPACITY_FACTOR_PRESETS.map((p) => p.source),
    ...Object.values(DEPARTURE_CURVE_SOURCES),
    ZONE_DEFAULTS.participationRateSource,
    ZONE_DEFAULTS.personsPerVehicleSource,
    ZONE_DEFAULTS.departureCurveSource,
  ];
}
