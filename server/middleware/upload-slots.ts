// Bounds the uploads one process reads and imports at once: each file is held in memory whole
// (and expanded, if compressed), so without a bound a handful of large uploads at the same
// moment could take the process's memory. A request beyond the bound is refused at once with
// 503 and Retry-After, before its body is read; its slot comes back when the answer is sent or
// the connection closes.
import type { RequestHandler } from 'express';
import { HttpError } from '../errors';

export function uploadSlots(max: number): RequestHandler {
  let inUse = 0;
  return (req, res, next) => {
    if (req.method !== 'POST' || !req.is('multipart/form-data')) return next();
    if (inUse >= max) {
      res.setHeader('Retry-After', '30');
      return next(new HttpError(503, 'busy', `The server is reading ${max} other uploads; try again in a minute.`));
    }
    inUse += 1;
    let released = false;
    const release = () => {
      if (!released) {
        released = true;
        inUse -= 1;
      }
    };
    res.on('finish', release);
    res.on('close', release);
    next();
  };
}
