// The one way the client talks to the server: JSON over fetch, the CSRF header on every change,
// responses parsed with the shared zod schemas, failures turned into ApiError.
import type { z } from 'zod';
import { errorEnvelopeSchema } from '@shared/api/errors';
import { ApiError } from './api-error';

export { ApiError };

let csrfToken = '';
export function setCsrfToken(token: string) {
  csrfToken = token;
}

type Method = 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';

/** The error envelope of a failed answer (already read as JSON, or null) as an ApiError. */
export function apiErrorFrom(status: number, statusText: string, body: unknown): ApiError {
  const parsed = errorEnvelopeSchema.safeParse(body);
  if (parsed.success) {
    const { code, message, fields, importFailure } = parsed.data.error;
    return new ApiError(status, code, message, fields, importFailure ?? null);
  }
  return new ApiError(status, 'internal', `The server answered ${status} ${statusText}.`);
}

/** The CSRF header value for changes sent outside request() (uploads through XMLHttpRequest). */
export const currentCsrfToken = () => csrfToken;

async function toApiError(response: Response): Promise<ApiError> {
  const body: unknown = await response.json().catch(() => null);
  return apiErrorFrom(response.status, response.statusText, body);
}

export async function request<S extends z.ZodType>(
  method: Method,
  path: string,
  schema: S,
  body?: unknown,
  options: { signal?: AbortSignal } = {},
): Promise<z.infer<S>> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (body !== undefined) headers['content-type'] = 'application/json';
  if (method !== 'GET') headers['x-csrf-token'] = csrfToken;
  let response: Response;
  try {
    response = await fetch(`/api${path}`, {
      method,
      headers,
      credentials: 'same-origin',
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: options.signal,
    });
  } catch (e) {
    // A caller that aborted (a stale map request) wants the abort, not a connection error.
    if (options.signal?.aborted) throw e;
    throw new ApiError(0, 'internal', 'The server cannot be reached. Check your connection.');
  }
  if (!response.ok) throw await toApiError(response);
  if (response.status === 204) return schema.parse(undefined);
  return schema.parse(await response.json());
}
