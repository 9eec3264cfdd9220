// Every OSM tag rule on synthetic fixtures (tests/fixtures/osm/tag-rules.osm: one way per
// rule off a "spine" road). Rules follow the OSM wiki (Key:oneway, Key:lanes, Key:maxspeed,
// Key:access, Key:layer); "motorway and roundabouts are one-way" is OSM convention (M).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { buildEvacuationProblem, defaultCapacityTable } from '../../../shared/model';
import { readRoadTags } from '../../../shared/geo';
import { importRoadLayer } from '../../../server/import/import-road-layer';
import { readOsmXml } from '../../../server/import/read-osm-xml';

const xml = readFileSync(new URL('../../fixtures/osm/tag-rules.osm', import.meta.url));
const network = importRoadLayer(xml, {}, 'tag-rules.osm');
const of = (wayId: number) => network.segments.filter((s) => s.sourceId === `way/${wayId}`);
const only = (wayId: number) => {
  const s = of(wayId);
  expect(s).toHaveLength(1);
  return s[0]!;
};
const nodeAt = (i: number) => network.nodes[i]!;
const built = buildEvacuationProblem({ nodeCount: network.nodes.length, segments: network.segments }, defaultCapacityTable(), [], [], [], { timeStepSeconds: 60, horizonSteps: 10 });
const roadsOf = (wayId: number) =>
  network.segments.flatMap((s, i) => (s.sourceId === `way/${wayId}` ? [built.segmentRoads[i]!] : []));

describe('oneway', () => {
  it('oneway=yes: one arc, along the way', () => {
    const s = only(101);
    expect(s.attributes).toMatchObject({ oneway: true, lanesBackward: 0 });
    // The way runs from the spine (lat 0) north; the arc must too.
    expect(nodeAt(s.fromNode).lat).toBe(0);
    expect(nodeAt(s.toNode).lat).toBeCloseTo(0.001, 9);
    expect(roadsOf(101)).toEqual([{ forward: expect.any(Number), backward: null }]);
  });

  it('oneway=-1: one arc, against the way (the geometry is stored reversed)', () => {
    const s = only(102);
    expect(s.attributes.oneway).toBe(true);
    expect(nodeAt(s.fromNode).lat).toBeCloseTo(0.001, 9);
    expect(nodeAt(s.toNode).lat).toBe(0);
    expect(s.coordinates[0]).toEqual([nodeAt(s.fromNode).lon, nodeAt(s.fromNode).lat]);
    const [roads] = roadsOf(102);
    expect(roads!.backward).toBeNull();
    expect(built.problem.roads[roads!.forward!]).toMatchObject({ from: s.fromNode, to: s.toNode });
  });

  it('oneway=no and no tag: arcs both ways', () => {
    expect(only(103).attributes.oneway).toBe(false);
    expect(only(107).attributes.oneway).toBe(false);
    expect(roadsOf(103)[0]!.backward).not.toBeNull();
  });

  it('motorway is one-way without a tag, two-way with oneway=no', () => {
    expect(only(110).attributes).toMatchObject({ roadClass: 'motorway', oneway: true });
    expect(only(111).attributes).toMatchObject({ roadClass: 'motorway', oneway: false });
  });

  it('a roundabout is one-way; a ring touching the road once becomes two segments, not a self-loop', () => {
    const ring = of(112);
    expect(ring).toHaveLength(2);
    for (const s of ring) expect(s.attributes).toMatchObject({ oneway: true, roadClass: 'tertiary' });
    expect(ring[0]!.toNode).toBe(ring[1]!.fromNode);
    expect(ring[1]!.toNode).toBe(ring[0]!.fromNode);
    for (const s of ring) expect(s.fromNode).not.toBe(s.toNode);
  });

  it('oneway=reversible is dropped and counted', () => {
    expect(of(119)).toHaveLength(0);
    expect(network.report.dropped).toContainEqual({ roadClass: 'residential', reason: 'reversibleOneway', features: 1 });
  });
});

describe('lanes', () => {
  it('lanes=4 on a two-way road splits evenly: 2 + 2', () => {
    expect(only(103).attributes).toMatchObject({ lanesForward: 2, lanesBackward: 2 });
  });
  it('lanes=3 with lanes:forward=2 leaves 1 backward', () => {
    expect(only(104).attributes).toMatchObject({ lanesForward: 2, lanesBackward: 1 });
  });
  it('lanes:forward and lanes:backward without lanes', () => {
    expect(only(105).attributes).toMatchObject({ lanesForward: 1, lanesBackward: 2 });
  });
  it('lanes=3 on a one-way road: all three forward', () => {
    expect(only(106).attributes).toMatchObject({ lanesForward: 3, lanesBackward: 0, oneway: true });
  });
  it('lanes=2 on a two-way road: one each way; no lanes tag: class default (null)', () => {
    expect(only(120).attributes).toMatchObject({ lanesForward: 1, lanesBackward: 1 });
    expect(only(107).attributes).toMatchObject({ lanesForward: null, lanesBackward: null });
  });
  it('the engine gets lanes × per-lane capacity (primary 1,000 veh/h/lane)', () => {
    const [r] = roadsOf(106);
    expect(built.problem.roads[r!.forward!]).toMatchObject({ lanes: 3, capacityVehPerHour: 3000 });
  });
});

describe('maxspeed', () => {
  it('reads km/h and mph (1 mi = 1.609344 km)', () => {
    expect(only(107).attributes.speedKmh).toBe(50);
    expect(only(108).attributes.speedKmh).toBeCloseTo(48.28032, 9);
  });
  it('an unreadable value falls back to the class default and is reported', () => {
    expect(only(109).attributes.speedKmh).toBeNull();
    expect(network.report.unreadValues).toEqual([{ key: 'maxspeed', value: 'XX:urban', features: 1 }]);
  });
});

describe('layers and crossings', () => {
  it('a bridge over a road shares no node with it (OSM topology)', () => {
    const bridge = only(116);
    expect(bridge.attributes).toMatchObject({ bridge: true, layer: 1 });
    const spineNodes = new Set(of(100).flatMap((s) => [s.fromNode, s.toNode]));
    expect(spineNodes.has(bridge.fromNode) || spineNodes.has(bridge.toNode)).toBe(false);
    expect(bridge.component).not.toBe(of(100)[0]!.component);
  });

  it('splitting at crossings joins a same-layer crossing but never the bridge', () => {
    const split = importRoadLayer(xml, { splitAtCrossings: true }, 'tag-rules.osm');
    expect(split.report.crossingsJoined).toBe(1);
    expect(split.report.crossingsOnDifferentLayers).toBe(1);
    const spine = split.segments.filter((s) => s.sourceId === 'way/100');
    const crossing = split.segments.filter((s) => s.sourceId === 'way/117');
    expect(crossing).toHaveLength(2);
    expect(crossing[0]!.component).toBe(spine[0]!.component);
    expect(split.segments.filter((s) => s.sourceId === 'way/116')).toHaveLength(1);
  });
});

describe('what is left out', () => {
  it('drops non-drivable, closed-to-cars and area ways and counts each reason', () => {
    expect(of(113)).toHaveLength(0);
    expect(of(114)).toHaveLength(0);
    expect(of(115)).toHaveLength(0);
    const dropped = Object.fromEntries(network.report.dropped.map((d) => [`${d.reason}/${d.roadClass}`, d.features]));
    expect(dropped).toEqual({
      'notDrivableClass/footway': 1,
      'noMotorVehicles/service': 1,
      'area/service': 1,
      'reversibleOneway/residential': 1,
      'noRoadClass/(none)': 1, // the building
    });
  });

  it('cuts a way at a missing node: both pieces kept, the gap not bridged, and reported', () => {
    const pieces = of(118);
    expect(pieces).toHaveLength(2);
    expect(network.report.waysCutAtMissingNodes).toEqual([{ sourceId: 'way/118', missingNodeIds: ['999999'] }]);
    // Each piece is one 0.0005° edge (≈ 55.6 m); no piece spans the gap.
    for (const p of pieces) expect(p.lengthMeters).toBeCloseTo(55.6, 0);
  });

  it('decodes XML entities in tag values', () => {
    expect(of(100)[0]!.attributes.name).toBe('Spine & Co Road');
  });
});

describe('OSM JSON input', () => {
  it('gives the same network as the XML it came from', () => {
    const json = Buffer.from(JSON.stringify(readOsmXml(xml)));
    const fromJson = importRoadLayer(json, {}, 'tag-rules.json');
    expect(fromJson.report.sourceFormat).toBe('osmJson');
    expect(fromJson.segments).toEqual(network.segments);
    expect(fromJson.nodes).toEqual(network.nodes);
  });

  it('takes positions from Overpass `out geom` when the node elements are absent', () => {
    const osm = readOsmXml(xml);
    const position = new Map(osm.elements.filter((e) => e.type === 'node').map((n) => [n.id, n]));
    const ways = osm.elements
      .filter((e) => e.type === 'way')
      .map((w) => ({ ...w, geometry: w.nodes.map((id) => (position.has(id) ? { lat: position.get(id)!.lat, lon: position.get(id)!.lon } : null)) }));
    const fromGeom = importRoadLayer(Buffer.from(JSON.stringify({ elements: ways })), {}, 'geom.json');
    expect(fromGeom.segments.map((s) => s.coordinates)).toEqual(network.segments.map((s) => s.coordinates));
  });
});

describe('readRoadTags, rules not in the fixture', () => {
  it('the most specific access key wins (motorcar=yes over access=no)', () => {
    expect(readRoadTags({ highway: 'service', access: 'no', motorcar: 'yes' }).kind).toBe('keep');
    expect(readRoadTags({ highway: 'service', motor_vehicle: 'no' })).toMatchObject({ kind: 'drop', reason: 'noMotorVehicles' });
    expect(readRoadTags({ highway: 'residential', access: 'private' }).kind).toBe('keep');
  });

  it('an untagged bridge is layer 1, an untagged tunnel layer −1, an explicit layer wins', () => {
    const layer = (t: Record<string, string>) => {
      const r = readRoadTags({ highway: 'primary', ...t });
      return r.kind === 'keep' ? r.attributes.layer : NaN;
    };
    expect(layer({ bridge: 'yes' })).toBe(1);
    expect(layer({ tunnel: 'yes' })).toBe(-1);
    expect(layer({ bridge: 'viaduct', layer: '2' })).toBe(2);
    expect(layer({ bridge: 'no' })).toBe(0);
  });

  it('lanes:both_ways belongs to neither direction; oneway=-1 uses lanes:backward', () => {
    const centre = readRoadTags({ highway: 'primary', lanes: '5', 'lanes:both_ways': '1' });
    expect(centre).toMatchObject({ kind: 'keep', attributes: { lanesForward: 2, lanesBackward: 2 } });
    const reverse = readRoadTags({ highway: 'primary', oneway: '-1', lanes: '3', 'lanes:backward': '2' });
    expect(reverse).toMatchObject({ kind: 'keep', reverse: true, attributes: { lanesForward: 2, lanesBackward: 0, oneway: true } });
  });

  it('maxspeed none means the class default; knots convert; the name falls back to ref', () => {
    const none = readRoadTags({ highway: 'motorway', maxspeed: 'none', ref: 'M 1' });
    expect(none).toMatchObject({ kind: 'keep', unread: [], attributes: { speedKmh: null, name: 'M 1' } });
    expect(readRoadTags({ highway: 'primary', maxspeed: '10 knots' })).toMatchObject({ attributes: { speedKmh: 18.52 } });
  });
});
