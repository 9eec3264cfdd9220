// The one error an import throws. It carries the whole failure (every bad feature), so the
// caller can show it and save nothing.
import type { BadFeature, ImportFailure, ImportFailureCode } from '../api/road-import';

export class RoadImportError extends Error {
  readonly failure: ImportFailure;

  constructor(code: ImportFailureCode, message: string, badFeatures: BadFeature[] = []) {
    super(badFeatures.length > 0 ? `${message} (${badFeatures.length} bad feature${badFeatures.length === 1 ? '' : 's'})` : message);
    this.name = 'RoadImportError';
    this.failure = { code, message, badFeatures };
  }
}
