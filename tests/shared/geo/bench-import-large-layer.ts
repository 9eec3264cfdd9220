// Import speed on county-sized synthetic layers (about 100,000 segments), printed as JSON:
// `npx tsx tests/shared/geo/bench-import-large-layer.ts [gridSize]`. A benchmark, not a test:
// it asserts nothing about time. Layers (invented, a square street grid of 100 m blocks):
//   shared     — one feature per street, vertices shared at every junction (OSM-like GeoJSON)
//   crossings  — one straight two-point line per street, junctions only crossings (GIS-like)
//   snapping   — one feature per block edge, every end moved by up to 1 m (no shared vertex)
//   osmXml     — one OSM way per block edge, as an .osm file (XML reader + osmtogeojson)
import { importRoadLayer } from '../../../server/import/import-road-layer';

const n = Number(process.argv[2] ?? 225);
const BLOCK = 100;
const M = (Math.PI / 180) * 6371008.8;
const LAT0 = 40;
const ll = (x: number, y: number): [number, number] => [-100 + x / (M * Math.cos((LAT0 * Math.PI) / 180)), LAT0 + y / M];

// A fixed pseudo-random sequence (mulberry32) so every run measures the same layer.
function random(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const feature = (coords: [number, number][], highway = 'residential') => ({ type: 'Feature', properties: { highway }, geometry: { type: 'LineString', coordinates: coords } });
const range = (k: number) => Array.from({ length: k }, (_, i) => i);

function sharedLayer() {
  const features = [];
  for (const j of range(n)) features.push(feature(range(n).map((i) => ll(i * BLOCK, j * BLOCK)), j % 10 === 0 ? 'primary' : 'residential'));
  for (const i of range(n)) features.push(feature(range(n).map((j) => ll(i * BLOCK, j * BLOCK))));
  return { type: 'FeatureCollection', features };
}

function crossingLayer() {
  const features = [];
  const far = n * BLOCK;
  for (const j of range(n)) features.push(feature([ll(-BLOCK / 2, j * BLOCK), ll(far - BLOCK / 2, j * BLOCK)]));
  for (const i of range(n)) features.push(feature([ll(i * BLOCK, -BLOCK / 2), ll(i * BLOCK, far - BLOCK / 2)]));
  return { type: 'FeatureCollection', features };
}

function snappingLayer() {
  const rnd = random(42);
  const jitter = (x: number, y: number) => ll(x + (rnd() - 0.5) * 1.4, y + (rnd() - 0.5) * 1.4);
  const features = [];
  for (const j of range(n)) for (const i of range(n - 1)) features.push(feature([jitter(i * BLOCK, j * BLOCK), jitter((i + 1) * BLOCK, j * BLOCK)]));
  for (const i of range(n)) for (const j of range(n - 1)) features.push(feature([jitter(i * BLOCK, j * BLOCK), jitter(i * BLOCK, (j + 1) * BLOCK)]));
  return { type: 'FeatureCollection', features };
}

function osmXmlLayer(): string {
  const lines = ['<?xml version="1.0" encoding="UTF-8"?>', '<osm version="0.6" generator="bench">'];
  const id = (i: number, j: number) => 1 + j * n + i;
  for (const j of range(n)) for (const i of range(n)) {
    const [lon, lat] = ll(i * BLOCK, j * BLOCK);
    lines.push(`  <node id="${id(i, j)}" version="1" lat="${lat.toFixed(7)}" lon="${lon.toFixed(7)}"/>`);
  }
  let way = 1;
  const edge = (a: number, b: number, highway: string) => {
    lines.push(`  <way id="${way++}" version="1">\n    <nd ref="${a}"/>\n    <nd ref="${b}"/>\n    <tag k="highway" v="${highway}"/>\n    <tag k="name" v="Bench &amp; Street"/>\n  </way>`);
  };
  for (const j of range(n)) for (const i of range(n - 1)) edge(id(i, j), id(i + 1, j), j % 10 === 0 ? 'primary' : 'residential');
  for (const i of range(n)) for (const j of range(n - 1)) edge(id(i, j), id(i, j + 1), 'residential');
  lines.push('</osm>');
  return lines.join('\n');
}

function measure(name: string, text: string, runs = 3) {
  const bytes = Buffer.from(text);
  const seconds: number[] = [];
  let result = importRoadLayer(bytes, {}, name);
  for (let r = 0; r < runs; r += 1) {
    const t0 = performance.now();
    result = importRoadLayer(bytes, {}, name);
    seconds.push((performance.now() - t0) / 1000);
  }
  const rep = result.report;
  return {
    layer: name,
    megabytes: Math.round(bytes.length / 1e5) / 10,
    features: rep.featureCount,
    segments: rep.segmentCount,
    nodes: rep.nodeCount,
    crossingsJoined: rep.crossingsJoined,
    snappedEnds: rep.snappedEnds.length,
    components: rep.components.length,
    secondsEachRun: seconds.map((s) => Math.round(s * 1000) / 1000),
    bestSeconds: Math.round(Math.min(...seconds) * 1000) / 1000,
    heapMegabytes: Math.round(process.memoryUsage().heapUsed / 1e6),
  };
}

const results = [
  measure('shared', JSON.stringify(sharedLayer())),
  measure('crossings', JSON.stringify(crossingLayer())),
  measure('snapping', JSON.stringify(snappingLayer())),
  measure('osmXml', osmXmlLayer()),
];
console.log(JSON.stringify({ gridSize: n, node: process.version, results }, null, 2));
