// Engine problems as the product builds them (default table, Δ and horizon given), without a
// database: road, zone and shelter layers read, imported and attached as the seed does.
//   demoProblem: the committed demo town; countyProblem: the generated county (tests/bench/county).
import { readFileSync } from 'node:fs';
import type { EvacuationProblem } from '../../../shared/flow';
import { attachShelters, attachZones, indexNodes, readShelters, readZones } from '../../../shared/geo';
import { buildEvacuationProblem, defaultCapacityTable } from '../../../shared/model';
import { importRoadLayer } from '../../../server/import/import-road-layer';
import { countyRoads, countyShelters, countyZones, FULL_COUNTY } from '../county/county';

const file = (name: string) => readFileSync(new URL(`../../../server/seed/demo-town/${name}`, import.meta.url), 'utf8');

function problemFromLayers(roadBytes: Buffer, roadFileName: string, zonesJson: unknown, sheltersJson: unknown, timeStepSeconds: number, horizonSteps: number): EvacuationProblem {
  const network = importRoadLayer(roadBytes, {}, roadFileName);
  const zones = readZones(zonesJson as Parameters<typeof readZones>[0]);
  const shelters = readShelters(sheltersJson as Parameters<typeof readShelters>[0]);
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

export function demoProblem(timeStepSeconds: number, horizonSteps: number): EvacuationProblem {
  return problemFromLayers(Buffer.from(file('roads.geojson')), 'roads.geojson', JSON.parse(file('zones.geojson')), JSON.parse(file('shelters.geojson')), timeStepSeconds, horizonSteps);
}

/** The generated county (300 × 300 blocks, 179,108 segments) as the product would build it. */
export function countyProblem(timeStepSeconds: number, horizonSteps: number): EvacuationProblem {
  const roads = Buffer.from(JSON.stringify(countyRoads(FULL_COUNTY)));
  return problemFromLayers(roads, 'roads.geojson', countyZones(FULL_COUNTY), countyShelters(FULL_COUNTY), timeStepSeconds, horizonSteps);
}
