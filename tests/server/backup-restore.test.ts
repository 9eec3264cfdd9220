// Backup and restore with the docker-free scripts (pg_dump / pg_restore): back up, wipe, restore,
// and every plan, run and signed briefing is there, the signature still verifying (pdfsig).
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import pg from 'pg';
import { startFakeSmtpServer, type FakeSmtpServer } from '../../server/services/briefings/mail/fake-smtp-server';
import { defaultRunParameters } from '../../shared/api/runs';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { pdfSig } from './briefings/support/poppler';

const root = path.resolve(import.meta.dirname, '../..');
let ctx: TestContext;
let smtp: FakeSmtpServer;
let planner: SignedInAgent;
let official: SignedInAgent;

function script(name: string, ...args: string[]): string {
  const port = new URL(ctx.url).port;
  return execFileSync('bash', [path.join(root, 'docker-free-scripts', name), ...args], { env: { ...process.env, CUTLINE_PG_PORT: port }, encoding: 'utf8' });
}

async function snapshot(url: string) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const q = async (sql: string) => (await client.query(sql)).rows;
    return {
      plans: await q('SELECT id, name, data_version FROM plans ORDER BY id'),
      runs: await q("SELECT id, status, input_hash, result->'headline' AS headline FROM runs ORDER BY id"),
      segments: (await q('SELECT count(*)::int AS n FROM road_segments'))[0].n,
      signed: await q("SELECT b.id, f.sha256, f.pdf FROM briefings b JOIN briefing_files f ON f.briefing_id = b.id AND f.kind = 'signed' ORDER BY b.id"),
    };
  } finally {
    await client.end();
  }
}

beforeAll(async () => {
  smtp = await startFakeSmtpServer({});
  ctx = await createTestContext({ SMTP_URL: smtp.url, DEV_OUTBOX: 'on' }, { withRunWorker: true });
  planner = await signInAs(ctx.app, 'planner');
  official = await signInAs(ctx.app, 'official');
});
afterAll(async () => {
  await ctx?.drop();
  await smtp?.close();
});

it('backs up, wipes, restores: plans, runs and signed briefings intact, signatures valid', async () => {
  const planId = (await planner.agent.get('/api/plans').expect(200)).body.plans[0].id;
  const started = await planner.agent.post(`/api/plans/${planId}/runs`).set('x-csrf-token', planner.csrf).send({ parameters: { ...defaultRunParameters, horizonMinutes: 120, timeStepSeconds: 120 } }).expect(202);
  for (let i = 0; i < 300; i++) {
    const r = await planner.agent.get(`/api/plans/${planId}/runs/${started.body.id}`).expect(200);
    if (r.body.status === 'succeeded') break;
    expect(['queued', 'running']).toContain(r.body.status);
    await new Promise((res) => setTimeout(res, 200));
  }
  const draft = await planner.agent.post('/api/briefings').set('x-csrf-token', planner.csrf).send({ runId: started.body.id, title: 'Backup check', recipients: [] }).expect(201);
  const briefingId = draft.body.briefing.id;
  await planner.agent.post(`/api/briefings/${briefingId}/sign-off-requests`).set('x-csrf-token', planner.csrf).send({ reviewerIds: [ctx.userIds['official@cutline.example']] }).expect(200);
  await official.agent.post(`/api/briefings/${briefingId}/sign`).set('x-csrf-token', official.csrf).expect(200);

  const before = await snapshot(ctx.url);
  expect(before.signed).toHaveLength(1);
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'cutline-backup-')), 'db.dump');
  script('backup.sh', ctx.name, file);
  expect(fs.statSync(file).size).toBeGreaterThan(1000);

  // Wipe: the database is dropped and created empty, then restored from the file.
  script('restore.sh', file, ctx.name);
  const after = await snapshot(ctx.url);
  expect(after.plans).toEqual(before.plans);
  expect(after.runs).toEqual(before.runs);
  expect(after.segments).toBe(before.segments);
  expect(after.signed.map((s) => s.sha256)).toEqual(before.signed.map((s) => s.sha256));
  expect(pdfSig(after.signed[0].pdf)).toMatch(/Signature is Valid/);
}, 120_000);

it('leaves the database intact when the backup is truncated, corrupt or not a backup at all', async () => {
  const before = await snapshot(ctx.url);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'cutline-backup-'));
  const good = path.join(dir, 'good.dump');
  script('backup.sh', ctx.name, good);
  const bytes = fs.readFileSync(good);
  const bad: Record<string, Buffer> = {
    // The table of contents is whole but the data stops halfway: only restoring finds out.
    'truncated.dump': bytes.subarray(0, Math.floor(bytes.length * 0.6)),
    'header-only.dump': bytes.subarray(0, 64),
    'garbage.dump': Buffer.from('this is not a backup\n'.repeat(100)),
    // Bytes overwritten in the middle of the compressed data.
    'corrupt.dump': Buffer.concat([bytes.subarray(0, Math.floor(bytes.length / 2)), Buffer.alloc(4096, 0x5a), bytes.subarray(Math.floor(bytes.length / 2) + 4096)]),
  };
  for (const [name, content] of Object.entries(bad)) {
    const file = path.join(dir, name);
    fs.writeFileSync(file, content);
    let failed = false;
    try {
      script('restore.sh', file, ctx.name);
    } catch (err) {
      failed = true;
      expect((err as { stderr?: string }).stderr ?? '', name).toMatch(/unchanged/);
    }
    expect(failed, name).toBe(true);
    const after = await snapshot(ctx.url);
    expect(after.plans, name).toEqual(before.plans);
    expect(after.runs, name).toEqual(before.runs);
    expect(after.segments, name).toBe(before.segments);
    expect(after.signed.map((s) => s.sha256), name).toEqual(before.signed.map((s) => s.sha256));
  }
  // No scratch database is left behind, and the good backup still restores.
  const admin = new pg.Client({ connectionString: new URL('/postgres', ctx.url).toString() });
  await admin.connect();
  try {
    const left = await admin.query(`SELECT datname FROM pg_database WHERE datname LIKE $1`, [`${ctx.name.slice(0, 40)}_re%`]);
    expect(left.rows).toEqual([]);
  } finally {
    await admin.end();
  }
  script('restore.sh', good, ctx.name);
  expect((await snapshot(ctx.url)).plans).toEqual(before.plans);
}, 180_000);
