// A run's self-contained input from a loaded plan snapshot: attachments, the engine problem
// (with the scenario's overlay), the labels that map engine indices back, and the hash that
// identifies it. Pure apart from the hash; throws BadRequestError with a planner's reason.
import { createHash } from 'node:crypto';
import type { RunParameters } from '../../shared/api/runs';
import type { Scenario } from '../../shared/api/scenarios';
import { buildEvacuationProblem, ModelInputError, type BuiltEvacuationProblem } from '../../shared/model/build-evacuation-problem';
import { applyScenarioToProblem, scenarioSegmentOverrides } from '../../shared/model/apply-scenario';
import { BadRequestError } from '../errors';
import { attachAll, modelSegments, type PlanModel } from '../services/plan-model';
import { horizonSteps } from '../services/runs';
import { ENGINE_VERSION } from './engine-version';
import { budgetRefusal, type RunBudget } from '../../shared/model/run-budget';
import type { RunInput } from '../../shared/model/run-input';

export type PreparedRun = { dataVersion: number; layerId: number; input: RunInput; inputHash: string };

/** The scenario's shelter changes on the plan's shelters; added ones get negative ids. */
function withScenarioShelters(model: PlanModel, scenario: Scenario): PlanModel {
  const known = new Set(model.shelters.map((s) => s.id));
  const unknown = scenario.overlay.removedShelterIds.filter((id) => !known.has(id));
  if (unknown.length > 0) throw new BadRequestError(`The scenario removes shelter ${unknown.join(', ')}, which is not in the plan.`);
  const removed = new Set(scenario.overlay.removedShelterIds);
  return {
    ...model,
    shelters: [
      ...model.shelters.filter((s) => !removed.has(s.id)),
      ...scenario.overlay.addedShelters.map((s, i) => ({ ...s, id: -(i + 1) })),
    ],
  };
}

/** The engine problem for these parameters on the snapshot; BadRequestError with the reason if it cannot be built. */
export function buildRunInput(
  loaded: PlanModel,
  parameters: RunParameters,
  budget: RunBudget,
  scenario: Scenario | null = null,
  // A sweep of participation sets every zone's rate.
  participationRate: number | null = null,
): PreparedRun {
  const base = participationRate === null ? loaded : { ...loaded, zones: loaded.zones.map((z) => ({ ...z, participationRate })) };
  const model = scenario ? withScenarioShelters(base, scenario) : base;
  const lookup = {
    indexOf: new Map(model.segments.map((seg, i) => [seg.id, i])),
    roadClassOf: (i: number) => model.segments[i]!.roadClass,
  };
  if (model.zones.length === 0) throw new BadRequestError('Add at least one evacuation zone before running.');
  if (model.shelters.length === 0) throw new BadRequestError('Add at least one shelter or exit before running.');
  const attached = attachAll(model);
  let built: BuiltEvacuationProblem;
  try {
    built = buildEvacuationProblem(
      { nodeCount: model.nodes.length, segments: modelSegments(model) },
      model.capacityTable,
      scenario ? scenarioSegmentOverrides(scenario.overlay, lookup) : [],
      model.zones.map((z, i) => ({ id: String(z.id), attributes: z, entryNodes: attached.zones[i]!.entryNodes })),
      model.shelters.map((s, i) => ({ id: String(s.id), attributes: s, node: attached.shelters[i]!.node })),
      { timeStepSeconds: parameters.timeStepSeconds, horizonSteps: horizonSteps(parameters), capacityFactor: model.capacityTable.capacityFactor * parameters.capacityFactor },
    );
    if (scenario) applyScenarioToProblem(built, scenario.overlay, lookup);
  } catch (e) {
    if (e instanceof ModelInputError) throw new BadRequestError(`The plan's data cannot be analysed: ${e.message}.`);
    throw e;
  }
  const { problem } = built;
  const entries = problem.zones.reduce((sum, z) => sum + z.entryNodes.length + 2, 0) + 2 * problem.shelters.length;
  const refusal = budgetRefusal({ nodeCount: problem.nodeCount, roads: problem.roads.length, entries }, parameters, budget);
  if (refusal) throw new BadRequestError(refusal);
  const input: RunInput = {
    problem: built.problem,
    algorithm: parameters.algorithm,
    roadOrigins: built.roadOrigins,
    segments: model.segments.map((seg) => ({ id: seg.id, name: seg.name ?? '', roadClass: seg.roadClass })),
    zones: model.zones.map((z, i) => ({ id: z.id, name: z.name, vehicles: built.zones[i]!.vehicles, persons: built.zones[i]!.evacuatingPersons })),
    shelters: model.shelters.map((sh, i) => ({ id: sh.id, name: sh.name, capacityPersons: sh.capacityPersons, capacityVehicles: built.shelters[i]!.capacityVehicles })),
    personsPerVehicleAtShelters: built.personsPerVehicleAtShelters,
  };
  const inputHash = createHash('sha256')
    .update(JSON.stringify({ engine: ENGINE_VERSION, algorithm: parameters.algorithm, problem: built.problem }))
    .digest('hex');
  return { dataVersion: model.dataVersion, layerId: model.layerId, input, inputHash };
}
