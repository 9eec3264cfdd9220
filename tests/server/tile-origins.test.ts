// One organization's administrator must not be able to take the installation down through its
// map settings: a tile URL's origin enters the Content-Security-Policy of every response, and
// helmet refuses a policy with "," or ";" in a value (every request then fails, /healthz too).
// Hostile tile URLs are refused by the form, and any that are already stored (or come from
// TILE_URL) are left out of the policy. CSP host-source grammar: CSP Level 3, §2.3.1.
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mapSettingsSchema } from '../../shared/api/settings';
import { cspImageOrigin } from '../../server/services/tile-origin';
import { createTestContext, signInAs, type TestContext } from './support/test-app';

const hostile = [
  'https://x,y/{z}/{x}/{y}.png',
  'https://x;y/{z}/{x}/{y}.png',
  "https://x'/{z}/{x}/{y}.png",
  'https://a"b/{z}/{x}/{y}.png',
  'https://tiles.example;script-src *,y/{z}/{x}/{y}',
  'https://x%2Cy/{z}/{x}/{y}',
  'https://ti les.example/{z}/{x}/{y}',
  'https://x!y/{z}/{x}/{y}',
  'https://x$y/{z}/{x}/{y}',
  'https://x*y/{z}/{x}/{y}',
  'https://x&y/{z}/{x}/{y}',
  'javascript://x/{z}/{x}/{y}',
  'https://x(y)/{z}/{x}/{y}',
];

describe('the policy origin of a tile URL', () => {
  it('is the origin of a host-shaped URL', () => {
    expect(cspImageOrigin('https://tiles.example.org/{z}/{x}/{y}.png')).toBe('https://tiles.example.org');
    expect(cspImageOrigin('https://{s}.tiles.example.org/{z}/{x}/{y}.png')).toBe('https://a.tiles.example.org');
    expect(cspImageOrigin('http://127.0.0.1:8080/{z}/{x}/{y}')).toBe('http://127.0.0.1:8080');
    expect(cspImageOrigin('https://[::1]:8443/{z}/{x}/{y}')).toBe('https://[::1]:8443');
    expect(cspImageOrigin('')).toBeNull();
  });

  it('is left out for every hostile URL', () => {
    for (const url of hostile) expect(cspImageOrigin(url), url).toBeNull();
  });

  it('never contains a character the policy cannot carry, whatever the host', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 40 }), fc.constantFrom('http', 'https'), (host, scheme) => {
        const origin = cspImageOrigin(`${scheme}://${host}/{z}/{x}/{y}.png`);
        if (origin !== null) expect(origin).toMatch(/^https?:\/\/[a-z0-9.\-[\]:]+$/);
      }),
      { numRuns: 2000 },
    );
  });

  it('is refused in the form for every hostile URL, with a reason', () => {
    // A user name and password in the URL: harmless to the policy (the origin drops them), but no tile URL has any business carrying one.
    for (const url of [...hostile, 'https://user:pw@tiles.example/{z}/{x}/{y}']) expect(mapSettingsSchema.safeParse({ tileUrl: url, attribution: '' }).success, url).toBe(false);
    expect(mapSettingsSchema.safeParse({ tileUrl: 'https://{s}.tiles.example.org:8443/{z}/{x}/{y}.png', attribution: '' }).success).toBe(true);
  });
});

describe('with hostile tile URLs stored and in TILE_URL', () => {
  let ctx: TestContext;
  beforeAll(async () => {
    ctx = await createTestContext({ TILE_URL: 'https://env,tiles/{z}/{x}/{y}.png' });
  });
  afterAll(async () => {
    await ctx.drop();
  });

  it('the form refuses them with 400, and the installation keeps answering with its policy', async () => {
    const admin = await signInAs(ctx.app, 'admin');
    for (const url of hostile.slice(0, 4)) {
      const res = await admin.agent.put('/api/settings/map').set('x-csrf-token', admin.csrf).send({ tileUrl: url, attribution: '' });
      expect(res.status, url).toBe(400);
    }
    const good = await admin.agent.put('/api/settings/map').set('x-csrf-token', admin.csrf).send({ tileUrl: 'https://tiles.veltmoor.example/{z}/{x}/{y}.png', attribution: 'Veltmoor tiles' });
    expect(good.status).toBe(200);

    // Values written before this rule, or straight into the database: another organization's
    // hostile one next to a third's good one. The next refresh of the origins reads them all
    // (a change of settings refreshes at once; otherwise within 10 s).
    await ctx.pool.query(`INSERT INTO app_settings (organization_id, key, value) VALUES ($1, 'map', $2)`, [ctx.otherOrganizationId, JSON.stringify({ tileUrl: "https://a;b'/{z}/{x}/{y}", attribution: '' })]);
    const { rows } = await ctx.pool.query<{ id: string }>(`INSERT INTO organizations (name, slug) VALUES ('Third', 'third') RETURNING id`);
    await ctx.pool.query(`INSERT INTO app_settings (organization_id, key, value) VALUES ($1, 'map', $2)`, [rows[0]!.id, JSON.stringify({ tileUrl: 'https://tiles.third.example/{z}/{x}/{y}.png', attribution: '' })]);
    await admin.agent.put('/api/settings/map').set('x-csrf-token', admin.csrf).send({ tileUrl: 'https://{s}.tiles.veltmoor.example/{z}/{x}/{y}.png', attribution: '' }).expect(200);

    // /healthz and the API keep answering, with a policy that carries only the good origins.
    for (let i = 0; i < 3; i++) {
      const health = await request(ctx.app).get('/healthz');
      expect(health.status).toBe(200);
      const csp = health.headers['content-security-policy'] as string;
      const img = csp.split(';').map((d) => d.trim()).find((d) => d.startsWith('img-src'))!;
      const [name, ...sources] = img.split(/\s+/);
      expect(name).toBe('img-src');
      expect(sources.slice(0, 3)).toEqual(["'self'", 'data:', 'blob:']);
      for (const source of sources.slice(3)) expect(source).toMatch(/^https?:\/\/[a-z0-9.-]+$/);
      expect(img).toContain('https://tiles.third.example');
      expect(img).toContain('https://a.tiles.veltmoor.example');
      await new Promise((r) => setTimeout(r, 20));
    }
    expect((await request(ctx.app).get('/api/auth/session')).status).toBe(200);
  });
});
