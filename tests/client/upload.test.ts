// Uploads go through XMLHttpRequest for progress: the CSRF header and credentials are sent,
// progress is reported as a share, a refused file comes back as an ApiError with its bad
// features, and an answer off the contract is not passed on.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { setCsrfToken, ApiError } from '../../src/api/http';
import { uploadFile } from '../../src/api/upload';

type Listener = (e: { lengthComputable: boolean; loaded: number; total: number }) => void;

class FakeXhr {
  static last: FakeXhr;
  headers: Record<string, string> = {};
  listeners: Record<string, (() => void)[]> = {};
  uploadListeners: Record<string, Listener[]> = {};
  upload = { addEventListener: (type: string, fn: Listener) => (this.uploadListeners[type] ??= []).push(fn) };
  method = '';
  url = '';
  body: FormData | null = null;
  status = 0;
  statusText = '';
  responseText = '';
  withCredentials = false;
  aborted = false;
  constructor() {
    FakeXhr.last = this;
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(k: string, v: string) {
    this.headers[k] = v;
  }
  addEventListener(type: string, fn: () => void) {
    (this.listeners[type] ??= []).push(fn);
  }
  send(body: FormData) {
    this.body = body;
  }
  abort() {
    this.aborted = true;
    this.listeners.abort?.forEach((f) => f());
  }
  progress(loaded: number, total: number) {
    this.uploadListeners.progress?.forEach((f) => f({ lengthComputable: true, loaded, total }));
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.listeners.load?.forEach((f) => f());
  }
}

afterEach(() => vi.unstubAllGlobals());

const file = () => new File(['{"type":"FeatureCollection","features":[]}'], 'roads.geojson', { type: 'application/geo+json' });

describe('uploadFile', () => {
  it('sends the file with the CSRF header and reports progress', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    setCsrfToken('token-7');
    const shares: number[] = [];
    const promise = uploadFile('/plans/p/imports/road-layer', file(), z.object({ ok: z.boolean() }), { fields: { name: 'Roads' }, onProgress: (p) => shares.push(p.share) });
    const xhr = FakeXhr.last;
    expect(xhr.method).toBe('POST');
    expect(xhr.url).toBe('/api/plans/p/imports/road-layer');
    expect(xhr.headers['x-csrf-token']).toBe('token-7');
    expect(xhr.withCredentials).toBe(true);
    expect((xhr.body!.get('file') as File).name).toBe('roads.geojson');
    expect(xhr.body!.get('name')).toBe('Roads');
    xhr.progress(50, 200);
    xhr.progress(200, 200);
    xhr.answer(201, { ok: true });
    await expect(promise).resolves.toEqual({ ok: true });
    expect(shares).toEqual([0.25, 1]);
  });

  it('turns a refused import into an ApiError carrying the bad features', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    const promise = uploadFile('/plans/p/imports/road-layer', file(), z.object({}));
    const importFailure = { code: 'badFeatures', message: '2 features are malformed.', badFeatures: [{ index: 3, id: null, problem: 'no coordinates' }] };
    FakeXhr.last.answer(400, { error: { code: 'invalid_request', message: '2 features are malformed.', importFailure } });
    const error = (await promise.catch((e: unknown) => e)) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(400);
    expect(error.message).toBe('2 features are malformed.');
    expect(error.importFailure).toEqual(importFailure);
  });

  it('refuses an answer that breaks the contract', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    const promise = uploadFile('/x', file(), z.object({ layer: z.object({ id: z.number() }) }));
    FakeXhr.last.answer(201, { layer: 'nope' });
    await expect(promise).rejects.toThrow('does not understand');
  });

  it('aborts on request', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    const controller = new AbortController();
    const promise = uploadFile('/x', file(), z.object({}), { signal: controller.signal });
    controller.abort();
    await expect(promise).rejects.toMatchObject({ name: 'AbortError' });
    expect(FakeXhr.last.aborted).toBe(true);
  });
});
