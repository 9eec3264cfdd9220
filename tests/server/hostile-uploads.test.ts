// Over a thousand generated malformed uploads for roads, zones and shelters. Malformed files are
// read by the import job's decode step, run the way the worker thread runs it (fast: no thread
// or queue per file): each must be refused with a readable failure, never a crash, naming exactly
// the bad features. Malformed forms around a file, and files over the limit, go to the import
// route itself: a 4xx with a readable message and nothing written. A sample of the malformed
// files goes the whole way (route, queue, worker thread) and fails with the very same failure,
// writing nothing but the import's own row; the valid files the malformed ones are broken from
// are decoded and saved by the job's two steps. Nothing may reach the app's error log.
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ImportKind } from '../../shared/api/imports';
import { accountFor, createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { expectReadableFailure, expectReadableRefusal } from './support/readable-refusal';
import { decodeAsTheJob, importEnded, postImport } from './support/import-jobs';
import { saveImport } from '../../server/services/save-import';
import { importUploadsSettled } from '../../server/services/imports';
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
const kinds: Record<UploadTarget, ImportKind> = { roads: 'road-layer', zones: 'zones', shelters: 'shelters' };

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;
const sent: Record<UploadTarget, number> = { roads: 0, zones: 0, shelters: 0 };

beforeAll(async () => {
  ctx = await createTestContext({ UPLOAD_MAX_MEGABYTES: String(LIMIT_MEGABYTES) }, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Hostile uploads' }).expect(201)).body.id;
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

/** Everything an import could write, in one query (the import's own row and its queue audit row apart). */
async function writable(): Promise<Record<string, unknown>> {
  const { rows } = await ctx.pool.query(`SELECT
    (SELECT count(*) FROM road_layers)::int AS road_layers,
    (SELECT string_agg(id::text, ',' ORDER BY id) FROM road_layers WHERE active) AS active_layers,
    (SELECT count(*) FROM road_nodes)::int AS road_nodes,
    (SELECT count(*) FROM road_segments)::int AS road_segments,
    (SELECT count(*) FROM zones)::int AS zones,
    (SELECT count(*) FROM shelters)::int AS shelters,
    (SELECT count(*) FROM audit_events WHERE action NOT LIKE 'import.%')::int AS audit_events,
    (SELECT count(*) FROM import_chunks)::int AS import_chunks,
    (SELECT sum(data_version) FROM plans)::int AS data_versions`);
  return rows[0];
}

function send(target: UploadTarget, upload: HostileFile | HostileForm, plan = planId) {
  if ('bytes' in upload) return postImport(planner, plan, kinds[target], upload.bytes, upload.fileName);
  const req = planner.agent.post(`/api/plans/${plan}/imports/${kinds[target]}`).set('x-csrf-token', planner.csrf);
  if ('body' in upload) return req.set('content-type', upload.contentType).send(upload.body);
  for (const [name, value] of upload.fields) req.field(name, value);
  for (const f of upload.files) req.attach(f.field, f.bytes, f.fileName);
  return req;
}

const noPollution = () => expect(({} as Record<string, unknown>)['polluted'], 'Object.prototype was polluted').toBeUndefined();

/** A malformed file through the job's decode step: refused, readably; returns the failure. */
async function expectDecodeRefused(target: UploadTarget, upload: HostileFile) {
  sent[target] += 1;
  const decoded = await decodeAsTheJob(kinds[target], upload.bytes, upload.fileName);
  expect(decoded.failure, `${target}: ${upload.kind} was read as valid`).toBeDefined();
  expectReadableFailure(decoded.failure, `${target}: ${upload.kind}`);
  noPollution();
  return decoded.failure!;
}

/**
 * A malformed request to the import route: a readable 4xx and nothing written. Where only the file
 * is wrong (a malformed file under an odd name), the route takes it (202): the file is then
 * refused by the decode step, and the import is cancelled so its job writes nothing either.
 */
async function expectRouteRefused(target: UploadTarget, upload: HostileFile | HostileForm) {
  const before = await writable();
  const logged = ctx.errors.length;
  const res = await send(target, upload);
  sent[target] += 1;
  let error: { code: string; message: string };
  if (res.status === 202) {
    expect('files' in upload && upload.files.length === 1 && upload.fields.length === 0, `${target}: ${upload.kind} was taken by the route`).toBe(true);
    const part = (upload as Extract<HostileForm, { files: unknown }>).files[0]!;
    const decoded = await decodeAsTheJob(kinds[target], part.bytes, res.body.fileName);
    expectReadableFailure(decoded.failure, `${target}: ${upload.kind}`);
    error = decoded.failure!;
    const cancel = await planner.agent.post(`/api/plans/${planId}/imports/${res.body.id}/cancel`).set('x-csrf-token', planner.csrf);
    // Cancelled, or (rarely) already failed in its job.
    if (cancel.status !== 200) expect((await importEnded(planner, planId, res.body.id)).status).toBe('failed');
  } else error = expectReadableRefusal(res, `${target}: ${upload.kind}`);
  // An upload the route took stores its last pieces behind its answer (the cancel drops them).
  await importUploadsSettled();
  expect(await writable(), `${target}: ${upload.kind} wrote rows`).toEqual(before);
  expect(ctx.errors.slice(logged), `${target}: ${upload.kind} logged an error`).toEqual([]);
  noPollution();
  return error;
}

/** The whole way: route, queue, the worker's thread. The import's failure, nothing written but its row. */
async function expectJobRefused(target: UploadTarget, upload: HostileFile) {
  const before = await writable();
  const logged = ctx.errors.length;
  const res = await send(target, upload);
  sent[target] += 1;
  expect(res.status, `${target}: ${upload.kind}: ${JSON.stringify(res.body).slice(0, 300)}`).toBe(202);
  const job = await importEnded(planner, planId, res.body.id);
  expect(job.status, `${target}: ${upload.kind} was imported`).toBe('failed');
  expectReadableFailure(job.failure, `${target}: ${upload.kind}`);
  expect(await writable(), `${target}: ${upload.kind} wrote rows`).toEqual(before);
  expect(ctx.errors.slice(logged), `${target}: ${upload.kind} logged an error`).toEqual([]);
  return job.failure!;
}

type Generated = fc.Arbitrary<HostileFile>;
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

describe.each(['roads', 'zones', 'shelters'] as const)('malformed %s files', (target) => {
  it.each(classes[target])('%s: refused by the decode step, readably', async (_name, generated, numRuns) => {
    await fc.assert(
      fc.asyncProperty(generated, async (upload) => {
        await expectDecodeRefused(target, upload);
      }),
      { numRuns },
    );
  });

  it('valid features beside malformed ones: the file is refused and exactly the malformed ones are named', async () => {
    await fc.assert(
      fc.asyncProperty(mixedValidAndInvalid(target), async (upload) => {
        const failure = await expectDecodeRefused(target, upload);
        expect(failure.badFeatures.map((b) => b.index)).toEqual(upload.badIndices);
      }),
      { numRuns: 50 },
    );
  });

  it('million-vertex geometry with a fault at the end', { timeout: 120_000 }, async () => {
    await fc.assert(
      fc.asyncProperty(millionVertexLine(target), async (upload) => {
        expect(upload.bytes.length).toBeLessThan(LIMIT_MEGABYTES * 1024 * 1024);
        await expectDecodeRefused(target, upload);
      }),
      { numRuns: 2 },
    );
  });

  it('malformed forms around the file: refused by the import route, nothing written', { timeout: 120_000 }, async () => {
    await fc.assert(
      fc.asyncProperty(hostileForms(target), async (upload) => {
        await expectRouteRefused(target, upload);
      }),
      { numRuns: 45 },
    );
  });

  it('a file over the upload limit: 413 from the import route, saying the limit', { timeout: 60_000 }, async () => {
    await fc.assert(
      fc.asyncProperty(oversized(LIMIT_MEGABYTES * 1024 * 1024), async (upload) => {
        const error = await expectRouteRefused(target, upload);
        expect(error.code).toBe('payload_too_large');
        expect(error.message).toContain(`${LIMIT_MEGABYTES} MB`);
      }),
      { numRuns: 2 },
    );
  });

  it('a sample the whole way (route, queue, worker thread): the import fails with exactly the decode step’s failure, nothing written', { timeout: 180_000 }, async () => {
    const sample = fc.sample(fc.oneof(truncated(target), binaryJunk(), badCoordinates(target), mixedValidAndInvalid(target)), { numRuns: 3, seed: 15 });
    for (const upload of sample) {
      const expected = await expectDecodeRefused(target, upload);
      expect(await expectJobRefused(target, upload), `${target}: ${upload.kind}`).toEqual(expected);
    }
  });
});

describe('valid but unusual files', () => {
  // What the malformed files are broken from is valid: read by the decode step and saved by the
  // job's save step, with exactly the rows its outcome reports and one audit row.
  it.each(['roads', 'zones', 'shelters'] as const)('%s: decoded and saved, with exactly the rows reported', { timeout: 180_000 }, async (target) => {
    const plan = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: `Valid ${target}` }).expect(201)).body.id;
    const actor = { userId: ctx.userIds[accountFor('planner').email]!, organizationId: ctx.demoOrganizationId };
    await fc.assert(
      fc.asyncProperty(validButOdd(target), async (upload) => {
        const before = await writable();
        const decoded = await decodeAsTheJob(kinds[target], upload.bytes, upload.fileName);
        expect(decoded.failure, `${upload.kind}: ${JSON.stringify(decoded.failure)}`).toBeUndefined();
        const outcome = await saveImport(ctx.db, actor, { kind: kinds[target], planId: plan, fileName: upload.fileName, layerName: null, options: null }, decoded.reading);
        const after = await writable();
        const grew = (key: string) => (after[key] as number) - (before[key] as number);
        if (target === 'roads') {
          expect([grew('road_layers'), grew('road_segments'), grew('road_nodes')]).toEqual([1, outcome['segments'], outcome['nodes']]);
          expect(outcome['segments']).toBeGreaterThan(0);
        } else expect([grew(target), outcome['created']]).toEqual([upload.features, upload.features]);
        expect(grew('audit_events')).toBe(1);
      }),
      { numRuns: 15 },
    );
  });

  it('a sample the whole way: imported by the job', { timeout: 180_000 }, async () => {
    const plan = (await planner.agent.post('/api/plans').set('x-csrf-token', planner.csrf).send({ name: 'Valid, whole way' }).expect(201)).body.id;
    for (const target of ['roads', 'zones', 'shelters'] as const) {
      const [upload] = fc.sample(validButOdd(target), { numRuns: 1, seed: 15 });
      const res = await send(target, upload!, plan);
      expect(res.status).toBe(202);
      const job = await importEnded(planner, plan, res.body.id);
      expect(job.status, `${target}: ${upload!.kind}: ${JSON.stringify(job.failure)}`).toBe('succeeded');
      if (target !== 'roads') expect(job.outcome!['created']).toBe(upload!.features);
    }
  });
});

describe('the generated uploads', () => {
  it('were at least a thousand across the three kinds', () => {
    console.info(`hostile uploads sent: ${JSON.stringify(sent)}`);
    expect(sent.roads + sent.zones + sent.shelters).toBeGreaterThanOrEqual(1_000);
  });
});
