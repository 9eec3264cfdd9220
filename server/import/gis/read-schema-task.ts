// The task of the file-schema threads (read-schema-in-worker.ts): one uploaded file in, what it
// holds out (fields, samples, CRS, extent, first features), or the reader's refusal. Untrusted
// parsers (zip, SQLite, XML, protocol buffers) run here, never on the API's event loop.
import type { FileSchema, ImportFailure, SourceReadOptions } from '../../../shared/api/road-import';
import { RoadImportError } from '../../../shared/geo/road-import-error';
import { readFileSchema } from './read-file-schema';

export type SchemaTask = { bytes: Uint8Array; options: SourceReadOptions; fileName: string };
export type SchemaAnswer = { type: 'done'; schema: FileSchema } | { type: 'refused'; failure: ImportFailure };

export default async function readSchemaTask({ bytes, options, fileName }: SchemaTask): Promise<SchemaAnswer> {
  try {
    return { type: 'done', schema: await readFileSchema(bytes, options, fileName) };
  } catch (e) {
    if (e instanceof RoadImportError) return { type: 'refused', failure: e.failure };
    throw e;
  }
}
