// The field-mapping step's first read: what an uploaded file holds (fields, samples, counts, CRS,
// extent, the first features), read by the server in a worker thread. Nothing is saved.
import { fileSchemaSchema, type SourceReadOptions } from '@shared/api/road-import';
import { uploadFile } from './upload';

export function readFileSchema(planId: string, file: File, source: SourceReadOptions = {}, signal?: AbortSignal) {
  return uploadFile(`/plans/${planId}/file-schema`, file, fileSchemaSchema, { fields: { source: JSON.stringify(source) }, signal });
}
