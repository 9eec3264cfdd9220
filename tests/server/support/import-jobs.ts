// Files into a plan the way the product takes them: uploaded through the import route (202),
// then read and saved by the import job a worker takes (the test context needs
// `{ withRunWorker: true }`), waited for until it ends. And the job's decode step alone, run the
// way the worker thread runs it, for the suites that throw a thousand hostile files at it.
import { expect } from 'vitest';
import { importSchema, type Import, type ImportKind } from '../../../shared/api/imports';
import type { ImportFailure, ImportJobOptions } from '../../../shared/api/road-import';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { readImport, type ImportReading } from '../../../server/import/read-import';
import type { SignedInAgent } from './test-app';

export type ImportFields = { name?: string; options?: unknown };

/** Posts one file to `POST …/imports/:kind`; the request, for a test that checks its answer. */
export function postImport(member: SignedInAgent, planId: string, kind: ImportKind | string, bytes: Buffer | Uint8Array | string, fileName: string, fields: ImportFields = {}) {
  const req = member.agent.post(`/api/plans/${planId}/imports/${kind}`).set('x-csrf-token', member.csrf);
  if (fields.name !== undefined) req.field('name', fields.name);
  if (fields.options !== undefined) req.field('options', JSON.stringify(fields.options));
  return req.attach('file', typeof bytes === 'string' ? Buffer.from(bytes) : Buffer.from(bytes), fileName);
}

/** Follows an import until it has ended (succeeded, failed or cancelled). */
export async function importEnded(member: SignedInAgent, planId: string, importId: string, timeoutMs = 150_000): Promise<Import> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const job = importSchema.parse((await member.agent.get(`/api/plans/${planId}/imports/${importId}`).expect(200)).body);
    if (!['queued', 'running'].includes(job.status)) return job;
    if (Date.now() > end) throw new Error(`import ${importId} (${job.fileName}) still ${job.status} (${job.phase}) after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** Uploads a file as an import and waits for its job: the ended import (succeeded or failed, as the file deserves). */
export async function importFile(member: SignedInAgent, planId: string, kind: ImportKind, bytes: Buffer | Uint8Array | string, fileName: string, fields: ImportFields = {}): Promise<Import> {
  const res = await postImport(member, planId, kind, bytes, fileName, fields);
  expect(res.status, `${kind} ${fileName}: ${JSON.stringify(res.body).slice(0, 400)}`).toBe(202);
  return importEnded(member, planId, importSchema.parse(res.body).id);
}

/** A file that must import: the succeeded import (its failure in the message otherwise). */
export async function imported(member: SignedInAgent, planId: string, kind: ImportKind, bytes: Buffer | Uint8Array | string, fileName: string, fields: ImportFields = {}): Promise<Import> {
  const job = await importFile(member, planId, kind, bytes, fileName, fields);
  expect(job.status, `${kind} ${fileName}: ${JSON.stringify(job.failure)}`).toBe('succeeded');
  return job;
}

/** A road file that must import: the plan's active layer afterwards (the one the import saved). */
export async function importedRoadLayer(member: SignedInAgent, planId: string, bytes: Buffer | Uint8Array | string, fileName: string, fields: ImportFields = {}) {
  const job = await imported(member, planId, 'road-layer', bytes, fileName, fields);
  const layer = (await member.agent.get(`/api/plans/${planId}/road-layer`).expect(200)).body.layer;
  expect(layer?.id).toBe(job.outcome?.['layerId']);
  return layer;
}

/** A file that must be refused: the failure its import ended with. */
export async function importRefused(member: SignedInAgent, planId: string, kind: ImportKind, bytes: Buffer | Uint8Array | string, fileName: string, fields: ImportFields = {}): Promise<ImportFailure> {
  const job = await importFile(member, planId, kind, bytes, fileName, fields);
  expect(job.status, `${kind} ${fileName} was not refused: ${JSON.stringify(job.outcome)}`).toBe('failed');
  return job.failure!;
}

export type Decoded<K extends ImportKind> = { reading: ImportReading[K]; failure?: undefined } | { reading?: undefined; failure: ImportFailure };

/**
 * The import job's decode step on one file, as the worker thread runs it (the same function,
 * server/import/read-import.ts, here on the test's own thread): what it read, or the reader's
 * refusal, which is what the import's `failure` would say. Anything else the reader throws is
 * thrown on, as the job would report a crash.
 */
export async function decodeAsTheJob<K extends ImportKind>(kind: K, bytes: Uint8Array, fileName: string, options: ImportJobOptions | null = null): Promise<Decoded<K>> {
  try {
    return { reading: (await readImport({ kind, bytes, fileName, options })) as ImportReading[K] };
  } catch (e) {
    if (e instanceof RoadImportError) return { failure: e.failure };
    throw e;
  }
}
