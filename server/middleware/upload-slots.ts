// Bounds the uploads one process reads at once: each file is held in memory whole (and
// expanded, if compressed), so without a bound a handful of large uploads at the same moment
// could take the process's memory. A slot is taken by the upload middleware itself
// (upload.ts), that is after the route's authorisation and rate limit: a caller the route
// refuses never holds one. The public signature check has slots of its own, so anonymous
// callers cannot keep members' uploads waiting. A request beyond the bound is refused at once
// with 503 and Retry-After, before its body is read; its slot comes back when the answer is
// sent or the connection closes.
import type { Request, Response } from 'express';
import { HttpError } from '../errors';

export type UploadPool = 'members' | 'public';

export type UploadSlots = { take(res: Response): HttpError | null };

export function createUploadSlots(max: number, describe: (max: number) => string): UploadSlots {
  let inUse = 0;
  return {
    take(res) {
      if (inUse >= max) {
        res.setHeader('Retry-After', '30');
        return new HttpError(503, 'busy', describe(max));
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
      return null;
    },
  };
}

/** What createApp puts in app.locals for the upload middleware. */
export type UploadLimits = { slots: Record<UploadPool, UploadSlots>; readTimeoutMilliseconds: number };

export function uploadLimits(membersAtOnce: number, publicAtOnce: number, readTimeoutSeconds: number): UploadLimits {
  return {
    slots: {
      members: createUploadSlots(membersAtOnce, (max) => `The server is reading ${max} other uploads; try again in a minute.`),
      public: createUploadSlots(publicAtOnce, (max) => `The server is checking ${max} other files; try again in a minute.`),
    },
    readTimeoutMilliseconds: readTimeoutSeconds * 1000,
  };
}

export function uploadLimitsOf(req: Request): UploadLimits | undefined {
  return (req.app.locals as { uploadLimits?: UploadLimits }).uploadLimits;
}
