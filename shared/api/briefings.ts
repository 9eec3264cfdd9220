// Briefings: the signed record of one analysis run. A planner drafts one from a finished run,
// asks officials to sign it off; an official signs it (a digital signature in the PDF) or
// returns it with a comment. Signed briefings never change; a new version is a new briefing.
import { z } from 'zod';

export const briefingStatusSchema = z.enum(['draft', 'awaiting-sign-off', 'signed', 'returned']);
export type BriefingStatus = z.infer<typeof briefingStatusSchema>;

export const briefingStatusLabels: Record<BriefingStatus, string> = {
  draft: 'Draft',
  'awaiting-sign-off': 'Awaiting sign-off',
  signed: 'Signed',
  returned: 'Returned for changes',
};

const title = z.string().trim().min(1, 'Give the briefing a title.').max(200);

export const recipientSchema = z.object({
  name: z.string().trim().min(1, 'Give the recipient’s name.').max(200),
  email: z.string().trim().toLowerCase().email('Not an e-mail address.').max(320),
});
export type Recipient = z.infer<typeof recipientSchema>;

const recipients = z
  .array(recipientSchema)
  .max(50, 'At most 50 recipients.')
  .refine((list) => new Set(list.map((r) => r.email)).size === list.length, 'Each address only once.');

export const briefingCreateSchema = z.object({
  runId: z.string().uuid(),
  title,
  recipients: recipients.default([]),
});
export type BriefingCreate = z.infer<typeof briefingCreateSchema>;

export const briefingUpdateSchema = z
  .object({ title: title.optional(), recipients: recipients.optional() })
  .refine((v) => v.title !== undefined || v.recipients !== undefined, 'Nothing to change.');
export type BriefingUpdate = z.infer<typeof briefingUpdateSchema>;

/** A new version of a briefing: from the same run unless another finished run of the plan is named. */
export const briefingVersionCreateSchema = z.object({ runId: z.string().uuid().optional(), title: title.optional() });
export type BriefingVersionCreate = z.infer<typeof briefingVersionCreateSchema>;

export const signOffRequestSchema = z.object({
  reviewerIds: z
    .array(z.string().uuid())
    .min(1, 'Choose at least one official.')
    .max(20)
    .refine((ids) => new Set(ids).size === ids.length, 'Each official only once.'),
  note: z.string().trim().max(1000).optional(),
});
export type SignOffRequest = z.infer<typeof signOffRequestSchema>;

export const briefingReturnSchema = z.object({ comment: z.string().trim().min(1, 'Say what needs to change.').max(2000) });
export type BriefingReturn = z.infer<typeof briefingReturnSchema>;

export const briefingListQuerySchema = z.object({ planId: z.string().uuid().optional() });

export const briefingFileKindSchema = z.enum(['draft', 'signed']);
export const briefingFileQuerySchema = z.object({
  // Without it: the signed copy of a signed briefing, else the latest draft.
  file: briefingFileKindSchema.optional(),
  // Any value: send as a download (attachment) instead of for viewing in the page.
  download: z.string().optional(),
});

export const briefingSummarySchema = z.object({
  id: z.string().uuid(),
  planId: z.string().uuid(),
  planName: z.string(),
  runId: z.string().uuid(),
  version: z.number().int(),
  previousVersionId: z.string().uuid().nullable(),
  title: z.string(),
  status: briefingStatusSchema,
  createdAt: z.string(),
  createdByName: z.string().nullable(),
  signedAt: z.string().nullable(),
  signerName: z.string().nullable(),
  signerRole: z.string().nullable(),
  contentSha256: z.string(),
  /** Officials asked to sign who have not answered yet. */
  pendingReviewers: z.array(z.string()),
});
export type BriefingSummary = z.infer<typeof briefingSummarySchema>;

export const briefingListSchema = z.object({ briefings: z.array(briefingSummarySchema) });

export const briefingReviewSchema = z.object({
  reviewerUserId: z.string().uuid().nullable(),
  reviewerName: z.string(),
  requestedAt: z.string(),
  decision: z.enum(['pending', 'signed', 'returned', 'withdrawn']),
  comment: z.string().nullable(),
  decidedAt: z.string().nullable(),
});

export const briefingStatusChangeSchema = z.object({
  fromStatus: briefingStatusSchema.nullable(),
  toStatus: briefingStatusSchema,
  actorName: z.string().nullable(),
  comment: z.string().nullable(),
  at: z.string(),
});

export const briefingDistributionSchema = z.object({
  recipientName: z.string(),
  recipientEmail: z.string(),
  // null until the signed copy has been sent (or tried).
  sentAt: z.string().nullable(),
  state: z.enum(['waiting-for-signature', 'sent', 'failed']),
  error: z.string().nullable(),
});
export type BriefingDistribution = z.infer<typeof briefingDistributionSchema>;

export const briefingFileInfoSchema = z.object({ sha256: z.string(), byteLength: z.number().int(), createdAt: z.string() });

export const briefingDetailSchema = briefingSummarySchema.extend({
  headline: z.object({
    steadyStatePersonsPerHour: z.number(),
    steadyStateVehiclesPerHour: z.number(),
    deliveredPersons: z.number(),
    demandPersons: z.number(),
    horizonMinutes: z.number(),
    clearanceMinutes: z.number().nullable(),
  }),
  reviews: z.array(briefingReviewSchema),
  history: z.array(briefingStatusChangeSchema),
  distributions: z.array(briefingDistributionSchema),
  files: z.object({ draft: briefingFileInfoSchema.nullable(), signed: briefingFileInfoSchema.nullable() }),
  /** The signed-in official was asked and may sign or return it now. */
  canDecide: z.boolean(),
  /** A later version of this briefing, if one was made. */
  nextVersionId: z.string().uuid().nullable(),
});
export type BriefingDetail = z.infer<typeof briefingDetailSchema>;

/** What a step reports about its e-mail: the step itself is recorded whatever the mail server said. */
export const mailReportSchema = z.object({ sent: z.array(z.string()), failed: z.array(z.object({ email: z.string(), error: z.string() })) });
export type MailReport = z.infer<typeof mailReportSchema>;

export const briefingStepResponseSchema = z.object({ briefing: briefingDetailSchema, mail: mailReportSchema.nullable() });
export type BriefingStepResponse = z.infer<typeof briefingStepResponseSchema>;

export const officialSchema = z.object({ id: z.string().uuid(), displayName: z.string(), email: z.string() });
export const officialListSchema = z.object({ officials: z.array(officialSchema) });
export type Official = z.infer<typeof officialSchema>;

// ---------------------------------------------------------------------------------------------
// Verification of an uploaded PDF

export const verificationSchema = z.object({
  /** The signature holds, covers the whole file and was made with a certificate of this installation. */
  valid: z.boolean(),
  /** Valid, and byte for byte the signed copy on record. */
  unaltered: z.boolean(),
  fileSha256: z.string(),
  signed: z.boolean(),
  signerName: z.string().nullable(),
  signerRole: z.string().nullable(),
  signedAt: z.string().nullable(),
  /** The organisation whose certificate made the signature (null: none of this installation's). */
  organizationName: z.string().nullable(),
  /** Only for a signed-in member: whether the signature is their organisation's. */
  ofYourOrganization: z.boolean().nullable(),
  briefingId: z.string().nullable(),
  version: z.number().int().nullable(),
  /** 'signed-copy': these exact bytes are the signed copy on record; 'draft': a draft on record. */
  onRecord: z.enum(['signed-copy', 'draft', 'none']),
  /** The content SHA-256 in the file equals the one recorded for that briefing. */
  contentMatchesRecord: z.boolean().nullable(),
  certificate: z.object({
    subject: z.string().nullable(),
    fingerprintSha256: z.string().nullable(),
    // 'generated': the organisation's own self-signed certificate, which other PDF readers call untrusted.
    source: z.enum(['generated', 'configured']).nullable(),
  }),
  /** Title and plan, for a signed-in member of the briefing's organisation. */
  title: z.string().nullable(),
  planName: z.string().nullable(),
  problems: z.array(z.string()),
});
export type Verification = z.infer<typeof verificationSchema>;

// ---------------------------------------------------------------------------------------------
// Development outbox

export const outboxAttachmentSchema = z.object({ filename: z.string().nullable(), contentType: z.string(), size: z.number(), sha256: z.string() });

export const outboxMessageSummarySchema = z.object({
  id: z.number().int(),
  receivedAt: z.string(),
  kind: z.string().nullable(),
  briefingId: z.string().nullable(),
  subject: z.string().nullable(),
  from: z.string().nullable(),
  to: z.string().nullable(),
  envelopeTo: z.array(z.string()),
  attachments: z.array(outboxAttachmentSchema),
});
export type OutboxMessageSummary = z.infer<typeof outboxMessageSummarySchema>;

export const outboxListSchema = z.object({ enabled: z.boolean(), messages: z.array(outboxMessageSummarySchema) });

export const outboxMessageSchema = outboxMessageSummarySchema.extend({ text: z.string().nullable() });
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;

export const outboxParamsSchema = z.object({ messageId: z.coerce.number().int().positive() });
export const outboxAttachmentParamsSchema = outboxParamsSchema.extend({ index: z.coerce.number().int().min(0) });
