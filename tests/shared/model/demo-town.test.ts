// The demo town (invented): the committed layers are the generator's output, they import
// cleanly, and the evacuation's static choke points are the four bridges (solved by the flow
// engine; 2 × 2 lanes × 1,000 + 850 + 750 veh/h from the default table), of which only Mill
// Bridge gains from one more lane alone.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { buildSteadyStateNetwork, rankFixes, solveEvacuation, solveSteadyState, validateEvacuationProblem } from '../../../shared/flow';
import { attachShelters, attachZones, indexNodes, readShelters, readZones } from '../../../shared/geo';
import { buildEvacuationProblem, defaultCapacityTable } from '../../../shared/model';
import { importRoadLayer } from '../../../server/import/import-road-layer';
import { demoRoads, demoShelters, demoZones } from '../../../server/seed/demo-town/demo-town';

const file = (name: string) => readFileSync(new URL(`../../../server/seed/demo-town/${name}`, import.meta.url), 'utf8');

describe('demo town', () => {
  const network = importRoadLayer(Buffer.from(file('roads.geojson')), {}, 'roads.geojson');
  const zones = readZones(JSON.parse(file('zones.geojson')));
  const shelters = readShelters(JSON.parse(file('shelters.geojson')));
  const index = indexNodes(network);
  const zoneLinks = attachZones(index, zones);
  const shelterLinks = attachShelters(index, shelters);

  it('commits exactly what the generator writes', () => {
    expect(JSON.parse(file('roads.geojson'))).toEqual(demoRoads());
    expect(JSON.parse(file('zones.geojson'))).toEqual(demoZones());
    expect(JSON.parse(file('shelters.geojson'))).toEqual(demoShelters());
  });

  it('is one connected network of a few hundred to a few thousand segments', () => {
    expect(network.segments.length).toBeGreaterThan(300);
    expect(network.segments.length).toBeLessThan(5000);
    expect(network.report.components).toHaveLength(1);
    expect(network.report.tinySegments).toEqual([]);
    expect(zones.length).toBeGreaterThanOrEqual(4);
    expect(zones.length).toBeLessThanOrEqual(8);
    expect(shelters.length).toBeGreaterThanOrEqual(3);
    expect(shelters.length).toBeLessThanOrEqual(6);
  });

  it('keeps Wharf Road under the bridges and the ramps over the far carriageway apart', () => {
    // 4 bridges over Wharf Road, Heron Overpass over 2 carriageways, 4 flyover ramps.
    expect(network.report.crossingsOnDifferentLayers).toBe(10);
    expect(network.report.crossingsJoined).toBe(0);
    const nodesOf = (name: string) => new Set(network.segments.filter((s) => s.attributes.name === name).flatMap((s) => [s.fromNode, s.toNode]));
    const wharf = nodesOf('Wharf Road');
    for (const bridge of ['Quay Bridge', 'Market Bridge', 'Heron Bridge', 'Mill Bridge']) {
      expect([...nodesOf(bridge)].some((v) => wharf.has(v))).toBe(false);
    }
  });

  it('attaches every zone by the nodes inside it and every shelter within a few metres', () => {
    expect(zoneLinks.every((z) => z.attachedBy === 'inside' && z.entryNodes.length > 50)).toBe(true);
    expect(shelterLinks.every((s) => s.distanceMeters < 10)).toBe(true);
  });

  it('has the four bridges as its static minimum cut: 5,600 veh/h', () => {
    const built = buildEvacuationProblem(
      { nodeCount: network.nodes.length, segments: network.segments },
      defaultCapacityTable(),
      [],
      zones.map((z, i) => ({ id: z.id!, attributes: z.attributes, entryNodes: zoneLinks[i]!.entryNodes })),
      shelters.map((s, i) => ({ id: s.id!, attributes: s.attributes, node: shelterLinks[i]!.node })),
      { timeStepSeconds: 60, horizonSteps: 360 },
    );
    validateEvacuationProblem(built.problem);
    const steady = buildSteadyStateNetwork(built.problem);
    const { summary, result } = solveSteadyState(built.problem, steady);
    expect(summary.unbounded).toBe(false);
    expect(summary.throughputVehPerHour).toBe(5600);
    const cut = summary.cutRoads.map((r) => {
      const origin = built.roadOrigins[r]!;
      return `${network.segments[origin.segment]!.attributes.name} ${origin.direction}`;
    });
    expect(cut.sort()).toEqual(['Heron Bridge forward', 'Market Bridge forward', 'Mill Bridge forward', 'Quay Bridge forward']);

    // One more lane on a bridge alone helps only where the roads on both sides are wider: Mill
    // Bridge (tertiary, 750 veh/h a lane) between four-lane secondary approaches gains a whole
    // lane, 750 veh/h; the other bridges are as wide as their approaches and gain nothing.
    const { fixes } = rankFixes(built.problem, steady, result, { algorithm: 'edmonds-karp', maxEvaluations: 100 });
    const gains = Object.fromEntries(fixes.map((f) => [network.segments[built.roadOrigins[f.road]!.segment]!.attributes.name, f.gainVehPerHour]));
    expect(gains).toEqual({ 'Mill Bridge': 750, 'Heron Bridge': 0, 'Market Bridge': 0, 'Quay Bridge': 0 });
  });
});

describe('demo town over time (default 1-minute step, 6 hours)', () => {
  it('keeps the curve, clearance and 50/90/95 % times the engine gave when they were pinned', () => {
    // Why pinned: these are the figures a planner sees first in the demo (Findings, briefing). A
    // change to the time model, the curve or the demo's data moves them; that must be deliberate.
    // The values are the engine's own output at commit 4c9a27d (2026-12-05, after the rounding
    // against node time potentials), copied from a run of this very computation, not worked out
    // by hand: when a deliberate change moves them, take the new ones from the engine's output and
    // say why in the commit. The outside checks of the model itself (glpk.js LP, Ford–Fulkerson's
    // temporally repeated flows, Dijkstra's free-flow times) are in tests/shared/flow.
    const network = importRoadLayer(Buffer.from(file('roads.geojson')), {}, 'roads.geojson');
    const zones = readZones(JSON.parse(file('zones.geojson')));
    const shelters = readShelters(JSON.parse(file('shelters.geojson')));
    const index = indexNodes(network);
    const zoneLinks = attachZones(index, zones);
    const shelterLinks = attachShelters(index, shelters);
    const built = buildEvacuationProblem(
      { nodeCount: network.nodes.length, segments: network.segments },
      defaultCapacityTable(),
      [],
      zones.map((z, i) => ({ id: z.id!, attributes: z.attributes, entryNodes: zoneLinks[i]!.entryNodes })),
      shelters.map((s, i) => ({ id: s.id!, attributes: s.attributes, node: shelterLinks[i]!.node })),
      { timeStepSeconds: 60, horizonSteps: 360 },
    );
    const result = solveEvacuation(built.problem);
    const curve = result.curve.deliveredVehiclesByStep;
    expect(result.demandVehicles).toBe(10551);
    expect(result.curve.clearanceStep).toBeNull();
    expect(result.curve.marks).toEqual({ p50: 72, p90: 168, p95: 206 });
    expect(curve.filter((_, t) => t % 30 === 0)).toEqual([0, 2337, 4555, 6443, 8134, 9117, 9711, 10067, 10277, 10397, 10465, 10505, 10525]);
    expect(curve.reduce((a, b) => a + b, 0)).toBe(2926074);
    expect(result.routeTiming.pairs).toBe(36);
    expect(Math.round(result.routeTiming.largestSeconds)).toBe(230);
    expect(Math.round(result.routeTiming.typicalSeconds)).toBe(89);
  }, 120_000);
});

describe('demo town as DIMACS', () => {
  it('writes a static s–t network whose maximum flow, read back with the engine’s parser, is 5,600 veh/h', async () => {
    const { formatDimacsMaxFlow, parseDimacsMaxFlow, buildNetworkFromArrays, maxFlow } = await import('../../../shared/flow');
    const { staticNetworkDimacs } = await import('../../../server/cli/static-dimacs');
    const network = importRoadLayer(Buffer.from(file('roads.geojson')));
    const index = indexNodes(network);
    const zones = readZones(JSON.parse(file('zones.geojson')));
    const shelters = readShelters(JSON.parse(file('shelters.geojson')));
    const { dimacs, comments } = staticNetworkDimacs(
      network,
      defaultCapacityTable(),
      { zones, attachments: attachZones(index, zones) },
      { shelters, attachments: attachShelters(index, shelters) },
      'demo',
    );
    const text = formatDimacsMaxFlow(dimacs, comments);
    expect(text.split('\n').filter((l) => l.startsWith('c ')).length).toBe(comments.length);
    const back = parseDimacsMaxFlow(text);
    expect(back.nodeCount).toBe(network.nodes.length + 2 + zones.length + shelters.length);
    const flow = maxFlow(buildNetworkFromArrays(back.nodeCount, back.tails, back.heads, back.capacities), back.source, back.sink);
    expect(flow.value).toBe(5600);
  });
});
