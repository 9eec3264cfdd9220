// The one error handler, mounted last (Express recognises it by its four parameters).
// It maps known errors to the shared envelope and never sends a stack trace.
import type { ErrorRequestHandler } from 'express';
import { ZodError } from 'zod';
import type { ErrorEnvelope, FieldError } from '../../shared/api/errors';
import { HttpError, zodFields } from '../errors';

function envelope(
  code: ErrorEnvelope['error']['code'],
  message: string,
  fields?: FieldError[],
  importFailure?: ErrorEnvelope['error']['importFailure'],
): ErrorEnvelope {
  return { error: { code, message, ...(fields ? { fields } : {}), ...(importFailure ? { importFailure } : {}) } };
}

type BodyParserError = { type?: string; status?: number; code?: string };

export function errorHandler(log: (err: unknown) => void): ErrorRequestHandler {
  return (err, _req, res, _next) => {
    if (err instanceof ZodError) {
      const fields = zodFields(err);
      res.status(400).json(envelope('invalid_request', `Invalid input: ${fields.map((f) => `${f.path}: ${f.message}`).join('; ')}`, fields));
      return;
    }
    if (err instanceof HttpError) {
      res.status(err.status).json(envelope(err.code, err.message, err.fields, err.importFailure));
      return;
    }
    const parserError = err as BodyParserError;
    if (parserError.type === 'entity.parse.failed') {
      res.status(400).json(envelope('invalid_request', 'The request body is not valid JSON.'));
      return;
    }
    if (parserError.type === 'entity.too.large' || parserError.code === 'LIMIT_FILE_SIZE') {
      res.status(413).json(envelope('payload_too_large', 'The request is larger than this server accepts.'));
      return;
    }
    if (parserError.code === 'EBADCSRFTOKEN') {
      res.status(403).json(envelope('csrf', 'The form expired or came from elsewhere: reload the page and try again.'));
      return;
    }
    if (typeof parserError.status === 'number' && parserError.status >= 400 && parserError.status < 500) {
      res.status(parserError.status).json(envelope('invalid_request', 'The request could not be read.'));
      return;
    }
    log(err);
    res.status(500).json(envelope('internal', 'Something went wrong on the server. The error was logged.'));
  };
}
