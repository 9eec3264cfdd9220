// Values a zone gets when an upload leaves them out. The planner sees and can change them.
import type { DepartureCurve } from '../api/zone-shelter-attributes';

export const ZONE_DEFAULTS = {
  /** > 80 % of residents who heard a mandatory order left (C, Baker 1991, Int. J. Mass
   *  Emergencies and Disasters 9(2)); the default assumes the order reached everyone. */
  participationRate: 0.8,
  participationRateSource: 'Baker (1991), Int. J. Mass Emergencies and Disasters 9(2): over 80 % of those who heard a mandatory order left (C)',
  /** About 2.5 persons per household over 1.2–1.4 vehicles per evacuating household (M). */
  personsPerVehicle: 2,
  personsPerVehicleSource: 'from memory: about 2.5 persons per household over 1.2–1.4 vehicles per evacuating household',
  /** S-shaped mobilisation (Li, Ozbay, Bartin et al. 2013); α and H are example values. */
  departureCurve: { kind: 'logistic', responseRatePerHour: 1, halfLoadingHours: 3 } as DepartureCurve,
  departureCurveSource: 'logistic form from Li, Ozbay, Bartin et al. (2013), TRR 2376 (C); α = 1/h and H = 3 h are example values, not fitted',
} as const;
