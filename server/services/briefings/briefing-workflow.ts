// Briefings, the workflow: a planner drafts one from a finished run (the content is frozen and
// rendered to a draft PDF), asks officials to sign it off (each gets an e-mail with a link to
// the review page); an official signs it (the organisation's certificate, the signer's name,
// role and time on the page, an embedded PDF signature) or returns it with a comment. Every
// step writes its status change and audit row in the same transaction as the change. Once
// signed a briefing never changes (the database refuses it too); a new version is a new
// briefing pointing back at the previous one. The signed copy is then mailed to the
// briefing's recipients and each delivery is recorded.
import { randomUUID } from 'node:crypto';
import { and, eq, inArray, max, ne, sql } from 'drizzle-orm';
import type { Config } from '../../config';
import { limitPlusOne, type Page } from '../../../shared/api/pagination';
import type { Database, Tx } from '../../db/client';
import { briefingDistributions, briefingFiles, briefingReviews, briefingStatusChanges, briefings, memberships, users } from '../../db/schema';
import type { BriefingCreate, BriefingStepResponse, BriefingUpdate, BriefingVersionCreate, MailReport, Official, Recipient, SignOffRequest } from '../../../shared/api/briefings';
import { roleLabels } from '../../../shared/api/roles';
import type { BriefingReturn, BriefingSignature, BriefingStatus } from './briefing-input';
import { storedBriefingContent, type StoredBriefingContent } from './content-fingerprint';
import { renderBriefing } from './render-briefing';
import { warmRenderer } from './render-in-worker';
import { signBriefing as signBriefingPdf } from './sign-briefing';
import { attachmentName, type Mailer } from './mail/mailer';
import { verifyPdf } from './signing/verify-pdf';
import { BadRequestError, ConflictError, ForbiddenError, HttpError, NotFoundError } from '../../errors';
import { recordAudit } from '../audit';
import { distributeSignedCopy, mailerFor, sendSignOffRequests, type BriefingRef } from './briefing-mail';
import { finishedRun, gatherBriefingInput } from './briefing-source';
import { briefingDetail, visibleBriefing, type BriefingActor, type BriefingRow } from './briefing-views';
import { signingKeyFor } from './signing-key';
import { ContentMismatchError, inputFromStored } from './stored-input';

export { briefingDetail, listBriefings } from './briefing-views';

/** The app's own address (PUBLIC_BASE_URL, else the address it listens on), without a trailing slash. */
export function publicBaseUrl(config: Config): string {
  const base = config.PUBLIC_BASE_URL ?? `http://${config.HOST === '0.0.0.0' ? 'localhost' : config.HOST}:${config.PORT}`;
  return base.replace(/\/+$/, '');
}

function pgCode(err: unknown): string | undefined {
  const e = err as { code?: unknown; cause?: { code?: unknown } };
  return typeof e?.code === 'string' ? e.code : typeof e?.cause?.code === 'string' ? e.cause.code : undefined;
}

/** The database's own refusal (triggers, unique indexes) as a 409, should a check here have been raced. */
async function guarded<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    const code = pgCode(err);
    if (code === '23000') throw new ConflictError('This briefing is signed and cannot be changed.');
    if (code === '23505') throw new ConflictError('Someone else changed this briefing at the same moment: reload and try again.');
    throw err;
  }
}

export function createBriefingService(db: Database, config: Config, mailer: Mailer | null = mailerFor(config)) {
  const base = publicBaseUrl(config);
  const verificationUrl = `${base}/verify`;
  const reviewUrl = (id: string) => `${base}/briefings/${id}/review`;
  const timeZone = config.BRIEFING_TIME_ZONE;
  const renderBudget = { seconds: config.BRIEFING_RENDER_SECONDS, megabytes: config.BRIEFING_RENDER_MEGABYTES };
  warmRenderer(renderBudget);

  const content = (row: BriefingRow) => row.content as StoredBriefingContent & { organizationName: string; planName: string; scenarioName: string | null };
  const ref = (row: BriefingRow): BriefingRef => ({
    briefingId: row.id,
    version: row.version,
    organizationName: content(row).organizationName,
    planName: content(row).planName,
    scenarioName: content(row).scenarioName,
  });

  function render(row: BriefingRow, status: BriefingStatus, extra: { signature?: BriefingSignature; returned?: BriefingReturn } = {}) {
    try {
      return inputFromStored(row.content, row.contentSha256, { status, timeZone, verificationUrl, ...extra });
    } catch (err) {
      if (err instanceof ContentMismatchError) throw new HttpError(500, 'internal', 'The stored content of this briefing no longer matches its recorded SHA-256; it cannot be rendered or signed.');
      throw err;
    }
  }

  async function storeFile(tx: Tx, briefingId: string, kind: 'draft' | 'signed', pdf: Buffer, sha256: string) {
    await tx.insert(briefingFiles).values({ briefingId, kind, pdf, sha256, byteLength: pdf.length });
  }

  async function statusChange(tx: Tx, actor: BriefingActor, briefingId: string, from: BriefingStatus | null, to: BriefingStatus, comment: string | null = null) {
    await tx.insert(briefingStatusChanges).values({ briefingId, fromStatus: from, toStatus: to, actorUserId: actor.userId, comment });
  }

  async function replaceRecipients(tx: Tx, briefingId: string, recipients: Recipient[]) {
    await tx.delete(briefingDistributions).where(eq(briefingDistributions.briefingId, briefingId));
    if (recipients.length) await tx.insert(briefingDistributions).values(recipients.map((r) => ({ briefingId, recipientName: r.name, recipientEmail: r.email })));
  }

  function refuseSigned(row: BriefingRow) {
    if (row.status === 'signed') throw new ConflictError('This briefing is signed and cannot be changed. Make a new version instead.');
  }

  async function respond(actor: BriefingActor, id: string, mail: MailReport | null = null): Promise<BriefingStepResponse> {
    return { briefing: await briefingDetail(db, actor, id), mail };
  }

  async function nextVersionOfRun(tx: Tx | Database, runId: string): Promise<number> {
    const [row] = await tx.select({ v: max(briefings.version) }).from(briefings).where(eq(briefings.runId, runId));
    return (row?.v ?? 0) + 1;
  }

  async function draft(actor: BriefingActor, o: { runId: string; title: string; recipients: Recipient[]; previous?: BriefingRow }): Promise<string> {
    const run = await finishedRun(db, actor.organizationId, o.runId);
    if (o.previous && run.planId !== o.previous.planId) throw new BadRequestError('A new version must come from an analysis of the same plan.', [{ path: 'runId', message: 'Another plan’s run.' }]);
    const id = randomUUID();
    const version = Math.max(await nextVersionOfRun(db, run.id), (o.previous?.version ?? 0) + 1);
    const input = await gatherBriefingInput(db, actor.organizationId, run, {
      briefingId: id,
      version,
      createdAt: new Date(),
      preparer: { userId: actor.userId, role: actor.role },
      timeZone,
      verificationUrl,
    });
    const rendered = await renderBriefing(input, renderBudget);
    await guarded(() =>
      db.transaction(async (tx) => {
        await tx.insert(briefings).values({
          id,
          organizationId: actor.organizationId,
          planId: run.planId,
          runId: run.id,
          scenarioId: run.scenarioId,
          version,
          previousVersionId: o.previous?.id ?? null,
          title: o.title,
          status: 'draft',
          content: storedBriefingContent(input),
          contentSha256: rendered.contentSha256,
          createdBy: actor.userId,
          createdAt: input.createdAt,
          updatedAt: input.createdAt,
        });
        await storeFile(tx, id, 'draft', rendered.pdf, rendered.fileSha256);
        await replaceRecipients(tx, id, o.recipients);
        await statusChange(tx, actor, id, null, 'draft', o.previous ? `new version of version ${o.previous.version}` : null);
        await recordAudit(tx, actor, o.previous ? 'briefing.new-version' : 'briefing.create', 'briefing', id, {
          planId: run.planId,
          runId: run.id,
          version,
          previousVersionId: o.previous?.id ?? null,
          contentSha256: rendered.contentSha256,
          fileSha256: rendered.fileSha256,
          recipients: o.recipients.length,
        });
      }),
    );
    return id;
  }

  /** Officials of the actor's organisation, for the sign-off request form. */
  function officialsQuery(actor: BriefingActor, onlyIds?: string[]) {
    return db
      .select({ id: users.id, displayName: users.displayName, email: users.email })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(
        and(
          eq(memberships.organizationId, actor.organizationId),
          eq(memberships.role, 'official'),
          eq(users.disabled, false),
          onlyIds ? inArray(users.id, onlyIds) : undefined,
        ),
      )
      .orderBy(users.displayName, users.id);
  }
  async function officials(actor: BriefingActor, page: Page): Promise<Official[]> {
    return officialsQuery(actor).limit(limitPlusOne(page)).offset(page.offset);
  }

  return {
    async create(actor: BriefingActor, input: BriefingCreate): Promise<BriefingStepResponse> {
      return respond(actor, await draft(actor, input));
    },

    async newVersion(actor: BriefingActor, id: string, input: BriefingVersionCreate): Promise<BriefingStepResponse> {
      const previous = await visibleBriefing(db, actor, id);
      if (previous.status === 'draft' || previous.status === 'awaiting-sign-off') {
        throw new ConflictError('This briefing is not signed or returned yet: change it instead of making a new version.');
      }
      const recipients = await db
        .select({ name: briefingDistributions.recipientName, email: briefingDistributions.recipientEmail })
        .from(briefingDistributions)
        .where(eq(briefingDistributions.briefingId, id));
      return respond(actor, await draft(actor, { runId: input.runId ?? previous.runId, title: input.title ?? previous.title, recipients, previous }));
    },

    async update(actor: BriefingActor, id: string, patch: BriefingUpdate): Promise<BriefingStepResponse> {
      await guarded(() =>
        db.transaction(async (tx) => {
          const row = await visibleBriefing(tx, actor, id, true);
          refuseSigned(row);
          if (patch.title !== undefined) await tx.update(briefings).set({ title: patch.title, updatedAt: new Date() }).where(eq(briefings.id, id));
          if (patch.recipients !== undefined) await replaceRecipients(tx, id, patch.recipients);
          await recordAudit(tx, actor, 'briefing.update', 'briefing', id, {
            ...(patch.title !== undefined ? { title: patch.title } : {}),
            ...(patch.recipients !== undefined ? { recipients: patch.recipients.length } : {}),
          });
        }),
      );
      return respond(actor, id);
    },

    async remove(actor: BriefingActor, id: string): Promise<void> {
      await guarded(() =>
        db.transaction(async (tx) => {
          const row = await visibleBriefing(tx, actor, id, true);
          refuseSigned(row);
          if (row.status === 'awaiting-sign-off') throw new ConflictError('Officials are reviewing this briefing: withdraw the request before deleting it.');
          await recordAudit(tx, actor, 'briefing.delete', 'briefing', id, { planId: row.planId, runId: row.runId, version: row.version, title: row.title });
          await tx.delete(briefings).where(eq(briefings.id, id));
        }),
      );
    },

    officials,

    async requestSignOff(actor: BriefingActor, id: string, request: SignOffRequest): Promise<BriefingStepResponse> {
      const candidates: Official[] = await officialsQuery(actor, request.reviewerIds);
      const reviewers = request.reviewerIds.map((rid) => candidates.find((o) => o.id === rid));
      const unknown = request.reviewerIds.filter((_, i) => !reviewers[i]);
      if (unknown.length) throw new BadRequestError('Sign-off can be asked of officials of your organisation only.', unknown.map(() => ({ path: 'reviewerIds', message: 'Not an official of your organisation.' })));
      const [requester] = await db.select({ name: users.displayName, email: users.email }).from(users).where(eq(users.id, actor.userId));
      const row = await guarded(() =>
        db.transaction(async (tx) => {
          const row = await visibleBriefing(tx, actor, id, true);
          refuseSigned(row);
          if (row.status === 'awaiting-sign-off') throw new ConflictError('Sign-off has already been requested for this briefing.');
          const rendered = await renderBriefing(render(row, 'awaiting-sign-off'), renderBudget);
          const now = new Date();
          for (const official of reviewers as Official[]) {
            await tx
              .insert(briefingReviews)
              .values({ briefingId: id, reviewerUserId: official.id, reviewerName: official.displayName, requestedBy: actor.userId, requestedAt: now })
              .onConflictDoUpdate({
                target: [briefingReviews.briefingId, briefingReviews.reviewerUserId],
                set: { decision: 'pending', comment: null, decidedAt: null, requestedAt: now, requestedBy: actor.userId, reviewerName: official.displayName },
              });
          }
          await storeFile(tx, id, 'draft', rendered.pdf, rendered.fileSha256);
          await statusChange(tx, actor, id, row.status, 'awaiting-sign-off', request.note ?? null);
          await recordAudit(tx, actor, 'briefing.request-sign-off', 'briefing', id, {
            reviewers: (reviewers as Official[]).map((o) => ({ id: o.id, name: o.displayName })),
            note: request.note ?? null,
            fileSha256: rendered.fileSha256,
          });
          await tx.update(briefings).set({ status: 'awaiting-sign-off', updatedAt: now }).where(eq(briefings.id, id));
          return row;
        }),
      );
      const mail = await sendSignOffRequests(
        mailer,
        ref(row),
        (reviewers as Official[]).map((o) => ({ name: o.displayName, email: o.email })),
        { name: requester?.name ?? 'A planner', email: requester?.email ?? config.MAIL_FROM },
        reviewUrl(id),
        request.note,
      );
      await recordAudit(db, actor, 'briefing.sign-off-request-mail', 'briefing', id, { sent: mail.sent, failed: mail.failed });
      return respond(actor, id, mail);
    },

    async withdraw(actor: BriefingActor, id: string): Promise<BriefingStepResponse> {
      await guarded(() =>
        db.transaction(async (tx) => {
          const row = await visibleBriefing(tx, actor, id, true);
          refuseSigned(row);
          if (row.status !== 'awaiting-sign-off') throw new ConflictError('No sign-off request is open for this briefing.');
          const rendered = await renderBriefing(render(row, 'draft'), renderBudget);
          await tx.update(briefingReviews).set({ decision: 'withdrawn', decidedAt: new Date() }).where(and(eq(briefingReviews.briefingId, id), eq(briefingReviews.decision, 'pending')));
          await storeFile(tx, id, 'draft', rendered.pdf, rendered.fileSha256);
          await statusChange(tx, actor, id, row.status, 'draft', 'request withdrawn');
          await recordAudit(tx, actor, 'briefing.withdraw-request', 'briefing', id, {});
          await tx.update(briefings).set({ status: 'draft', updatedAt: new Date() }).where(eq(briefings.id, id));
        }),
      );
      return respond(actor, id);
    },

    async sign(actor: BriefingActor, id: string): Promise<BriefingStepResponse> {
      const signed = await guarded(() =>
        db.transaction(async (tx) => {
          const row = await decidable(tx, actor, id);
          const [signer] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, actor.userId));
          const person = { name: signer!.name, role: roleLabels[actor.role] };
          const key = await signingKeyFor(tx, config, actor);
          const pdf = await signBriefingPdf(render(row, 'awaiting-sign-off'), person, key.certificate, new Date(), renderBudget);
          // Our own check of what is about to become the record, before it is stored.
          const check = verifyPdf(pdf.pdf, [key.certificate.certificatePem]);
          if (!check.valid) throw new Error(`the freshly signed briefing ${id} does not verify: ${check.problems.join(' ')}`);
          await storeFile(tx, id, 'signed', pdf.pdf, pdf.fileSha256);
          await tx
            .update(briefingReviews)
            .set({ decision: 'signed', decidedAt: pdf.signedAt })
            .where(and(eq(briefingReviews.briefingId, id), eq(briefingReviews.reviewerUserId, actor.userId)));
          await tx
            .update(briefingReviews)
            .set({ decision: 'withdrawn', decidedAt: pdf.signedAt })
            .where(and(eq(briefingReviews.briefingId, id), eq(briefingReviews.decision, 'pending'), ne(briefingReviews.reviewerUserId, actor.userId)));
          await statusChange(tx, actor, id, row.status, 'signed');
          await recordAudit(tx, actor, 'briefing.sign', 'briefing', id, {
            signerName: person.name,
            signerRole: person.role,
            signedAt: pdf.signedAt.toISOString(),
            fileSha256: pdf.fileSha256,
            contentSha256: pdf.contentSha256,
            signingKeyId: key.keyId,
            certificateFingerprintSha256: key.certificate.fingerprintSha256,
          });
          // Last: after this update the row is signed and the database refuses any other change.
          await tx
            .update(briefings)
            .set({ status: 'signed', signedBy: actor.userId, signerName: person.name, signerRole: person.role, signedAt: pdf.signedAt, signingKeyId: key.keyId, updatedAt: pdf.signedAt })
            .where(eq(briefings.id, id));
          return { row, pdf, person };
        }),
      );
      const mail = await distributeSignedCopy(db, mailer, actor, ref(signed.row), {
        pdf: signed.pdf.pdf,
        fileSha256: signed.pdf.fileSha256,
        signedBy: { ...signed.person, signedAt: signed.pdf.signedAt },
        verificationUrl,
        timeZone,
      });
      return respond(actor, id, mail);
    },

    async returnWithComment(actor: BriefingActor, id: string, comment: string): Promise<BriefingStepResponse> {
      await guarded(() =>
        db.transaction(async (tx) => {
          const row = await decidable(tx, actor, id);
          const [official] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, actor.userId));
          const now = new Date();
          const rendered = await renderBriefing(render(row, 'returned', { returned: { name: official!.name, role: roleLabels[actor.role], returnedAt: now, comment } }), renderBudget);
          await tx
            .update(briefingReviews)
            .set({ decision: 'returned', comment, decidedAt: now })
            .where(and(eq(briefingReviews.briefingId, id), eq(briefingReviews.reviewerUserId, actor.userId)));
          await tx
            .update(briefingReviews)
            .set({ decision: 'withdrawn', decidedAt: now })
            .where(and(eq(briefingReviews.briefingId, id), eq(briefingReviews.decision, 'pending')));
          await storeFile(tx, id, 'draft', rendered.pdf, rendered.fileSha256);
          await statusChange(tx, actor, id, row.status, 'returned', comment);
          await recordAudit(tx, actor, 'briefing.return', 'briefing', id, { comment });
          await tx.update(briefings).set({ status: 'returned', updatedAt: now }).where(eq(briefings.id, id));
        }),
      );
      return respond(actor, id);
    },

    /** Sends the signed copy to the recipients it has not reached yet (after a mail failure). */
    async distribute(actor: BriefingActor, id: string): Promise<BriefingStepResponse> {
      const row = await visibleBriefing(db, actor, id);
      if (row.status !== 'signed') throw new ConflictError('Only a signed briefing is distributed.');
      const [file] = await db.select().from(briefingFiles).where(and(eq(briefingFiles.briefingId, id), eq(briefingFiles.kind, 'signed')));
      const mail = await distributeSignedCopy(db, mailer, actor, ref(row), {
        pdf: file!.pdf,
        fileSha256: file!.sha256,
        signedBy: { name: row.signerName!, role: row.signerRole ?? '', signedAt: row.signedAt! },
        verificationUrl,
        timeZone,
      });
      return respond(actor, id, mail);
    },

    /** The PDF to view or download: the signed copy of a signed briefing unless the draft is asked for; viewers get signed copies only. */
    async file(actor: BriefingActor, id: string, kind?: 'draft' | 'signed') {
      const row = await visibleBriefing(db, actor, id);
      const wanted = kind ?? (row.status === 'signed' ? 'signed' : 'draft');
      if (wanted === 'draft' && actor.role === 'viewer') throw new ForbiddenError('Your role downloads signed briefings only.');
      const [file] = await db
        .select({ pdf: briefingFiles.pdf, sha256: briefingFiles.sha256 })
        .from(briefingFiles)
        .where(and(eq(briefingFiles.briefingId, id), eq(briefingFiles.kind, wanted)))
        .orderBy(sql`${briefingFiles.createdAt} DESC`)
        .limit(1);
      if (!file) throw new NotFoundError(wanted === 'signed' ? 'signed copy (the briefing is not signed)' : 'draft');
      const name = attachmentName(ref(row));
      return { pdf: file.pdf, sha256: file.sha256, kind: wanted, filename: wanted === 'signed' ? name : name.replace(/\.pdf$/, '-draft.pdf') };
    },
  };

  /** The briefing, locked, if it awaits sign-off and the actor was asked to decide. */
  async function decidable(tx: Tx, actor: BriefingActor, id: string): Promise<BriefingRow> {
    const row = await visibleBriefing(tx, actor, id, true);
    refuseSigned(row);
    if (row.status !== 'awaiting-sign-off') throw new ConflictError('Sign-off has not been requested for this briefing.');
    const [review] = await tx
      .select({ decision: briefingReviews.decision })
      .from(briefingReviews)
      .where(and(eq(briefingReviews.briefingId, id), eq(briefingReviews.reviewerUserId, actor.userId)));
    if (review?.decision !== 'pending') throw new ForbiddenError('You were not asked to sign off this briefing.');
    return row;
  }
}

export type BriefingService = ReturnType<typeof createBriefingService>;

