// The development outbox: a fake SMTP server on loopback (mail/) whose every
// message is kept in mail_messages, tagged with the organisation of the briefing it concerns,
// so that an administrator reads on the outbox page what would have been sent.
import { and, desc, eq } from 'drizzle-orm';
import type { Config } from '../../config';
import type { Database } from '../../db/client';
import { briefings, mailMessages } from '../../db/schema';
import { startFakeSmtpServer, type FakeSmtpServer, type ReceivedMessage } from './mail/fake-smtp-server';
import { BRIEFING_HEADER, KIND_HEADER } from './mail/mailer';
import { parseMessage } from './mail/parse-message';
import type { OutboxMessage, OutboxMessageSummary } from '../../../shared/api/briefings';
import { NotFoundError } from '../../errors';
import { limitPlusOne, type Page } from '../../../shared/api/pagination';

/** DEV_OUTBOX, defaulting to on everywhere but production. */
export function outboxEnabled(config: Config): boolean {
  return config.DEV_OUTBOX ? config.DEV_OUTBOX === 'on' : config.NODE_ENV !== 'production';
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export async function keepOutboxMessage(db: Database, m: ReceivedMessage): Promise<void> {
  const header = (name: string) => m.parsed.headers.find(([k]) => k === name.toLowerCase())?.[1] ?? null;
  const briefingId = header(BRIEFING_HEADER);
  const [briefing] = briefingId && UUID.test(briefingId) ? await db.select({ organizationId: briefings.organizationId }).from(briefings).where(eq(briefings.id, briefingId)) : [];
  await db.insert(mailMessages).values({
    organizationId: briefing?.organizationId ?? null,
    briefingId: briefing ? briefingId : null,
    kind: header(KIND_HEADER),
    receivedAt: m.receivedAt,
    envelopeFrom: m.envelopeFrom,
    envelopeTo: m.envelopeTo,
    subject: m.parsed.subject,
    fromHeader: m.parsed.from,
    toHeader: m.parsed.to,
    textBody: m.parsed.text,
    htmlBody: m.parsed.html,
    attachments: m.parsed.attachments.map(({ filename, contentType, size, sha256 }) => ({ filename, contentType, size, sha256 })),
    raw: m.raw,
  });
}

/** The fake SMTP server the start command uses when the outbox is on and no SMTP_URL is set. */
export async function startDevOutbox(db: Database, config: Config): Promise<FakeSmtpServer | null> {
  if (!outboxEnabled(config) || config.SMTP_URL) return null;
  // keep: 0 — the database keeps the messages, not the process.
  return startFakeSmtpServer({ host: '127.0.0.1', port: 0, keep: 0, onMessage: (m) => keepOutboxMessage(db, m) });
}

type Row = typeof mailMessages.$inferSelect;

function summary(r: Omit<Row, 'raw' | 'textBody' | 'htmlBody'>): OutboxMessageSummary {
  return {
    id: r.id,
    receivedAt: r.receivedAt.toISOString(),
    kind: r.kind,
    briefingId: r.briefingId,
    subject: r.subject,
    from: r.fromHeader,
    to: r.toHeader,
    envelopeTo: r.envelopeTo,
    attachments: r.attachments,
  };
}

const summaryColumns = {
  id: mailMessages.id,
  organizationId: mailMessages.organizationId,
  briefingId: mailMessages.briefingId,
  kind: mailMessages.kind,
  receivedAt: mailMessages.receivedAt,
  envelopeFrom: mailMessages.envelopeFrom,
  envelopeTo: mailMessages.envelopeTo,
  subject: mailMessages.subject,
  fromHeader: mailMessages.fromHeader,
  toHeader: mailMessages.toHeader,
  attachments: mailMessages.attachments,
};

export async function listOutbox(db: Database, organizationId: string, page: Page): Promise<OutboxMessageSummary[]> {
  const rows = await db
    .select(summaryColumns)
    .from(mailMessages)
    .where(eq(mailMessages.organizationId, organizationId))
    .orderBy(desc(mailMessages.id))
    .limit(limitPlusOne(page))
    .offset(page.offset);
  return rows.map(summary);
}

async function messageRow(db: Database, organizationId: string, id: number): Promise<Row> {
  const [row] = await db
    .select()
    .from(mailMessages)
    .where(and(eq(mailMessages.id, id), eq(mailMessages.organizationId, organizationId)));
  if (!row) throw new NotFoundError('message');
  return row;
}

export async function getOutboxMessage(db: Database, organizationId: string, id: number): Promise<OutboxMessage> {
  const row = await messageRow(db, organizationId, id);
  return { ...summary(row), text: row.textBody };
}

export async function outboxAttachment(db: Database, organizationId: string, id: number, index: number) {
  const row = await messageRow(db, organizationId, id);
  const attachment = parseMessage(row.raw).attachments[index];
  if (!attachment) throw new NotFoundError('attachment');
  return attachment;
}
