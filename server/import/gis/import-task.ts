// What the import worker thread is asked to do, and what it answers.
import type { FileSchema, ImportFailure, ImportOptionsInput, ShelterUploadOptions, SourceReadOptions, ZoneUploadOptions } from '../../../shared/api/road-import';
import type { RoadGraph } from '../../../shared/geo/build-road-graph';
import type { ShelterFeature } from '../../../shared/geo/read-shelters';
import type { ZoneFeature } from '../../../shared/geo/read-zones';

export type ImportTask =
  | { kind: 'roads'; bytes: Uint8Array; options: ImportOptionsInput; fileName: string }
  | { kind: 'zones'; bytes: Uint8Array; options: ZoneUploadOptions; fileName: string }
  | { kind: 'shelters'; bytes: Uint8Array; options: ShelterUploadOptions; fileName: string }
  | { kind: 'schema'; bytes: Uint8Array; options: SourceReadOptions; fileName: string };

export interface ImportResults {
  roads: RoadGraph;
  zones: ZoneFeature[];
  shelters: ShelterFeature[];
  schema: FileSchema;
}

export type ImportWorkerMessage = { type: 'done'; result: unknown } | { type: 'refused'; failure: ImportFailure } | { type: 'error'; message: string };
