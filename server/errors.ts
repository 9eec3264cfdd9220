// Errors a service may throw; the error handler turns each into its HTTP status and envelope.
import type { ZodError } from 'zod';
import type { ErrorCode, FieldError } from '../shared/api/errors';
import { issueMessage } from '../shared/api/issue-message';
import type { ImportFailure } from '../shared/api/road-import';

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly fields?: { path: string; message: string }[],
    readonly importFailure?: ImportFailure,
  ) {
    super(message);
  }
}

export class NotFoundError extends HttpError {
  constructor(what = 'record') {
    super(404, 'not_found', `No such ${what}.`);
  }
}

export class ForbiddenError extends HttpError {
  constructor(message = 'Your role does not allow this.') {
    super(403, 'forbidden', message);
  }
}

export class UnauthenticatedError extends HttpError {
  constructor() {
    super(401, 'unauthenticated', 'Sign in first.');
  }
}

export class ConflictError extends HttpError {
  constructor(message: string) {
    super(409, 'conflict', message);
  }
}

export class BadRequestError extends HttpError {
  constructor(message: string, fields?: { path: string; message: string }[]) {
    super(400, 'invalid_request', message, fields);
  }
}

export class ImportRefusedError extends HttpError {
  constructor(failure: ImportFailure) {
    super(400, 'invalid_request', failure.message, undefined, failure);
  }
}

/** A zod error's issues as the envelope's field errors (path joined with dots). */
export function zodFields(error: ZodError): FieldError[] {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join('.') || '(body)',
    message: issueMessage(issue),
  }));
}
