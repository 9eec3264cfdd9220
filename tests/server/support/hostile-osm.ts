// fast-check generators of malformed OpenStreetMap road files (XML and JSON). Each file leaves
// no drivable road that could be imported, or breaks the format outright.
import fs from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { file, type HostileFile } from './hostile-files';

type OsmNode = { id: number; lat: number | string; lon: number | string };
type OsmWay = { id: number | string; refs: (number | string)[]; tags: Record<string, string> };
type Extract = { nodes: OsmNode[]; ways: OsmWay[] };

const xmlFile = (kind: string, text: string): HostileFile => file(kind, text, 'upload.osm');
const jsonFile = (kind: string, value: unknown): HostileFile => file(kind, JSON.stringify(value), 'upload.osm.json');

const escape = (s: string) => s.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;');

/** An OSM XML document; `attr` lets a test put any text into an attribute. */
export function osmXml({ nodes, ways }: Extract, prolog = '<?xml version="1.0" encoding="UTF-8"?>', attr = (s: string) => escape(s)): string {
  const n = nodes.map((x) => `  <node id="${attr(String(x.id))}" lat="${attr(String(x.lat))}" lon="${attr(String(x.lon))}"/>`);
  const w = ways.map(
    (x) =>
      `  <way id="${attr(String(x.id))}">\n${x.refs.map((r) => `    <nd ref="${attr(String(r))}"/>`).join('\n')}\n${Object.entries(x.tags)
        .map(([k, v]) => `    <tag k="${attr(k)}" v="${attr(v)}"/>`)
        .join('\n')}\n  </way>`,
  );
  return `${prolog}\n<osm version="0.6" generator="cutline tests">\n${[...n, ...w].join('\n')}\n</osm>`;
}

const coordinate = (min: number, max: number) => fc.double({ min, max, noNaN: true }).map((v) => Number(v.toFixed(7)));
const highway = fc.constantFrom('residential', 'primary', 'tertiary', 'service', 'motorway');

/** A small valid extract: 2–8 nodes, 1–4 highway ways over them. */
export const extract: fc.Arbitrary<Extract> = fc.integer({ min: 2, max: 8 }).chain((count) =>
  fc.record({
    nodes: fc.tuple(...Array.from({ length: count }, (_, i) => fc.record({ id: fc.constant(i + 1), lat: coordinate(44.18, 44.24), lon: coordinate(-38.52, -38.44) }))),
    ways: fc.array(
      fc.record({
        id: fc.integer({ min: 100, max: 999 }),
        refs: fc.uniqueArray(fc.integer({ min: 1, max: count }), { minLength: 2, maxLength: count }),
        tags: fc.record({ highway, name: fc.constantFrom('Quay Road', 'Mill Lane', 'Heron Way') }),
      }),
      { minLength: 1, maxLength: 4 },
    ),
  }),
);

/** A valid extract cut short anywhere, or the bzip2-compressed West Oakland extract cut short (© OpenStreetMap contributors, ODbL). */
export function truncatedOsm(): fc.Arbitrary<HostileFile> {
  const fixture = fs.readFileSync(path.resolve(import.meta.dirname, '../../fixtures/osm/West-Oakland.osm.bz2'));
  return fc.oneof(
    fc.tuple(extract, fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true })).map(([x, at]) => {
      const text = osmXml(x);
      return xmlFile('truncated OSM XML', text.slice(0, Math.floor(at * text.length)));
    }),
    // Cut right after a way, as a download that stopped between two ways would be: every
    // element in it is whole, only the end of the area is missing.
    fc.tuple(extract, fc.nat()).map(([x, k]) => {
      const text = osmXml(x);
      const ends = [...text.matchAll(/<\/way>\n/g)].map((m) => m.index + m[0].length);
      return xmlFile('OSM XML cut after a way', text.slice(0, ends[k % ends.length]));
    }),
    // Cut inside the blocks: a cut in the 10-byte end-of-stream trailer loses no data (seek-bzip
    // then reads every block whole, and so the whole extract).
    fc.integer({ min: 0, max: fixture.length - 11 }).map((at) => file('truncated OSM bzip2', fixture.subarray(0, at), 'extract.osm.bz2')),
  );
}

/** Ways whose nodes are missing from the file, so no two consecutive ones have a position. */
export function danglingReferences(): fc.Arbitrary<HostileFile> {
  return fc.tuple(extract, fc.boolean(), fc.boolean()).map(([x, keepOnePresent, asJson]) => {
    const ways = x.ways.map((w) => ({
      ...w,
      // Missing ids, with at most one present node between two missing ones.
      refs: w.refs.flatMap((r, i) => (keepOnePresent && i % 2 === 0 ? [Number(r) + 10_000, r] : [Number(r) + 10_000])),
    }));
    const broken = { nodes: x.nodes, ways };
    return asJson ? jsonFile('OSM JSON with dangling references', toOsmJson(broken)) : xmlFile('OSM XML with dangling references', osmXml(broken));
  });
}

const notANumberText = fc.constantFrom('NaN', '', 'abc', '1e999', '-Infinity', '1,5', '--1', '44.2.1');

/** One number attribute of a valid extract that is not a number, or a position out of range. */
export function badOsmNumbers(): fc.Arbitrary<HostileFile> {
  return fc
    .tuple(extract, fc.constantFrom('node id', 'node lat', 'node lon', 'nd ref', 'way id', 'lat range', 'lon range'), notANumberText, fc.nat(), fc.double({ min: 90.0001, max: 1e300, noNaN: true }))
    .map(([x, what, text, i, far]) => {
      const b = structuredClone(x) as Extract;
      const way = b.ways[i % b.ways.length]!;
      // A node the chosen way uses, so a position problem cannot go unnoticed.
      const used = b.nodes.find((n) => n.id === way.refs[0])!;
      if (what === 'node id') used.id = text as unknown as number;
      if (what === 'node lat') used.lat = text;
      if (what === 'node lon') used.lon = text;
      if (what === 'nd ref') way.refs[i % way.refs.length] = text;
      if (what === 'way id') way.id = text;
      if (what === 'lat range') used.lat = i % 2 ? far : -far;
      if (what === 'lon range') used.lon = i % 2 ? 180 + far : -180 - far;
      return xmlFile(`OSM XML with a bad ${what}`, osmXml(b));
    });
}

/** Documents that are not an OSM extract, or break the format's structure. */
export function brokenOsmStructure(): fc.Arbitrary<HostileFile> {
  return fc.tuple(extract, fc.constantFrom('osmChange', 'no root', 'node in way', 'open way', 'open tag', 'open comment', 'open quote', 'no nodes')).map(([x, how]) => {
    const text = osmXml(x);
    const broken = {
      osmChange: text.replace('<osm version="0.6" generator="cutline tests">', '<osmChange version="0.6"><modify>').replace('</osm>', '</modify></osmChange>'),
      'no root': text.replace('<osm version="0.6" generator="cutline tests">', '<map>').replace('</osm>', '</map>'),
      'node in way': text.replace('<nd ', '<node id="77" lat="44.2" lon="-38.5"/><nd '),
      'open way': text.slice(0, text.lastIndexOf('  </way>')),
      'open tag': text.replace('</osm>', '<way id="5" '),
      'open comment': text.replace('</osm>', '<!-- the rest of the county follows'),
      'open quote': text.replace('</osm>', '<tag k="x" v="unclosed />\n</osm>'),
      'no nodes': osmXml({ nodes: [], ways: x.ways }),
    }[how];
    return xmlFile(`OSM XML: ${how}`, broken);
  });
}

/**
 * Entity tricks: a billion-laughs DOCTYPE whose entity is used as a coordinate, an external
 * entity as the road class of every way, and character references to no character at all.
 */
export function entityPayloads(): fc.Arbitrary<HostileFile> {
  const laughs = ['<!ENTITY lol "lol">', ...Array.from({ length: 9 }, (_, i) => `<!ENTITY lol${i + 1} "${`&lol${i === 0 ? '' : i};`.repeat(10)}">`)].join('');
  const doctype = (subset: string) => `<?xml version="1.0" encoding="UTF-8"?>\n<!DOCTYPE osm [${subset}]>`;
  const verbatim = (s: string) => s;
  return fc.tuple(extract, fc.constantFrom('laughs', 'external', 'parameter', 'char ref'), fc.constantFrom('&#x110000;', '&#99999999999;', '&#x7FFFFFFF;', '&#0;', '&#x0;')).map(([x, how, ref]) => {
    if (how === 'laughs') {
      const b = structuredClone(x) as Extract;
      b.nodes[0]!.lat = '&lol9;';
      return xmlFile('OSM XML: billion laughs', osmXml(b, doctype(laughs), verbatim));
    }
    if (how === 'external' || how === 'parameter') {
      const subset = how === 'external' ? '<!ENTITY xxe SYSTEM "file:///etc/passwd">' : '<!ENTITY % remote SYSTEM "http://127.0.0.1:9/evil.dtd"> %remote; <!ENTITY xxe "&#x25;remote;">';
      const ways = x.ways.map((w) => ({ ...w, tags: { ...w.tags, highway: '&xxe;' } }));
      return xmlFile(`OSM XML: ${how} entity`, osmXml({ nodes: x.nodes, ways }, doctype(subset), verbatim));
    }
    const ways = x.ways.map((w, i) => (i === 0 ? { ...w, tags: { ...w.tags, name: `Quay ${ref} Road` } } : w));
    return xmlFile(`OSM XML: character reference ${ref}`, osmXml({ nodes: x.nodes, ways }, undefined, verbatim));
  });
}

function toOsmJson({ nodes, ways }: Extract) {
  return {
    version: 0.6,
    elements: [...nodes.map((n) => ({ type: 'node', ...n })), ...ways.map((w) => ({ type: 'way', id: w.id, nodes: w.refs, tags: w.tags }))],
  };
}

const junkValue = fc.oneof(fc.jsonValue({ maxDepth: 2 }), fc.constantFrom({ toString: 1 }, { trim: 'x' }, [], {}));

/** OSM JSON with elements of the wrong shape, none of them a road with two positions. */
export function malformedOsmJson(): fc.Arbitrary<HostileFile> {
  return fc.tuple(extract, fc.constantFrom('highway type', 'geometry type', 'nodes type', 'junk elements', 'string positions', 'far position', 'repeated node', 'tags type'), junkValue).map(([x, how, junk]) => {
    const osm = toOsmJson(x) as { elements: Record<string, unknown>[] };
    const ways = osm.elements.filter((e) => e['type'] === 'way');
    const nodes = osm.elements.filter((e) => e['type'] === 'node');
    if (how === 'highway type') for (const w of ways) w['tags'] = { highway: typeof junk === 'string' ? 12 : junk };
    if (how === 'geometry type') for (const w of ways) Object.assign(w, { geometry: typeof junk === 'object' && Array.isArray(junk) ? 'not a list' : junk, nodes: (w['nodes'] as number[]).map((r) => r + 10_000) });
    if (how === 'nodes type') for (const w of ways) w['nodes'] = Array.isArray(junk) ? { 0: 1, 1: 2 } : junk;
    if (how === 'junk elements') osm.elements = [junk as Record<string, unknown>, null as never, 5 as never, 'way' as never, { type: 'way', nodes: [1, 2] }, { type: 'node', id: 1 }];
    if (how === 'string positions') for (const n of nodes) Object.assign(n, { lat: String(n['lat']), lon: String(n['lon']) });
    if (how === 'far position') for (const n of nodes) n['lat'] = 1000;
    if (how === 'repeated node') for (const w of ways) w['nodes'] = [1, 1];
    if (how === 'tags type') for (const w of ways) w['tags'] = ['highway', 'primary'];
    return jsonFile(`OSM JSON: ${how}`, osm);
  });
}

/** OSM XML that is not UTF-8 text: Latin-1 under a UTF-8 declaration, UTF-16, a raw NUL byte. */
export function osmNotUtf8(): fc.Arbitrary<HostileFile> {
  return fc.tuple(extract, fc.constantFrom('latin1', 'utf16le', 'utf16be', 'nul')).map(([x, how]) => {
    const ways = x.ways.map((w, i) => (i === 0 ? { ...w, tags: { ...w.tags, name: how === 'nul' ? 'Quay\u0000Road' : 'Straße am Mühlteich' } } : w));
    const text = osmXml({ nodes: x.nodes, ways });
    const utf16le = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
    const bytes = { latin1: Buffer.from(text, 'latin1'), utf16le, utf16be: Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(text, 'utf16le').swap16()]), nul: Buffer.from(text) }[how]!;
    return file(`OSM XML in ${how}`, bytes, 'upload.osm');
  });
}
