// `auto` decides by the network's shape before it solves (shared/flow/network-shape.ts): push-relabel
// alone where capacities are drawn from a wide range, Boykov–Kolmogorov on road graphs, incremental
// BFS on time-expanded networks, incremental BFS with the handover to push-relabel armed where the
// shape is unclear, Edmonds–Karp up to 5,000 arcs.
// Outside references: the family graphs are generated from their published descriptions by the
// bench's generator (GENRMF-like frames, Goldfarb & Grigoriadis 1988 as described by Cherkassky &
// Goldberg 1997; random level graphs, Cherkassky & Goldberg 1997); glpk.js solves each random
// graph's maximum flow as a linear program; Edmonds–Karp is the reference method.
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  MAX_FLOW_ALGORITHMS,
  buildNetwork,
  buildSteadyStateNetwork,
  chooseAuto,
  shapeFigures,
  expandOverTime,
  maxFlow,
  verify,
  type ArcInput,
  type FlowNetwork,
} from '../../../shared/flow';
import { attachShelters, attachZones, indexNodes, readShelters, readZones } from '../../../shared/geo';
import { buildEvacuationProblem, defaultCapacityTable } from '../../../shared/model';
import { importRoadLayer } from '../../../server/import/import-road-layer';
import { genrmf, randomLevelGraph } from '../../bench/flow/families';
import { city } from '../../bench/flow/instances';
import { generateCity } from '../../bench/flow/road-like-city';
import { loadGlpk, solveFlowLp, type Glpk } from './support/glpk';
import { randomGraph } from './support/random-graphs';

let glpk: Glpk;
beforeAll(async () => {
  glpk = await loadGlpk();
});

/** Solves with auto and with Edmonds–Karp; both must give the same verified maximum. */
function solveBoth(network: FlowNetwork, source: number, sink: number) {
  const auto = maxFlow(network, source, sink);
  const reference = maxFlow(network, source, sink, { algorithm: 'edmonds-karp' });
  expect(auto.value).toBe(reference.value);
  expect(verify(network, auto).problems).toEqual([]);
  return auto;
}

describe('auto chooses by shape before it solves', () => {
  it('runs push-relabel alone on GENRMF-like and random level graphs: no incremental BFS first', () => {
    const families = [genrmf(8, 20, 5), genrmf(12, 10, 21), genrmf(16, 6, 3), randomLevelGraph(32, 64, 6), randomLevelGraph(64, 40, 8), randomLevelGraph(256, 8, 9)];
    for (const { network, source, sink } of families) {
      expect(network.arcCount).toBeGreaterThan(5000);
      const auto = solveBoth(network, source, sink);
      expect(auto.autoChoice).toMatchObject({ shape: 'spread-capacities', start: 'push-relabel', handover: false });
      expect(auto.autoChoice!.reason).toMatch(/push-relabel/);
      expect(auto.algorithm).toBe('push-relabel');
      // No augmenting path was searched: the handover's first stage never ran.
      expect(auto.stats.augmentations).toBe(0);
      expect(auto.stats.pushes).toBeGreaterThan(0);
    }
  }, 60_000);

  it('runs Boykov–Kolmogorov on road-like cities and incremental BFS on their time-expanded networks', () => {
    for (const width of [40, 100]) {
      const steady = buildSteadyStateNetwork(generateCity(city(width, { seed: width })));
      const auto = solveBoth(steady.network, steady.source, steady.sink);
      expect(auto.autoChoice).toMatchObject({ shape: 'two-way', start: 'boykov-kolmogorov', handover: false });
      expect(auto.autoChoice!.reason).toMatch(/two-way roads.*Boykov–Kolmogorov/);
      expect(auto.algorithm).toBe('boykov-kolmogorov');
      expect(auto.stats.pushes).toBe(0);
    }
    const expanded = expandOverTime(generateCity(city(40, { horizonSteps: 15 })));
    expect(expanded.network.arcCount).toBeGreaterThan(5000);
    const auto = solveBoth(expanded.network, expanded.source, expanded.sink);
    expect(auto.autoChoice).toMatchObject({ shape: 'one-way', start: 'incremental-bfs', handover: false });
    expect(auto.algorithm).toBe('incremental-bfs');
  }, 60_000);

  it('sees the demo town (invented) as two-way roads, and its time-expanded network as one-way layers', () => {
    const file = (name: string) => readFileSync(new URL(`../../../server/seed/demo-town/${name}`, import.meta.url), 'utf8');
    const roads = importRoadLayer(Buffer.from(file('roads.geojson')), {}, 'roads.geojson');
    const zones = readZones(JSON.parse(file('zones.geojson')));
    const shelters = readShelters(JSON.parse(file('shelters.geojson')));
    const index = indexNodes(roads);
    const zoneLinks = attachZones(index, zones);
    const shelterLinks = attachShelters(index, shelters);
    const { problem } = buildEvacuationProblem(
      { nodeCount: roads.nodes.length, segments: roads.segments },
      defaultCapacityTable(),
      [],
      zones.map((z, i) => ({ id: z.id!, attributes: z.attributes, entryNodes: zoneLinks[i]!.entryNodes })),
      shelters.map((s, i) => ({ id: s.id!, attributes: s.attributes, node: shelterLinks[i]!.node })),
      { timeStepSeconds: 60, horizonSteps: 30 },
    );
    const steady = buildSteadyStateNetwork(problem);
    // The figures auto decides by (it looks only above 5,000 arcs): two-way roads, no spread.
    const figures = shapeFigures(steady.network, steady.source, steady.sink);
    expect(figures.twoWayShare).toBeGreaterThan(0.5);
    expect(figures.lowCapacityShare).toBeLessThan(0.05);
    const expanded = expandOverTime(problem);
    expect(expanded.network.arcCount).toBeGreaterThan(5000);
    const choice = chooseAuto(expanded.network, expanded.source, expanded.sink);
    expect(choice).toMatchObject({ shape: 'one-way', start: 'incremental-bfs' });
  }, 60_000);

  it('keeps the handover where the shape is unclear: many low capacities but few distinct values', () => {
    // GENRMF-like frames with capacities 1–50 between frames: 19 % low capacities but under 64 values.
    const { network, source, sink } = genrmf(8, 20, 5, 1, 50);
    const auto = solveBoth(network, source, sink);
    expect(auto.autoChoice).toMatchObject({ shape: 'mixed', start: 'incremental-bfs', handover: true });
    expect(auto.stats.augmentations).toBeGreaterThan(0);
    expect(auto.algorithm).toBe('push-relabel'); // handed over
  });

  it('uses Edmonds–Karp up to 5,000 arcs and says so', () => {
    const auto = maxFlow(buildNetwork(3, [{ from: 0, to: 1, capacity: 5 }, { from: 1, to: 2, capacity: 3 }]), 0, 2);
    expect(auto.autoChoice).toMatchObject({ shape: 'small', start: 'edmonds-karp' });
    expect(auto.algorithm).toBe('edmonds-karp');
    expect(maxFlow(buildNetwork(2, [{ from: 0, to: 1, capacity: 1 }]), 0, 1, { algorithm: 'dinic' }).autoChoice).toBeNull();
  });

  it('agrees with every algorithm and with glpk.js on random graphs with bundles, whichever start the shape picks', () => {
    // Each random graph (parallel and antiparallel bundles in shuffled order) gets a padding
    // component the source cannot reach, 5,100 arcs that carry nothing and lift auto past its
    // size threshold: widely spread capacities (auto starts with push-relabel) or two-way pairs
    // of one capacity (auto starts with Boykov–Kolmogorov). The maximum is the random graph's.
    fc.assert(
      fc.property(
        fc.oneof(randomGraph({ maxNodes: 12, maxArcs: 40 }), randomGraph({ maxNodes: 9, maxArcs: 20, maxCapacity: 4, bundles: 2 })),
        fc.boolean(),
        fc.integer({ min: 1, max: 1 << 30 }),
        (graph, spread, seed) => {
          const pad = 200;
          const arcs: ArcInput[] = [...graph.arcs];
          let x = seed;
          const next = () => {
            x ^= x << 13;
            x ^= x >>> 17;
            x ^= x << 5;
            return x >>> 0;
          };
          for (let k = 0; k < 2550; k++) {
            const from = graph.nodeCount + (next() % pad);
            const to = graph.nodeCount + (next() % pad);
            if (spread) {
              arcs.push({ from, to, capacity: 1 + (next() % 10_000) }, { from: to, to: from, capacity: 1 + (next() % 10_000) });
            } else {
              arcs.push({ from, to, capacity: 600 }, { from: to, to: from, capacity: 600 });
            }
          }
          const network = buildNetwork(graph.nodeCount + pad, arcs);
          const lp = solveFlowLp(glpk, graph.nodeCount, graph.arcs, graph.source, graph.sink);
          const auto = maxFlow(network, graph.source, graph.sink);
          expect(auto.autoChoice!.start).toBe(spread ? 'push-relabel' : 'boykov-kolmogorov');
          expect(auto.value).toBe(Math.round(lp.value));
          expect(verify(network, auto).problems).toEqual([]);
          for (const algorithm of MAX_FLOW_ALGORITHMS) {
            const result = maxFlow(network, graph.source, graph.sink, { algorithm });
            expect(result.value, algorithm).toBe(auto.value);
            expect([...result.minCut.sourceSide].join(''), algorithm).toBe([...auto.minCut.sourceSide].join(''));
          }
        },
      ),
      { numRuns: 60, seed: 6142 },
    );
  }, 180_000);
});
