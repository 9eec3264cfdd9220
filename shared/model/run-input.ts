// The self-contained input of one run: the engine problem plus the labels that turn engine
// indices back into segments, zones and shelters.
import type { EvacuationProblem } from '../flow';
import type { AlgorithmChoice } from '../api/runs';
import type { RoadOrigin } from './build-evacuation-problem';

export type RunInput = {
  problem: EvacuationProblem;
  algorithm: AlgorithmChoice;
  /** Index = engine road. */
  roadOrigins: RoadOrigin[];
  /** Index = the model's segment index. */
  segments: { id: number; name: string; roadClass: string }[];
  /** Same order as problem.zones. */
  zones: { id: number; name: string; vehicles: number; persons: number }[];
  /** Same order as problem.shelters. */
  shelters: { id: number; name: string; capacityPersons: number | null; capacityVehicles: number | null }[];
  personsPerVehicleAtShelters: number;
};
