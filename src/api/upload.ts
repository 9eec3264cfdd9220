// Multipart uploads through XMLHttpRequest, because fetch reports no upload progress. Same CSRF
// header and the same error parsing as http.ts; the answer is checked against a shared schema.
import type { z } from 'zod';
import { ApiError, apiErrorFrom, currentCsrfToken } from './http';

export type UploadProgress = { loadedBytes: number; totalBytes: number; share: number };

export type UploadOptions = {
  /** Extra text fields sent with the file (e.g. `name`, `options` as JSON text). */
  fields?: Record<string, string>;
  onProgress?: (progress: UploadProgress) => void;
  signal?: AbortSignal;
};

export function uploadFile<S extends z.ZodType>(path: string, file: File, schema: S, options: UploadOptions = {}): Promise<z.infer<S>> {
  const form = new FormData();
  for (const [key, value] of Object.entries(options.fields ?? {})) form.append(key, value);
  form.append('file', file, file.name);

  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api${path}`);
    xhr.setRequestHeader('accept', 'application/json');
    xhr.setRequestHeader('x-csrf-token', currentCsrfToken());
    xhr.withCredentials = true;
    xhr.upload.addEventListener('progress', (event) => {
      if (!event.lengthComputable || !options.onProgress) return;
      options.onProgress({ loadedBytes: event.loaded, totalBytes: event.total, share: event.total > 0 ? event.loaded / event.total : 0 });
    });
    xhr.addEventListener('load', () => {
      let body: unknown = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        body = null;
      }
      if (xhr.status < 200 || xhr.status >= 300) {
        reject(apiErrorFrom(xhr.status, xhr.statusText, body));
        return;
      }
      const parsed = schema.safeParse(body);
      if (parsed.success) resolve(parsed.data);
      else reject(new ApiError(xhr.status, 'internal', 'The server answered in a shape this page does not understand.'));
    });
    xhr.addEventListener('error', () => reject(new ApiError(0, 'internal', 'The server cannot be reached. Check your connection.')));
    xhr.addEventListener('abort', () => reject(new DOMException('The upload was cancelled.', 'AbortError')));
    options.signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(form);
  });
}
