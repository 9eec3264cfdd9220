// Two set-ups the main workflow test does not cover: a configured organisation certificate
// (SIGNING_P12_PATH) instead of the generated one, and a mail server that refuses the first
// delivery — the signature stands, the failure is recorded, and the signed copy goes out on retry.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { startFakeSmtpServer, type FakeSmtpServer } from '../../server/services/briefings/mail/fake-smtp-server';
import { generateOrganizationCertificate, type OrganizationCertificate } from '../../server/services/briefings/signing/organization-certificate';
import { briefingStepResponseSchema, verificationSchema } from '../../shared/api/briefings';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { demoPlanId, insertDemoRun } from './support/demo-run';
import { pdfSig } from './briefings/support/poppler';

let ctx: TestContext;
let smtp: FakeSmtpServer;
let dir: string;
let configured: OrganizationCertificate;
let refuse = true;
let planner: SignedInAgent;
let official: SignedInAgent;

beforeAll(async () => {
  smtp = await startFakeSmtpServer({
    // Async on purpose: the server answers 451 to a rejected promise (a synchronous throw is not caught there).
    onMessage: async () => {
      if (refuse) throw new Error('mailbox busy');
    },
  });
  dir = mkdtempSync(path.join(tmpdir(), 'cutline-p12-'));
  // Stands in for a certificate from a certificate authority: what matters here is that it comes from a file.
  configured = generateOrganizationCertificate({ organizationName: 'Veltmoor Emergency Management', passphrase: 'configured-p12-pass' });
  writeFileSync(path.join(dir, 'org.p12'), configured.p12);
  ctx = await createTestContext({ SMTP_URL: smtp.url, SIGNING_P12_PATH: path.join(dir, 'org.p12'), SIGNING_P12_PASSPHRASE: configured.passphrase });
  planner = await signInAs(ctx.app, 'planner');
  official = await signInAs(ctx.app, 'official');
});
afterAll(async () => {
  expect(ctx?.errors).toEqual([]);
  await ctx?.drop();
  await smtp?.close();
  rmSync(dir, { recursive: true, force: true });
});

it('signs with the configured certificate, records a refused delivery, and sends the signed copy on retry', async () => {
  const planId = await demoPlanId(ctx.db, ctx.demoOrganizationId);
  const { runId } = await insertDemoRun(ctx.db, planId, null);
  const created = await planner.agent.post('/api/briefings').set('x-csrf-token', planner.csrf).send({ runId, title: 'Configured', recipients: [{ name: 'Ada Fenwick', email: 'ada@veltmoor.example' }] });
  expect(created.status).toBe(201);
  const id = created.body.briefing.id as string;
  const asked = await planner.agent.post(`/api/briefings/${id}/sign-off-requests`).set('x-csrf-token', planner.csrf).send({ reviewerIds: [ctx.userIds['official@cutline.example']] });
  expect(asked.status).toBe(200);
  // The request itself is recorded even though the mail server refused the message.
  expect(asked.body.briefing.status).toBe('awaiting-sign-off');
  expect(asked.body.mail.failed[0]).toMatchObject({ email: 'official@cutline.example', error: expect.stringMatching(/451/) });

  const signed = briefingStepResponseSchema.parse((await official.agent.post(`/api/briefings/${id}/sign`).set('x-csrf-token', official.csrf)).body);
  expect(signed.briefing.status).toBe('signed');
  expect(signed.mail!.failed.map((f) => f.email)).toEqual(['ada@veltmoor.example']);
  expect(signed.briefing.distributions[0]).toMatchObject({ state: 'failed', error: expect.stringMatching(/451/) });

  const { rows } = await ctx.pool.query('SELECT source, p12, fingerprint_sha256 FROM organization_signing_keys WHERE organization_id = $1', [ctx.demoOrganizationId]);
  expect(rows).toEqual([{ source: 'configured', p12: null, fingerprint_sha256: configured.fingerprintSha256 }]);

  const pdf = (await official.agent.get(`/api/briefings/${id}/pdf`).buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  })).body as Buffer;
  expect(pdfSig(pdf)).toContain('Signature Validation: Signature is Valid.');
  const check = verificationSchema.parse((await official.agent.post('/api/briefings/verify').set('x-csrf-token', official.csrf).attach('file', pdf, 'b.pdf')).body);
  expect(check).toMatchObject({ valid: true, unaltered: true, certificate: { source: 'configured', fingerprintSha256: configured.fingerprintSha256 } });

  refuse = false;
  const retried = briefingStepResponseSchema.parse((await planner.agent.post(`/api/briefings/${id}/distribute`).set('x-csrf-token', planner.csrf)).body);
  expect(retried.mail).toEqual({ sent: ['ada@veltmoor.example'], failed: [] });
  expect(retried.briefing.distributions[0]).toMatchObject({ state: 'sent', error: null });
  const m = await smtp.waitFor((x) => x.envelopeTo.includes('ada@veltmoor.example'));
  expect(m.parsed.attachments[0]!.content.equals(pdf)).toBe(true);
  // Nothing left to send: a second retry sends nothing.
  const again = briefingStepResponseSchema.parse((await planner.agent.post(`/api/briefings/${id}/distribute`).set('x-csrf-token', planner.csrf)).body);
  expect(again.mail).toEqual({ sent: [], failed: [] });
}, 120_000);
