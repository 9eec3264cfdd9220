// What a failed request throws: the status, the envelope's code, message and field errors.
// Views and components may import this file (to read a 409 or a field error); it calls nothing.
import type { ErrorCode, FieldError } from '@shared/api/errors';
import type { ImportFailure } from '@shared/api/road-import';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly fields: FieldError[] = [],
    // A refused upload names every bad feature, so the planner can fix the file.
    readonly importFailure: ImportFailure | null = null,
  ) {
    super(message);
  }
}
