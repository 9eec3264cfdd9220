// The SHA-256 printed in a briefing's footer.
//
// A file cannot carry the hash of its own bytes, so the footer carries the hash of the briefing's
// *content*: the canonical JSON (keys sorted, no whitespace, UTF-8) of what the figures say —
// briefing id and version, organisation, plan, scenario, preparer, creation time, the run, its
// result, the assumptions and the map geometry. Status, sign-off, return comment, time zone and
// page size are left out on purpose: the draft an official reviewed and the copy they signed carry
// the same content hash, so anyone can see that the signed figures are the reviewed ones.
//
// The SHA-256 of the PDF file itself is a different number. It is recorded in the database when a
// file is stored and shown by the verification page, which can also recompute the content hash
// from the stored content and compare it with the one read back from the file's metadata.
import { createHash } from 'node:crypto';
import { BRIEFING_CONTENT_FORMAT, type StoredBriefingContent } from '../../db/schema/briefing-content';
import type { BriefingInput } from './briefing-input';

export type { StoredBriefingContent };
export const CONTENT_FORMAT = BRIEFING_CONTENT_FORMAT;

export type BriefingContent = {
  format: typeof CONTENT_FORMAT;
} & Pick<
  BriefingInput,
  'briefingId' | 'version' | 'organizationName' | 'planName' | 'scenarioName' | 'createdAt' | 'preparedBy' | 'run' | 'result' | 'assumptions' | 'map'
>;

export function briefingContent(input: BriefingInput): BriefingContent {
  const { briefingId, version, organizationName, planName, scenarioName, createdAt, preparedBy, run, result, assumptions, map } = input;
  return { format: CONTENT_FORMAT, briefingId, version, organizationName, planName, scenarioName, createdAt, preparedBy, run, result, assumptions, map };
}

/**
 * JSON with object keys in code-point order at every level and no whitespace; `undefined`
 * members are dropped and Dates become ISO strings, as JSON.stringify does. Non-finite numbers
 * have no JSON form and are refused rather than silently turned into null.
 */
export function canonicalJson(value: unknown): string {
  if (value === null) return 'null';
  if (value instanceof Date) return JSON.stringify(value.toISOString());
  switch (typeof value) {
    case 'number':
      if (!Number.isFinite(value)) throw new Error(`canonicalJson: ${value} has no JSON form`);
      return JSON.stringify(value);
    case 'string':
    case 'boolean':
      return JSON.stringify(value);
    case 'object': {
      if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
      const entries = Object.entries(value as Record<string, unknown>)
        .filter(([, v]) => v !== undefined)
        .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
      return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
    }
    default:
      throw new Error(`canonicalJson: cannot encode a ${typeof value}`);
  }
}

export function sha256Hex(data: string | Uint8Array): string {
  return createHash('sha256').update(data).digest('hex');
}

/** The content hash of a briefing (hex, 64 characters). */
export function contentSha256(input: BriefingInput): string {
  return sha256Hex(canonicalJson(briefingContent(input)));
}

export function storedBriefingContent(input: BriefingInput): StoredBriefingContent {
  return JSON.parse(canonicalJson(briefingContent(input))) as StoredBriefingContent;
}

/** Equals contentSha256(input) for storedBriefingContent(input): key order and Dates do not matter. */
export function sha256OfStoredContent(stored: StoredBriefingContent): string {
  return sha256Hex(canonicalJson(stored));
}
