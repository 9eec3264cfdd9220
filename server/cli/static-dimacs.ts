// The static s–t network of a road layer with its zones and shelters, in the DIMACS
// max-flow format (the engine's writer): capacities in veh/h from the given capacity table,
// super source feeding the zones, super sink fed by the shelters (the engine's layout).
import type { CapacityTable } from '../../shared/api/capacity-table';
import { buildSteadyStateNetwork, networkToDimacs, type DimacsMaxFlow } from '../../shared/flow';
import type { RoadGraph } from '../../shared/geo/build-road-graph';
import type { ShelterFeature } from '../../shared/geo/read-shelters';
import type { ZoneFeature } from '../../shared/geo/read-zones';
import type { ShelterAttachment, ZoneAttachment } from '../../shared/api/zone-shelter-attributes';
import { buildEvacuationProblem, type BuiltEvacuationProblem } from '../../shared/model';

export interface StaticDimacs {
  dimacs: DimacsMaxFlow;
  /** `c` lines saying what the node and arc numbers stand for. */
  comments: string[];
  built: BuiltEvacuationProblem;
}

export function staticNetworkDimacs(
  network: Pick<RoadGraph, 'nodes' | 'segments'>,
  table: CapacityTable,
  zones: { zones: ZoneFeature[]; attachments: ZoneAttachment[] },
  shelters: { shelters: ShelterFeature[]; attachments: ShelterAttachment[] },
  label: string,
): StaticDimacs {
  const built = buildEvacuationProblem(
    { nodeCount: network.nodes.length, segments: network.segments },
    table,
    [],
    zones.zones.map((zone, i) => ({ id: zone.id ?? `zone-${zone.index}`, attributes: zone.attributes, entryNodes: zones.attachments[i]!.entryNodes })),
    shelters.shelters.map((s, i) => ({ id: s.id ?? `shelter-${s.index}`, attributes: s.attributes, node: shelters.attachments[i]!.node })),
    { timeStepSeconds: 60, horizonSteps: 0 },
  );
  const steady = buildSteadyStateNetwork(built.problem);
  const dimacs = networkToDimacs(steady.network, steady.source, steady.sink);
  const N = network.nodes.length;
  const comments = [
    `Cutline static s-t network of ${label}: capacities in vehicles per hour, capacity factor ${table.capacityFactor}`,
    `nodes 1..${N}: road nodes (node id + 1); ${N + 1}: super source; ${N + 2}: super sink`,
    `nodes ${N + 3}..${N + 2 + built.problem.zones.length}: zones (${built.problem.zones.map((z) => z.id).join(', ')})`,
    `then one collector per shelter (${built.problem.shelters.map((s) => s.id).join(', ')})`,
    `the first ${built.problem.roads.length} arc lines are roads (one per segment direction, in segment order); capacity 2147483647 = no limit`,
  ];
  return { dimacs, comments, built };
}
