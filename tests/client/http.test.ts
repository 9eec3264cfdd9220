// The client's one door to the server: CSRF header on changes, error envelopes to ApiError,
// responses checked against the shared schemas.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, request, setCsrfToken } from '../../src/api/http';

afterEach(() => vi.unstubAllGlobals());

function stubFetch(status: number, body: unknown) {
  const fetchMock = vi.fn(async () => new Response(body === undefined ? null : JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } }));
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}

describe('request', () => {
  it('sends the CSRF token on changes and not on reads', async () => {
    setCsrfToken('token-1');
    const fetchMock = stubFetch(200, { ok: true });
    await request('POST', '/plans', z.object({ ok: z.boolean() }), { name: 'x' });
    await request('GET', '/plans', z.object({ ok: z.boolean() }));
    const [, post] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    const [, get] = fetchMock.mock.calls[1] as unknown as [string, RequestInit];
    expect((post.headers as Record<string, string>)['x-csrf-token']).toBe('token-1');
    expect((get.headers as Record<string, string>)['x-csrf-token']).toBeUndefined();
  });

  it('turns the error envelope into an ApiError with its fields', async () => {
    stubFetch(400, { error: { code: 'invalid_request', message: 'Invalid input', fields: [{ path: 'name', message: 'Give the plan a name.' }] } });
    const error = await request('POST', '/plans', z.object({}), {}).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).status).toBe(400);
    expect((error as ApiError).fields).toEqual([{ path: 'name', message: 'Give the plan a name.' }]);
  });

  it('reports a response that breaks the contract instead of passing it on', async () => {
    stubFetch(200, { plans: 'not a list' });
    await expect(request('GET', '/plans', z.object({ plans: z.array(z.string()) }))).rejects.toThrow();
  });

  it('explains an unreachable server', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => { throw new TypeError('network'); }));
    await expect(request('GET', '/plans', z.object({}))).rejects.toThrow('cannot be reached');
  });
});
