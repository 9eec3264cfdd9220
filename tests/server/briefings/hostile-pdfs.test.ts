// The PDF reader behind the public signature check, fed hostile files (tests/server/support/
// hostile-pdfs.ts): every one answers "not valid" with a reason, never throws, and the reader's
// work is bounded by the file's size. The worker thread around it (verify-in-worker.ts) stops a
// check that outlasts its time or heap budget, and the event loop answers meanwhile.
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { signBriefing } from '../../../server/services/briefings/sign-briefing';
import { generateOrganizationCertificate, type OrganizationCertificate } from '../../../server/services/briefings/signing/organization-certificate';
import { verifyPdf } from '../../../server/services/briefings/signing/verify-pdf';
import { openPdf, readObject, PdfTooComplexError, workBudgetFor } from '../../../server/services/briefings/signing/pdf-objects';
import { verifyInWorker, type VerifierBudget } from '../../../server/services/briefings/signing/verify-in-worker';
import { damagedCopies, hostilePdfs, pdfWithObjects } from '../support/hostile-pdfs';
import { briefingInput, signer } from '../../fixtures/briefing/demo-town-briefing';
import { createTestContext, type TestContext } from '../support/test-app';

let org: OrganizationCertificate;
let signed: Buffer;
beforeAll(async () => {
  const issuedAt = new Date('2026-12-02T14:00:00Z');
  org = generateOrganizationCertificate({ organizationName: 'Demo Emergency Management Office', passphrase: 'demo signing passphrase', now: issuedAt });
  signed = (await signBriefing(briefingInput(), signer, org, new Date('2026-12-02T14:05:33Z'))).pdf;
}, 60_000);

describe('the PDF reader on hostile files', () => {
  // Before the bounds, a table declaring 2e9 entries looped 2e9 times, a field listing itself
  // as a kid 64 times branched 64-fold per level, and objects nested in each other's strings
  // were each read to the end of the file.
  it.each(hostilePdfs.map((arb, i) => [i, arb] as const))('generator %i: not valid, with a reason, within 2 s', (_i, arb) => {
    fc.assert(
      fc.property(arb, (h) => {
        const t = performance.now();
        const v = verifyPdf(h.bytes, [org.certificatePem]);
        const ms = performance.now() - t;
        expect(v.valid).toBe(false);
        expect(v.problems.length).toBeGreaterThan(0);
        expect(ms).toBeLessThan(2000);
      }),
      { numRuns: 12 },
    );
  });

  it('keeps the signed briefing valid, and damaged copies of it readable', () => {
    expect(verifyPdf(signed, [org.certificatePem]).valid).toBe(true);
    fc.assert(
      fc.property(damagedCopies(signed), (h) => {
        const v = verifyPdf(h.bytes, [org.certificatePem]);
        // A byte changed in the zero padding after the signature value leaves the signature
        // intact (the bytes are then not the copy on record: verification.test checks that part).
        if (!/overwritten/.test(h.kind)) expect(v.valid).toBe(false);
        if (!v.valid) expect(v.problems.length).toBeGreaterThan(0);
      }),
      { numRuns: 40 },
    );
  });

  it('spends at most twice the file size (and a little) on parsing, however the objects overlap', () => {
    // 3,000 objects each nested in the previous one's string: read one by one, each would be
    // read to the end of the file (about 4.5 million bytes of work for a 100 kB file).
    let text = '%PDF-1.4\n';
    const offsets: number[] = [];
    for (let i = 1; i <= 3000; i++) {
      offsets.push(text.length);
      text += `\n${i} 0 obj (`;
    }
    text += `${')'.repeat(3000)}\ntrailer\n<< >>\n%%EOF\n`;
    const buf = Buffer.from(text, 'latin1');
    const doc = openPdf(buf);
    expect(doc.via).toBe('scan');
    expect(doc.budget.left).toBeLessThanOrEqual(workBudgetFor(buf).left);
    let read = 0;
    expect(() => {
      for (const num of doc.offsets.keys()) {
        readObject(doc, num);
        read++;
      }
    }).toThrow(PdfTooComplexError);
    expect(read).toBeLessThan(3000);
    expect(doc.budget.left).toBeLessThan(0);
  });

  it('answers a malformed Info object with "not valid", not an exception', () => {
    const bytes = Buffer.from(pdfWithObjects(['<< /Title (never closed', '<< /Type /Catalog >>'], '<< /Info 1 0 R /Root 2 0 R >>'), 'latin1');
    const v = verifyPdf(bytes, []);
    expect(v.valid).toBe(false);
    expect(v.problems).toContain('The file does not identify itself as a Cutline briefing.');
  });
});

describe('the verifier thread', () => {
  const budget: VerifierBudget = { timeMilliseconds: 300, memoryMegabytes: 64, threads: 1, queue: 4 };
  let ctx: TestContext;
  beforeAll(async () => {
    ctx = await createTestContext();
  });
  afterAll(async () => {
    await ctx.drop();
  });

  it('verifies in the thread as in-process', async () => {
    const v = await verifyInWorker(signed, [org.certificatePem], budget);
    expect(v.valid).toBe(true);
    expect(v.signingTime).toBeInstanceOf(Date);
    expect((await verifyInWorker(Buffer.from('%PDF-1.4 nothing'), [], budget)).valid).toBe(false);
  }, 30_000);

  it('stops a check that outlasts its time budget with a readable 422, /healthz answering meanwhile', async () => {
    const endless = new URL('./support/endless-verify-task.mjs', import.meta.url);
    const started = performance.now();
    const check = verifyInWorker(Buffer.from('%PDF-1.4'), [], budget, endless).then(
      () => null,
      (err: { status?: number; message: string }) => err,
    );
    // The event loop is free: health checks answer while the check spins in its thread.
    for (let i = 0; i < 3; i++) await request(ctx.app).get('/healthz').expect(200);
    const err = await check;
    expect(err?.status).toBe(422);
    expect(err?.message).toMatch(/took longer to check than allowed/);
    expect(performance.now() - started).toBeLessThan(budget.timeMilliseconds + 15_000);
    // The stopped thread is replaced: the next check of the pool is answered.
    const again = await verifyInWorker(Buffer.from('%PDF-1.4'), [], budget, endless).catch((e: { status?: number }) => e);
    expect((again as { status?: number }).status).toBe(422);
  }, 60_000);

  it('stops a check that outgrows its heap budget with a readable 422', async () => {
    const greedy = new URL('./support/greedy-verify-task.mjs', import.meta.url);
    const err = await verifyInWorker(Buffer.from('%PDF-1.4'), [], { ...budget, timeMilliseconds: 30_000, memoryMegabytes: 32 }, greedy).catch((e: { status?: number; message: string }) => e);
    expect((err as { status?: number }).status).toBe(422);
    expect((err as Error).message).toMatch(/more memory/);
  }, 60_000);
});
