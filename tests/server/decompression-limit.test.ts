// Compressed uploads are expanded with a ceiling: a decompression bomb (a few kilobytes that
// expand a thousandfold, as zeros do under gzip and bzip2; common practice) is refused with a
// readable reason instead of taking the server's memory. The real ceiling is 512 MB; these
// checks use a 1 MB one so they stay small.
import { execFileSync } from 'node:child_process';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { decodeUpload, MAX_EXPANDED_BYTES } from '../../server/import/decode-upload';
import { RoadImportError } from '../../shared/geo/road-import-error';

const limit = 1024 * 1024;
// Valid GeoJSON padded with blanks to 4 MB: a legitimate-looking file over the ceiling.
const bomb = Buffer.concat([Buffer.from('{"type":"FeatureCollection","features":[]'), Buffer.alloc(4 * limit, 0x20), Buffer.from('}')]);
const bzip2 = (bytes: Buffer) => execFileSync('bzip2', ['-c', '-9'], { input: bytes, maxBuffer: 64 * limit });

function refusal(run: () => unknown): RoadImportError {
  try {
    run();
  } catch (e) {
    if (e instanceof RoadImportError) return e;
    throw e;
  }
  throw new Error('not refused');
}

describe('decompression ceiling', () => {
  it('is 512 MB, past which no file could become one string anyway', () => {
    expect(MAX_EXPANDED_BYTES).toBe(512 * 1024 * 1024);
  });

  it.each([
    ['gzip', gzipSync(bomb)],
    ['bzip2', bzip2(bomb)],
  ])('refuses a %s file that expands past it, with the reason', (kind, packed) => {
    expect(packed.byteLength).toBeLessThan(limit / 10);
    const e = refusal(() => decodeUpload(packed, 'bomb.geojson.gz', limit));
    expect(e.message).toBe(`bomb.geojson.gz: the ${kind} file expands to more than 1 MB, more than an import can read; split the area into smaller files`);
  });

  it.each([
    ['gzip', (b: Buffer) => gzipSync(b)],
    ['bzip2', bzip2],
  ])('still reads a %s file under it', (_kind, pack) => {
    const small = bomb.subarray(0, limit / 2);
    const text = Buffer.concat([small, Buffer.from('}')]);
    const decoded = decodeUpload(pack(text), 'ok.geojson', limit);
    expect(decoded.kind).toBe('json');
    expect(decoded.bytes.byteLength).toBe(text.byteLength);
  });

  it('refuses a plain file over it', () => {
    expect(refusal(() => decodeUpload(bomb, 'big.geojson', limit)).message).toMatch(/^big\.geojson: the file is larger than 1 MB/);
  });
});
