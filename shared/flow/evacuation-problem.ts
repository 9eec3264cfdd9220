// The evacuation problem the server fills from plan data, and its validation. Units are in the
// names; node and road indices are the caller's (results refer to indices of `roads`).

import { FlowInputError } from './errors';

/** A time window during which a road takes no new vehicles; untilSeconds null = to the end. */
export interface RoadClosure {
  fromSeconds: number;
  untilSeconds: number | null;
}

export interface EvacuationRoad {
  from: number;
  to: number;
  /** Directional capacity (all lanes, after any capacity factor). */
  capacityVehPerHour: number;
  /** Free-flow travel time; becomes whole steps rounded against node time potentials (route-timing.ts). */
  travelTimeSeconds: number;
  /** Lanes in this direction (default 1); used with capacityVehPerHourPerLane for lane fixes. */
  lanes?: number;
  /** Capacity one more lane would add (default capacityVehPerHour / lanes). */
  capacityVehPerHourPerLane?: number;
  /** Vehicles that can queue on the road (jam density × lanes × length); default no limit. */
  storageVehicles?: number;
  closures?: RoadClosure[];
}

export interface EvacuationZone {
  id: string;
  /** Road nodes where the zone's vehicles enter the network (any of them). */
  entryNodes: number[];
  /** Vehicles to evacuate (an integer). */
  vehicles: number;
  /**
   * Departure curve: cumulative share of the vehicles that have departed by the end of step θ,
   * θ = 0..horizonSteps (a shorter array repeats its last value). Default: everyone at step 0.
   */
  releaseFractionByStep?: number[];
  /** Alternatively the number of vehicles departing in step θ (integers). */
  releaseVehiclesByStep?: number[];
  /** At most this many vehicles per hour can enter the roads from the zone (default no limit). */
  releaseVehPerHour?: number;
}

export interface EvacuationShelter {
  id: string;
  node: number;
  /** Vehicles the shelter can take over the whole horizon; null = an exit with no limit. */
  capacityVehicles: number | null;
  /** Intake rate limit; default no limit. */
  intakeVehPerHour?: number;
}

export interface EvacuationProblem {
  nodeCount: number;
  roads: EvacuationRoad[];
  zones: EvacuationZone[];
  shelters: EvacuationShelter[];
  /** Δ, the length of one time step. */
  timeStepSeconds: number;
  /** T: the time-expanded network has node copies for steps 0..T. */
  horizonSteps: number;
}

/** A problem that cannot be solved as given; `path` names the offending field. */
export class EvacuationInputError extends FlowInputError {
  override readonly name: string = 'EvacuationInputError';
  constructor(
    readonly path: string,
    message: string,
  ) {
    super(`${path}: ${message}`);
  }
}

const MAX_HORIZON_STEPS = 100_000;

/** Throws EvacuationInputError on the first invalid field. O(size of the problem). */
export function validateEvacuationProblem(problem: EvacuationProblem): void {
  const fail = (path: string, message: string): never => {
    throw new EvacuationInputError(path, message);
  };
  const { nodeCount } = problem;
  if (!Number.isInteger(nodeCount) || nodeCount < 0) fail('nodeCount', 'must be a non-negative integer');
  const node = (path: string, v: unknown): void => {
    if (!Number.isInteger(v) || (v as number) < 0 || (v as number) >= nodeCount) {
      fail(path, `node ${String(v)} is outside 0..${nodeCount - 1}`);
    }
  };
  const nonNegative = (path: string, x: unknown): void => {
    if (typeof x !== 'number' || !Number.isFinite(x) || x < 0) fail(path, 'must be a finite number ≥ 0');
  };
  if (!(problem.timeStepSeconds > 0) || !Number.isFinite(problem.timeStepSeconds)) {
    fail('timeStepSeconds', 'must be a finite number > 0');
  }
  const T = problem.horizonSteps;
  if (!Number.isInteger(T) || T < 0 || T > MAX_HORIZON_STEPS) {
    fail('horizonSteps', `must be an integer in 0..${MAX_HORIZON_STEPS}`);
  }

  problem.roads.forEach((road, i) => {
    const at = `roads[${i}]`;
    node(`${at}.from`, road.from);
    node(`${at}.to`, road.to);
    nonNegative(`${at}.capacityVehPerHour`, road.capacityVehPerHour);
    if (!(road.travelTimeSeconds >= 0) || !Number.isFinite(road.travelTimeSeconds)) {
      fail(`${at}.travelTimeSeconds`, 'must be a finite number ≥ 0');
    }
    if (road.lanes !== undefined && !(Number.isFinite(road.lanes) && road.lanes > 0)) {
      fail(`${at}.lanes`, 'must be a number > 0');
    }
    if (road.capacityVehPerHourPerLane !== undefined) {
      nonNegative(`${at}.capacityVehPerHourPerLane`, road.capacityVehPerHourPerLane);
    }
    if (road.storageVehicles !== undefined) nonNegative(`${at}.storageVehicles`, road.storageVehicles);
    road.closures?.forEach((closure, k) => {
      nonNegative(`${at}.closures[${k}].fromSeconds`, closure.fromSeconds);
      if (closure.untilSeconds !== null && !(closure.untilSeconds >= closure.fromSeconds)) {
        fail(`${at}.closures[${k}].untilSeconds`, 'must be null or ≥ fromSeconds');
      }
    });
  });

  const zoneIds = new Set<string>();
  problem.zones.forEach((zone, i) => {
    const at = `zones[${i}]`;
    if (zoneIds.has(zone.id)) fail(`${at}.id`, `duplicate zone id ${zone.id}`);
    zoneIds.add(zone.id);
    if (zone.entryNodes.length === 0) fail(`${at}.entryNodes`, 'needs at least one node');
    zone.entryNodes.forEach((v, k) => node(`${at}.entryNodes[${k}]`, v));
    if (!Number.isInteger(zone.vehicles) || zone.vehicles < 0 || zone.vehicles > 2_147_483_647) {
      fail(`${at}.vehicles`, 'must be a non-negative integer below 2^31');
    }
    if (zone.releaseFractionByStep && zone.releaseVehiclesByStep) {
      fail(at, 'give releaseFractionByStep or releaseVehiclesByStep, not both');
    }
    let previous = 0;
    zone.releaseFractionByStep?.forEach((f, k) => {
      if (!(f >= 0 && f <= 1 + 1e-9)) fail(`${at}.releaseFractionByStep[${k}]`, 'must be in [0, 1]');
      if (f < previous - 1e-9) fail(`${at}.releaseFractionByStep[${k}]`, 'a cumulative share cannot decrease');
      previous = f;
    });
    let total = 0;
    zone.releaseVehiclesByStep?.forEach((count, k) => {
      if (!Number.isInteger(count) || count < 0) fail(`${at}.releaseVehiclesByStep[${k}]`, 'must be a non-negative integer');
      total += count;
    });
    if (total > zone.vehicles) fail(`${at}.releaseVehiclesByStep`, `releases ${total} of ${zone.vehicles} vehicles`);
    if (zone.releaseVehPerHour !== undefined) nonNegative(`${at}.releaseVehPerHour`, zone.releaseVehPerHour);
  });

  const shelterIds = new Set<string>();
  problem.shelters.forEach((shelter, i) => {
    const at = `shelters[${i}]`;
    if (shelterIds.has(shelter.id)) fail(`${at}.id`, `duplicate shelter id ${shelter.id}`);
    shelterIds.add(shelter.id);
    node(`${at}.node`, shelter.node);
    if (shelter.capacityVehicles !== null) nonNegative(`${at}.capacityVehicles`, shelter.capacityVehicles);
    if (shelter.intakeVehPerHour !== undefined) nonNegative(`${at}.intakeVehPerHour`, shelter.intakeVehPerHour);
  });
}
