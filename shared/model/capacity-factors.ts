// Ready-made global capacity factors the planner can pick, each with its source. They
// multiply every arc's capacity (docs/model.md §1: lanes × veh/h/lane × factor).

export interface CapacityFactorPreset {
  id: string;
  label: string;
  factor: number;
  source: string;
}

const WEATHER = 'HCM 7th ed. Exhibit 11-20, transcription (C)';

export const CAPACITY_FACTOR_PRESETS: readonly CapacityFactorPreset[] = [
  { id: 'none', label: 'No adjustment', factor: 1, source: 'handbook capacities as they are' },
  { id: 'mediumRain55', label: 'Medium rain, free-flow speed 55 mi/h', factor: 0.94, source: WEATHER },
  { id: 'mediumRain65', label: 'Medium rain, free-flow speed 65 mi/h', factor: 0.92, source: WEATHER },
  { id: 'mediumRain75', label: 'Medium rain, free-flow speed 75 mi/h', factor: 0.9, source: WEATHER },
  { id: 'heavyRain55', label: 'Heavy rain, free-flow speed 55 mi/h', factor: 0.89, source: WEATHER },
  { id: 'heavyRain65', label: 'Heavy rain, free-flow speed 65 mi/h', factor: 0.86, source: WEATHER },
  { id: 'heavyRain75', label: 'Heavy rain, free-flow speed 75 mi/h', factor: 0.82, source: WEATHER },
  { id: 'heavySnow55', label: 'Heavy snow, free-flow speed 55 mi/h', factor: 0.8, source: WEATHER },
  { id: 'heavySnow65', label: 'Heavy snow, free-flow speed 65 mi/h', factor: 0.76, source: WEATHER },
  { id: 'heavySnow75', label: 'Heavy snow, free-flow speed 75 mi/h', factor: 0.72, source: WEATHER },
  {
    id: 'rainMean',
    label: 'Rain over 0.25 in/h (mean reduction 14.13 %)',
    factor: 1 - 0.1413,
    source: 'HCM 2010 Exhibit 10-15 via FHWA-HOP-13-042, 2013 (C)',
  },
  {
    id: 'snowMean',
    label: 'Snow over 0.5 in/h (mean reduction 22.43 %)',
    factor: 1 - 0.2243,
    source: 'HCM 2010 Exhibit 10-15 via FHWA-HOP-13-042, 2013 (C)',
  },
  {
    id: 'observedEvacuation',
    label: 'Observed evacuation flow: about 600 of 2,000 veh/h/lane on freeway lanes',
    factor: 600 / 2000,
    source:
      'sustained flows near 600 veh/h/ln reported, TRB Annual Meeting 2011 paper 11-4115 (C); ratio to the motorway default (X)',
  },
];

/** Capacity per open lane when lanes are closed (HCM 7th ed. Exhibit 11-23, transcription (C)). */
export const LANE_CLOSURE_FACTORS: readonly { lanes: number; closed: number; factorPerOpenLane: number }[] = [
  { lanes: 2, closed: 1, factorPerOpenLane: 0.7 },
  { lanes: 3, closed: 1, factorPerOpenLane: 0.74 },
  { lanes: 3, closed: 2, factorPerOpenLane: 0.51 },
];
