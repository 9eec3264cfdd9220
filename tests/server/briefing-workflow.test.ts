// The briefing workflow through the API on the real database, with mail going to a real fake
// SMTP server on loopback: a planner drafts a briefing from a finished run of the demo plan,
// asks the official to sign it off, the official signs; the signed PDF is then checked by
// readers that are not ours (poppler's pdfsig and pdftotext), by the verification API, and the
// messages are read back from the SMTP server. Then every role against every step.
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { startFakeSmtpServer, type FakeSmtpServer, type ReceivedMessage } from '../../server/services/briefings/mail/fake-smtp-server';
import { sha256OfStoredContent } from '../../server/services/briefings/content-fingerprint';
import { verifyPdf } from '../../server/services/briefings/signing/verify-pdf';
import { seedOrganization } from '../../server/seed/seed-organization';
import { demoOrganization } from '../../server/seed/demo-accounts';
import { keepOutboxMessage } from '../../server/services/briefings/outbox';
import type { RunResult } from '../../shared/api/runs';
import type { BriefingDetail } from '../../shared/api/briefings';
import { briefingDetailSchema, briefingStepResponseSchema, verificationSchema } from '../../shared/api/briefings';
import { createTestContext, signIn, signInAs, type SignedInAgent, type TestContext } from './support/test-app';
import { demoPlanId, insertDemoRun, STEADY_VEHICLES_PER_HOUR } from './support/demo-run';
import { pdfSig, pdfToText, squeeze } from './briefings/support/poppler';

const BASE = 'http://cutline.test:8080';
const recipients = [
  { name: 'Ada Fenwick', email: 'ada.fenwick@veltmoor.example' },
  { name: 'Boris Lantern', email: 'boris.lantern@veltmoor.example' },
];
const extraAccounts = {
  secondOfficial: { role: 'official' as const, email: 'official2@cutline.example', displayName: 'Hale Brightwater', password: 'official2-demo-2026' },
  otherOfficial: { role: 'official' as const, email: 'official@other.example', displayName: 'Other Official', password: 'other-official-2026' },
  otherAdmin: { role: 'admin' as const, email: 'admin@other.example', displayName: 'Other Admin', password: 'other-admin-2026' },
};

type Who = 'admin' | 'planner' | 'official' | 'viewer' | 'secondOfficial' | 'otherOfficial' | 'otherAdmin' | 'signed-out';

let ctx: TestContext;
let smtp: FakeSmtpServer;
let planId: string;
let runId: string;
let result: RunResult;
const agents = new Map<Who, SignedInAgent>();
const as = (who: Who) => agents.get(who)!;

// supertest's parser type names superagent's Response; on Node it is the response stream.
function binary(res: request.Response, done: (err: Error | null, body: Buffer) => void) {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
}

async function getPdf(who: Who, id: string, query = ''): Promise<{ status: number; body: Buffer; headers: Record<string, string> }> {
  const res = await as(who).agent.get(`/api/briefings/${id}/pdf${query}`).buffer(true).parse(binary);
  return { status: res.status, body: res.body as Buffer, headers: res.headers as Record<string, string> };
}

function post(who: Who, path: string, body: object = {}) {
  const { agent, csrf } = as(who);
  return agent.post(path).set('x-csrf-token', csrf).send(body);
}

async function verify(who: Who, pdf: Buffer) {
  const { agent, csrf } = as(who);
  const res = await agent.post('/api/briefings/verify').set('x-csrf-token', csrf).attach('file', pdf, 'briefing.pdf');
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return verificationSchema.parse(res.body);
}

async function draft(title = 'Veltmoor bridges, evening order'): Promise<BriefingDetail> {
  const res = await post('planner', '/api/briefings', { runId, title, recipients });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return briefingStepResponseSchema.parse(res.body).briefing;
}

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');
const count = (n: number) => Math.round(n).toLocaleString('en-US');
const byKind = (kind: string, to: string) => (m: ReceivedMessage) =>
  m.parsed.headers.some(([k, v]) => k === 'x-cutline-mail-kind' && v === kind) && m.envelopeTo.includes(to);

beforeAll(async () => {
  smtp = await startFakeSmtpServer({ onMessage: (m) => keepOutboxMessage(ctx.db, m) });
  ctx = await createTestContext({ SMTP_URL: smtp.url, PUBLIC_BASE_URL: BASE, DEV_OUTBOX: 'on' });
  Object.assign(ctx.userIds, (await seedOrganization(ctx.db, demoOrganization, [extraAccounts.secondOfficial], 4)).userIds);
  Object.assign(ctx.userIds, (await seedOrganization(ctx.db, { name: 'Other County', slug: 'other' }, [extraAccounts.otherOfficial], 4)).userIds);
  planId = await demoPlanId(ctx.db, ctx.demoOrganizationId);
  ({ runId, result } = await insertDemoRun(ctx.db, planId, ctx.userIds['planner@cutline.example']!));
  for (const role of ['admin', 'planner', 'official', 'viewer'] as const) agents.set(role, await signInAs(ctx.app, role));
  for (const [who, a] of Object.entries(extraAccounts)) agents.set(who as Who, await signIn(ctx.app, a.email, a.password));
  const anonymous = request.agent(ctx.app);
  agents.set('signed-out', { agent: anonymous, csrf: (await anonymous.get('/api/auth/session')).body.csrfToken });
});
afterAll(async () => {
  expect(ctx?.errors).toEqual([]);
  await ctx?.drop();
  await smtp?.close();
});

describe('from draft to signed, distributed and verified', () => {
  let briefing: BriefingDetail;
  let draftPdf: Buffer;
  let signedPdf: Buffer;

  it('a planner drafts a briefing from a finished run: content, hash, draft PDF, status history and audit', async () => {
    briefing = await draft();
    expect(briefing).toMatchObject({ status: 'draft', version: 1, previousVersionId: null, planId, runId, createdByName: 'Tomas Everly', signedAt: null });
    expect(briefing.distributions.map((d) => [d.recipientEmail, d.state])).toEqual(recipients.map((r) => [r.email, 'waiting-for-signature']));
    expect(briefing.history.map((h) => [h.fromStatus, h.toStatus, h.actorName])).toEqual([[null, 'draft', 'Tomas Everly']]);

    const { rows } = await ctx.pool.query('SELECT content, content_sha256 FROM briefings WHERE id = $1', [briefing.id]);
    expect(sha256OfStoredContent(rows[0].content)).toBe(rows[0].content_sha256);
    expect(rows[0].content.result).toEqual(result);

    const pdf = await getPdf('planner', briefing.id);
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect(pdf.headers['content-disposition']).toMatch(/^inline; filename="briefing-veltmoor-river-crossings-v1-[0-9a-f]{8}-draft\.pdf"$/);
    expect(sha256(pdf.body)).toBe(briefing.files.draft!.sha256);
    draftPdf = pdf.body;
    expect(pdfSig(draftPdf)).toMatch(/does not contain any signatures/);
  });

  it('pdftotext shows the run’s headline figures, as stored, and the cautions', () => {
    const t = squeeze(pdfToText(draftPdf));
    const h = result.headline;
    // The stored result's own numbers, formatted here with Intl rather than the briefing's helpers.
    expect(h.steadyStateVehiclesPerHour).toBe(STEADY_VEHICLES_PER_HOUR);
    expect(t).toContain(`${count(h.steadyStatePersonsPerHour)} persons/h`);
    expect(t).toContain(`${count(h.steadyStateVehiclesPerHour)} veh/h once traffic is steady`);
    // The headline panels stand side by side, so pdftotext breaks their notes line by line.
    expect(t).toContain(`of ${count(h.demandPersons)} persons leaving are at a`);
    expect(t).toContain(`Vehicles arrived: ${count(h.deliveredVehicles)} of ${count(h.demandVehicles)}`);
    expect(t).toContain('Arrived within 12 h');
    expect(h.clearanceMinutes).not.toBeNull();
    // The clearance time as hours and minutes, written out here by hand.
    const c = Math.round(h.clearanceMinutes!);
    expect(t).toContain(c < 60 ? `${c} min` : `${Math.floor(c / 60)} h${c % 60 === 0 ? '' : ` ${String(c % 60).padStart(2, '0')} min`}`);
    expect(t).toContain('From the order until the last vehicle is at a');
    for (const p of [h.p50Minutes, h.p90Minutes, h.p95Minutes]) expect(t).toContain(`${count(p!)} minutes after the order`);
    for (const bridge of ['Quay Bridge', 'Market Bridge', 'Heron Bridge', 'Mill Bridge']) expect(t).toContain(bridge);
    for (const zone of result.zones) expect(t).toContain(zone.name);
    expect(t).toContain('Veltmoor river crossings');
    expect(t).toContain('Prepared by Tomas Everly, Planner');
    expect(t).toContain('Draft — not signed');
    expect(t).toContain(`Content SHA-256 ${briefing.contentSha256}`);
    // Line breaks of the page do not matter for the cautions' wording.
    const flat = t.replace(/\s+/g, ' ');
    expect(flat).toContain('Cautions and limits');
    expect(flat).toContain('A planning aid, not an order.');
    expect(flat).toContain('Results depend on how many residents leave and when');
    expect(flat).toContain('Defer to the jurisdiction’s emergency operations plan and to local emergency management codes');
    expect(flat).toContain('review and approval by a licensed traffic engineer');
  });

  it('the planner asks the official to sign it off; the official gets an e-mail with the review link', async () => {
    const res = await post('planner', `/api/briefings/${briefing.id}/sign-off-requests`, { reviewerIds: [ctx.userIds['official@cutline.example']], note: 'Bridges as discussed on Monday.' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const step = briefingStepResponseSchema.parse(res.body);
    expect(step.mail).toEqual({ sent: ['official@cutline.example'], failed: [] });
    expect(step.briefing.status).toBe('awaiting-sign-off');
    expect(step.briefing.pendingReviewers).toEqual(['Mina Ashcombe']);

    const m = await smtp.waitFor(byKind('sign-off-request', 'official@cutline.example'));
    expect(m.parsed.subject).toBe('Sign-off requested: Veltmoor river crossings');
    expect(m.parsed.text).toContain(`Review it in Cutline: ${BASE}/briefings/${briefing.id}/review`);
    expect(m.parsed.text).toContain('Their note: Bridges as discussed on Monday.');
    expect(m.parsed.attachments).toEqual([]);

    // The official's copy to review says what it is.
    const review = await getPdf('official', briefing.id);
    expect(squeeze(pdfToText(review.body))).toContain('Awaiting sign-off — not signed');
    expect(pdfToText(review.body)).toContain(`Content SHA-256 ${briefing.contentSha256}`);
  });

  it('refuses to sign for anyone else: the viewer, the planner, an official who was not asked, another organisation', async () => {
    expect((await post('viewer', `/api/briefings/${briefing.id}/sign`)).status).toBe(403);
    expect((await post('planner', `/api/briefings/${briefing.id}/sign`)).status).toBe(403);
    expect((await post('admin', `/api/briefings/${briefing.id}/sign`)).status).toBe(403);
    expect((await post('secondOfficial', `/api/briefings/${briefing.id}/sign`)).status).toBe(403);
    expect((await post('otherOfficial', `/api/briefings/${briefing.id}/sign`)).status).toBe(404);
    expect((await getPdf('viewer', briefing.id)).status).toBe(403);
    expect((await getPdf('otherOfficial', briefing.id)).status).toBe(404);
    const { rows } = await ctx.pool.query('SELECT status FROM briefings WHERE id = $1', [briefing.id]);
    expect(rows[0].status).toBe('awaiting-sign-off');
  });

  it('the official signs: a new organisation certificate, the signed PDF, the record, the distribution', async () => {
    expect(await countKeys()).toBe(0);
    const res = await post('official', `/api/briefings/${briefing.id}/sign`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const step = briefingStepResponseSchema.parse(res.body);
    briefing = step.briefing;
    expect(briefing).toMatchObject({ status: 'signed', signerName: 'Mina Ashcombe', signerRole: 'Official', canDecide: false, pendingReviewers: [] });
    expect(step.mail).toEqual({ sent: recipients.map((r) => r.email), failed: [] });
    expect(briefing.distributions.map((d) => d.state)).toEqual(['sent', 'sent']);
    expect(briefing.history.map((h) => h.toStatus)).toEqual(['draft', 'awaiting-sign-off', 'signed']);
    expect(await countKeys()).toBe(1);

    const pdf = await getPdf('official', briefing.id);
    expect(pdf.status).toBe(200);
    expect(sha256(pdf.body)).toBe(briefing.files.signed!.sha256);
    signedPdf = pdf.body;
  });

  it('pdfsig (poppler) says the signature is valid, and invalid after one byte is changed', () => {
    const out = pdfSig(signedPdf);
    expect(out).toContain('Signature Type: adbe.pkcs7.detached');
    expect(out).toContain('Total document signed');
    expect(out).toContain('Signature Validation: Signature is Valid.');
    expect(out).toContain('Signer Certificate Common Name: Veltmoor Emergency Management - briefing signing');

    const tampered = alterOneByte(signedPdf);
    const bad = pdfSig(tampered);
    expect(bad).not.toContain('Signature is Valid.');
    expect(bad).toMatch(/Signature Validation: (Signature is Invalid|Digest Mismatch)/);
  });

  it('the signed PDF names the signer, their role and time, and carries the same content hash as the draft', () => {
    const t = squeeze(pdfToText(signedPdf));
    expect(t).toContain('SIGNED OFF');
    expect(t).toContain('Mina Ashcombe, Official');
    expect(t).toMatch(/Signed on \d{1,2} \w+ 20\d\d, \d\d:\d\d UTC for Veltmoor Emergency Management\./);
    expect(t).toContain(`upload it at ${BASE}/verify`);
    expect(t).toContain(`Content SHA-256 ${briefing.contentSha256}`);
    expect(t).not.toContain('not signed');
  });

  it('the verification API says who signed it and when, and that it is unaltered; a changed copy is altered', async () => {
    const ok = await verify('viewer', signedPdf);
    expect(ok).toMatchObject({
      valid: true,
      unaltered: true,
      signed: true,
      signerName: 'Mina Ashcombe',
      signerRole: 'Official',
      signedAt: briefing.signedAt,
      organizationName: 'Veltmoor Emergency Management',
      ofYourOrganization: true,
      briefingId: briefing.id,
      version: 1,
      onRecord: 'signed-copy',
      contentMatchesRecord: true,
      title: 'Veltmoor bridges, evening order',
      planName: 'Veltmoor river crossings',
      problems: [],
    });
    expect(ok.fileSha256).toBe(briefing.files.signed!.sha256);
    expect(ok.certificate).toMatchObject({ source: 'generated', subject: expect.stringContaining('Veltmoor Emergency Management - briefing signing') });

    const altered = await verify('viewer', alterOneByte(signedPdf));
    expect(altered).toMatchObject({ valid: false, unaltered: false, onRecord: 'none' });
    expect(altered.problems.join(' ')).toMatch(/changed since it was signed/);

    const draftCheck = await verify('planner', draftPdf);
    expect(draftCheck).toMatchObject({ valid: false, unaltered: false, signed: false, onRecord: 'draft' });
    expect(draftCheck.problems).toContain('The file carries no digital signature.');
  });

  it('answers strangers too, with only what the file says; another organisation sees it is not theirs', async () => {
    const stranger = await verify('signed-out', signedPdf);
    expect(stranger).toMatchObject({ valid: true, unaltered: true, signerName: 'Mina Ashcombe', organizationName: 'Veltmoor Emergency Management', ofYourOrganization: null, title: null, planName: null });
    const other = await verify('otherAdmin', signedPdf);
    expect(other).toMatchObject({ valid: true, ofYourOrganization: false, title: null });
    const notPdf = await verify('signed-out', Buffer.from('hello, not a PDF'));
    expect(notPdf.valid).toBe(false);
    expect(notPdf.problems[0]).toMatch(/not a readable PDF/);
  });

  it('each recipient received the signed PDF attached, byte for byte, and it still verifies', async () => {
    for (const r of recipients) {
      const m = await smtp.waitFor(byKind('distribution', r.email));
      expect(m.envelopeTo).toEqual([r.email]);
      expect(m.parsed.subject).toBe('Signed briefing: Veltmoor river crossings');
      expect(m.parsed.text).toContain('Mina Ashcombe, Official, signed it on');
      expect(m.parsed.text).toContain(`upload it at ${BASE}/verify`);
      expect(m.parsed.attachments).toHaveLength(1);
      const a = m.parsed.attachments[0]!;
      expect(a.contentType).toBe('application/pdf');
      expect(a.sha256).toBe(briefing.files.signed!.sha256);
      expect(a.content.equals(signedPdf)).toBe(true);
    }
    const { rows } = await ctx.pool.query('SELECT recipient_email, message_id, error FROM briefing_distributions WHERE briefing_id = $1 ORDER BY id', [briefing.id]);
    expect(rows.map((r) => r.recipient_email)).toEqual(recipients.map((r) => r.email));
    for (const r of rows) expect([r.message_id !== null, r.error]).toEqual([true, null]);
    // The outbox kept everything: one request and two distributions for this briefing.
    const kept = await ctx.pool.query('SELECT kind, organization_id FROM mail_messages WHERE briefing_id = $1 ORDER BY id', [briefing.id]);
    expect(kept.rows.map((r) => r.kind)).toEqual(['sign-off-request', 'distribution', 'distribution']);
    expect(new Set(kept.rows.map((r) => r.organization_id))).toEqual(new Set([ctx.demoOrganizationId]));
  });

  it('a signed briefing cannot be changed: 409 for every change, and the database refuses it too', async () => {
    const { agent, csrf } = as('planner');
    expect((await agent.patch(`/api/briefings/${briefing.id}`).set('x-csrf-token', csrf).send({ title: 'Renamed' })).status).toBe(409);
    expect((await agent.delete(`/api/briefings/${briefing.id}`).set('x-csrf-token', csrf)).status).toBe(409);
    expect((await post('planner', `/api/briefings/${briefing.id}/sign-off-requests`, { reviewerIds: [ctx.userIds['official@cutline.example']] })).status).toBe(409);
    expect((await post('planner', `/api/briefings/${briefing.id}/withdraw`)).status).toBe(409);
    expect((await post('official', `/api/briefings/${briefing.id}/sign`)).status).toBe(409);
    expect((await post('official', `/api/briefings/${briefing.id}/return`, { comment: 'too late' })).status).toBe(409);
    await expect(ctx.pool.query("UPDATE briefings SET title = 'x' WHERE id = $1", [briefing.id])).rejects.toThrow(/signed and cannot be changed/);
    await expect(ctx.pool.query("UPDATE briefing_files SET sha256 = 'x' WHERE briefing_id = $1 AND kind = 'signed'", [briefing.id])).rejects.toThrow(/cannot be changed/);
    const again = await getPdf('official', briefing.id);
    expect(sha256(again.body)).toBe(briefing.files.signed!.sha256);
  });

  it('viewers download the signed copy but not its draft, and list signed briefings only', async () => {
    const signed = await getPdf('viewer', briefing.id, '?download=1');
    expect(signed.status).toBe(200);
    expect(signed.headers['content-disposition']).toMatch(/^attachment; /);
    expect(signed.body.equals(signedPdf)).toBe(true);
    expect((await getPdf('viewer', briefing.id, '?file=draft')).status).toBe(403);
    expect((await getPdf('planner', briefing.id, '?file=draft')).status).toBe(200);
    const open = await draft('An open draft');
    const list = await as('viewer').agent.get(`/api/briefings?planId=${planId}`);
    expect(list.status).toBe(200);
    const ids = (list.body.briefings as { id: string; status: string }[]).map((b) => b.id);
    expect(ids).toContain(briefing.id);
    expect(ids).not.toContain(open.id);
    const plannerList = await as('planner').agent.get('/api/briefings');
    expect((plannerList.body.briefings as { id: string }[]).map((b) => b.id)).toEqual(expect.arrayContaining([briefing.id, open.id]));
    expect((await as('otherAdmin').agent.get('/api/briefings')).body.briefings).toEqual([]);
  });

  it('a new version is a new briefing pointing back at the signed one', async () => {
    const res = await post('planner', `/api/briefings/${briefing.id}/versions`, {});
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const next = briefingStepResponseSchema.parse(res.body).briefing;
    expect(next).toMatchObject({ status: 'draft', previousVersionId: briefing.id, runId, title: briefing.title });
    expect(next.version).toBeGreaterThan(briefing.version);
    expect(next.distributions.map((d) => d.recipientEmail)).toEqual(recipients.map((r) => r.email));
    const old = briefingDetailSchema.parse((await as('planner').agent.get(`/api/briefings/${briefing.id}`)).body);
    expect(old).toMatchObject({ status: 'signed', nextVersionId: next.id });
  });

  it('every step is in the audit trail', async () => {
    const res = await as('admin').agent.get('/api/audit?limit=200');
    expect(res.status).toBe(200);
    const mine = (res.body.events as { action: string; entityId: string | null }[]).filter((e) => e.entityId === briefing.id).map((e) => e.action);
    for (const action of ['briefing.create', 'briefing.request-sign-off', 'briefing.sign-off-request-mail', 'briefing.sign', 'briefing.distribute']) expect(mine).toContain(action);
    expect((res.body.events as { action: string }[]).map((e) => e.action)).toContain('signing-key.create');
  });

  it('admins read the kept messages on the outbox, with the attachment; nobody else does', async () => {
    const res = await as('admin').agent.get('/api/briefings/outbox');
    expect(res.status).toBe(200);
    expect(res.body.enabled).toBe(true);
    const dist = (res.body.messages as { id: number; kind: string; briefingId: string; envelopeTo: string[] }[]).find((m) => m.kind === 'distribution' && m.briefingId === briefing.id)!;
    expect(dist.envelopeTo).toEqual([recipients[1]!.email]);
    const one = await as('admin').agent.get(`/api/briefings/outbox/${dist.id}`);
    expect(one.body.text).toContain('Attached is the signed evacuation capacity briefing');
    const att = await as('admin').agent.get(`/api/briefings/outbox/${dist.id}/attachments/0`).buffer(true).parse(binary);
    expect((att.body as Buffer).equals(signedPdf)).toBe(true);
    for (const who of ['planner', 'official', 'viewer'] as const) expect((await as(who).agent.get('/api/briefings/outbox')).status).toBe(403);
    expect((await as('otherAdmin').agent.get('/api/briefings/outbox')).body.messages).toEqual([]);
    expect((await as('otherAdmin').agent.get(`/api/briefings/outbox/${dist.id}`)).status).toBe(404);
  });
});

describe('returning a briefing with a comment', () => {
  it('records the comment, withdraws the other request, prints the comment on the draft, and allows asking again', async () => {
    const b = await draft('Returned one');
    const both = [ctx.userIds['official@cutline.example'], ctx.userIds['official2@cutline.example']];
    expect((await post('planner', `/api/briefings/${b.id}/sign-off-requests`, { reviewerIds: both })).status).toBe(200);
    expect((await post('official', `/api/briefings/${b.id}/return`, { comment: '' })).status).toBe(400);
    const res = await post('secondOfficial', `/api/briefings/${b.id}/return`, { comment: 'Use the winter capacity factor for Heron Bridge.' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const back = briefingStepResponseSchema.parse(res.body).briefing;
    expect(back.status).toBe('returned');
    expect(back.reviews.map((r) => [r.reviewerName, r.decision, r.comment])).toEqual(
      expect.arrayContaining([
        ['Hale Brightwater', 'returned', 'Use the winter capacity factor for Heron Bridge.'],
        ['Mina Ashcombe', 'withdrawn', null],
      ]),
    );
    expect(back.history.at(-1)).toMatchObject({ fromStatus: 'awaiting-sign-off', toStatus: 'returned', actorName: 'Hale Brightwater', comment: 'Use the winter capacity factor for Heron Bridge.' });
    expect((await post('official', `/api/briefings/${b.id}/sign`)).status).toBe(409);
    const t = squeeze(pdfToText((await getPdf('planner', b.id)).body));
    expect(t).toContain('RETURNED FOR CHANGES — NOT SIGNED');
    expect(t).toContain('Use the winter capacity factor for Heron Bridge.');

    const again = await post('planner', `/api/briefings/${b.id}/sign-off-requests`, { reviewerIds: [ctx.userIds['official@cutline.example']] });
    expect(again.status).toBe(200);
    expect(briefingStepResponseSchema.parse(again.body).briefing).toMatchObject({ status: 'awaiting-sign-off', pendingReviewers: ['Mina Ashcombe'] });
    const signed = await post('official', `/api/briefings/${b.id}/sign`);
    expect(signed.status).toBe(200);
    // The organisation's certificate was made once and is used again.
    expect(await countKeys()).toBe(1);
    expect(verifyPdf((await getPdf('official', b.id)).body, [(await ctx.pool.query('SELECT certificate_pem FROM organization_signing_keys')).rows[0].certificate_pem]).valid).toBe(true);
  });

  it('a withdrawn request goes back to draft; a draft can be edited and deleted', async () => {
    const b = await draft('Withdrawn one');
    expect((await post('planner', `/api/briefings/${b.id}/sign-off-requests`, { reviewerIds: [ctx.userIds['official@cutline.example']] })).status).toBe(200);
    const { agent, csrf } = as('planner');
    expect((await agent.delete(`/api/briefings/${b.id}`).set('x-csrf-token', csrf)).status).toBe(409);
    const w = await post('planner', `/api/briefings/${b.id}/withdraw`);
    expect(briefingStepResponseSchema.parse(w.body).briefing).toMatchObject({ status: 'draft', pendingReviewers: [] });
    const patched = await agent.patch(`/api/briefings/${b.id}`).set('x-csrf-token', csrf).send({ title: 'Renamed draft', recipients: [recipients[0]] });
    expect(patched.status).toBe(200);
    expect(briefingStepResponseSchema.parse(patched.body).briefing.distributions.map((d) => d.recipientEmail)).toEqual([recipients[0]!.email]);
    expect((await agent.delete(`/api/briefings/${b.id}`).set('x-csrf-token', csrf)).status).toBe(204);
    expect((await agent.get(`/api/briefings/${b.id}`)).status).toBe(404);
  });
});

describe('a run under a scenario', () => {
  it('names the scenario and states its changes; a scenario changed since the run is refused', async () => {
    const { rows: bridge } = await ctx.pool.query("SELECT id FROM road_segments WHERE name = 'Mill Bridge' ORDER BY id LIMIT 1");
    const { rows: zone } = await ctx.pool.query("SELECT id FROM zones WHERE plan_id = $1 AND name = 'Riverside'", [planId]);
    const overlay = {
      closures: [{ segmentId: Number(bridge[0].id), fromMinutes: 180, untilMinutes: null }],
      laneChanges: [],
      contraflow: [],
      classFactors: [{ roadClass: 'tertiary', factor: 0.8 }],
      removedShelterIds: [],
      addedShelters: [],
      departureDelays: [{ zoneId: zone[0].id, delayMinutes: 30 }],
    };
    const { rows } = await ctx.pool.query(
      "INSERT INTO scenarios (plan_id, name, description, overlay, updated_at) VALUES ($1, 'Flooded mill', 'Mill Bridge under water from hour 3', $2, now() - interval '1 minute') RETURNING id",
      [planId, JSON.stringify(overlay)],
    );
    const { runId: scenarioRun } = await insertDemoRun(ctx.db, planId, null, {}, rows[0].id);
    const res = await post('planner', '/api/briefings', { runId: scenarioRun, title: 'Flooded mill' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const t = squeeze(pdfToText((await getPdf('planner', res.body.briefing.id)).body)).replace(/\s+/g, ' ');
    expect(t).toContain('Scenario: Flooded mill');
    expect(t).toContain('scenario “Flooded mill” — closed: Mill Bridge from 3 h; capacity × 0.8 on tertiary; later departures: Riverside +30 min');

    await ctx.pool.query('UPDATE scenarios SET updated_at = now() WHERE id = $1', [rows[0].id]);
    const stale = await post('planner', '/api/briefings', { runId: scenarioRun, title: 'Flooded mill again' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/scenario “Flooded mill” changed after this analysis/);
  });
});

describe('what a briefing can be made from', () => {
  it('refuses a run that has not finished, one whose plan changed since, one of another organisation, and bad input', async () => {
    const { runId: stale } = await insertDemoRun(ctx.db, planId, null);
    await ctx.pool.query('UPDATE runs SET data_version = data_version - 1 WHERE id = $1', [stale]);
    const changed = await post('planner', '/api/briefings', { runId: stale, title: 'Stale' });
    expect(changed.status).toBe(409);
    expect(changed.body.error.message).toMatch(/changed after this analysis/);

    const { runId: running } = await insertDemoRun(ctx.db, planId, null);
    await ctx.pool.query("UPDATE runs SET status = 'running' WHERE id = $1", [running]);
    expect((await post('planner', '/api/briefings', { runId: running, title: 'Running' })).status).toBe(409);

    const otherPlanner = await signIn(ctx.app, 'planner@other.example', 'other-planner-2026');
    expect((await otherPlanner.agent.post('/api/briefings').set('x-csrf-token', otherPlanner.csrf).send({ runId, title: 'Not mine' })).status).toBe(404);

    const bad = await post('planner', '/api/briefings', { runId, title: '', recipients: [{ name: 'X', email: 'not-an-address' }] });
    expect(bad.status).toBe(400);
    expect((bad.body.error.fields as { path: string }[]).map((f) => f.path)).toEqual(expect.arrayContaining(['title', 'recipients.0.email']));
    const notOfficial = await post('planner', `/api/briefings/${(await draft('x')).id}/sign-off-requests`, { reviewerIds: [ctx.userIds['viewer@cutline.example']] });
    expect(notOfficial.status).toBe(400);
  });
});

// Every role against every briefing route, on a signed briefing and on an open draft.
type Route = { name: string; method: 'get' | 'post' | 'patch'; path: (ids: Ids) => string; body?: object; expect: Partial<Record<Who, number>> };
type Ids = { signed: string; draft: string };

const everyone = (status: number): Partial<Record<Who, number>> => ({ admin: status, planner: status, official: status, viewer: status, 'signed-out': 401 });
const routes: Route[] = [
  { name: 'list briefings', method: 'get', path: () => '/api/briefings', expect: { ...everyone(200), otherOfficial: 200 } },
  { name: 'read a signed briefing', method: 'get', path: (i) => `/api/briefings/${i.signed}`, expect: { ...everyone(200), otherOfficial: 404 } },
  { name: 'download a signed briefing', method: 'get', path: (i) => `/api/briefings/${i.signed}/pdf`, expect: { ...everyone(200), otherOfficial: 404 } },
  { name: 'read a draft', method: 'get', path: (i) => `/api/briefings/${i.draft}`, expect: { ...everyone(200), viewer: 403, otherOfficial: 404 } },
  { name: 'download a draft', method: 'get', path: (i) => `/api/briefings/${i.draft}/pdf`, expect: { ...everyone(200), viewer: 403, otherOfficial: 404 } },
  { name: 'download the draft of a signed briefing', method: 'get', path: (i) => `/api/briefings/${i.signed}/pdf?file=draft`, expect: { ...everyone(200), viewer: 403, otherOfficial: 404 } },
  { name: 'list officials to ask', method: 'get', path: () => '/api/briefings/officials', expect: { admin: 200, planner: 200, official: 403, viewer: 403, 'signed-out': 401 } },
  { name: 'rename a draft', method: 'patch', path: (i) => `/api/briefings/${i.draft}`, body: { title: 'Matrix' }, expect: { admin: 200, planner: 200, official: 403, viewer: 403, otherOfficial: 403, 'signed-out': 401 } },
  { name: 'rename a signed briefing', method: 'patch', path: (i) => `/api/briefings/${i.signed}`, body: { title: 'Matrix' }, expect: { admin: 409, planner: 409, official: 403, viewer: 403, 'signed-out': 401 } },
  { name: 'sign a draft nobody asked to sign', method: 'post', path: (i) => `/api/briefings/${i.draft}/sign`, expect: { admin: 403, planner: 403, official: 409, viewer: 403, otherOfficial: 404, 'signed-out': 401 } },
  { name: 'sign a signed briefing', method: 'post', path: (i) => `/api/briefings/${i.signed}/sign`, expect: { admin: 403, planner: 403, official: 409, viewer: 403, otherOfficial: 404, 'signed-out': 401 } },
  { name: 'return a draft', method: 'post', path: (i) => `/api/briefings/${i.draft}/return`, body: { comment: 'x' }, expect: { admin: 403, planner: 403, official: 409, viewer: 403, otherOfficial: 404, 'signed-out': 401 } },
  { name: 'read the outbox', method: 'get', path: () => '/api/briefings/outbox', expect: { admin: 200, planner: 403, official: 403, viewer: 403, otherAdmin: 200, 'signed-out': 401 } },
];

describe('role matrix', () => {
  const ids: Ids = { signed: '', draft: '' };
  beforeAll(async () => {
    const s = await draft('Matrix signed');
    await post('planner', `/api/briefings/${s.id}/sign-off-requests`, { reviewerIds: [ctx.userIds['official@cutline.example']] }).expect(200);
    await post('official', `/api/briefings/${s.id}/sign`).expect(200);
    ids.signed = s.id;
    ids.draft = (await draft('Matrix draft')).id;
  });

  describe.each(routes)('$name', (route) => {
    it.each(Object.entries(route.expect) as [Who, number][])('as %s → %i', async (who, status) => {
      const { agent, csrf } = as(who);
      let req = agent[route.method](route.path(ids));
      if (route.method !== 'get') req = req.set('x-csrf-token', csrf);
      const res = await (route.body ? req.send(route.body) : req);
      expect(res.status, JSON.stringify(res.body)).toBe(status);
      if (status >= 400) expect(res.body.error).toBeDefined();
    });
  });

  it('creating a briefing: planners and admins only', async () => {
    for (const [who, status] of [['admin', 201], ['planner', 201], ['official', 403], ['viewer', 403], ['signed-out', 401]] as const) {
      expect((await post(who, '/api/briefings', { runId, title: `By ${who}` })).status).toBe(status);
    }
  });

  it('verification: open to everyone, signed in or not', async () => {
    const pdf = (await getPdf('viewer', ids.signed)).body;
    for (const who of ['admin', 'planner', 'official', 'viewer', 'otherOfficial', 'signed-out'] as const) expect((await verify(who, pdf)).valid).toBe(true);
  });
});

describe('the organisation units and time zone', () => {
  it('give a draft its speeds in mph and its dates in the organisation zone, and the deployment zone again when cleared', async () => {
    const { agent, csrf } = as('admin');
    await agent.put('/api/settings/organization').set('x-csrf-token', csrf).send({ unitSystem: 'us-customary', timeZone: 'America/Chicago' }).expect(200);
    const us = await post('planner', '/api/briefings', { runId, title: 'In miles' });
    expect(us.status, JSON.stringify(us.body)).toBe(201);
    const t = squeeze(pdfToText((await getPdf('planner', us.body.briefing.id)).body)).replace(/\s+/g, ' ');
    // Chicago is UTC−6 in winter (IANA tz database); the zone is named with every time.
    expect(t).toMatch(/Prepared on \d{1,2} \w+ 20\d\d, \d\d:\d\d GMT-6/);
    expect(t).not.toMatch(/\d\d:\d\d UTC/);
    expect(t).toContain('Road class Lanes mph veh/h/lane Sources');
    expect(t).toContain('veh/mi per lane');

    await agent.put('/api/settings/organization').set('x-csrf-token', csrf).send({ unitSystem: 'metric', timeZone: null }).expect(200);
    const metric = await post('planner', '/api/briefings', { runId, title: 'In kilometres' });
    const m = squeeze(pdfToText((await getPdf('planner', metric.body.briefing.id)).body)).replace(/\s+/g, ' ');
    expect(m).toMatch(/Prepared on \d{1,2} \w+ 20\d\d, \d\d:\d\d UTC/);
    expect(m).toContain('Road class Lanes km/h veh/h/lane Sources');
  });
});

async function countKeys(): Promise<number> {
  return Number((await ctx.pool.query('SELECT count(*) AS n FROM organization_signing_keys WHERE organization_id = $1', [ctx.demoOrganizationId])).rows[0].n);
}

/** One byte flipped in the middle of a content stream, inside the signed range. */
function alterOneByte(pdf: Buffer): Buffer {
  const copy = Buffer.from(pdf);
  const at = copy.indexOf('stream\n', 2000) + 40;
  const firstRangeEnd = Number(/\/ByteRange \[\d+ +(\d+)/.exec(copy.toString('latin1'))![1]);
  expect(at).toBeLessThan(firstRangeEnd);
  copy[at] = copy[at]! ^ 0x01;
  return copy;
}
