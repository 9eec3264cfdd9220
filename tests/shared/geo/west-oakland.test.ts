// The real OpenStreetMap extract West-Oakland.osm.bz2 (© OpenStreetMap contributors, ODbL;
// from Debian's python-osmnx-doc 1.2.3+ds-1, see tests/fixtures/osm/PROVENANCE.md).
// The reference reading of the XML is independent of our reader: @xmldom/xmldom's DOM parser, the
// one osmtogeojson itself uses for XML documents.
//
// Drivable (what Cutline keeps): highway = motorway, trunk, primary, secondary, tertiary (and
// their _link roads), unclassified, residential, living_street, service; minus area=yes and
// ways closed to cars (access/vehicle/motor_vehicle/motorcar = no, agricultural, forestry,
// bus, psv; the most specific key decides). access=private stays: residents drive out too.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import osmtogeojson from 'osmtogeojson';
import { buildEvacuationProblem, defaultCapacityTable } from '../../../shared/model';
import { importRoadLayer } from '../../../server/import/import-road-layer';
import { decodeUpload } from '../../../server/import/decode-upload';

interface DomElement {
  getAttribute(name: string): string;
  getElementsByTagName(name: string): ArrayLike<DomElement>;
}
const { DOMParser } = createRequire(import.meta.url)('@xmldom/xmldom') as { DOMParser: new () => { parseFromString(s: string, type: string): DomElement } };

const DRIVABLE = new Set(['motorway', 'motorway_link', 'trunk', 'trunk_link', 'primary', 'primary_link', 'secondary', 'secondary_link', 'tertiary', 'tertiary_link', 'unclassified', 'residential', 'living_street', 'service']);
const NO_CARS = new Set(['no', 'agricultural', 'forestry', 'bus', 'psv']);

const bytes = readFileSync(new URL('../../fixtures/osm/West-Oakland.osm.bz2', import.meta.url));
const xmlText = new TextDecoder().decode(decodeUpload(bytes).bytes);
const dom = new DOMParser().parseFromString(xmlText, 'text/xml');

const position = new Map<string, [number, number]>();
for (const n of Array.from(dom.getElementsByTagName('node'))) position.set(n.getAttribute('id'), [Number(n.getAttribute('lon')), Number(n.getAttribute('lat'))]);
const allWays = Array.from(dom.getElementsByTagName('way')).map((w) => ({
  id: w.getAttribute('id'),
  refs: Array.from(w.getElementsByTagName('nd')).map((nd) => nd.getAttribute('ref')),
  tags: Object.fromEntries(Array.from(w.getElementsByTagName('tag')).map((t) => [t.getAttribute('k'), t.getAttribute('v')])),
}));
const isDrivable = (tags: Record<string, string>) => {
  if (!DRIVABLE.has(tags['highway'] ?? '') || tags['area'] === 'yes') return false;
  const access = tags['motorcar'] ?? tags['motor_vehicle'] ?? tags['vehicle'] ?? tags['access'];
  return access === undefined || !NO_CARS.has(access);
};
const drivableWays = allWays.filter((w) => isDrivable(w.tags));

function haversineMeters(a: [number, number], b: [number, number]): number {
  const rad = Math.PI / 180;
  const h = Math.sin(((b[1] - a[1]) * rad) / 2) ** 2 + Math.cos(a[1] * rad) * Math.cos(b[1] * rad) * Math.sin(((b[0] - a[0]) * rad) / 2) ** 2;
  return 2 * 6371008.8 * Math.asin(Math.sqrt(h));
}

const network = importRoadLayer(bytes, {}, 'West-Oakland.osm.bz2');
const built = buildEvacuationProblem({ nodeCount: network.nodes.length, segments: network.segments }, defaultCapacityTable(), [], [], [], { timeStepSeconds: 60, horizonSteps: 10 });
const segmentsOf = (wayId: string) => network.segments.map((s, i) => ({ s, i })).filter(({ s }) => s.sourceId === `way/${wayId}`);

describe('West Oakland extract', () => {
  it('keeps the 23 drivable ways: 9 residential, 6 service, 5 secondary, 3 unclassified', () => {
    expect(allWays).toHaveLength(66);
    expect(drivableWays).toHaveLength(23);
    const keptIds = new Set(network.segments.map((s) => s.sourceId));
    expect([...keptIds].sort()).toEqual(drivableWays.map((w) => `way/${w.id}`).sort());
    const byClass = Object.fromEntries(network.report.kept.map((k) => [k.roadClass, k.features]));
    expect(byClass).toEqual({ residential: 9, service: 6, secondary: 5, unclassified: 3 });
    const dropped = Object.fromEntries(network.report.dropped.map((d) => [`${d.reason}/${d.roadClass}`, d.features]));
    expect(dropped).toEqual({ 'notDrivableClass/footway': 7, 'notDrivableClass/cycleway': 1, 'noRoadClass/(none)': 35 });
    expect(network.report.waysCutAtMissingNodes).toEqual([]);
  });

  it('every kept way appears as arcs whose segments retrace its nodes in order', () => {
    for (const way of drivableWays) {
      const parts = segmentsOf(way.id);
      expect(parts.length).toBeGreaterThan(0);
      const traced = parts.flatMap(({ s }, k) => (k === 0 ? s.coordinates : s.coordinates.slice(1)));
      expect(traced).toEqual(way.refs.map((r) => position.get(r)));
      for (const { i } of parts) expect(built.segmentRoads[i]!.forward).not.toBeNull();
    }
  });

  it('one-way ways give arcs in one direction only, along the way; the others both ways', () => {
    const oneway = drivableWays.filter((w) => w.tags['oneway'] === 'yes');
    expect(oneway.map((w) => w.id).sort()).toEqual(['202455449', '202455451', '202459252', '393667837', '395354451', '417704456', '52538632', '52538633']);
    for (const way of drivableWays) {
      for (const { s, i } of segmentsOf(way.id)) {
        const roads = built.segmentRoads[i]!;
        const forward = built.problem.roads[roads.forward!]!;
        expect([forward.from, forward.to]).toEqual([s.fromNode, s.toNode]);
        if (way.tags['oneway'] === 'yes') expect(roads.backward).toBeNull();
        else expect(built.problem.roads[roads.backward!]).toMatchObject({ from: s.toNode, to: s.fromNode });
      }
    }
    expect(network.report.arcCount).toBe(built.problem.roads.length);
  });

  it('segment lengths add up to the haversine length of each way', () => {
    for (const way of drivableWays) {
      const coords = way.refs.map((r) => position.get(r)!);
      let expected = 0;
      for (let k = 1; k < coords.length; k += 1) expected += haversineMeters(coords[k - 1]!, coords[k]!);
      const got = segmentsOf(way.id).reduce((sum, { s }) => sum + s.lengthMeters, 0);
      expect(got / expected).toBeCloseTo(1, 9);
    }
  });

  it('nodes are exactly the way ends and the vertices ways share', () => {
    const uses = new Map<string, number>();
    for (const w of drivableWays) for (const r of w.refs) uses.set(r, (uses.get(r) ?? 0) + 1);
    const expected = new Set<string>();
    for (const w of drivableWays) {
      expected.add(w.refs[0]!);
      expected.add(w.refs[w.refs.length - 1]!);
      for (const r of w.refs) if ((uses.get(r) ?? 0) > 1) expected.add(r);
    }
    expect(network.report.snappedEnds).toEqual([]);
    expect(network.nodes).toHaveLength(expected.size);
  });

  it('the largest component holds nearly all drivable length', () => {
    const [largest] = network.report.components;
    expect(largest!.shareOfLength).toBeGreaterThan(0.98);
    const total = network.segments.reduce((sum, s) => sum + s.lengthMeters, 0);
    const inLargest = network.segments.filter((s) => s.component === 0).reduce((sum, s) => sum + s.lengthMeters, 0);
    expect(inLargest / total).toBeCloseTo(largest!.shareOfLength, 12);
  });

  it('our streaming XML reader gives osmtogeojson the same ways as its own DOM path', () => {
    const reference = osmtogeojson(dom, { polygonFeatures: () => false });
    const byId = new Map(reference.features.filter((f) => f.id?.toString().startsWith('way/')).map((f) => [f.id, f]));
    for (const way of drivableWays) {
      const ref = byId.get(`way/${way.id}`)!;
      expect(ref.geometry).toMatchObject({ type: 'LineString' });
      const traced = segmentsOf(way.id).flatMap(({ s }, k) => (k === 0 ? s.coordinates : s.coordinates.slice(1)));
      expect(traced).toEqual((ref.geometry as { coordinates: number[][] }).coordinates);
    }
  });
});
