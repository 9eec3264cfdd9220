// Answers that many people ask for unchanged (a finished run with its result; a plan's map, road
// layer summary and road table pages at one data version) kept ready in this process as bytes,
// plain and gzip-compressed.
// The key must name everything the answer depends on; the caller reads that from the database
// first (a small query), so a change made by any process is a new key, never a stale answer.
// Concurrent requests for a key being built share the one build.
import { createHash } from 'node:crypto';
import { promisify } from 'node:util';
import { gzip } from 'node:zlib';
import type { Request, Response } from 'express';
import { LRUCache } from 'lru-cache';

const gzipAsync = promisify(gzip);

type ReadyAnswer = { plain: Buffer; gzipped: Buffer; etag: string };

export type AnswerCache = ReturnType<typeof createAnswerCache>;

export function createAnswerCache(maxMegabytes: number) {
  const maxSize = Math.max(1, maxMegabytes * 1024 * 1024);
  const ready = new LRUCache<string, ReadyAnswer>({ maxSize, sizeCalculation: (a) => a.plain.length + a.gzipped.length + 1 });
  const building = new Map<string, Promise<ReadyAnswer>>();

  async function prepare(content: string | Buffer): Promise<ReadyAnswer> {
    const plain = typeof content === 'string' ? Buffer.from(content) : content;
    // zlib runs on libuv's thread pool, off the request thread.
    const gzipped = await gzipAsync(plain, { level: 6 });
    return { plain, gzipped, etag: createHash('sha1').update(plain).digest('base64url') };
  }

  function answer(key: string, build: () => Promise<string | Buffer>): Promise<ReadyAnswer> {
    const hit = ready.get(key);
    if (hit) return Promise.resolve(hit);
    let pending = building.get(key);
    if (!pending) {
      pending = build()
        .then(prepare)
        .then((a) => {
          if (maxMegabytes > 0) ready.set(key, a);
          return a;
        })
        .finally(() => building.delete(key));
      building.set(key, pending);
    }
    return pending;
  }

  /** Sends the JSON answer for `key`, building it with `build` when this process has none ready. */
  async function sendJson(req: Request, res: Response, key: string, build: () => Promise<string>): Promise<void> {
    await send(req, res, 'json', await answer(key, build));
  }

  /** The same for bytes of another type (a map tile). */
  async function sendBytes(req: Request, res: Response, key: string, type: string, build: () => Promise<Buffer>): Promise<void> {
    await send(req, res, type, await answer(key, build));
  }

  async function send(req: Request, res: Response, type: string, a: ReadyAnswer): Promise<void> {
    // No Accept-Encoding header: plain, as common practice (and curl) expect.
    const gzipped = req.headers['accept-encoding'] !== undefined && req.acceptsEncodings('gzip') === 'gzip';
    res.vary('Accept-Encoding');
    res.type(type);
    // One tag per representation, so a cache never serves the compressed bytes as plain.
    res.setHeader('ETag', `"${a.etag}${gzipped ? '-gz' : ''}"`);
    if (gzipped) res.setHeader('Content-Encoding', 'gzip');
    res.send(gzipped ? a.gzipped : a.plain);
  }

  return { sendJson, sendBytes };
}
