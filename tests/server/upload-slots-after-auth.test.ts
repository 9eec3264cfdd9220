// Upload slots are taken after the route's authorisation and rate limit, the public signature
// check has slots of its own, and a body must arrive within UPLOAD_READ_TIMEOUT_SECONDS. Before,
// the slot was taken before authentication: four slow anonymous multipart POSTs to the public
// check made every road, zone and shelter upload answer 503 busy. (Uploads here are imports.)
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { importEnded } from './support/import-jobs';

const zones = JSON.stringify({
  type: 'FeatureCollection',
  features: [{ type: 'Feature', properties: { name: 'Slot test zone', population: 120 }, geometry: { type: 'Polygon', coordinates: [[[0, 0], [0.01, 0], [0.01, 0.01], [0, 0]]] } }],
});
const boundary = 'cutline-slow-upload';
const head = (name: string) => `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\nContent-Type: application/octet-stream\r\n\r\n`;
const tail = `\r\n--${boundary}--\r\n`;

type Slow = { answer: Promise<{ status: number; body: string }>; finish: (rest: string) => void; abort: () => void };

async function started(port: number, path: string, headers: Record<string, string>, first: string, declaredLength: number): Promise<Slow> {
  const req = http.request({ host: '127.0.0.1', port, method: 'POST', path, headers: { ...headers, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': declaredLength } });
  const answer = new Promise<{ status: number; body: string }>((resolve) => {
    req.on('response', (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (d: string) => (body += d));
      res.on('end', () => resolve({ status: res.statusCode!, body }));
      res.on('error', () => resolve({ status: res.statusCode!, body }));
    });
    req.on('error', () => resolve({ status: 0, body: '' }));
  });
  req.write(first);
  await new Promise((r) => setTimeout(r, 200));
  return { answer, finish: (rest) => req.end(rest), abort: () => req.destroy() };
}

async function anonymousSession(ctx: TestContext) {
  const res = await (await import('supertest')).default(ctx.app).get('/api/auth/session');
  const cookie = ((res.headers['set-cookie'] as unknown as string[]) ?? []).map((c) => c.split(';')[0]).join('; ');
  return { cookie, csrf: res.body.csrfToken as string };
}

describe('upload slots after authorisation', () => {
  let ctx: TestContext;
  let planner: SignedInAgent;
  let planId: string;
  let server: http.Server;
  let port: number;
  beforeAll(async () => {
    ctx = await createTestContext({ UPLOADS_AT_ONCE: '1', VERIFY_UPLOADS_AT_ONCE: '1', VERIFY_PER_MINUTE: '1000' }, { withRunWorker: true });
    planner = await signInAs(ctx.app, 'planner');
    planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
    server = ctx.app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    port = (server.address() as AddressInfo).port;
  });
  afterAll(async () => {
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
    await ctx.drop();
  });

  // A member's import, taken (202) and imported by its job.
  const plannerUpload = async () => {
    const res = await planner.agent.post(`/api/plans/${planId}/imports/zones`).set('x-csrf-token', planner.csrf).attach('file', Buffer.from(zones), 'zones.geojson');
    if (res.status === 202) expect((await importEnded(planner, planId, res.body.id)).status).toBe('succeeded');
    return res;
  };

  it('slow anonymous checks of the public verifier do not make members wait', async () => {
    const slow: Slow[] = [];
    for (let i = 0; i < 4; i++) {
      const { cookie, csrf } = await anonymousSession(ctx);
      slow.push(await started(port, '/api/briefings/verify', { cookie, 'x-csrf-token': csrf }, head('copy.pdf') + '%PDF-1.4\n', 1_000_000));
    }
    // The first holds the public slot; the others are told to come back, at once.
    const refused = await Promise.race([Promise.all(slow.slice(1).map((s) => s.answer)), new Promise<null>((r) => setTimeout(() => r(null), 10_000))]);
    expect(refused?.map((r) => r.status)).toEqual([503, 503, 503]);
    expect(JSON.parse(refused![0]!.body).error.message).toMatch(/checking 1 other files/);
    // Members' uploads have their own slot, free.
    expect((await plannerUpload()).status).toBe(202);
    for (const s of slow) s.abort();
  });

  it('a caller the route refuses never holds a slot, however slowly it sends', async () => {
    const { cookie, csrf } = await anonymousSession(ctx);
    const slow = await started(port, `/api/plans/${planId}/imports/zones`, { cookie, 'x-csrf-token': csrf }, head('zones.geojson'), 1_000_000);
    // Refused before its body is read, while its connection is still open.
    const answer = await Promise.race([slow.answer, new Promise<null>((r) => setTimeout(() => r(null), 10_000))]);
    expect(answer?.status).toBe(401);
    expect((await plannerUpload()).status).toBe(202);
    slow.abort();
  });
});

describe('the body-read time limit', () => {
  let ctx: TestContext;
  let planner: SignedInAgent;
  let planId: string;
  let server: http.Server;
  let port: number;
  beforeAll(async () => {
    ctx = await createTestContext({ UPLOADS_AT_ONCE: '1', UPLOAD_READ_TIMEOUT_SECONDS: '1' }, { withRunWorker: true });
    planner = await signInAs(ctx.app, 'planner');
    planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
    server = ctx.app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    port = (server.address() as AddressInfo).port;
  });
  afterAll(async () => {
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
    await ctx.drop();
  });

  it('answers 408 to an upload that does not arrive in time, and frees its slot', async () => {
    const cookie = (await planner.agent.get('/api/auth/session')).request.cookies as unknown as string;
    const t = performance.now();
    const slow = await started(port, `/api/plans/${planId}/imports/zones`, { cookie, 'x-csrf-token': planner.csrf }, head('zones.geojson') + zones.slice(0, 20), 1_000_000);
    const answer = await Promise.race([slow.answer, new Promise<null>((r) => setTimeout(() => r(null), 20_000))]);
    expect(answer?.status).toBe(408);
    expect(JSON.parse(answer!.body).error.message).toBe('The upload did not arrive within 1 s. Try again on a faster connection.');
    expect(performance.now() - t).toBeLessThan(15_000);
    const next = await planner.agent.post(`/api/plans/${planId}/imports/zones`).set('x-csrf-token', planner.csrf).attach('file', Buffer.from(zones), 'zones.geojson');
    expect(next.status).toBe(202);
    expect((await importEnded(planner, planId, next.body.id)).status).toBe('succeeded');
    expect(ctx.errors).toEqual([]);
  });
});
