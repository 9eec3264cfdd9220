// Briefings: the signed record of an analysis run. A briefing is drafted from one run, reviewed
// by one or more officials, then signed or returned. Once signed it never changes (enforced by
// triggers in the migration, see below); a new version is a new briefing pointing back at the
// previous one. Also here: the PDF files with their SHA-256, the review requests, the status
// history, the distribution log, the organisation's signing keys, and the messages the
// development outbox received.
//
// Immutability: the migration for this file adds, as custom SQL,
//   CREATE FUNCTION briefings_keep_signed() RETURNS trigger LANGUAGE plpgsql AS $$
//   BEGIN
//     IF OLD.status = 'signed' THEN
//       RAISE EXCEPTION 'briefing % is signed and cannot be changed or deleted', OLD.id
//         USING ERRCODE = 'integrity_constraint_violation';
//     END IF;
//     RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
//   END $$;
//   CREATE TRIGGER briefings_keep_signed BEFORE UPDATE OR DELETE ON briefings
//     FOR EACH ROW EXECUTE FUNCTION briefings_keep_signed();
//   CREATE FUNCTION briefing_files_keep_signed() RETURNS trigger LANGUAGE plpgsql AS $$
//   BEGIN
//     RAISE EXCEPTION 'the signed file of briefing % cannot be changed or deleted', OLD.briefing_id
//       USING ERRCODE = 'integrity_constraint_violation';
//   END $$;
//   CREATE TRIGGER briefing_files_keep_signed BEFORE UPDATE OR DELETE ON briefing_files
//     FOR EACH ROW WHEN (OLD.kind = 'signed') EXECUTE FUNCTION briefing_files_keep_signed();
import { sql } from 'drizzle-orm';
import { bigserial, check, customType, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import type { StoredBriefingContent } from './briefing-content';
import { timestamps } from './columns';
import { organizations, users } from './organizations';
import { plans } from './plans';
import { runs } from './runs';

/** PostgreSQL bytea; node-postgres reads and writes it as a Buffer. */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

export const briefingStatusEnum = pgEnum('briefing_status', ['draft', 'awaiting-sign-off', 'signed', 'returned']);
export const briefingFileKindEnum = pgEnum('briefing_file_kind', ['draft', 'signed']);
export const reviewDecisionEnum = pgEnum('briefing_review_decision', ['pending', 'signed', 'returned', 'withdrawn']);
export const signingKeySourceEnum = pgEnum('signing_key_source', ['generated', 'configured']);

export const organizationSigningKeys = pgTable(
  'organization_signing_keys',
  {
    id: uuid().primaryKey().defaultRandom(),
    organizationId: uuid()
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    source: signingKeySourceEnum().notNull(),
    // The PKCS#12 (key + certificate) of a generated key, encrypted with the passphrase from the
    // environment (never stored here). Null for a configured key, which stays in its file.
    p12: bytea(),
    certificatePem: text().notNull(),
    fingerprintSha256: text().notNull().unique(),
    subject: text().notNull(),
    serialNumber: text().notNull(),
    notBefore: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    notAfter: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    // Retired keys sign nothing new but still verify the briefings they signed.
    retiredAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [uniqueIndex('organization_signing_keys_one_active').on(t.organizationId).where(sql`${t.retiredAt} IS NULL`)],
);

export const briefings = pgTable(
  'briefings',
  {
    id: uuid().primaryKey().defaultRandom(),
    organizationId: uuid()
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    // No cascade from plan or run: a briefing is part of the record, so deleting the plan or
    // run behind it is refused (NO ACTION) unless the whole organisation goes.
    planId: uuid()
      .notNull()
      .references(() => plans.id),
    runId: uuid()
      .notNull()
      .references(() => runs.id),
    scenarioId: uuid(),
    version: integer().notNull().default(1),
    previousVersionId: uuid().references((): AnyPgColumn => briefings.id, { onDelete: 'set null' }),
    title: text().notNull(),
    status: briefingStatusEnum().notNull().default('draft'),
    // What the figures say, as rendered: the content the footer's SHA-256 is computed from
    // (storedBriefingContent in server/services/briefings/content-fingerprint.ts), so the hash can be
    // recomputed from this column at any time with sha256OfStoredContent.
    content: jsonb().$type<StoredBriefingContent>().notNull(),
    contentSha256: text().notNull(),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    // Who signed, as printed on the page (names and roles can change later).
    signedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    signerName: text(),
    signerRole: text(),
    signedAt: timestamp({ withTimezone: true, mode: 'date' }),
    signingKeyId: uuid().references(() => organizationSigningKeys.id),
    ...timestamps,
  },
  (t) => [
    index().on(t.organizationId, t.createdAt),
    index().on(t.planId),
    uniqueIndex().on(t.runId, t.version),
    check('briefings_signed_has_signature', sql`(${t.status} = 'signed') = (${t.signedAt} IS NOT NULL AND ${t.signerName} IS NOT NULL AND ${t.signingKeyId} IS NOT NULL)`),
  ],
);

export const briefingFiles = pgTable(
  'briefing_files',
  {
    id: uuid().primaryKey().defaultRandom(),
    briefingId: uuid()
      .notNull()
      .references(() => briefings.id, { onDelete: 'cascade' }),
    kind: briefingFileKindEnum().notNull(),
    pdf: bytea().notNull(),
    // SHA-256 of these exact bytes: the verification page looks an upload up by it.
    sha256: text().notNull(),
    byteLength: integer().notNull(),
    createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (t) => [
    index().on(t.briefingId, t.createdAt),
    index().on(t.sha256),
    uniqueIndex('briefing_files_one_signed').on(t.briefingId).where(sql`${t.kind} = 'signed'`),
  ],
);

export const briefingReviews = pgTable(
  'briefing_reviews',
  {
    id: uuid().primaryKey().defaultRandom(),
    briefingId: uuid()
      .notNull()
      .references(() => briefings.id, { onDelete: 'cascade' }),
    reviewerUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
    reviewerName: text().notNull(),
    requestedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    requestedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    decision: reviewDecisionEnum().notNull().default('pending'),
    comment: text(),
    decidedAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [uniqueIndex().on(t.briefingId, t.reviewerUserId), index().on(t.reviewerUserId, t.decision)],
);

export const briefingStatusChanges = pgTable(
  'briefing_status_changes',
  {
    id: bigserial({ mode: 'number' }).primaryKey(),
    briefingId: uuid()
      .notNull()
      .references(() => briefings.id, { onDelete: 'cascade' }),
    fromStatus: briefingStatusEnum(),
    toStatus: briefingStatusEnum().notNull(),
    actorUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
    comment: text(),
    at: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (t) => [index().on(t.briefingId, t.id)],
);

export const briefingDistributions = pgTable(
  'briefing_distributions',
  {
    id: bigserial({ mode: 'number' }).primaryKey(),
    briefingId: uuid()
      .notNull()
      .references(() => briefings.id, { onDelete: 'cascade' }),
    recipientName: text().notNull(),
    recipientEmail: text().notNull(),
    sentBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    sentAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    // The SMTP Message-ID on success; the error text when the server refused.
    messageId: text(),
    error: text(),
  },
  (t) => [index().on(t.briefingId, t.sentAt)],
);

export type MailAttachmentSummary = { filename: string | null; contentType: string; size: number; sha256: string };

export const mailMessages = pgTable(
  'mail_messages',
  {
    id: bigserial({ mode: 'number' }).primaryKey(),
    // The organisation the message concerns (from its briefing), so an admin sees only theirs.
    organizationId: uuid().references(() => organizations.id, { onDelete: 'cascade' }),
    briefingId: uuid(),
    kind: text(),
    receivedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    envelopeFrom: text(),
    envelopeTo: text().array().notNull(),
    subject: text(),
    fromHeader: text(),
    toHeader: text(),
    textBody: text(),
    htmlBody: text(),
    attachments: jsonb().$type<MailAttachmentSummary[]>().notNull().default([]),
    // The message as received (RFC 5322), attachments included.
    raw: bytea().notNull(),
  },
  (t) => [index().on(t.organizationId, t.receivedAt), index().on(t.briefingId)],
);
