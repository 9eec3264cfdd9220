// PostgreSQL text and jsonb cannot hold NUL (U+0000), and no name, title or note needs one, so
// a JSON body or a query carrying one is refused here, before a route stores it (a 500 else).
// Upload forms are checked the same way once read (./upload.ts).
import type { RequestHandler } from 'express';
import { BadRequestError } from '../errors';

/** Walks the value with a stack, not recursion: a body may be nested far deeper than the call stack. */
export function holdsNul(value: unknown): boolean {
  const pending = [value];
  while (pending.length > 0) {
    const v = pending.pop();
    if (typeof v === 'string') {
      if (v.includes('\u0000')) return true;
    } else if (v !== null && typeof v === 'object') {
      for (const [key, inner] of Object.entries(v)) {
        if (key.includes('\u0000')) return true;
        pending.push(inner);
      }
    }
  }
  return false;
}

export const refuseNulText: RequestHandler = (req, _res, next) => {
  if (holdsNul(req.body) || holdsNul(req.query)) return next(new BadRequestError('Text must not contain the NUL character (U+0000).'));
  next();
};
