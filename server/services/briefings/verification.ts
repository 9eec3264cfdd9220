// Answers for an uploaded PDF: is it a briefing signed by one of this installation's
// organisations, unaltered (the signature holds over the whole file and the bytes are the
// signed copy on record), who signed it and when. Anyone may ask — a recipient outside the
// organisation must be able to check a copy — but the answer to a stranger holds only what
// the file itself already says; title and plan are added for members of the organisation.
import { eq } from 'drizzle-orm';
import type { Database } from '../../db/client';
import { briefingFiles, briefings, organizationSigningKeys, organizations, plans } from '../../db/schema';
import { verifyInWorker, type VerifierBudget } from './signing/verify-in-worker';
import type { Config } from '../../config';
import type { Verification } from '../../../shared/api/briefings';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export function verifierBudget(config: Config): VerifierBudget {
  return {
    timeMilliseconds: config.VERIFY_TIME_BUDGET_MILLISECONDS,
    memoryMegabytes: config.VERIFY_MEMORY_BUDGET_MEGABYTES,
    threads: config.VERIFY_THREADS,
    queue: config.VERIFY_QUEUE,
  };
}

/** Anyone may upload here: the file is read in a worker thread with a time and memory budget. */
export async function verifyUpload(db: Database, config: Config, pdf: Buffer, viewerOrganizationId: string | null): Promise<Verification> {
  // Retired keys too: briefings they signed must still verify.
  const keys = await db
    .select({
      id: organizationSigningKeys.id,
      pem: organizationSigningKeys.certificatePem,
      fingerprint: organizationSigningKeys.fingerprintSha256,
      organizationId: organizationSigningKeys.organizationId,
      source: organizationSigningKeys.source,
      organizationName: organizations.name,
    })
    .from(organizationSigningKeys)
    .innerJoin(organizations, eq(organizations.id, organizationSigningKeys.organizationId));
  const v = await verifyInWorker(pdf, keys.map((k) => k.pem), verifierBudget(config));
  const key = keys.find((k) => k.fingerprint === v.signer.certificateFingerprintSha256) ?? null;
  const problems = [...v.problems];

  const [file] = await db
    .select({ kind: briefingFiles.kind, briefingId: briefingFiles.briefingId })
    .from(briefingFiles)
    .where(eq(briefingFiles.sha256, v.fileSha256))
    .limit(1);
  const claimedId = v.briefing.id && UUID.test(v.briefing.id) ? v.briefing.id : null;
  const recordId = file?.briefingId ?? claimedId;
  const [record] = recordId
    ? await db
        .select({
          id: briefings.id,
          organizationId: briefings.organizationId,
          status: briefings.status,
          contentSha256: briefings.contentSha256,
          signingKeyId: briefings.signingKeyId,
          title: briefings.title,
          planName: plans.name,
        })
        .from(briefings)
        .innerJoin(plans, eq(plans.id, briefings.planId))
        .where(eq(briefings.id, recordId))
    : [];

  const onRecord = file ? (file.kind === 'signed' ? 'signed-copy' : 'draft') : 'none';
  const contentMatchesRecord = record && v.briefing.contentSha256 ? record.contentSha256 === v.briefing.contentSha256 : null;
  if (v.valid) {
    if (!record) problems.push('No briefing with this identifier is on record here.');
    else {
      if (key && record.organizationId !== key.organizationId) problems.push('The signature belongs to another organisation than the briefing on record.');
      if (record.status !== 'signed') problems.push('The briefing on record is not signed.');
      else if (key && record.signingKeyId !== key.id) problems.push('The briefing on record was signed with another certificate.');
      if (contentMatchesRecord === false) problems.push('The figures in this file are not the ones on record for this briefing.');
      if (onRecord !== 'signed-copy') problems.push('The signature holds, but these bytes are not the signed copy on record.');
    }
  } else if (onRecord === 'draft') {
    problems.push('This is an unsigned draft: drafts are not for distribution.');
  }

  const member = record !== undefined && viewerOrganizationId !== null && record.organizationId === viewerOrganizationId;
  const unaltered = v.valid && onRecord === 'signed-copy' && contentMatchesRecord === true && record?.status === 'signed' && record.signingKeyId === key?.id;
  return {
    valid: v.valid,
    unaltered,
    fileSha256: v.fileSha256,
    signed: v.signaturePresent,
    signerName: v.signaturePresent ? v.signer.name : null,
    signerRole: v.signaturePresent ? v.signer.role : null,
    signedAt: v.signingTime?.toISOString() ?? null,
    organizationName: v.valid && key ? key.organizationName : null,
    ofYourOrganization: viewerOrganizationId === null ? null : key !== null && key.organizationId === viewerOrganizationId,
    briefingId: v.briefing.id,
    version: v.briefing.version,
    onRecord,
    contentMatchesRecord,
    certificate: { subject: v.signer.certificateSubject, fingerprintSha256: v.signer.certificateFingerprintSha256, source: key?.source ?? null },
    title: member ? record.title : null,
    planName: member ? record.planName : null,
    problems: [...new Set(problems)],
  };
}
