// Sends a briefing's two kinds of e-mail and records the outcome. One message per person, so
// no recipient sees the others' addresses. A mail failure never undoes the step it belongs to
// (the request or signature is already recorded): it is reported and, for distribution, kept
// on the recipient's row so that the signed copy can be sent again.
import { and, asc, eq, isNull } from 'drizzle-orm';
import type { Config } from '../../config';
import type { Database } from '../../db/client';
import { briefingDistributions } from '../../db/schema';
import { createMailer, type Mailer, type MailAddress } from './mail/mailer';
import type { MailReport } from '../../../shared/api/briefings';
import { recordAudit, type Actor } from '../audit';

export type BriefingRef = { briefingId: string; version: number; organizationName: string; planName: string; scenarioName: string | null };

export function mailerFor(config: Config): Mailer | null {
  return config.SMTP_URL ? createMailer({ smtpUrl: config.SMTP_URL, from: config.MAIL_FROM }) : null;
}

const NO_SERVER = 'No mail server is configured (SMTP_URL).';

function errorText(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

export async function sendSignOffRequests(
  mailer: Mailer | null,
  ref: BriefingRef,
  to: MailAddress[],
  requestedBy: MailAddress,
  reviewUrl: string,
  note: string | undefined,
): Promise<MailReport> {
  const report: MailReport = { sent: [], failed: [] };
  for (const person of to) {
    if (!mailer) {
      report.failed.push({ email: person.email, error: NO_SERVER });
      continue;
    }
    try {
      const sent = await mailer.sendSignOffRequest({ ...ref, to: [person], requestedBy, reviewUrl, note });
      if (sent.rejected.length > 0) report.failed.push({ email: person.email, error: 'The mail server refused the address.' });
      else report.sent.push(person.email);
    } catch (err) {
      report.failed.push({ email: person.email, error: errorText(err) });
    }
  }
  return report;
}

export type SignedCopy = {
  pdf: Buffer;
  fileSha256: string;
  signedBy: { name: string; role: string; signedAt: Date };
  verificationUrl: string;
  timeZone: string;
};

/**
 * Sends the signed copy to every recipient not yet reached (all of them the first time; those
 * that failed on a retry) and records each attempt on the recipient's row.
 */
export async function distributeSignedCopy(db: Database, mailer: Mailer | null, actor: Actor, ref: BriefingRef, copy: SignedCopy): Promise<MailReport> {
  const pending = await db
    .select()
    .from(briefingDistributions)
    .where(and(eq(briefingDistributions.briefingId, ref.briefingId), isNull(briefingDistributions.messageId)))
    .orderBy(asc(briefingDistributions.id));
  const report: MailReport = { sent: [], failed: [] };
  for (const row of pending) {
    let messageId: string | null = null;
    let error: string | null = null;
    if (!mailer) error = NO_SERVER;
    else {
      try {
        const sent = await mailer.sendDistribution({ ...ref, ...copy, to: [{ name: row.recipientName, email: row.recipientEmail }] });
        if (sent.rejected.length > 0) error = 'The mail server refused the address.';
        else messageId = sent.messageId;
      } catch (err) {
        error = errorText(err);
      }
    }
    await db.update(briefingDistributions).set({ messageId, error, sentAt: new Date(), sentBy: actor.userId }).where(eq(briefingDistributions.id, row.id));
    if (messageId) report.sent.push(row.recipientEmail);
    else report.failed.push({ email: row.recipientEmail, error: error ?? 'unknown' });
  }
  if (pending.length > 0) {
    await recordAudit(db, actor, 'briefing.distribute', 'briefing', ref.briefingId, { sent: report.sent, failed: report.failed, fileSha256: copy.fileSha256 });
  }
  return report;
}
