// The generated county (tests/bench/county/county.ts) at a small size: the import reads it
// into the grid it describes, every zone and destination attaches, and the same seed gives the
// same files. The full 300 × 300 county is for `npm run bench:county`, never for this suite.
import { describe, expect, it } from 'vitest';
import { buildRoadGraph } from '../../../shared/geo/build-road-graph';
import { attachShelters, attachZones } from '../../../shared/geo/attach-zones-and-shelters';
import { indexNodes } from '../../../shared/geo/node-index';
import { readShelters } from '../../../shared/geo/read-shelters';
import { readZones } from '../../../shared/geo/read-zones';
import { countyLayout, countyRoads, countyShelters, countyZones, type CountySpec } from '../../bench/county/county';

const spec: CountySpec = { size: 40, seed: 3 };

describe('generated county', () => {
  it('imports as an n × n grid of blocks whose river is crossed only by its bridges', () => {
    const graph = buildRoadGraph(countyRoads(spec));
    const { n, bridgeRows } = countyLayout(spec);
    expect(bridgeRows).toHaveLength(8);
    // Grid arithmetic: 2·n·(n − 1) block edges, less the n river crossings, plus the bridges.
    expect(graph.report.segmentCount).toBe(2 * n * (n - 1) - n + bridgeRows.length);
    expect(graph.report.nodeCount).toBe(n * n);
    expect(graph.report.components).toHaveLength(1);
    const classes = new Set(graph.report.kept.map((k) => k.roadClass));
    expect([...classes].sort()).toEqual(['primary', 'residential', 'secondary', 'tertiary']);
  });

  it('has six zones of 2.5 persons per vehicle and six destinations, all attached to the roads', () => {
    const graph = buildRoadGraph(countyRoads(spec));
    const index = indexNodes(graph);
    const zones = readZones(countyZones(spec));
    const shelters = readShelters(countyShelters(spec));
    expect(zones).toHaveLength(6);
    expect(shelters).toHaveLength(6);
    expect(attachZones(index, zones).every((a) => a.attachedBy === 'inside')).toBe(true);
    expect(attachShelters(index, shelters).every((a) => a.distanceMeters < 1)).toBe(true);
    const population = zones.reduce((sum, z) => sum + z.attributes.population, 0);
    expect(Math.abs(population - 240_000 * (40 / 300) ** 2)).toBeLessThanOrEqual(300);
  });

  it('is the same for the same seed and differs for another', () => {
    const text = (s: CountySpec) => JSON.stringify([countyRoads(s), countyZones(s), countyShelters(s)]);
    expect(text(spec)).toBe(text({ ...spec }));
    expect(text(spec)).not.toBe(text({ ...spec, seed: 4 }));
  });
});
