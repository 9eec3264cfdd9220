// fast-check generators of malformed uploads for the road, zone and shelter endpoints. Every
// generator makes files that are wrong for the endpoint it is named for (a refusal is the only
// right answer), except `validButOdd`: files that are right however unusual, which the
// endpoints must take, so that the valid documents the others break are known to be valid.
import { gzipSync } from 'node:zlib';
import fc from 'fast-check';
import { drivableRoadClasses } from '../../../shared/api/road-attributes';

export type UploadTarget = 'roads' | 'zones' | 'shelters';
export type HostileFile = { kind: string; bytes: Buffer; fileName: string };

// ---------------------------------------------------------------------------------------------
// Serialising, with tokens JSON has not got (NaN, Infinity) and numbers it overflows (1e999)

const RAW = '\u0001raw:';
/** A value JSON.stringify writes as the given text, unquoted: `raw('NaN')`. */
export const raw = (text: string) => `${RAW}${text}\u0001`;
export function toJsonText(value: unknown): string {
  return JSON.stringify(value).replace(/"\\u0001raw:(.*?)\\u0001"/g, '$1');
}

/** Counterexamples print as their kind, size and first bytes, not as megabytes of buffer. */
export function printable<T extends { kind: string }>(value: T, bytes: Buffer): T {
  const head = bytes.subarray(0, 160).toString('latin1').replace(/[^\x20-\x7e]/g, '.');
  return Object.assign(value, { [fc.toStringMethod]: () => `${value.kind} (${bytes.length} bytes): ${head}${bytes.length > 160 ? '…' : ''}` });
}

export function file(kind: string, bytes: Buffer | string, fileName = 'upload.geojson'): HostileFile {
  const buffer = typeof bytes === 'string' ? Buffer.from(bytes, 'utf8') : bytes;
  return printable({ kind, bytes: buffer, fileName }, buffer);
}

// ---------------------------------------------------------------------------------------------
// Valid documents to break: small, around the invented town of Veltmoor

type Position = [number, number];
type Doc = { type: 'FeatureCollection'; features: Record<string, unknown>[] };

// A grid of 0.001° (about 80 m by 110 m here), so that no two positions of a line fall
// within the 3 m snap tolerance and a valid line keeps its length.
const lon = fc.integer({ min: 0, max: 80 }).map((i) => Number((-38.52 + i * 0.001).toFixed(3)));
const lat = fc.integer({ min: 0, max: 60 }).map((j) => Number((44.18 + j * 0.001).toFixed(3)));
const position: fc.Arbitrary<Position> = fc.tuple(lon, lat);
const roadClass = fc.constantFrom(...drivableRoadClasses);
const name = fc.string({ minLength: 1, maxLength: 24 }).filter((s) => s.trim().length > 0);

/** A line whose consecutive positions differ, so it keeps a length. */
const line = fc.uniqueArray(position, { minLength: 2, maxLength: 6, selector: (p) => `${p[0]},${p[1]}` });

export const roadFeature = fc.record({
  type: fc.constant('Feature'),
  properties: fc.record({ highway: roadClass, name }),
  geometry: fc.record({ type: fc.constant('LineString'), coordinates: line }),
});

function square([x, y]: Position, size: number): Position[] {
  return [[x, y], [x + size, y], [x + size, y + size], [x, y + size], [x, y]];
}
export const zoneFeature = fc.record({
  type: fc.constant('Feature'),
  properties: fc.record({ name, population: fc.integer({ min: 0, max: 50_000 }) }),
  geometry: fc.record({ type: fc.constant('Polygon'), coordinates: fc.tuple(position, fc.double({ min: 0.001, max: 0.01, noNaN: true })).map(([p, d]) => [square(p, d)]) }),
});
export const shelterFeature = fc.record({
  type: fc.constant('Feature'),
  properties: fc.record({ name, capacityPersons: fc.option(fc.integer({ min: 0, max: 10_000 }), { nil: null }) }),
  geometry: fc.record({ type: fc.constant('Point'), coordinates: position }),
});

export const featureOf: Record<UploadTarget, fc.Arbitrary<Record<string, unknown>>> = { roads: roadFeature, zones: zoneFeature, shelters: shelterFeature };
export const validDocument = (target: UploadTarget, maxFeatures = 5): fc.Arbitrary<Doc> =>
  fc.array(featureOf[target], { minLength: 1, maxLength: maxFeatures }).map((features) => ({ type: 'FeatureCollection', features }));

const clone = <T>(value: T): T => structuredClone(value);
type Geometry = { type: string; coordinates: unknown };
const geometryOf = (f: Record<string, unknown>) => f['geometry'] as Geometry;

/** Every position of a feature's geometry, as [container, index] so it can be replaced. */
function positionSlots(g: Geometry): [unknown[], number][] {
  if (g.type === 'Point') return [];
  const slots: [unknown[], number][] = [];
  const walk = (list: unknown[], depth: number) => list.forEach((item, i) => (depth === 0 ? slots.push([list, i]) : walk(item as unknown[], depth - 1)));
  walk(g.coordinates as unknown[], g.type === 'LineString' ? 0 : 1);
  return slots;
}

// ---------------------------------------------------------------------------------------------
// Values that are not what a field holds

/** A JSON value that is never a number, nor text the zone and shelter readers take for one ("12"). */
const notANumber = fc.oneof(
  fc.string({ maxLength: 8 }).filter((s) => !/^\s*-?\d+(\.\d+)?\s*$/.test(s)),
  fc.constantFrom('NaN', 'Infinity', '-Infinity', '1e999', '12,5', '0x10', ' ', 'null', 'unbounded!'),
  fc.boolean(),
  fc.constant(null),
  fc.array(fc.integer(), { maxLength: 3 }),
  fc.constantFrom({}, { value: 1 }, { toString: 1 }, { valueOf: 'x' }),
);

/** Positions that are not [longitude, latitude] in range. */
export const badPosition: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(raw('NaN'), raw('Infinity'), raw('-Infinity')),
  fc.constantFrom(raw('[1e999, 44.2]'), raw('[-38.5, -1e999]'), raw('[NaN, NaN]')),
  fc.tuple(fc.double({ min: 180.000001, max: 1e308, noNaN: true }), lat),
  fc.tuple(lon, fc.double({ min: 90.000001, max: 1e308, noNaN: true }).map((v) => -v)),
  fc.tuple(fc.constantFrom(500_000, 6_500_000.25, -1e12), fc.constantFrom(4_200_000, 1e300)),
  fc.tuple(notANumber, lat),
  fc.tuple(lon, notANumber),
  position.map((p) => [p[0]]),
  fc.constant([]),
  fc.tuple(position, position).map(([a, b]) => [...a, ...b, 0]),
  position.map((p) => [p]),
  position.map(([x, y]) => ({ lon: x, lat: y })),
  position.map(([x, y]) => `${x},${y}`),
  fc.constant(null),
);

// ---------------------------------------------------------------------------------------------
// Features that are malformed for each endpoint (one is enough to refuse the whole file)

const notAFeature = fc.oneof(
  fc.constantFrom(null, 7, 'Feature', true, [], [1, 2]),
  fc.record({ type: fc.constantFrom('feature', 'Geometry', 'FeatureCollection', 'LineString', ''), geometry: fc.constant({ type: 'LineString', coordinates: [[0, 0], [0.001, 0.001]] }) }),
);

const badRoadGeometry = fc.oneof(
  fc.constantFrom(7, 'LineString', true),
  fc.constantFrom([], [[0, 0], [1, 1]]),
  fc.record({ type: fc.constantFrom('Line', 'linestring', 'Polyline', 'Curve', '', 12, null, {}) as fc.Arbitrary<unknown>, coordinates: line }),
  fc.record({ coordinates: line }),
  fc.record({ type: fc.constantFrom('LineString', 'MultiLineString'), coordinates: fc.constantFrom(undefined, null, 5, 'x', [], {}) as fc.Arbitrary<unknown> }),
  fc.record({ type: fc.constant('LineString'), coordinates: position.map((p) => [p]) }),
  fc.record({ type: fc.constant('MultiLineString'), coordinates: fc.constantFrom([[]], [[[0, 0]]], [5]) as fc.Arbitrary<unknown> }),
  fc.tuple(line, fc.nat(), badPosition).map(([l, i, bad]) => {
    const coordinates: unknown[] = [...l];
    coordinates[i % coordinates.length] = bad;
    return { type: 'LineString', coordinates };
  }),
);

const badZoneProperties = fc.oneof(
  fc.record({ name, population: fc.oneof(notANumber, fc.constantFrom(-1, 1.5, 50_000_001, 1e300)) }),
  fc.record({ name }),
  fc.record({ name: fc.constantFrom({}, [], [[]], { first: 'North' }, true, false), population: fc.constant(100) }),
  fc.record({ name, population: fc.constant(100), participationRate: fc.oneof(notANumber.filter((v) => v !== null && v !== ''), fc.constantFrom(-0.1, 1.01, 7)) }),
  fc.record({ name, population: fc.constant(100), personsPerVehicle: fc.oneof(fc.constantFrom(0, 0.5, 11, -2, 'two'), fc.constantFrom({}, true, [2])) }),
  fc.record({
    name,
    population: fc.constant(100),
    departureCurve: fc.constantFrom({ kind: 'sudden' }, { kind: 'uniform' }, { kind: 'uniform', durationHours: -1 }, { kind: 'logistic', responseRatePerHour: 'fast' }, 5, [], true, 'not json', '{"kind":', '{"kind":"rayleigh"}'),
  }),
  fc.record({ name, population: fc.constant(100), departure: fc.constantFrom('sometime', 'uniform', 'rayleigh', 5) }),
);

const badZoneGeometry = fc.oneof(
  fc.constantFrom(null, 7, 'Polygon', [], {}),
  line.map((coordinates) => ({ type: 'LineString', coordinates })),
  position.map((coordinates) => ({ type: 'Point', coordinates })),
  fc.record({ type: fc.constantFrom('polygon', 'Circle', 'GeometryCollection', '', 1), coordinates: fc.tuple(position).map(([p]) => [square(p, 0.01)]) }),
  fc.record({ type: fc.constant('Polygon'), coordinates: fc.constantFrom(undefined, null, [], [[]], 'x', [[[0, 0], [1, 0], [0, 0]]]) as fc.Arbitrary<unknown> }),
  // An open ring: the last position is not the first.
  position.map((p) => ({ type: 'Polygon', coordinates: [square(p, 0.01).slice(0, 4).concat([[p[0] + 0.0001, p[1]]])] })),
  fc.record({ type: fc.constant('MultiPolygon'), coordinates: fc.constantFrom([], [[]], [[[]]], 5) as fc.Arbitrary<unknown> }),
  fc.tuple(position, fc.integer({ min: 1, max: 3 }), badPosition).map(([p, i, bad]) => {
    const ring: unknown[] = square(p, 0.01);
    ring[i] = bad;
    return { type: 'Polygon', coordinates: [ring] };
  }),
);

const badShelterProperties = fc.oneof(
  fc.record({ name, capacityPersons: fc.oneof(notANumber.filter((v) => v !== null && v !== '' && v !== 'unbounded'), fc.constantFrom(-5, 1.5, 50_000_001, 'many')) }),
  fc.record({ name: fc.constantFrom({}, [], [[]], { first: 'Hall' }, true), capacityPersons: fc.constant(100) }),
);

const badShelterGeometry = fc.oneof(
  fc.constantFrom(null, 7, 'Point', [], {}),
  line.map((coordinates) => ({ type: 'LineString', coordinates })),
  line.map((coordinates) => ({ type: 'MultiPoint', coordinates })),
  position.map((p) => ({ type: 'Polygon', coordinates: [square(p, 0.01)] })),
  fc.record({ type: fc.constantFrom('point', 'Place', '', 0), coordinates: position }),
  badPosition.map((coordinates) => ({ type: 'Point', coordinates })),
);

const withGeometry = (g: fc.Arbitrary<unknown>, props: fc.Arbitrary<unknown>) => fc.record({ type: fc.constant('Feature'), properties: props, geometry: g });

export const badFeature: Record<UploadTarget, fc.Arbitrary<unknown>> = {
  roads: fc.oneof(notAFeature, withGeometry(badRoadGeometry, fc.record({ highway: roadClass }))),
  zones: fc.oneof(
    notAFeature,
    withGeometry(badZoneGeometry, fc.record({ name, population: fc.constant(10) })),
    fc.tuple(zoneFeature, badZoneProperties).map(([f, properties]) => ({ ...f, properties })),
  ),
  shelters: fc.oneof(
    notAFeature,
    withGeometry(badShelterGeometry, fc.record({ name, capacityPersons: fc.constant(10) })),
    fc.tuple(shelterFeature, badShelterProperties).map(([f, properties]) => ({ ...f, properties })),
  ),
};

// ---------------------------------------------------------------------------------------------
// The classes of malformed file

/** A valid file cut short anywhere (plain or gzip-compressed). */
export function truncated(target: UploadTarget): fc.Arbitrary<HostileFile> {
  return fc.tuple(validDocument(target), fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }), fc.boolean()).map(([doc, at, gzip]) => {
    const whole = Buffer.from(toJsonText(doc));
    const bytes = gzip ? gzipSync(whole) : whole;
    const cut = bytes.subarray(0, Math.floor(at * bytes.length));
    return file(gzip ? 'truncated gzip' : 'truncated', cut, gzip ? 'upload.geojson.gz' : 'upload.geojson');
  });
}

/** The envelope with a wrong type where the collection, its features or the geometry belong. */
export function wrongEnvelopeTypes(target: UploadTarget): fc.Arbitrary<HostileFile> {
  const wrong = fc.oneof(fc.jsonValue({ maxDepth: 2 }), fc.constantFrom({ type: 'FeatureCollection' }, {}, 'FeatureCollection'));
  return fc.tuple(validDocument(target), fc.constantFrom('type', 'features', 'features[]'), wrong).map(([doc, at, value]) => {
    const broken: Record<string, unknown> = clone(doc);
    if (at === 'type') broken['type'] = value === 'FeatureCollection' ? 'featurecollection' : value;
    else if (at === 'features') broken['features'] = Array.isArray(value) ? { ...value } : value;
    else broken['features'] = [value];
    return file(`wrong type at ${at}`, toJsonText(broken));
  });
}

/** Valid features with one or more malformed ones among them (all of it valid JSON, so each can be named). */
export function mixedValidAndInvalid(target: UploadTarget): fc.Arbitrary<HostileFile & { badIndices: number[] }> {
  const parsable = badFeature[target].filter((f) => !JSON.stringify(f).includes('\\u0001raw:'));
  return fc
    .tuple(fc.array(featureOf[target], { maxLength: 6 }), fc.array(fc.tuple(parsable, fc.nat()), { minLength: 1, maxLength: 3 }))
    .map(([valid, bad]) => {
      const features: unknown[] = [...valid];
      for (const [feature, at] of bad) features.splice(at % (features.length + 1), 0, feature);
      const badIndices = features.flatMap((f, i) => (bad.some(([b]) => b === f) ? [i] : []));
      return { ...file('valid and malformed features', toJsonText({ type: 'FeatureCollection', features })), badIndices };
    });
}

/** One position of a valid file replaced by something that is not a position. */
export function badCoordinates(target: UploadTarget): fc.Arbitrary<HostileFile> {
  return fc.tuple(validDocument(target), fc.nat(), fc.nat(), badPosition).map(([doc, fi, pi, bad]) => {
    const broken = clone(doc);
    const feature = broken.features[fi % broken.features.length]!;
    const g = geometryOf(feature);
    const slots = positionSlots(g);
    if (slots.length === 0) g.coordinates = bad;
    else {
      const [list, i] = slots[pi % slots.length]!;
      list[i] = bad;
      // A ring's first and last positions are one point: replace both.
      if (g.type === 'Polygon' && (i === 0 || i === list.length - 1)) list[i === 0 ? list.length - 1 : 0] = bad;
    }
    return file('bad coordinates', toJsonText(broken));
  });
}

/** Zone and shelter files with a wrong value in one attribute of one feature. */
export function wrongAttributeTypes(target: 'zones' | 'shelters'): fc.Arbitrary<HostileFile> {
  const props = target === 'zones' ? badZoneProperties : badShelterProperties;
  return fc.tuple(validDocument(target), fc.nat(), props).map(([doc, fi, properties]) => {
    const broken = clone(doc);
    broken.features[fi % broken.features.length]!['properties'] = properties;
    return file('wrong attribute types', toJsonText(broken));
  });
}

/** Geometry of the wrong kind everywhere: areas and points as roads, lines as zones, … */
export function wrongGeometryKind(target: UploadTarget): fc.Arbitrary<HostileFile> {
  const kinds: Record<UploadTarget, fc.Arbitrary<unknown>> = {
    roads: fc.oneof(
      position.map((p) => ({ type: 'Polygon', coordinates: [square(p, 0.01)] })),
      position.map((p) => ({ type: 'MultiPolygon', coordinates: [[square(p, 0.01)]] })),
      position.map((coordinates) => ({ type: 'Point', coordinates })),
      line.map((coordinates) => ({ type: 'MultiPoint', coordinates })),
      line.map((coordinates) => ({ type: 'GeometryCollection', geometries: [{ type: 'LineString', coordinates }] })),
    ),
    zones: fc.oneof(
      line.map((coordinates) => ({ type: 'LineString', coordinates })),
      position.map((coordinates) => ({ type: 'Point', coordinates })),
      position.map((p) => ({ type: 'GeometryCollection', geometries: [{ type: 'Polygon', coordinates: [square(p, 0.01)] }] })),
    ),
    shelters: fc.oneof(
      position.map((p) => ({ type: 'Polygon', coordinates: [square(p, 0.01)] })),
      line.map((coordinates) => ({ type: 'LineString', coordinates })),
      line.map((coordinates) => ({ type: 'MultiPoint', coordinates })),
    ),
  };
  return fc.tuple(validDocument(target), fc.array(kinds[target], { minLength: 1, maxLength: 5 })).map(([doc, geometries]) => {
    const features = geometries.map((geometry, i) => ({ ...doc.features[i % doc.features.length]!, geometry }));
    return file('wrong geometry kind', toJsonText({ type: 'FeatureCollection', features }));
  });
}

/** A FeatureCollection with nothing in it. */
export function emptyCollection(): fc.Arbitrary<HostileFile> {
  return fc
    .constantFrom(
      { type: 'FeatureCollection', features: [] },
      { type: 'FeatureCollection', features: [], crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:OGC:1.3:CRS84' } } },
      { type: 'FeatureCollection', features: [], bbox: [-38.5, 44.1, -38.4, 44.3] },
    )
    .map((doc) => file('empty collection', toJsonText(doc)));
}

/** JSON that parses but is not a FeatureCollection (nor an OpenStreetMap document). */
export function jsonNotGeoJson(): fc.Arbitrary<HostileFile> {
  const isCollectionLike = (v: unknown) =>
    v !== null && typeof v === 'object' && ((v as { type?: unknown }).type === 'FeatureCollection' || Array.isArray((v as { elements?: unknown }).elements));
  return fc
    .oneof(
      fc.jsonValue().filter((v) => !isCollectionLike(v)),
      fc.constantFrom(
        { type: 'Feature', properties: { highway: 'residential' }, geometry: { type: 'LineString', coordinates: [[-38.5, 44.2], [-38.49, 44.2]] } },
        { type: 'LineString', coordinates: [[-38.5, 44.2], [-38.49, 44.2]] },
        { type: 'GeometryCollection', geometries: [] },
        { type: 'Topology', objects: {}, arcs: [] },
        { features: [] },
        { type: 'FeatureCollection', features: null },
        { type: 'FeatureCollection', features: {} },
        { type: 'FeatureCollection', features: 'all of them' },
        { elements: 'nodes and ways' },
        [{ type: 'FeatureCollection', features: [] }],
      ),
    )
    .map((v) => file('JSON that is not GeoJSON', toJsonText(v) ?? 'null', 'upload.json'));
}

/** Another format altogether: XML that is not OpenStreetMap, CSV, KML, GPX. */
export function otherTextFormats(target: UploadTarget): fc.Arbitrary<HostileFile> {
  const texts = [
    '<?xml version="1.0"?><gpx version="1.1"><trk><trkseg><trkpt lat="44.2" lon="-38.5"/></trkseg></trk></gpx>',
    'type: FeatureCollection\nfeatures: []\n',
    '# just a comment',
  ];
  // A CSV of points and a KML placemark are shelter files (read since the GIS formats came in);
  // for roads they hold no line, and a zone is not a KML point nor a CSV row without a population.
  if (target !== 'shelters') {
    texts.push('lon,lat,name\n-38.5,44.2,Quay\n', '<?xml version="1.0"?><kml xmlns="http://www.opengis.net/kml/2.2"><Placemark><Point><coordinates>-38.5,44.2</coordinates></Point></Placemark></kml>');
  }
  // An OpenStreetMap extract is a road file, not zones or shelters.
  if (target !== 'roads') texts.push('<?xml version="1.0"?><osm version="0.6"><node id="1" lat="44.2" lon="-38.5"/></osm>');
  return fc.constantFrom(...texts).map((t) => file('another text format', t, 'upload.txt'));
}

/** Random bytes, alone or behind the magic number of another format. */
export function binaryJunk(): fc.Arbitrary<HostileFile> {
  const magic = fc.constantFrom(
    [],
    [0x1f, 0x8b], // gzip
    [0x1f, 0x8b, 0x08, 0x00, 0, 0, 0, 0, 0, 0x03], // a gzip header
    [0x42, 0x5a, 0x68, 0x39], // bzip2 "BZh9"
    [0x42, 0x5a, 0x68, 0x39, 0x31, 0x41, 0x59, 0x26, 0x53, 0x59], // bzip2 block header
    [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], // PNG
    [0x25, 0x50, 0x44, 0x46, 0x2d, 0x31, 0x2e, 0x37], // %PDF-1.7
    [0x50, 0x4b, 0x03, 0x04], // zip (a zipped shapefile)
    [0x00, 0x00, 0x27, 0x0a], // shapefile .shp
    [0x7f, 0x45, 0x4c, 0x46], // ELF
    [0x7b], // "{" then junk
    [0x3c], // "<" then junk
  );
  return fc.tuple(magic, fc.uint8Array({ maxLength: 4096 })).map(([m, rest]) => file('binary junk', Buffer.concat([Buffer.from(m), Buffer.from(rest)]), 'upload.bin'));
}

/** Valid content compressed, but broken inside the compression, or a broken document compressed. */
export function brokenGzip(target: UploadTarget): fc.Arbitrary<HostileFile> {
  return fc.oneof(
    fc.tuple(validDocument(target), fc.nat(), fc.integer({ min: 1, max: 255 })).map(([doc, at, xor]) => {
      const gz = gzipSync(Buffer.from(toJsonText(doc)));
      // Past the 10-byte header: a flipped byte in the deflate data or the CRC-32/size trailer.
      const i = 10 + (at % (gz.length - 10));
      gz[i] = gz[i]! ^ xor;
      return file('gzip with a corrupt byte', gz, 'upload.geojson.gz');
    }),
    badFeature[target].map((f) => file('gzip of a malformed file', gzipSync(Buffer.from(toJsonText({ type: 'FeatureCollection', features: [f] }))), 'upload.geojson.gz')),
    fc.constant(file('gzip of gzip of nothing', gzipSync(gzipSync(Buffer.alloc(0))), 'upload.gz')),
  );
}

/** The bytes of `text` with `inserted` bytes right after the first `after`. */
function spliceBytes(text: Buffer, after: string, inserted: number[]): Buffer {
  const i = text.indexOf(after) + Buffer.byteLength(after);
  return Buffer.concat([text.subarray(0, i), Buffer.from(inserted), text.subarray(i)]);
}

/** Text in an encoding other than UTF-8, UTF-8 with stray byte-order marks, or with a NUL character. */
export function wrongEncodings(target: UploadTarget): fc.Arbitrary<HostileFile> {
  const accented = fc.constantFrom('Rue de l’Église', 'Straße am Mühlteich', 'Café Fjørd', 'Ñandú Way', 'Øster Allé');
  return fc.tuple(validDocument(target), accented, fc.constantFrom('utf16le-bom', 'utf16be-bom', 'utf16le', 'utf32le-bom', 'latin1', 'double-bom', 'bom-utf16', 'invalid-utf8', 'nul')).map(([doc, label, encoding]) => {
    const named = clone(doc);
    (named.features[0]!['properties'] as Record<string, unknown>)['name'] = label;
    const text = toJsonText(named);
    const utf16le = Buffer.from(text, 'utf16le');
    const bytes = {
      'utf16le-bom': Buffer.concat([Buffer.from([0xff, 0xfe]), utf16le]),
      'utf16be-bom': Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(utf16le).swap16()]),
      utf16le,
      'utf32le-bom': Buffer.concat([Buffer.from([0xff, 0xfe, 0, 0]), Buffer.from([...text].flatMap((c) => { const b = Buffer.alloc(4); b.writeUInt32LE(c.codePointAt(0)!); return [...b]; }))]),
      // Latin-1 cannot hold ’; the other names are all Latin-1.
      latin1: Buffer.from(text.replace('’', "'"), 'latin1'),
      'double-bom': Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf, 0xef, 0xbb, 0xbf]), Buffer.from(text)]),
      'bom-utf16': Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), utf16le]),
      // An overlong "/" (C0 AF) and a UTF-8-encoded surrogate (ED A0 80) inside the name.
      'invalid-utf8': spliceBytes(Buffer.from(text), label, [0xc0, 0xaf, 0xed, 0xa0, 0x80]),
      // Valid JSON and valid UTF-8, but a NUL character in the name, which no text column holds.
      nul: Buffer.from(text.replace(label, `${label}\\u0000`)),
    }[encoding];
    return file(`text in ${encoding}`, bytes);
  });
}

/** Nesting far deeper than any geometry: in coordinates, properties or as the feature itself. */
export function deepNesting(target: UploadTarget): fc.Arbitrary<HostileFile> {
  const nestedArray = (depth: number, inner = '0') => `${'['.repeat(depth)}${inner}${']'.repeat(depth)}`;
  const nestedObject = (depth: number) => `${'{"a":'.repeat(depth)}1${'}'.repeat(depth)}`;
  const where = target === 'roads' ? ['coordinates', 'position', 'feature', 'geometry', 'properties+badGeometry'] : ['coordinates', 'position', 'feature', 'geometry', 'name', 'attribute'];
  return fc.tuple(fc.constantFrom(...where), fc.constantFrom(64, 1_000, 10_000, 100_000, 400_000)).map(([at, depth]) => {
    const geometryType = { roads: 'LineString', zones: 'Polygon', shelters: 'Point' }[target];
    const props = target === 'roads' ? '{"highway":"residential"}' : target === 'zones' ? '{"name":"Deep","population":10}' : '{"name":"Deep","capacityPersons":10}';
    const feature = (geometry: string, properties = props) => `{"type":"Feature","properties":${properties},"geometry":${geometry}}`;
    const text = {
      coordinates: feature(`{"type":"${geometryType}","coordinates":${nestedArray(depth)}}`),
      position: feature(`{"type":"${geometryType}","coordinates":${target === 'shelters' ? nestedArray(depth, '-38.5') : target === 'zones' ? `[[${nestedArray(depth, '-38.5')}]]` : `[${nestedArray(depth, '-38.5')},[-38.49,44.2]]`}}`),
      feature: nestedArray(depth, '{"type":"Feature"}'),
      geometry: feature(nestedObject(depth)),
      'properties+badGeometry': feature('{"type":"LineString","coordinates":[[0,0]]}', `{"highway":"residential","tags":${nestedObject(depth)}}`),
      name: feature(target === 'zones' ? '{"type":"Polygon","coordinates":[[[-38.5,44.2],[-38.49,44.2],[-38.49,44.21],[-38.5,44.2]]]}' : '{"type":"Point","coordinates":[-38.5,44.2]}', `{"name":${nestedArray(depth, '"x"')},"population":10,"capacityPersons":10}`),
      attribute: feature(
        target === 'zones' ? '{"type":"Polygon","coordinates":[[[-38.5,44.2],[-38.49,44.2],[-38.49,44.21],[-38.5,44.2]]]}' : '{"type":"Point","coordinates":[-38.5,44.2]}',
        `{"name":"Deep","population":${nestedObject(depth)},"capacityPersons":${nestedArray(depth)}}`,
      ),
    }[at]!;
    return file(`nested ${depth} deep at ${at}`, `{"type":"FeatureCollection","features":[${text}]}`);
  });
}

/** A million-vertex line (or ring, or coordinate list) with one fault at its very end. */
export function millionVertexLine(target: UploadTarget, vertices = 1_000_000): fc.Arbitrary<HostileFile> {
  return fc.tuple(fc.integer({ min: 0, max: 1_000 }), fc.constantFrom('["x",44.2]', '[-38.5]', 'null', '[-38.5,144.2]')).map(([seed, fault]) => {
    const parts: string[] = new Array(vertices);
    for (let i = 0; i < vertices; i += 1) parts[i] = `[${(-38.5 + ((i * 7 + seed) % 100_000) * 1e-6).toFixed(6)},${(44.2 + ((i * 13) % 100_000) * 1e-6).toFixed(6)}]`;
    // Roads: the last vertex is not a position. Zones: the ring never closes (and ends on the
    // fault). Shelters: a Point whose coordinates are the whole list.
    parts[vertices - 1] = fault;
    const coordinates = `[${parts.join(',')}]`;
    const geometry = { roads: `{"type":"LineString","coordinates":${coordinates}}`, zones: `{"type":"Polygon","coordinates":[${coordinates}]}`, shelters: `{"type":"Point","coordinates":${coordinates}}` }[target];
    const props = target === 'roads' ? '{"highway":"primary"}' : '{"name":"Long","population":10,"capacityPersons":10}';
    return file(`${vertices}-vertex geometry`, `{"type":"FeatureCollection","features":[{"type":"Feature","properties":${props},"geometry":${geometry}}]}`);
  });
}

/** A file just over the upload limit: padding after a valid start, or junk. */
export function oversized(limitBytes: number): fc.Arbitrary<HostileFile> {
  return fc.tuple(fc.integer({ min: 1, max: 512 * 1024 }), fc.boolean()).map(([extra, padded]) => {
    const bytes = Buffer.alloc(limitBytes + extra, padded ? 0x20 : 0xa5);
    if (padded) bytes.write('{"type":"FeatureCollection","features":[');
    return file('over the upload limit', bytes);
  });
}

/** Figure-eights, lines doubling back and bow-tie rings, alongside one malformed feature. */
export function selfIntersectingWithAFault(target: 'roads' | 'zones'): fc.Arbitrary<HostileFile> {
  const crossing = fc.tuple(position, fc.double({ min: 0.0005, max: 0.005, noNaN: true }), fc.constantFrom('figure-eight', 'back-and-forth', 'spiral')).map(([[x, y], r, shape]): Position[] => {
    if (shape === 'figure-eight') return [[x - r, y - r], [x + r, y + r], [x + r, y - r], [x - r, y + r], [x - r, y - r]];
    if (shape === 'back-and-forth') return [[x, y], [x + r, y], [x + r / 2, y], [x + 2 * r, y]];
    return [[x, y], [x + r, y], [x + r, y + r], [x - r, y + r], [x - r, y - r], [x + 2 * r, y - r], [x + 2 * r, y + 2 * r]];
  });
  const feature: fc.Arbitrary<unknown> =
    target === 'roads'
      ? crossing.map((coordinates) => ({ type: 'Feature', properties: { highway: 'residential' }, geometry: { type: 'LineString', coordinates } }))
      : fc.tuple(position, fc.double({ min: 0.001, max: 0.01, noNaN: true })).map(([[x, y], d]) => ({
          type: 'Feature',
          properties: { name: 'Bow tie', population: 10 },
          geometry: { type: 'Polygon', coordinates: [[[x, y], [x + d, y + d], [x + d, y], [x, y + d], [x, y]]] },
        }));
  return fc.tuple(fc.array(feature, { minLength: 1, maxLength: 5 }), badFeature[target], fc.nat()).map(([odd, bad, at]) => {
    const features: unknown[] = [...odd];
    features.splice(at % (features.length + 1), 0, bad);
    return file('self-intersecting with a fault', toJsonText({ type: 'FeatureCollection', features }));
  });
}

/** Roads whose every line stays on one spot (and, at times, footways): nothing drivable is left. */
export function zeroLengthLines(): fc.Arbitrary<HostileFile> {
  const still = fc.tuple(position, fc.integer({ min: 2, max: 12 })).map(([p, n]) => Array.from({ length: n }, () => p));
  const feature = fc.oneof(
    fc.tuple(still, roadClass).map(([coordinates, highway]) => ({ type: 'Feature', properties: { highway }, geometry: { type: 'LineString', coordinates } })),
    fc.tuple(fc.array(still, { minLength: 1, maxLength: 3 }), roadClass).map(([coordinates, highway]) => ({ type: 'Feature', properties: { highway }, geometry: { type: 'MultiLineString', coordinates } })),
    line.map((coordinates) => ({ type: 'Feature', properties: { highway: 'footway' }, geometry: { type: 'LineString', coordinates } })),
  );
  return fc
    .array(feature, { minLength: 1, maxLength: 6 })
    .filter((features) => features.some((f) => (f.properties as { highway: string }).highway !== 'footway'))
    .map((features) => file('zero-length lines', toJsonText({ type: 'FeatureCollection', features })));
}

/** Right but unusual files: byte-order mark, gzip, elevations, repeated vertices, self-crossing, numbers as text, deep nesting where it does no harm. */
export function validButOdd(target: UploadTarget): fc.Arbitrary<HostileFile & { features: number }> {
  const odd = fc.constantFrom('plain', 'byte-order mark', 'gzip', 'elevation', 'repeated vertices', 'crossing itself', 'CRS84 declared', 'numbers as text', 'deep attribute');
  return fc.tuple(validDocument(target), odd).map(([doc, how]) => {
    const d: Record<string, unknown> & Doc = clone(doc);
    for (const f of d.features) {
      const g = geometryOf(f);
      const props = f['properties'] as Record<string, unknown>;
      if (how === 'elevation') {
        if (g.type === 'Point') g.coordinates = [...(g.coordinates as number[]), 12.5];
        else for (const [list, i] of positionSlots(g)) list[i] = [...(list[i] as number[]), 3];
      }
      if (how === 'repeated vertices' && g.type === 'LineString') g.coordinates = (g.coordinates as Position[]).flatMap((p) => [p, p]);
      if (how === 'crossing itself' && g.type !== 'Point') {
        const [x, y] = positionSlots(g).map(([list, i]) => list[i] as Position)[0]!;
        const r = 0.002;
        g.coordinates =
          g.type === 'Polygon'
            ? [[[x, y], [x + r, y + r], [x + r, y], [x, y + r], [x, y]]]
            : [[x - r, y - r], [x + r, y + r], [x + r, y - r], [x - r, y + r], [x - r, y - r]];
      }
      // Roads note an unreadable oneway in the report; zones and shelters ignore other attributes.
      if (how === 'deep attribute') props[target === 'roads' ? 'oneway' : 'notes'] = raw(`${'['.repeat(20_000)}0${']'.repeat(20_000)}`);
      if (how === 'numbers as text') {
        for (const key of ['population', 'capacityPersons']) if (typeof props[key] === 'number') props[key] = ` ${props[key]} `;
        if (target === 'shelters' && props['capacityPersons'] === null) props['capacityPersons'] = 'unbounded';
      }
    }
    if (how === 'CRS84 declared') d['crs'] = { type: 'name', properties: { name: 'urn:ogc:def:crs:OGC:1.3:CRS84' } };
    const text = Buffer.from(toJsonText(d));
    const bytes = how === 'gzip' ? gzipSync(text) : how === 'byte-order mark' ? Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), text]) : text;
    return { ...file(`valid, ${how}`, bytes), features: d.features.length };
  });
}
