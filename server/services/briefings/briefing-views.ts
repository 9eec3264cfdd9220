// Briefings as the API shows them: the list (viewers see signed ones only) and one briefing
// with its reviews, status history, distribution and files. Reads only.
import { aliasedTable, and, asc, desc, eq, inArray, type SQL } from 'drizzle-orm';
import type { Database, Tx } from '../../db/client';
import { briefingDistributions, briefingFiles, briefingReviews, briefingStatusChanges, briefings, plans, users } from '../../db/schema';
import type { BriefingDetail, BriefingDistribution, BriefingSummary } from '../../../shared/api/briefings';
import type { RunResult } from '../../../shared/api/runs';
import { can, type Role } from '../../../shared/api/roles';
import { ForbiddenError, NotFoundError } from '../../errors';
import { limitPlusOne, type Page } from '../../../shared/api/pagination';

export type BriefingActor = { userId: string; organizationId: string; role: Role };
export type BriefingRow = typeof briefings.$inferSelect;

const creators = aliasedTable(users, 'creators');

const iso = (d: Date | null) => d?.toISOString() ?? null;

/** The briefing if it is the actor's organisation's (else 404) and their role may see it (viewers: signed only). */
export async function visibleBriefing(db: Database | Tx, actor: BriefingActor, id: string, lock = false): Promise<BriefingRow> {
  const query = db
    .select()
    .from(briefings)
    .where(and(eq(briefings.id, id), eq(briefings.organizationId, actor.organizationId)));
  const [row] = lock ? await query.for('update') : await query;
  if (!row) throw new NotFoundError('briefing');
  if (row.status !== 'signed' && !can(actor.role, 'briefings:read-drafts')) throw new ForbiddenError('Your role sees signed briefings only.');
  return row;
}

async function summaries(db: Database, where: SQL | undefined, page: Page): Promise<BriefingSummary[]> {
  const rows = await db
    .select({ b: briefings, planName: plans.name, createdByName: creators.displayName })
    .from(briefings)
    .innerJoin(plans, eq(plans.id, briefings.planId))
    .leftJoin(creators, eq(creators.id, briefings.createdBy))
    .where(where)
    .orderBy(desc(briefings.createdAt), desc(briefings.version), asc(briefings.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  const ids = rows.map((r) => r.b.id);
  const pending = ids.length
    ? await db
        .select({ briefingId: briefingReviews.briefingId, name: briefingReviews.reviewerName })
        .from(briefingReviews)
        .where(and(inArray(briefingReviews.briefingId, ids), eq(briefingReviews.decision, 'pending')))
        .orderBy(asc(briefingReviews.reviewerName))
    : [];
  return rows.map(({ b, planName, createdByName }) => ({
    id: b.id,
    planId: b.planId,
    planName,
    runId: b.runId,
    version: b.version,
    previousVersionId: b.previousVersionId,
    title: b.title,
    status: b.status,
    createdAt: b.createdAt.toISOString(),
    createdByName,
    signedAt: iso(b.signedAt),
    signerName: b.signerName,
    signerRole: b.signerRole,
    contentSha256: b.contentSha256,
    pendingReviewers: pending.filter((p) => p.briefingId === b.id).map((p) => p.name),
  }));
}

export async function listBriefings(db: Database, actor: BriefingActor, page: Page, planId?: string): Promise<BriefingSummary[]> {
  const filters: SQL[] = [eq(briefings.organizationId, actor.organizationId)];
  if (planId) filters.push(eq(briefings.planId, planId));
  if (!can(actor.role, 'briefings:read-drafts')) filters.push(eq(briefings.status, 'signed'));
  return summaries(db, and(...filters), page);
}

function distributionState(r: typeof briefingDistributions.$inferSelect): BriefingDistribution {
  const state = r.messageId ? 'sent' : r.error ? 'failed' : 'waiting-for-signature';
  return { recipientName: r.recipientName, recipientEmail: r.recipientEmail, state, sentAt: state === 'waiting-for-signature' ? null : r.sentAt.toISOString(), error: r.error };
}

export async function briefingDetail(db: Database, actor: BriefingActor, id: string): Promise<BriefingDetail> {
  const row = await visibleBriefing(db, actor, id);
  const [summary] = await summaries(db, eq(briefings.id, row.id), { limit: 1, offset: 0 });
  const reviews = await db.select().from(briefingReviews).where(eq(briefingReviews.briefingId, id)).orderBy(asc(briefingReviews.requestedAt), asc(briefingReviews.reviewerName));
  const history = await db
    .select({ c: briefingStatusChanges, actorName: users.displayName })
    .from(briefingStatusChanges)
    .leftJoin(users, eq(users.id, briefingStatusChanges.actorUserId))
    .where(eq(briefingStatusChanges.briefingId, id))
    .orderBy(asc(briefingStatusChanges.id));
  const distributions = await db.select().from(briefingDistributions).where(eq(briefingDistributions.briefingId, id)).orderBy(asc(briefingDistributions.id));
  const files = await db
    .select({ kind: briefingFiles.kind, sha256: briefingFiles.sha256, byteLength: briefingFiles.byteLength, createdAt: briefingFiles.createdAt })
    .from(briefingFiles)
    .where(eq(briefingFiles.briefingId, id))
    .orderBy(desc(briefingFiles.createdAt));
  const [next] = await db
    .select({ id: briefings.id })
    .from(briefings)
    .where(and(eq(briefings.previousVersionId, id), eq(briefings.organizationId, actor.organizationId)))
    .limit(1);
  const fileInfo = (kind: 'draft' | 'signed') => {
    const f = files.find((x) => x.kind === kind);
    return f ? { sha256: f.sha256, byteLength: f.byteLength, createdAt: f.createdAt.toISOString() } : null;
  };
  const h = (row.content as unknown as { result: RunResult }).result.headline;
  const ownPending = reviews.some((r) => r.reviewerUserId === actor.userId && r.decision === 'pending');
  return {
    ...summary!,
    headline: {
      steadyStatePersonsPerHour: h.steadyStatePersonsPerHour,
      steadyStateVehiclesPerHour: h.steadyStateVehiclesPerHour,
      deliveredPersons: h.deliveredPersons,
      demandPersons: h.demandPersons,
      horizonMinutes: h.horizonMinutes,
      clearanceMinutes: h.clearanceMinutes,
    },
    reviews: reviews.map((r) => ({
      reviewerUserId: r.reviewerUserId,
      reviewerName: r.reviewerName,
      requestedAt: r.requestedAt.toISOString(),
      decision: r.decision,
      comment: r.comment,
      decidedAt: iso(r.decidedAt),
    })),
    history: history.map(({ c, actorName }) => ({ fromStatus: c.fromStatus, toStatus: c.toStatus, actorName, comment: c.comment, at: c.at.toISOString() })),
    distributions: distributions.map(distributionState),
    files: { draft: fileInfo('draft'), signed: fileInfo('signed') },
    canDecide: row.status === 'awaiting-sign-off' && can(actor.role, 'briefings:sign') && ownPending,
    nextVersionId: next?.id ?? null,
  };
}
