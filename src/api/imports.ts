// Imports of road, zone and shelter files: the upload answers with a queued import at once; the
// server's worker then reads and saves the file, and this polls its phase and progress.
import { importSchema, type Import, type ImportKind } from '@shared/api/imports';
import { ApiError } from './api-error';
import { request } from './http';
import { uploadFile, type UploadProgress } from './upload';

const base = (planId: string) => `/plans/${planId}/imports`;

export const getImport = (planId: string, importId: string) => request('GET', `${base(planId)}/${importId}`, importSchema);
export const cancelImport = (planId: string, importId: string) => request('POST', `${base(planId)}/${importId}/cancel`, importSchema);

export type ImportOptions = {
  fields?: Record<string, string>;
  /** While the bytes go up. */
  onProgress?: (p: UploadProgress) => void;
  /** While the server reads and saves: its phase and share done (0 to 1). */
  onServerProgress?: (phase: string, share: number) => void;
  signal?: AbortSignal;
};

/** Uploads, then follows the import to its end; resolves when it succeeded, throws its reason otherwise. */
export async function importFile(planId: string, kind: ImportKind, file: File, options: ImportOptions = {}): Promise<Import> {
  const queued = await uploadFile(`${base(planId)}/${kind}`, file, importSchema, {
    fields: options.fields ?? {},
    onProgress: options.onProgress,
    signal: options.signal,
  });
  for (let current = queued; ; ) {
    options.onServerProgress?.(current.phase, current.progress);
    if (current.status === 'succeeded') return current;
    if (current.status === 'failed') throw new ApiError(400, 'invalid_request', current.failure?.message ?? 'The file could not be imported.', [], current.failure);
    if (current.status === 'cancelled') throw new DOMException('The import was cancelled.', 'AbortError');
    if (options.signal?.aborted) {
      await cancelImport(planId, queued.id).catch(() => undefined);
      throw new DOMException('The import was cancelled.', 'AbortError');
    }
    await new Promise((r) => setTimeout(r, 500));
    current = await getImport(planId, queued.id);
  }
}
