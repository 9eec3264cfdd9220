// One uploaded file per request, kept in memory (imports parse it whole anyway), size-limited.
// Mounted after the route's authorisation and rate limit: it takes an upload slot
// (upload-slots.ts) only for a caller the route accepts, and gives the body a time limit to
// arrive in, so a slow sender cannot hold a slot until the server's request timeout.
import multer from 'multer';
import type { RequestHandler } from 'express';
import { BadRequestError, HttpError } from '../errors';
import { holdsNul } from './refuse-nul-text';
import { uploadLimitsOf, type UploadPool } from './upload-slots';

export function singleFileUpload(maxMegabytes: number, pool: UploadPool = 'members'): RequestHandler {
  const handler = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxMegabytes * 1024 * 1024, files: 1, fields: 10 } }).single('file');
  return (req, res, next) => {
    const limits = uploadLimitsOf(req);
    const busy = limits?.slots[pool].take(res) ?? null;
    if (busy) return next(busy);
    let settled = false;
    const timer = limits
      ? setTimeout(() => {
          if (settled) return;
          settled = true;
          // Answer now, then drop the connection: the rest of the body is not worth reading.
          res.setHeader('Connection', 'close');
          res.once('finish', () => req.socket?.destroy());
          next(new HttpError(408, 'invalid_request', `The upload did not arrive within ${Math.round(limits.readTimeoutMilliseconds / 1000)} s. Try again on a faster connection.`));
        }, limits.readTimeoutMilliseconds)
      : null;
    handler(req, res, (err: unknown) => {
      if (timer) clearTimeout(timer);
      if (settled) return;
      settled = true;
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, 'payload_too_large', `The file is larger than ${maxMegabytes} MB.`));
        return next(new BadRequestError(`The upload could not be read: ${err.message}.`));
      }
      // Anything else comes from reading the form (no boundary, cut short, a malformed part):
      // the request's fault, never the server's.
      if (err) return next(new BadRequestError(`The upload is not a readable form: ${err instanceof Error ? err.message : String(err)}.`));
      if (!req.file) return next(new BadRequestError('Attach the file in a form field named "file".', [{ path: 'file', message: 'Required.' }]));
      if (holdsNul(req.body) || req.file.originalname.includes('\u0000')) return next(new BadRequestError('Form fields and file names must not contain the NUL character (U+0000).'));
      next();
    });
  };
}

/** Optional JSON in a multipart text field, e.g. the import options. */
export function jsonField(value: unknown, field: string): unknown {
  if (value === undefined || value === '') return undefined;
  if (typeof value !== 'string') throw new BadRequestError(`The "${field}" field must be JSON text.`);
  try {
    return JSON.parse(value);
  } catch {
    throw new BadRequestError(`The "${field}" field is not valid JSON.`, [{ path: field, message: 'Not valid JSON.' }]);
  }
}
