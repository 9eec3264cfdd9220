// The organisation's signing certificate at the moment of signing: the configured PKCS#12 if
// there is one, else the generated key kept in organization_signing_keys, else a new one made
// now (first need) and stored. Every certificate used is recorded there, so that verification
// knows it and a briefing row can point at the key that signed it.
import { and, eq, isNull } from 'drizzle-orm';
import type { Tx } from '../../db/client';
import { organizationSigningKeys, organizations } from '../../db/schema';
import type { Config } from '../../config';
import {
  CertificateError,
  loadStoredCertificate,
  readConfiguredCertificate,
  resolveOrganizationCertificate,
  type OrganizationCertificate,
} from './signing/organization-certificate';
import { ConflictError, HttpError, NotFoundError } from '../../errors';
import { recordAudit, type Actor } from '../audit';

export type SigningKey = { certificate: OrganizationCertificate; keyId: string };

function unusable(err: unknown): never {
  if (err instanceof CertificateError) {
    throw new HttpError(
      500,
      'internal',
      `The organisation's signing certificate cannot be used (${err.message}). An administrator must check SIGNING_KEY_PASSPHRASE or SIGNING_P12_PATH and SIGNING_P12_PASSPHRASE.`,
    );
  }
  throw err;
}

async function store(tx: Tx, actor: Actor, certificate: OrganizationCertificate): Promise<string> {
  const now = new Date();
  await tx
    .update(organizationSigningKeys)
    .set({ retiredAt: now })
    .where(and(eq(organizationSigningKeys.organizationId, actor.organizationId), isNull(organizationSigningKeys.retiredAt)));
  const [row] = await tx
    .insert(organizationSigningKeys)
    .values({
      organizationId: actor.organizationId,
      source: certificate.source,
      // A configured key stays in its file; only a generated one is kept here (encrypted).
      p12: certificate.source === 'generated' ? (certificate.stored ?? certificate.p12) : null,
      certificatePem: certificate.certificatePem,
      fingerprintSha256: certificate.fingerprintSha256,
      subject: certificate.subject,
      serialNumber: certificate.serialNumber,
      notBefore: certificate.notBefore,
      notAfter: certificate.notAfter,
    })
    .returning({ id: organizationSigningKeys.id });
  await recordAudit(tx, actor, 'signing-key.create', 'organization_signing_key', row!.id, {
    source: certificate.source,
    subject: certificate.subject,
    fingerprintSha256: certificate.fingerprintSha256,
    notAfter: certificate.notAfter.toISOString(),
  });
  return row!.id;
}

/** Call inside the signing transaction: the organisation row is locked so two first signatures cannot both make a key. */
export async function signingKeyFor(tx: Tx, config: Config, actor: Actor): Promise<SigningKey> {
  const [org] = await tx.select({ name: organizations.name }).from(organizations).where(eq(organizations.id, actor.organizationId)).for('update');
  if (!org) throw new NotFoundError('organization');

  if (config.SIGNING_P12_PATH) {
    const certificate = await readConfiguredCertificate(config.SIGNING_P12_PATH, config.SIGNING_P12_PASSPHRASE).catch(unusable);
    const [known] = await tx.select().from(organizationSigningKeys).where(eq(organizationSigningKeys.fingerprintSha256, certificate.fingerprintSha256));
    if (known && known.organizationId !== actor.organizationId) {
      // organization_signing_keys.fingerprint_sha256 is unique across organisations.
      throw new ConflictError('The configured signing certificate is already registered to another organisation of this installation.');
    }
    return { certificate, keyId: known?.id ?? (await store(tx, actor, certificate)) };
  }

  const [active] = await tx
    .select()
    .from(organizationSigningKeys)
    .where(and(eq(organizationSigningKeys.organizationId, actor.organizationId), isNull(organizationSigningKeys.retiredAt)));
  if (active?.source === 'generated' && active.p12) {
    try {
      return { certificate: loadStoredCertificate(active.p12, config.SIGNING_KEY_PASSPHRASE), keyId: active.id };
    } catch (err) {
      unusable(err);
    }
  }
  // No key yet, or the active one was a configured certificate that is no longer configured.
  const { certificate } = await resolveOrganizationCertificate({ organizationName: org.name, passphrase: config.SIGNING_KEY_PASSPHRASE }).catch(unusable);
  return { certificate, keyId: await store(tx, actor, certificate) };
}
