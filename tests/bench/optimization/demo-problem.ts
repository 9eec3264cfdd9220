// The demo town's engine problem as the product builds it (default table, Δ and horizon given),
// without a database: the committed layers read, imported and attached as the seed does.
import { readFileSync } from 'node:fs';
import type { EvacuationProblem } from '../../../shared/flow';
import { attachShelters, attachZones, indexNodes, readShelters, readZones } from '../../../shared/geo';
import { buildEvacuationProblem, defaultCapacityTable } from '../../../shared/model';
import { importRoadLayer } from '../../../server/import/import-road-layer';

const file = (name: string) => readFileSync(new URL(`../../../server/seed/demo-town/${name}`, import.meta.url), 'utf8');

export function demoProblem(timeStepSeconds: number, horizonSteps: number): EvacuationProblem {
  const network = importRoadLayer(Buffer.from(file('roads.geojson')), {}, 'roads.geojson');
  const zones = readZones(JSON.parse(file('zones.geojson')));
  const shelters = readShelters(JSON.parse(file('shelters.geojson')));
  const index = indexNodes(network);
  const zoneLinks = attachZones(index, zones);
  const shelterLinks = attachShelters(index, shelters);
  return buildEvacuationProblem(
    { nodeCount: network.nodes.length, segments: network.segments },
    defaultCapacityTable(),
    [],
    zones.map((z, i) => ({ id: z.id!, attributes: z.attributes, entryNodes: zoneLinks[i]!.entryNodes })),
    shelters.map((s, i) => ({ id: s.id!, attributes: s.attributes, node: shelterLinks[i]!.node })),
    { timeStepSeconds, horizonSteps },
  ).problem;
}
