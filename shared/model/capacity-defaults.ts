// Per-class defaults pre-filled into every plan's capacity table. Values and their status
// come from docs/model.md §2–3: C = confirmed in a published source, CP = common practice with
// no source, X = computed from a C value. Each row repeats its source so that the planner
// sees it next to the number.
import type { CapacityTable, CapacityTableRow } from '../api/capacity-table';
import type { RoadClass } from '../api/road-attributes';
import { freewayBaseCapacity, JAM_DENSITY_PC_PER_KM_PER_LANE, KM_PER_MILE, multilaneBaseCapacity, PLANNING_GREEN_RATIO, signalisedLaneCapacity } from './hcm';

/** Heavy-vehicle allowance used to turn pc/h into veh/h for the derived rows (CP). */
export const ASSUMED_HEAVY_VEHICLE_FACTOR = 0.9;

const JAM_DENSITY_SOURCE =
  'HCM 6th ed. Exhibit 25-2: 190 pc/mi/ln (C) = 118.06 pc/km/ln (X); used for every class (CP)';
const LANES_CP = 'common default per direction (CP); the OSM wiki Key:lanes splits `lanes` evenly between directions (C)';
const SPEED_CP = 'common default free-flow speed (CP); tagged maxspeed is used where present';

function row(
  roadClass: RoadClass,
  lanesPerDirection: number,
  speedKmh: number,
  capacityVehPerHourPerLane: number,
  capacitySource: string,
): CapacityTableRow {
  return {
    roadClass,
    lanesPerDirection,
    lanesSource: LANES_CP,
    speedKmh,
    speedSource: SPEED_CP,
    capacityVehPerHourPerLane,
    capacitySource,
    jamDensityVehPerKmPerLane: Math.round(JAM_DENSITY_PC_PER_KM_PER_LANE * 100) / 100,
    jamDensitySource: JAM_DENSITY_SOURCE,
  };
}

/**
 * A single-lane ramp is planned below a freeway lane (2,000 veh/h/ln above): common practice,
 * no handbook exhibit checked for it. Stored tables that carried the earlier ramp source are
 * rewritten to this text by migration 0011.
 */
export const MOTORWAY_LINK_CAPACITY_SOURCE =
  'common practice (CP): a single-lane ramp planned below a freeway lane, 1,500 veh/h/ln';

const mph = (kmh: number) => kmh / KM_PER_MILE;
const r0 = (x: number) => Math.round(x);

/** The default rows, one per drivable class (docs/model.md §3). */
export const DEFAULT_CAPACITY_ROWS: readonly CapacityTableRow[] = [
  row('motorway', 2, 110, 2000,
    `HCM 7th ed. Eq. 12-6 at FFS 110 km/h gives ${r0(freewayBaseCapacity(mph(110)))} pc/h/ln (C); × f_HV ${ASSUMED_HEAVY_VEHICLE_FACTOR} and rounded down to 2,000 veh/h/ln (CP)`),
  row('motorway_link', 1, 60, 1500, MOTORWAY_LINK_CAPACITY_SOURCE),
  row('trunk', 2, 90, 1800,
    `HCM 7th ed. Eq. 12-7 (multilane) at FFS 90 km/h gives ${r0(multilaneBaseCapacity(mph(90)))} pc/h/ln (C); × f_HV ${ASSUMED_HEAVY_VEHICLE_FACTOR} and rounded down to 1,800 veh/h/ln (CP)`),
  row('trunk_link', 1, 60, 1300, 'common practice (CP)'),
  row('primary', 2, 60, 1000,
    `1,900 pc/h/ln saturation flow × g/C ${PLANNING_GREEN_RATIO.principalArterial} = ${r0(signalisedLaneCapacity(PLANNING_GREEN_RATIO.principalArterial))} (HCM Eq. 19-16; g/C from FHWA HPMS Field Manual 2002 App. N) (C); rounded down to 1,000 (CP)`),
  row('primary_link', 1, 40, 900, 'links of primary roads: 700–900 veh/h/ln (CP); upper end'),
  row('secondary', 1, 50, 850,
    `1,900 pc/h/ln × g/C ${PLANNING_GREEN_RATIO.minorArterial} = ${r0(signalisedLaneCapacity(PLANNING_GREEN_RATIO.minorArterial))} (HCM Eq. 19-16; HPMS App. N) (C); rounded down to 850 (CP)`),
  row('secondary_link', 1, 40, 800, 'links of secondary roads: 700–900 veh/h/ln (CP); middle'),
  row('tertiary', 1, 50, 750,
    `1,900 pc/h/ln × g/C ${PLANNING_GREEN_RATIO.collector} = ${r0(signalisedLaneCapacity(PLANNING_GREEN_RATIO.collector))} (HCM Eq. 19-16; HPMS App. N) (C); rounded down to 750 (CP)`),
  row('tertiary_link', 1, 40, 700, 'links of tertiary roads: 700–900 veh/h/ln (CP); lower end'),
  row('unclassified', 1, 40, 600, 'common practice (CP)'),
  row('residential', 1, 40, 600, 'common practice (CP)'),
  row('living_street', 1, 15, 300, 'common practice (CP)'),
  row('service', 1, 15, 300, 'common practice (CP)'),
];

/** A fresh capacity table for a new plan: the defaults and no adjustment. */
export function defaultCapacityTable(): CapacityTable {
  return {
    rows: DEFAULT_CAPACITY_ROWS.map((r) => ({ ...r })),
    capacityFactor: 1,
    capacityFactorNote: 'no adjustment',
  };
}

/** The row for one class; throws if the table lacks it (the schema forbids that). */
export function capacityRowFor(table: Pick<CapacityTable, 'rows'>, roadClass: RoadClass): CapacityTableRow {
  const found = table.rows.find((r) => r.roadClass === roadClass);
  if (!found) throw new Error(`capacity table has no row for ${roadClass}`);
  return found;
}
