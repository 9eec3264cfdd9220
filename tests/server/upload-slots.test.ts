// Uploads read at once by one process are bounded (UPLOADS_AT_ONCE): with one slot, a second
// upload while a first is still arriving is refused at once with 503 and Retry-After, and
// nothing is written; when the first is done the slot is free again.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, countRows, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { importEnded } from './support/import-jobs';

let ctx: TestContext;
let planner: SignedInAgent;
let planId: string;
let server: http.Server;
let port: number;

const zones = JSON.stringify({
  type: 'FeatureCollection',
  features: [{ type: 'Feature', properties: { name: 'Slot test zone', population: 120 }, geometry: { type: 'Polygon', coordinates: [[[0, 0], [0.01, 0], [0.01, 0.01], [0, 0]]] } }],
});

beforeAll(async () => {
  ctx = await createTestContext({ UPLOADS_AT_ONCE: '1' }, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
  server = ctx.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('upload slots', () => {
  it('refuses a second upload while the first is still arriving, then takes the next', async () => {
    // The agent's cookie, for a raw request that sends its body slowly.
    const cookie = (await planner.agent.get('/api/auth/session')).request.cookies as unknown as string;
    const boundary = 'cutline-slot-test';
    const head = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="zones.geojson"\r\nContent-Type: application/geo+json\r\n\r\n`;
    const tail = `\r\n--${boundary}--\r\n`;
    const body = head + zones + tail;
    const slow = http.request({
      host: '127.0.0.1',
      port,
      method: 'POST',
      path: `/api/plans/${planId}/imports/zones`,
      headers: { cookie, 'x-csrf-token': planner.csrf, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': Buffer.byteLength(body) },
    });
    const slowAnswer = new Promise<{ status: number; body: string }>((resolve, reject) => {
      slow.on('response', (res) => {
        let body = '';
        res.on('data', (d: Buffer) => (body += d.toString()));
        res.on('end', () => resolve({ status: res.statusCode!, body }));
      });
      slow.on('error', reject);
    });
    slow.write(head);
    await new Promise((r) => setTimeout(r, 300));

    const zonesBefore = await countRows(ctx, 'zones');
    const importsBefore = await countRows(ctx, 'imports');
    const refused = await planner.agent.post(`/api/plans/${planId}/imports/zones`).set('x-csrf-token', planner.csrf).attach('file', Buffer.from(zones), 'zones.geojson');
    expect(refused.status).toBe(503);
    expect(refused.headers['retry-after']).toBe('30');
    expect(refused.body.error).toEqual({ code: 'busy', message: 'The server is reading 1 other uploads; try again in a minute.' });
    expect(await countRows(ctx, 'zones')).toBe(zonesBefore);
    // The refused upload left no import behind (the slow one's row is already there).
    expect(await countRows(ctx, 'imports')).toBe(importsBefore);

    slow.end(zones + tail);
    const first = await slowAnswer;
    expect(first.status).toBe(202);
    const next = await planner.agent.post(`/api/plans/${planId}/imports/zones`).set('x-csrf-token', planner.csrf).attach('file', Buffer.from(zones), 'zones.geojson');
    expect(next.status).toBe(202);
    for (const id of [JSON.parse(first.body).id as string, next.body.id as string]) expect((await importEnded(planner, planId, id)).status).toBe('succeeded');
    expect(await countRows(ctx, 'zones')).toBe(zonesBefore + 2);
  });

  it('leaves requests that are not uploads alone', async () => {
    const res = await planner.agent.patch(`/api/plans/${planId}`).set('x-csrf-token', planner.csrf).send({ description: 'not an upload' });
    expect(res.status).toBe(200);
  });
});
