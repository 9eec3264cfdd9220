// One uploaded file per request, handed on while it arrives and never held whole: the route's
// service stores it piece by piece (an import's bytes go to PostgreSQL as they come off the
// socket), so a large file neither waits in memory nor ties up the event loop, and the request
// answers as soon as the last piece is stored. Same bounds as upload.ts: an upload slot taken after
// the route's authorisation, a size limit, a time for the body to arrive in, NUL refused in
// fields and file names. A fault of the body found after the route has started (too large, cut
// short, late, malformed) is thrown from `pieces` or `fields()`, so the service's transaction rolls
// back and nothing is written.
import busboy from 'busboy';
import type { Readable } from 'node:stream';
import type { RequestHandler, Response } from 'express';
import { BadRequestError, HttpError } from '../errors';
import { holdsNul } from './refuse-nul-text';
import { uploadLimitsOf, type UploadPool } from './upload-slots';

/** About 1 MB a piece: one database row each (measured: 1 MB rows store a 19 MB file in ~0.1 s, one 19 MB row in 0.4–0.9 s). */
export const PIECE_BYTES = 1 << 20;

export type StreamedUpload = {
  fileName: string;
  /** The form's text fields that came before the file. */
  fieldsBefore: Record<string, string>;
  /** The file's bytes in pieces of about PIECE_BYTES, as they arrive; throws the request's fault. */
  pieces: AsyncIterable<Buffer>;
  /** Every text field of the form, once the whole body has been read; throws the request's fault. */
  fields: () => Promise<Record<string, string>>;
};

export function streamedUploadOf(res: Response): StreamedUpload {
  const upload = (res.locals as { upload?: StreamedUpload }).upload;
  if (!upload) throw new Error('streamedFileUpload() must be mounted before this route');
  return upload;
}

const notReadable = (message: string) => new BadRequestError(`The upload is not a readable form: ${message}.`);
const nulInForm = () => new BadRequestError('Form fields and file names must not contain the NUL character (U+0000).');

/** `fieldNames`: the text fields the route takes beside the file; any other, or one twice, is refused. */
export function streamedFileUpload(maxMegabytes: number, fieldNames: readonly string[], pool: UploadPool = 'members'): RequestHandler {
  const maxBytes = maxMegabytes * 1024 * 1024;
  return (req, res, next) => {
    const limits = uploadLimitsOf(req);
    const busy = limits?.slots[pool].take(res) ?? null;
    if (busy) return next(busy);
    let form: busboy.Busboy;
    try {
      form = busboy({ headers: req.headers, defParamCharset: 'latin1', limits: { fileSize: maxBytes, files: 1, fields: 10, fieldSize: 1024 * 1024 } });
    } catch (e) {
      return next(notReadable(e instanceof Error ? e.message : String(e)));
    }
    const fields: Record<string, string> = Object.create(null) as Record<string, string>;
    let file: Readable | null = null;
    let started = false;
    let failure: HttpError | null = null;
    let finished = false;
    let settleFields: { resolve: (f: Record<string, string>) => void; reject: (e: Error) => void } | null = null;
    const fieldsDone = new Promise<Record<string, string>>((resolve, reject) => (settleFields = { resolve, reject }));
    fieldsDone.catch(() => undefined);

    // The body is not worth reading any further: answer (through the route or here), then close.
    const fail = (error: HttpError, dropConnection = false) => {
      if (failure || finished) return;
      failure = error;
      if (timer) clearTimeout(timer);
      req.unpipe(form);
      if (!res.headersSent) res.setHeader('Connection', 'close');
      if (dropConnection) res.once('finish', () => req.socket?.destroy());
      else req.resume();
      file?.destroy(error);
      settleFields!.reject(error);
      if (!started) {
        started = true;
        next(error);
      }
    };
    const timer = limits
      ? setTimeout(
          () => fail(new HttpError(408, 'invalid_request', `The upload did not arrive within ${Math.round(limits.readTimeoutMilliseconds / 1000)} s. Try again on a faster connection.`), true),
          limits.readTimeoutMilliseconds,
        )
      : null;

    form.on('field', (name, value, info) => {
      if (holdsNul(name) || holdsNul(value)) return fail(nulInForm());
      if (info.nameTruncated || info.valueTruncated) return fail(new BadRequestError('The upload could not be read: Field value too long.'));
      if (!fieldNames.includes(name)) return fail(new BadRequestError(`The form has a field "${name.slice(0, 60)}" this upload does not take${fieldNames.length ? ` (it takes ${fieldNames.map((f) => `"${f}"`).join(', ')} and "file")` : ' (only "file")'}.`));
      if (name in fields) return fail(new BadRequestError(`The form has the field "${name}" twice.`));
      fields[name] = value;
    });
    form.on('fieldsLimit', () => fail(new BadRequestError('The upload could not be read: Too many fields.')));
    form.on('partsLimit', () => fail(new BadRequestError('The upload could not be read: Too many parts.')));
    form.on('filesLimit', () => fail(new BadRequestError('The upload could not be read: Too many files.')));
    form.on('file', (name, stream, info) => {
      if (failure) return void stream.resume();
      if (name !== 'file' || file) {
        stream.resume();
        return fail(new BadRequestError(`The upload could not be read: Unexpected field "${name}". Attach the file in a form field named "file".`));
      }
      if (holdsNul(info.filename ?? '')) {
        stream.resume();
        return fail(nulInForm());
      }
      file = stream;
      // The fault reaches the route through `pieces`; once the route has read the whole file, a
      // fault found later (a second file, too many fields) must not be thrown as an uncaught error.
      stream.on('error', () => undefined);
      stream.on('limit', () => fail(new HttpError(413, 'payload_too_large', `The file is larger than ${maxMegabytes} MB.`)));
      res.locals.upload = {
        fileName: info.filename ?? 'upload',
        fieldsBefore: { ...fields },
        pieces: piecesOf(stream, () => failure),
        fields: () => fieldsDone,
      } satisfies StreamedUpload;
      started = true;
      next();
    });
    form.on('close', () => {
      if (failure) return;
      if (!file) return fail(new BadRequestError('Attach the file in a form field named "file".', [{ path: 'file', message: 'Required.' }]));
      finished = true;
      if (timer) clearTimeout(timer);
      settleFields!.resolve(fields);
    });
    // Anything else comes from reading the form (no boundary, cut short, a malformed part): the
    // request's fault, never the server's.
    form.on('error', (e: unknown) => fail(notReadable(e instanceof Error ? e.message : String(e))));
    req.on('aborted', () => fail(notReadable('the connection closed before the end of the body'), true));
    req.on('close', () => {
      if (!finished && !req.complete) fail(notReadable('the connection closed before the end of the body'), true);
    });
    // Answered before the body was all read (the route refused something first): drain the rest
    // unread, so the connection is not left stalled on a file nobody consumes.
    res.once('finish', () => {
      if (finished || failure) return;
      // Answered: the body's time limit no longer matters (its timer would answer a second time).
      if (timer) clearTimeout(timer);
      req.unpipe(form);
      file?.resume();
      req.resume();
    });
    req.pipe(form);
  };
}

async function* piecesOf(stream: Readable, failure: () => HttpError | null): AsyncGenerator<Buffer> {
  let held: Buffer[] = [];
  let size = 0;
  try {
    for await (const chunk of stream as AsyncIterable<Buffer>) {
      held.push(chunk);
      size += chunk.length;
      if (size >= PIECE_BYTES) {
        yield Buffer.concat(held, size);
        held = [];
        size = 0;
      }
    }
  } catch (e) {
    // The form broke inside the file (cut short, a malformed part): the request's fault, never
    // the server's, whichever of the file and the form reports it first.
    throw failure() ?? notReadable(e instanceof Error ? e.message : String(e));
  }
  // A file cut at the size limit ends like a whole one: only the flag tells.
  const fault = failure() ?? ((stream as Readable & { truncated?: boolean }).truncated ? new HttpError(413, 'payload_too_large', 'The file is too large.') : null);
  if (fault) throw fault;
  if (size > 0) yield Buffer.concat(held, size);
}

