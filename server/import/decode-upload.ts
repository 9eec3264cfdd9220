// Uploaded bytes → text of a known kind. Compression is recognised by its magic bytes
// (bzip2 "BZh", gzip 1f 8b), the format by the first non-blank character, never by the file
// name alone (planners rename files).
import { createRequire } from 'node:module';
import { gunzipSync } from 'node:zlib';
import { RoadImportError } from '../../shared/geo/road-import-error';

// seek-bzip is CommonJS without type declarations; this is the one function used.
const bunzip = createRequire(import.meta.url)('seek-bzip') as { decode(input: Buffer, output?: { writeByte(b: number): void; getBuffer(): Buffer }): Buffer };

export type UploadKind = 'xml' | 'json';

export interface DecodedUpload {
  kind: UploadKind;
  bytes: Uint8Array;
  compression: 'none' | 'bzip2' | 'gzip';
}

function startsWith(bytes: Uint8Array, prefix: number[]): boolean {
  return prefix.every((b, i) => bytes[i] === b);
}

// Text longer than this cannot become one JavaScript string (V8's limit is about 2^29
// characters), so no larger file could be read anyway; it also stops a decompression bomb
// (gzip and bzip2 expand a thousandfold and more) before it takes the server's memory.
export const MAX_EXPANDED_BYTES = 512 * 1024 * 1024;

class ExpandedTooLarge extends Error {}

/** An output for seek-bzip that grows as needed up to the limit, then stops the decoder. */
function boundedOutput(limit: number) {
  let buffer = Buffer.alloc(1 << 16);
  let pos = 0;
  return {
    writeByte(byte: number) {
      if (pos >= buffer.length) {
        if (buffer.length >= limit) throw new ExpandedTooLarge();
        const grown = Buffer.alloc(Math.min(limit, buffer.length * 2));
        buffer.copy(grown);
        buffer = grown;
      }
      buffer[pos++] = byte;
    },
    getBuffer: () => buffer.subarray(0, pos),
  };
}

/** Compressed uploads (bzip2, gzip) expanded within the limit; other bytes as they are. */
export function expandUpload(input: Uint8Array, fileName = 'upload', maxExpandedBytes = MAX_EXPANDED_BYTES): { bytes: Uint8Array; compression: DecodedUpload['compression'] } {
  let bytes = input;
  const compression: DecodedUpload['compression'] = startsWith(input, [0x42, 0x5a, 0x68]) ? 'bzip2' : startsWith(input, [0x1f, 0x8b]) ? 'gzip' : 'none';
  const limit = `${Math.round(maxExpandedBytes / 1024 / 1024)} MB`;
  const tooLarge = () =>
    new RoadImportError(
      'unreadableFile',
      compression === 'none'
        ? `${fileName}: the file is larger than ${limit}, more than an import can read; split the area into smaller files`
        : `${fileName}: the ${compression} file expands to more than ${limit}, more than an import can read; split the area into smaller files`,
    );
  if (input.byteLength > maxExpandedBytes) throw tooLarge();
  try {
    if (compression === 'bzip2') bytes = bunzip.decode(Buffer.from(input.buffer, input.byteOffset, input.byteLength), boundedOutput(maxExpandedBytes));
    else if (compression === 'gzip') bytes = gunzipSync(input, { maxOutputLength: maxExpandedBytes });
  } catch (error) {
    if (error instanceof ExpandedTooLarge || (error as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE') throw tooLarge();
    throw new RoadImportError('unreadableFile', `${fileName}: the ${compression} data is corrupt (${String((error as Error).message ?? error)})`);
  }
  return { bytes, compression };
}

/** Where text starts: after a UTF-8 byte-order mark and leading blanks; -1 when there is none. */
export function textStart(bytes: Uint8Array): number {
  let i = 0;
  if (startsWith(bytes, [0xef, 0xbb, 0xbf])) i = 3;
  while (i < bytes.length && (bytes[i] === 0x20 || bytes[i] === 0x0a || bytes[i] === 0x0d || bytes[i] === 0x09)) i += 1;
  return i >= bytes.length ? -1 : i;
}

/** @throws RoadImportError `unreadableFile` for empty, corrupt, oversized or unknown content. */
export function decodeUpload(input: Uint8Array, fileName = 'upload', maxExpandedBytes = MAX_EXPANDED_BYTES): DecodedUpload {
  const { bytes, compression } = expandUpload(input, fileName, maxExpandedBytes);
  let i = 0;
  // Skip a UTF-8 byte-order mark and leading blanks.
  if (startsWith(bytes, [0xef, 0xbb, 0xbf])) i = 3;
  while (i < bytes.length && (bytes[i] === 0x20 || bytes[i] === 0x0a || bytes[i] === 0x0d || bytes[i] === 0x09)) i += 1;
  if (i >= bytes.length) throw new RoadImportError('unreadableFile', `${fileName}: the file is empty`);
  if (bytes[i] === 0x3c) return { kind: 'xml', bytes: bytes.subarray(i), compression };
  if (bytes[i] === 0x7b) return { kind: 'json', bytes: bytes.subarray(i), compression };
  throw new RoadImportError(
    'unreadableFile',
    `${fileName}: not GeoJSON, OpenStreetMap XML or OpenStreetMap JSON (optionally .bz2 or .gz compressed)`,
  );
}

// A \u0000 escape: after an even number of backslashes (an odd number escapes the last one).
const NUL_ESCAPE = /(?<!\\)(?:\\\\)*\\u0000/;

/** Parses JSON bytes; @throws RoadImportError `unreadableFile` with the parser's message. */
export function parseJsonBytes(bytes: Uint8Array, fileName = 'upload'): unknown {
  let text: string;
  try {
    // Fatal: JSON is UTF-8 (RFC 8259 §8.1); a Latin-1 or UTF-16 file read as UTF-8 would garble names.
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new RoadImportError('unreadableFile', `${fileName}: the file is not UTF-8 text; save it as UTF-8 and upload it again`);
  }
  // PostgreSQL text cannot hold NUL, and no name or attribute needs one.
  if (text.includes('\\u0000') && NUL_ESCAPE.test(text)) {
    throw new RoadImportError('unreadableFile', `${fileName}: the file contains a NUL character (\\u0000), which no name or attribute may hold`);
  }
  try {
    return JSON.parse(text);
  } catch (error) {
    throw new RoadImportError('unreadableFile', `${fileName}: not valid JSON (${(error as Error).message})`);
  }
}

/** A GeoJSON upload (zones, shelters): decompressed and parsed, not yet checked. */
export function readGeoJsonUpload(input: Uint8Array, fileName = 'upload'): unknown {
  const decoded = decodeUpload(input, fileName);
  if (decoded.kind !== 'json') throw new RoadImportError('unreadableFile', `${fileName}: expected GeoJSON, found XML`);
  return parseJsonBytes(decoded.bytes, fileName);
}
