// Highway Capacity Manual formulas that the class defaults are derived from. Each function
// carries its equation number so that the table in capacity-defaults.ts can be re-derived.

/** Kilometres in one statute mile (exact by definition). */
export const KM_PER_MILE = 1.609344;

/**
 * Basic freeway segment base capacity, pc/h/ln:
 * c = 2,200 + 10·(FFS − 50), at most 2,400, for FFS 55–75 mi/h.
 * HCM 7th ed. Eq. 12-6 / Exhibit 12-6 (transcription; same in the 6th ed.).
 */
export function freewayBaseCapacity(freeFlowSpeedMph: number): number {
  return Math.min(2400, 2200 + 10 * (freeFlowSpeedMph - 50));
}

/**
 * Multilane highway base capacity, pc/h/ln:
 * c = 1,900 + 20·(FFS − 45), at most 2,300, for FFS 45–70 mi/h.
 * HCM 7th ed. Eq. 12-7 (transcription).
 */
export function multilaneBaseCapacity(freeFlowSpeedMph: number): number {
  return Math.min(2300, 1900 + 20 * (freeFlowSpeedMph - 45));
}

/** Signalised intersection base saturation flow, pc/h/ln (HCM 6th/7th ed. Ch. 19). */
export const BASE_SATURATION_FLOW_PC_PER_HOUR_PER_LANE = 1900;

/** Capacity per lane at a signal: s·(g/C) (HCM 6th/7th ed. Eq. 19-16). */
export function signalisedLaneCapacity(greenRatio: number, saturationFlow = BASE_SATURATION_FLOW_PC_PER_HOUR_PER_LANE): number {
  return saturationFlow * greenRatio;
}

/** Planning green ratios g/C by arterial type: FHWA HPMS Field Manual (2002), App. N. */
export const PLANNING_GREEN_RATIO = { principalArterial: 0.55, minorArterial: 0.45, collector: 0.4 } as const;

/**
 * Heavy-vehicle adjustment f_HV = 1 / (1 + P_T·(E_T − 1)) (HCM 6th/7th ed. Eq. 12-10);
 * E_T = 2.0 on level terrain, 3.0 on rolling terrain (Exhibit 12-25).
 */
export function heavyVehicleFactor(truckShare: number, passengerCarEquivalent: number): number {
  return 1 / (1 + truckShare * (passengerCarEquivalent - 1));
}

/** Two-lane highway capacity per direction, pc/h (HCM 2010 / 7th ed. Ch. 15). */
export const TWO_LANE_HIGHWAY_CAPACITY_PC_PER_HOUR = 1700;

/** Jam density 190 pc/mi/ln (HCM 6th ed. Exhibit 25-2), here per km. */
export const JAM_DENSITY_PC_PER_MILE_PER_LANE = 190;
export const JAM_DENSITY_PC_PER_KM_PER_LANE = JAM_DENSITY_PC_PER_MILE_PER_LANE / KM_PER_MILE;
