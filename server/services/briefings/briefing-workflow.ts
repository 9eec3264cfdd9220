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
import { organizationPreferences } from '../organization-settings';

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

/** What every step of the workflow needs: the database, the mailer, the app's addresses, the
 *  render budget, and the small writes each step shares. */
function workflowContext(db: Database, config: Config, mailer: Mailer | null) {
  const base = publicBaseUrl(config);
  const verificationUrl = `${base}/verify`;
  // The organisation's zone and units (its setting, else the deployment's BRIEFING_TIME_ZONE).
  const preferences = (organizationId: string) => organizationPreferences(db, organizationId, config.BRIEFING_TIME_ZONE);
  const renderBudget = { seconds: config.BRIEFING_RENDER_SECONDS, megabytes: config.BRIEFING_RENDER_MEGABYTES };

  const content = (row: BriefingRow) => row.content as StoredBriefingContent & { organizationName: string; planName: string; scenarioName: string | null };
  const ref = (row: BriefingRow): BriefingRef => ({
    briefingId: row.id,
    version: row.version,
    organizationName: content(row).organizationName,
    planName: content(row).planName,
    scenarioName: content(row).scenarioName,
  });

  async function render(row: BriefingRow, status: BriefingStatus, extra: { signature?: BriefingSignature; returned?: BriefingReturn } = {}) {
    const { timeZone, unitSystem } = await preferences(row.organizationId);
    try {
      return inputFromStored(row.content, row.contentSha256, { status, timeZone, unitSystem, verificationUrl, ...extra });
    } catch (err) {
      if (err instanceof ContentMismatchError) throw new HttpError(500, 'internal', 'The stored content of this briefing no longer matches its recorded SHA-256; it cannot be rendered or signed.');
      throw err;
    }
  }

  return {
    db,
    config,
    mailer,
    verificationUrl,
    reviewUrl: (id: string) => `${base}/briefings/${id}/review`,
    preferences,
    renderBudget,
    ref,
    render,
    respond: async (actor: BriefingActor, id: string, mail: MailReport | null = null): Promise<BriefingStepResponse> => ({ briefing: await briefingDetail(db, actor, id), mail }),
  };
}
type Workflow = ReturnType<typeof workflowContext>;

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

async function nextVersionOfRun(tx: Tx | Database, runId: string): Promise<number> {
  const [row] = await tx.select({ v: max(briefings.version) }).from(briefings).where(eq(briefings.runId, runId));
  return (row?.v ?? 0) + 1;
}

/** A new draft from a finished run (or a new version of `previous`): content frozen, rendered, stored. */
async function draft(w: Workflow, actor: BriefingActor, o: { runId: string; title: string; recipients: Recipient[]; previous?: BriefingRow }): Promise<string> {
  const { db } = w;
  const run = await finishedRun(db, actor.organizationId, o.runId);
  if (o.previous && run.planId !== o.previous.planId) throw new BadRequestError('A new version must come from an analysis of the same plan.', [{ path: 'runId', message: 'Another plan’s run.' }]);
  const id = randomUUID();
  const version = Math.max(await nextVersionOfRun(db, run.id), (o.previous?.version ?? 0) + 1);
  const { timeZone, unitSystem } = await w.preferences(actor.organizationId);
  const gathered = await gatherBriefingInput(db, actor.organizationId, run, {
    briefingId: id,
    version,
    createdAt: new Date(),
    preparer: { userId: actor.userId, role: actor.role },
    timeZone,
    verificationUrl: w.verificationUrl,
  });
  const input = { ...gathered, unitSystem };
  const rendered = await renderBriefing(input, w.renderBudget);
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
function officialsQuery(db: Database, actor: BriefingActor, onlyIds?: string[]) {
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

async function newVersion(w: Workflow, actor: BriefingActor, id: string, input: BriefingVersionCreate): Promise<BriefingStepResponse> {
  const previous = await visibleBriefing(w.db, actor, id);
  if (previous.status === 'draft' || previous.status === 'awaiting-sign-off') {
    throw new ConflictError('This briefing is not signed or returned yet: change it instead of making a new version.');
  }
  const recipients = await w.db
    .select({ name: briefingDistributions.recipientName, email: briefingDistributions.recipientEmail })
    .from(briefingDistributions)
    .where(eq(briefingDistributions.briefingId, id));
  return w.respond(actor, await draft(w, actor, { runId: input.runId ?? previous.runId, title: input.title ?? previous.title, recipients, previous }));
}

async function update(w: Workflow, actor: BriefingActor, id: string, patch: BriefingUpdate): Promise<BriefingStepResponse> {
  await guarded(() =>
    w.db.transaction(async (tx) => {
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
  return w.respond(actor, id);
}

async function remove(w: Workflow, actor: BriefingActor, id: string): Promise<void> {
  await guarded(() =>
    w.db.transaction(async (tx) => {
      const row = await visibleBriefing(tx, actor, id, true);
      refuseSigned(row);
      if (row.status === 'awaiting-sign-off') throw new ConflictError('Officials are reviewing this briefing: withdraw the request before deleting it.');
      await recordAudit(tx, actor, 'briefing.delete', 'briefing', id, { planId: row.planId, runId: row.runId, version: row.version, title: row.title });
      await tx.delete(briefings).where(eq(briefings.id, id));
    }),
  );
}

/** The officials asked, checked to be officials of the actor's organisation. */
async function reviewersOf(w: Workflow, actor: BriefingActor, request: SignOffRequest): Promise<Official[]> {
  const candidates: Official[] = await officialsQuery(w.db, actor, request.reviewerIds);
  const reviewers = request.reviewerIds.map((rid) => candidates.find((o) => o.id === rid));
  const unknown = request.reviewerIds.filter((_, i) => !reviewers[i]);
  if (unknown.length) throw new BadRequestError('Sign-off can be asked of officials of your organisation only.', unknown.map(() => ({ path: 'reviewerIds', message: 'Not an official of your organisation.' })));
  return reviewers as Official[];
}

async function requestSignOff(w: Workflow, actor: BriefingActor, id: string, request: SignOffRequest): Promise<BriefingStepResponse> {
  const reviewers = await reviewersOf(w, actor, request);
  const [requester] = await w.db.select({ name: users.displayName, email: users.email }).from(users).where(eq(users.id, actor.userId));
  const row = await guarded(() =>
    w.db.transaction(async (tx) => {
      const row = await visibleBriefing(tx, actor, id, true);
      refuseSigned(row);
      if (row.status === 'awaiting-sign-off') throw new ConflictError('Sign-off has already been requested for this briefing.');
      const rendered = await renderBriefing(await w.render(row, 'awaiting-sign-off'), w.renderBudget);
      const now = new Date();
      for (const official of reviewers) {
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
        reviewers: reviewers.map((o) => ({ id: o.id, name: o.displayName })),
        note: request.note ?? null,
        fileSha256: rendered.fileSha256,
      });
      await tx.update(briefings).set({ status: 'awaiting-sign-off', updatedAt: now }).where(eq(briefings.id, id));
      return row;
    }),
  );
  const mail = await sendSignOffRequests(
    w.mailer,
    w.ref(row),
    reviewers.map((o) => ({ name: o.displayName, email: o.email })),
    { name: requester?.name ?? 'A planner', email: requester?.email ?? w.config.MAIL_FROM },
    w.reviewUrl(id),
    request.note,
  );
  await recordAudit(w.db, actor, 'briefing.sign-off-request-mail', 'briefing', id, { sent: mail.sent, failed: mail.failed });
  return w.respond(actor, id, mail);
}

async function withdraw(w: Workflow, actor: BriefingActor, id: string): Promise<BriefingStepResponse> {
  await guarded(() =>
    w.db.transaction(async (tx) => {
      const row = await visibleBriefing(tx, actor, id, true);
      refuseSigned(row);
      if (row.status !== 'awaiting-sign-off') throw new ConflictError('No sign-off request is open for this briefing.');
      const rendered = await renderBriefing(await w.render(row, 'draft'), w.renderBudget);
      await tx.update(briefingReviews).set({ decision: 'withdrawn', decidedAt: new Date() }).where(and(eq(briefingReviews.briefingId, id), eq(briefingReviews.decision, 'pending')));
      await storeFile(tx, id, 'draft', rendered.pdf, rendered.fileSha256);
      await statusChange(tx, actor, id, row.status, 'draft', 'request withdrawn');
      await recordAudit(tx, actor, 'briefing.withdraw-request', 'briefing', id, {});
      await tx.update(briefings).set({ status: 'draft', updatedAt: new Date() }).where(eq(briefings.id, id));
    }),
  );
  return w.respond(actor, id);
}

/** The signature step inside its transaction: sign the PDF, check it, store it, record the decision. */
async function signInTransaction(w: Workflow, tx: Tx, actor: BriefingActor, id: string) {
  const row = await decidable(tx, actor, id);
  const [signer] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, actor.userId));
  const person = { name: signer!.name, role: roleLabels[actor.role] };
  const key = await signingKeyFor(tx, w.config, actor);
  const pdf = await signBriefingPdf(await w.render(row, 'awaiting-sign-off'), person, key.certificate, new Date(), w.renderBudget);
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
}

async function sign(w: Workflow, actor: BriefingActor, id: string): Promise<BriefingStepResponse> {
  const signed = await guarded(() => w.db.transaction((tx) => signInTransaction(w, tx, actor, id)));
  const mail = await distributeSignedCopy(w.db, w.mailer, actor, w.ref(signed.row), {
    pdf: signed.pdf.pdf,
    fileSha256: signed.pdf.fileSha256,
    signedBy: { ...signed.person, signedAt: signed.pdf.signedAt },
    verificationUrl: w.verificationUrl,
    timeZone: (await w.preferences(actor.organizationId)).timeZone,
  });
  return w.respond(actor, id, mail);
}

async function returnWithComment(w: Workflow, actor: BriefingActor, id: string, comment: string): Promise<BriefingStepResponse> {
  await guarded(() =>
    w.db.transaction(async (tx) => {
      const row = await decidable(tx, actor, id);
      const [official] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, actor.userId));
      const now = new Date();
      const rendered = await renderBriefing(await w.render(row, 'returned', { returned: { name: official!.name, role: roleLabels[actor.role], returnedAt: now, comment } }), w.renderBudget);
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
  return w.respond(actor, id);
}

/** Sends the signed copy to the recipients it has not reached yet (after a mail failure). */
async function distribute(w: Workflow, actor: BriefingActor, id: string): Promise<BriefingStepResponse> {
  const row = await visibleBriefing(w.db, actor, id);
  if (row.status !== 'signed') throw new ConflictError('Only a signed briefing is distributed.');
  const [file] = await w.db.select().from(briefingFiles).where(and(eq(briefingFiles.briefingId, id), eq(briefingFiles.kind, 'signed')));
  const mail = await distributeSignedCopy(w.db, w.mailer, actor, w.ref(row), {
    pdf: file!.pdf,
    fileSha256: file!.sha256,
    signedBy: { name: row.signerName!, role: row.signerRole ?? '', signedAt: row.signedAt! },
    verificationUrl: w.verificationUrl,
    timeZone: (await w.preferences(actor.organizationId)).timeZone,
  });
  return w.respond(actor, id, mail);
}

/** The PDF to view or download: the signed copy of a signed briefing unless the draft is asked for; viewers get signed copies only. */
async function file(w: Workflow, actor: BriefingActor, id: string, kind?: 'draft' | 'signed') {
  const row = await visibleBriefing(w.db, actor, id);
  const wanted = kind ?? (row.status === 'signed' ? 'signed' : 'draft');
  if (wanted === 'draft' && actor.role === 'viewer') throw new ForbiddenError('Your role downloads signed briefings only.');
  const [stored] = await w.db
    .select({ pdf: briefingFiles.pdf, sha256: briefingFiles.sha256 })
    .from(briefingFiles)
    .where(and(eq(briefingFiles.briefingId, id), eq(briefingFiles.kind, wanted)))
    .orderBy(sql`${briefingFiles.createdAt} DESC`)
    .limit(1);
  if (!stored) throw new NotFoundError(wanted === 'signed' ? 'signed copy (the briefing is not signed)' : 'draft');
  const name = attachmentName(w.ref(row));
  return { pdf: stored.pdf, sha256: stored.sha256, kind: wanted, filename: wanted === 'signed' ? name : name.replace(/\.pdf$/, '-draft.pdf') };
}

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

/** The workflow's steps bound to one database, configuration and mailer; the renderer is started now. */
export function createBriefingService(db: Database, config: Config, mailer: Mailer | null = mailerFor(config)) {
  const w = workflowContext(db, config, mailer);
  warmRenderer(w.renderBudget);
  return {
    create: async (actor: BriefingActor, input: BriefingCreate): Promise<BriefingStepResponse> => w.respond(actor, await draft(w, actor, input)),
    newVersion: (actor: BriefingActor, id: string, input: BriefingVersionCreate) => newVersion(w, actor, id, input),
    update: (actor: BriefingActor, id: string, patch: BriefingUpdate) => update(w, actor, id, patch),
    remove: (actor: BriefingActor, id: string) => remove(w, actor, id),
    officials: async (actor: BriefingActor, page: Page): Promise<Official[]> => officialsQuery(db, actor).limit(limitPlusOne(page)).offset(page.offset),
    requestSignOff: (actor: BriefingActor, id: string, request: SignOffRequest) => requestSignOff(w, actor, id, request),
    withdraw: (actor: BriefingActor, id: string) => withdraw(w, actor, id),
    sign: (actor: BriefingActor, id: string) => sign(w, actor, id),
    returnWithComment: (actor: BriefingActor, id: string, comment: string) => returnWithComment(w, actor, id, comment),
    distribute: (actor: BriefingActor, id: string) => distribute(w, actor, id),
    file: (actor: BriefingActor, id: string, kind?: 'draft' | 'signed') => file(w, actor, id, kind),
  };
}

export type BriefingService = ReturnType<typeof createBriefingService>;
