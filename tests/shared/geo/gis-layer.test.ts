// A GIS-style layer without shared vertices (tests/fixtures/geo/gis-no-shared-vertices.geojson,
// invented, built by make-fixtures.ts): junctions drawn as crossings, a level-1 freeway over
// the grid, an undershoot, an end-to-end gap, an overshoot, a lone street, ESRI-style
// attributes read through a property mapping. Expected counts are worked out by hand from
// the drawing in make-fixtures.ts.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { propertyMappingSchema } from '../../../shared/api/road-import';
import { importRoadLayer } from '../../../server/import/import-road-layer';

const fixture = (name: string) => readFileSync(new URL(`../../fixtures/geo/${name}`, import.meta.url));
const mapping = propertyMappingSchema.parse(JSON.parse(fixture('gis-no-shared-vertices.mapping.json').toString()));
const layer = fixture('gis-no-shared-vertices.geojson');
const network = importRoadLayer(layer, { propertyMapping: mapping });
const of = (id: string) => network.segments.filter((s) => s.sourceId === id);
const meters = (id: string) => of(id).map((s) => Math.round(s.lengthMeters * 100) / 100);

describe('splitting at crossings', () => {
  it('splits a 3 × 3 grid of single lines at its nine crossings (and where Long Lane crosses)', () => {
    expect(network.report.splitAtCrossings).toBe(true);
    expect(network.report.crossingsJoined).toBe(10);
    expect(meters('H0')).toEqual([50, 200, 100, 100, 50]); // x = 0, 200, 300 (Long Lane), 400
    expect(meters('V1')).toEqual([50, 200, 200, 50]);
    const h0 = of('H0');
    const v0 = of('V0');
    expect(v0[0]!.toNode).toBe(h0[0]!.toNode); // (0, 0) is one node
  });

  it('does not join roads on different layers: the level-1 freeway crosses four streets and meets none', () => {
    expect(network.report.crossingsOnDifferentLayers).toBe(4);
    const skyway = of('F1');
    expect(skyway).toHaveLength(1);
    expect(skyway[0]!.attributes).toMatchObject({ roadClass: 'motorway', layer: 1, oneway: false, lanesForward: 2, lanesBackward: 2 });
    expect(skyway[0]!.component).not.toBe(0);
  });

  it('can be switched off: then nothing is joined and every street is its own piece', () => {
    const apart = importRoadLayer(layer, { propertyMapping: mapping, splitAtCrossings: false, snapToleranceMeters: 0 });
    expect(apart.report.crossingsJoined).toBe(0);
    expect(apart.report.components).toHaveLength(11);
    expect(apart.segments).toHaveLength(11);
  });
});

describe('snapping dangling ends', () => {
  it('joins an undershoot to the road it stops 1.5 m short of, splitting that road there', () => {
    const [shortLane] = of('U1');
    expect(meters('H2')).toEqual([50, 100, 100, 200, 50]); // split at x = 100
    const northRow = of('H2');
    expect(shortLane!.toNode).toBe(northRow[1]!.toNode);
    // Gap Lane and Short Lane meet halfway (two ends, 1 m each), the undershoot moves 1.5 m
    // and the overshoot 2 m.
    const moves = network.report.snappedEnds.map((s) => [s.ends, Math.round(s.movedMeters * 10) / 10]);
    expect(moves.sort((a, b) => a[1]! - b[1]!)).toEqual([[2, 1], [1, 1.5], [1, 2]]);
  });

  it('joins ends 2 m apart end to end at their midpoint, and trims a 2 m overshoot onto the road it crossed', () => {
    expect(of('U2')[0]!.toNode).toBe(of('U1')[0]!.fromNode);
    expect(meters('O1')).toEqual([150]);
    expect(of('O1')[0]!.toNode).toBe(of('H0')[2]!.toNode); // x = 300 on South Row
  });

  it('leaves a street 50 m from anything alone, as its own component, and lists its ends', () => {
    const lonely = of('X1')[0]!;
    expect(lonely.component).toBe(2);
    const dangling = new Set(network.report.danglingEnds.map((d) => d.node));
    expect(dangling.has(lonely.fromNode) && dangling.has(lonely.toNode)).toBe(true);
    expect(network.report.components.map((c) => [c.nodes, c.segments])).toEqual([[26, 29], [2, 1], [2, 1]]);
  });

  it('does not snap with a zero tolerance: the undershoot stays a dead end', () => {
    const strict = importRoadLayer(layer, { propertyMapping: mapping, snapToleranceMeters: 0 });
    expect(strict.report.snappedEnds).toEqual([]);
    expect(strict.segments.filter((s) => s.sourceId === 'U1')[0]!.component).not.toBe(0);
  });
});

describe('property mapping', () => {
  it('maps class values, drops mapped-out and unknown classes, and counts them', () => {
    expect(network.report.dropped).toEqual([
      { roadClass: 'Ramp??', reason: 'unknownClass', features: 1 },
      { roadClass: 'Trail', reason: 'unknownClass', features: 1 },
    ]);
    expect(Object.fromEntries(network.report.kept.map((k) => [k.roadClass, k.features]))).toEqual({ residential: 9, primary: 1, motorway: 1 });
  });

  it('reads FT/TF one-way codes, lane counts, speeds in mi/h and names', () => {
    const middle = of('H1');
    for (const s of middle) expect(s.attributes).toMatchObject({ oneway: true, lanesForward: 2, lanesBackward: 0, name: 'Middle Row' });
    expect(middle[0]!.attributes.speedKmh).toBeCloseTo(35 * 1.609344, 9);
    // TF: traffic runs against the drawing (drawn south → north), so segments run north → south.
    const east = of('V2');
    for (const s of east) expect(network.nodes[s.fromNode]!.lat).toBeGreaterThan(network.nodes[s.toNode]!.lat);
    expect(of('H0')[0]!.attributes.speedKmh).toBeCloseTo(25 * 1.609344, 9);
    expect(of('H2')[0]!.attributes.speedKmh).toBeNull();
  });
});

describe('junctions drawn as loose ends', () => {
  it('joins four ends misplaced by up to 1 m into one node, without slivers from the crossing search', () => {
    // A 3 × 3 grid of 100 m blocks, one feature per block edge, every end moved a little.
    const D = 1 / 111195;
    const wobble = [0.7, -0.4, 0.2, -0.9, 0.5, -0.1, 0.8, -0.6];
    let k = 0;
    const at = (x: number, y: number) => [(x + wobble[k++ % 8]!) * D, (y + wobble[k++ % 8]!) * D];
    const features = [];
    for (let j = 0; j < 3; j += 1) for (let i = 0; i < 2; i += 1) features.push({ type: 'Feature', properties: { highway: 'residential' }, geometry: { type: 'LineString', coordinates: [at(i * 100, j * 100), at((i + 1) * 100, j * 100)] } });
    for (let i = 0; i < 3; i += 1) for (let j = 0; j < 2; j += 1) features.push({ type: 'Feature', properties: { highway: 'residential' }, geometry: { type: 'LineString', coordinates: [at(i * 100, j * 100), at(i * 100, (j + 1) * 100)] } });
    const grid = importRoadLayer(Buffer.from(JSON.stringify({ type: 'FeatureCollection', features })));
    expect(grid.nodes).toHaveLength(9);
    expect(grid.segments).toHaveLength(12);
    expect(grid.report.tinySegments).toEqual([]);
    expect(grid.report.components).toHaveLength(1);
    expect(grid.report.danglingEnds).toEqual([]);
  });
});

describe('map output', () => {
  it('draws every segment and every finding of the report', async () => {
    const { reportFindingsToGeoJson, segmentsToGeoJson } = await import('../../../shared/geo');
    const lines = segmentsToGeoJson(network.segments);
    expect(lines.features).toHaveLength(network.segments.length);
    expect(lines.features[0]!.properties).toMatchObject({ segment: 0, roadClass: 'residential', sourceId: 'H0' });
    const findings = reportFindingsToGeoJson(network.report, network);
    const count = (kind: string) => findings.features.filter((f) => f.properties!['finding'] === kind).length;
    expect(count('danglingEnd')).toBe(network.report.danglingEnds.length);
    expect(count('snappedEnd')).toBe(3);
    expect(count('smallComponent')).toBe(2); // the skyway and Lonely Lane
  });
});
