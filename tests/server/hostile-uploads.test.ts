// Over a thousand generated malformed uploads thrown at the road, zone and shelter endpoints:
// each must be refused with a 4xx and a readable message, never a 5xx, with no row written
// anywhere it could land (road layers, nodes, segments, zones, shelters, audit trail, the
// plans' data versions) and nothing in the app's error log.
import fc from 'fast-check';
import type { Test } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { expectReadableRefusal } from './support/readable-refusal';
import {
  badCoordinates,
  binaryJunk,
  brokenGzip,
  deepNesting,
  emptyCollection,
  jsonNotGeoJson,
  millionVertexLine,
  mixedValidAndInvalid,
  otherTextFormats,
  oversized,
  selfIntersectingWithAFault,
  truncated,
  validButOdd,
  wrongAttributeTypes,
  wrongEncodings,
  wrongEnvelopeTypes,
  wrongGeometryKind,
  zeroLengthLines,
  type HostileFile,
  type UploadTarget,
} from './support/hostile-files';
import { badOsmNumbers, brokenOsmStructure, danglingReferences, entityPayloads, malformedOsmJson, osmNotUtf8, truncatedOsm } from './support/hostile-osm';
import { hostileForms, type HostileForm } from './support/hostile-forms';

// Low enough that an oversized file stays cheap to build, high enough for a million vertices.
const LIMIT_MEGABYTES = 32;
const endpoints: Record<UploadTarget, string> = { roads: 'road-layer', zones: 'zones/upload', shelters: 'shelters/upload' };

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;
const sent: Record<UploadTarget, number> = { roads: 0, zones: 0, shelters: 0 };

beforeAll(async () => {
  ctx = await createTestContext({ UPLOAD_MAX_MEGABYTES: String(LIMIT_MEGABYTES) });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Hostile uploads' }).expect(201)).body.id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

/** Everything an upload could write, in one query. */
async function writable(): Promise<Record<string, unknown>> {
  const { rows } = await ctx.pool.query(`SELECT
    (SELECT count(*) FROM road_layers)::int AS road_layers,
    (SELECT string_agg(id::text, ',' ORDER BY id) FROM road_layers WHERE active) AS active_layers,
    (SELECT count(*) FROM road_nodes)::int AS road_nodes,
    (SELECT count(*) FROM road_segments)::int AS road_segments,
    (SELECT count(*) FROM zones)::int AS zones,
    (SELECT count(*) FROM shelters)::int AS shelters,
    (SELECT count(*) FROM audit_events)::int AS audit_events,
    (SELECT sum(data_version) FROM plans)::int AS data_versions`);
  return rows[0];
}

function send(target: UploadTarget, upload: HostileFile | HostileForm, plan = planId): Test {
  const req = planner.agent.post(`/api/plans/${plan}/${endpoints[target]}`).set('x-csrf-token', planner.csrf);
  if ('bytes' in upload) return req.attach('file', upload.bytes, upload.fileName);
  if ('body' in upload) return req.set('content-type', upload.contentType).send(upload.body);
  for (const [name, value] of upload.fields) req.field(name, value);
  for (const f of upload.files) req.attach(f.field, f.bytes, f.fileName);
  return req;
}

/** Sends one malformed upload and checks the refusal; returns the error envelope. */
async function expectRefused(target: UploadTarget, upload: HostileFile | HostileForm) {
  const before = await writable();
  const logged = ctx.errors.length;
  const res = await send(target, upload);
  sent[target] += 1;
  const error = expectReadableRefusal(res, `${target}: ${upload.kind}`);
  expect(await writable(), `${target}: ${upload.kind} wrote rows`).toEqual(before);
  expect(ctx.errors.slice(logged), `${target}: ${upload.kind} logged an error`).toEqual([]);
  expect(({} as Record<string, unknown>)['polluted'], 'Object.prototype was polluted').toBeUndefined();
  return error;
}

type Generated = fc.Arbitrary<HostileFile | HostileForm>;
const common = (target: UploadTarget): [string, Generated, number][] => [
  ['truncated files', truncated(target), 45],
  ['wrong types in the envelope', wrongEnvelopeTypes(target), 35],
  ['NaN, infinite, huge and misshapen coordinates', badCoordinates(target), 55],
  ['geometry of the wrong kind', wrongGeometryKind(target), 25],
  ['an empty FeatureCollection', emptyCollection(), 3],
  ['JSON that is not GeoJSON', jsonNotGeoJson(), 35],
  ['other text formats', otherTextFormats(target), 10],
  ['binary junk and other formats’ magic numbers', binaryJunk(), 30],
  ['broken gzip', brokenGzip(target), 20],
  ['UTF-16, UTF-32, Latin-1, stray byte-order marks, invalid UTF-8, NUL', wrongEncodings(target), 35],
  ['deeply nested JSON', deepNesting(target), 20],
  ['malformed forms around the file', hostileForms(target), 45],
];
const classes: Record<UploadTarget, [string, Generated, number][]> = {
  roads: [
    ...common('roads'),
    ['self-intersecting lines beside a malformed feature', selfIntersectingWithAFault('roads'), 20],
    ['zero-length lines only', zeroLengthLines(), 20],
    ['OpenStreetMap XML cut short', truncatedOsm(), 40],
    ['OpenStreetMap ways referencing absent nodes', danglingReferences(), 25],
    ['OpenStreetMap numbers that are not numbers', badOsmNumbers(), 35],
    ['OpenStreetMap XML of the wrong structure', brokenOsmStructure(), 25],
    ['entity-expansion and character-reference payloads', entityPayloads(), 25],
    ['OpenStreetMap JSON of the wrong shape', malformedOsmJson(), 35],
    ['OpenStreetMap XML that is not UTF-8 text', osmNotUtf8(), 15],
  ],
  zones: [
    ...common('zones'),
    ['wrong attribute types and values', wrongAttributeTypes('zones'), 60],
    ['self-intersecting rings beside a malformed zone', selfIntersectingWithAFault('zones'), 15],
  ],
  shelters: [...common('shelters'), ['wrong attribute types and values', wrongAttributeTypes('shelters'), 60]],
};

describe.each(['roads', 'zones', 'shelters'] as const)('malformed %s uploads', (target) => {
  it.each(classes[target])('%s: refused, readable, nothing written', async (_name, generated, numRuns) => {
    await fc.assert(
      fc.asyncProperty(generated, async (upload) => {
        await expectRefused(target, upload);
      }),
      { numRuns },
    );
  });

  it('valid features beside malformed ones: the file is refused and exactly the malformed ones are named', async () => {
    await fc.assert(
      fc.asyncProperty(mixedValidAndInvalid(target), async (upload) => {
        const error = await expectRefused(target, upload);
        expect(error.importFailure?.badFeatures.map((b) => b.index)).toEqual(upload.badIndices);
      }),
      { numRuns: 50 },
    );
  });

  it('million-vertex geometry with a fault at the end', { timeout: 120_000 }, async () => {
    await fc.assert(
      fc.asyncProperty(millionVertexLine(target), async (upload) => {
        expect(upload.bytes.length).toBeLessThan(LIMIT_MEGABYTES * 1024 * 1024);
        await expectRefused(target, upload);
      }),
      { numRuns: 2 },
    );
  });

  it('a file over the upload limit: 413, saying the limit', { timeout: 60_000 }, async () => {
    await fc.assert(
      fc.asyncProperty(oversized(LIMIT_MEGABYTES * 1024 * 1024), async (upload) => {
        const error = await expectRefused(target, upload);
        expect(error.code).toBe('payload_too_large');
        expect(error.message).toContain(`${LIMIT_MEGABYTES} MB`);
      }),
      { numRuns: 2 },
    );
  });
});

describe('valid but unusual uploads', () => {
  // What the malformed files are broken from is valid: taken, and stored as the response says.
  it.each(['roads', 'zones', 'shelters'] as const)('%s: taken (201), with exactly the rows reported', async (target) => {
    const plan = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: `Valid ${target}` }).expect(201)).body.id;
    await fc.assert(
      fc.asyncProperty(validButOdd(target), async (upload) => {
        const before = await writable();
        const res = await send(target, upload, plan);
        expect(res.status, `${upload.kind}: ${JSON.stringify(res.body).slice(0, 400)}`).toBe(201);
        const after = await writable();
        const grew = (key: string) => (after[key] as number) - (before[key] as number);
        if (target === 'roads') {
          expect([grew('road_layers'), grew('road_segments'), grew('road_nodes')]).toEqual([1, res.body.layer.segmentCount, res.body.layer.nodeCount]);
          expect(res.body.layer.segmentCount).toBeGreaterThan(0);
        } else expect(grew(target)).toBe(upload.features);
        expect(grew('audit_events')).toBe(1);
      }),
      { numRuns: 15 },
    );
  });
});

describe('the generated uploads', () => {
  it('were at least a thousand across the three endpoints', () => {
    console.info(`hostile uploads sent: ${JSON.stringify(sent)}`);
    expect(sent.roads + sent.zones + sent.shelters).toBeGreaterThanOrEqual(1_000);
  });
});
