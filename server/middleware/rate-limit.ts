// The one way a route is rate-limited: counted in memory (see SECURITY.md), this process's own,
// or, among several API processes (API_PROCESSES), their primary's, so the limit holds for the
// machine; answered with the API's error envelope and the standard RateLimit headers.
import cluster from 'node:cluster';
import { ClusterMemoryStoreWorker } from '@express-rate-limit/cluster-memory-store';
import rateLimit, { type Options } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import { HttpError } from '../errors';

type LimitOptions = { name: string; windowMs: number; limit: number; message: string } & Pick<Partial<Options>, 'keyGenerator' | 'skipSuccessfulRequests'>;

export function rateLimited(options: LimitOptions): RequestHandler {
  const { message, name, ...rest } = options;
  return rateLimit({
    ...rest,
    // The name keeps each limit's counts apart in the shared store.
    // A primary too busy to answer within its second lets the request through rather than fail
    // it; the account lockout, in the database, still holds.
    ...(cluster.isWorker ? { store: new ClusterMemoryStoreWorker({ prefix: `${name}:` }), passOnStoreError: true } : {}),
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', message)),
  });
}
