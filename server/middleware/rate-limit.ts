// The one way a route is rate-limited: counted in this process's memory (see SECURITY.md),
// answered with the API's error envelope and the standard RateLimit headers.
import rateLimit, { type Options } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import { HttpError } from '../errors';

export function rateLimited(options: { windowMs: number; limit: number; message: string } & Pick<Partial<Options>, 'keyGenerator' | 'skipSuccessfulRequests'>): RequestHandler {
  const { message, ...rest } = options;
  return rateLimit({
    ...rest,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', message)),
  });
}
