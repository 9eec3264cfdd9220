// What every refusal of bad input must look like: a 4xx in the shared error envelope, with a
// message a planner can read (no stack trace, no JavaScript leaking through as "undefined" or
// "[object Object]", not pages long) and the same for each bad feature of a refused upload.
import { expect } from 'vitest';
import type { Response } from 'supertest';
import { errorEnvelopeSchema } from '../../../shared/api/errors';

const MAX_MESSAGE_CHARS = 2_000;
const LEAKS = /\bundefined\b|\[object \w+\]|^\s+at |\bat [\w.<>]+ \(|node:internal|\.ts:\d+/m;

export function expectReadable(text: unknown, what: string): void {
  expect(typeof text, what).toBe('string');
  const s = text as string;
  expect(s.trim().length, `${what} is empty`).toBeGreaterThan(0);
  expect(s.length, `${what} is ${s.length} characters long: ${s.slice(0, 200)}…`).toBeLessThanOrEqual(MAX_MESSAGE_CHARS);
  expect(s, what).not.toMatch(LEAKS);
}

/** A 4xx (never a 5xx) whose envelope and messages are readable; returns the envelope. */
export function expectReadableRefusal(res: Response, context: string) {
  const where = `${context} → ${res.status} ${JSON.stringify(res.body)?.slice(0, 600)}`;
  expect(res.status, where).toBeGreaterThanOrEqual(400);
  expect(res.status, where).toBeLessThan(500);
  const envelope = errorEnvelopeSchema.safeParse(res.body);
  expect(envelope.success, `${where}: not the error envelope`).toBe(true);
  const error = envelope.data!.error;
  expectReadable(error.message, `${where}: message`);
  for (const field of error.fields ?? []) expectReadable(field.message, `${where}: field ${field.path}`);
  if (error.importFailure) {
    expectReadable(error.importFailure.message, `${where}: import failure`);
    for (const bad of error.importFailure.badFeatures) expectReadable(bad.problem, `${where}: bad feature ${bad.index}`);
  }
  return error;
}

/** An import's failure (what its job ended with) is as readable as a refusal's envelope. */
export function expectReadableFailure(failure: { message: string; badFeatures: { index: number; problem: string }[] } | null | undefined, context: string): void {
  expect(failure, `${context}: no failure`).toBeTruthy();
  expectReadable(failure!.message, `${context}: import failure`);
  for (const bad of failure!.badFeatures) expectReadable(bad.problem, `${context}: bad feature ${bad.index}`);
}
