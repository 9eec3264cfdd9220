// The organisation's signing certificate: a configured PKCS#12 file when one is given (a real
// certificate from a certificate authority), otherwise a self-signed one made with node-forge at
// first start (RSA 2048, SHA-256) and kept by the caller in organization_signing_keys.
//
// A self-signed certificate proves that the file is unchanged since this Cutline installation
// signed it; it does not prove to an outside reader who the organisation is (pdfsig says
// "Certificate issuer isn't Trusted"). That is why a real certificate can be configured.
import { createHash, randomBytes } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { derivePkcs12Password, newKeySalt, openKey, sealKey } from './key-envelope';
import forge from 'node-forge';

export type CertificateSource = 'generated' | 'configured';

export type OrganizationCertificate = {
  source: CertificateSource;
  /** PKCS#12 (private key + certificate), encrypted with `passphrase` (what the signer opens). */
  p12: Buffer;
  passphrase: string;
  /** What the database keeps of a generated key (key-envelope.ts); absent for a configured file. */
  stored?: Buffer;
  certificatePem: string;
  /** SHA-256 of the certificate's DER bytes, lower-case hex: how verification recognises it. */
  fingerprintSha256: string;
  subject: string;
  serialNumber: string;
  notBefore: Date;
  notAfter: Date;
};

export class CertificateError extends Error {}

const DAY_MS = 86_400_000;

export function certificateFingerprint(cert: forge.pki.Certificate): string {
  const der = forge.asn1.toDer(forge.pki.certificateToAsn1(cert)).getBytes();
  return createHash('sha256').update(Buffer.from(der, 'binary')).digest('hex');
}

// (@types/node-forge types valueTagClass as a tag class; forge reads it as the tag type.)
const UTF8 = forge.asn1.Type.UTF8 as unknown as forge.asn1.Class;

/**
 * Names in our certificates are kept to ASCII: node-forge re-encodes a parsed UTF-8 name when it
 * writes the signer's issuer into the CMS, so a name with "é" or "Ł" no longer matches its own
 * certificate and pdfsig rejects the signature. The full name still prints on every page.
 */
export function certificateName(name: string): string {
  const special: Record<string, string> = { Ł: 'L', ł: 'l', Ø: 'O', ø: 'o', Đ: 'D', đ: 'd', ß: 'ss', Æ: 'AE', æ: 'ae', Œ: 'OE', œ: 'oe', Þ: 'Th', þ: 'th', '—': '-', '–': '-' };
  return name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^\x20-\x7e]/g, (c) => special[c] ?? '?')
    .trim();
}

function isAscii(value: unknown): boolean {
  return typeof value === 'string' && /^[\x20-\x7e]*$/.test(value);
}

export function subjectString(cert: forge.pki.Certificate): string {
  return cert.subject.attributes.map((a) => `${a.shortName ?? a.name}=${String(a.value)}`).join(', ');
}

function describe(source: CertificateSource, p12: Buffer, passphrase: string, cert: forge.pki.Certificate): OrganizationCertificate {
  return {
    source,
    p12,
    passphrase,
    certificatePem: forge.pki.certificateToPem(cert),
    fingerprintSha256: certificateFingerprint(cert),
    subject: subjectString(cert),
    serialNumber: cert.serialNumber,
    notBefore: cert.validity.notBefore,
    notAfter: cert.validity.notAfter,
  };
}

export type GenerateOptions = {
  organizationName: string;
  /** Encrypts the P12; take it from the environment, never store it next to the P12. */
  passphrase: string;
  validDays?: number;
  now?: Date;
};

export function generateOrganizationCertificate({ organizationName, passphrase, validDays = 3650, now = new Date() }: GenerateOptions): OrganizationCertificate {
  if (passphrase.length < 8) throw new CertificateError('the signing key passphrase needs at least 8 characters');
  const keys = forge.pki.rsa.generateKeyPair({ bits: 2048, e: 0x10001 });
  const cert = forge.pki.createCertificate();
  cert.publicKey = keys.publicKey;
  // A positive 128-bit serial: random, so two installations never issue the same one.
  const serial = randomBytes(16);
  serial[0] = serial[0]! & 0x7f;
  cert.serialNumber = serial.toString('hex');
  // Back-dated a few minutes so a verifier with a slightly slow clock accepts a fresh signature.
  cert.validity.notBefore = new Date(now.getTime() - 5 * 60_000);
  cert.validity.notAfter = new Date(now.getTime() + validDays * DAY_MS);
  const name = [
    { name: 'commonName', value: `${certificateName(organizationName)} - briefing signing`, valueTagClass: UTF8 },
    { name: 'organizationName', value: certificateName(organizationName), valueTagClass: UTF8 },
  ];
  cert.setSubject(name);
  cert.setIssuer(name);
  cert.setExtensions([
    { name: 'basicConstraints', cA: false, critical: true },
    { name: 'keyUsage', digitalSignature: true, nonRepudiation: true, critical: true },
    { name: 'subjectKeyIdentifier' },
  ]);
  cert.sign(keys.privateKey, forge.md.sha256.create());
  // AES-256 under PBKDF2-HMAC-SHA256, with a password derived from the passphrase by scrypt.
  const salt = newKeySalt();
  const password = derivePkcs12Password(passphrase, salt);
  const asn1 = forge.pkcs12.toPkcs12Asn1(keys.privateKey, [cert], password, {
    algorithm: 'aes256',
    prfAlgorithm: 'sha256',
    count: 10_000,
    saltSize: 16,
    friendlyName: `${organizationName} briefing signing`,
  } as Parameters<typeof forge.pkcs12.toPkcs12Asn1>[3]);
  const p12 = Buffer.from(forge.asn1.toDer(asn1).getBytes(), 'binary');
  return { ...describe('generated', p12, password, cert), stored: sealKey(p12, salt) };
}

/** Opens a generated key as the database keeps it: sealed (key-envelope.ts), or an older plain PKCS#12. */
export function loadStoredCertificate(stored: Buffer, passphrase: string): OrganizationCertificate {
  const sealed = openKey(stored);
  if (!sealed) return { ...loadOrganizationCertificate(stored, passphrase, 'generated'), stored };
  return { ...loadOrganizationCertificate(sealed.p12, derivePkcs12Password(passphrase, sealed.salt), 'generated'), stored };
}

/**
 * Reads a PKCS#12 and checks it can sign: a shrouded private key (the kind @signpdf's P12Signer
 * reads) and a certificate whose public key matches it.
 */
export function loadOrganizationCertificate(p12: Buffer, passphrase: string, source: CertificateSource = 'configured'): OrganizationCertificate {
  let pfx: forge.pkcs12.Pkcs12Pfx;
  try {
    pfx = forge.pkcs12.pkcs12FromAsn1(forge.asn1.fromDer(forge.util.createBuffer(p12.toString('binary'))), false, passphrase);
  } catch (err) {
    throw new CertificateError(`cannot open the signing certificate (wrong passphrase or not a PKCS#12 file): ${(err as Error).message}`);
  }
  const keyBags = pfx.getBags({ bagType: forge.pki.oids.pkcs8ShroudedKeyBag! })[forge.pki.oids.pkcs8ShroudedKeyBag!] ?? [];
  const key = keyBags[0]?.key as forge.pki.rsa.PrivateKey | undefined;
  if (!key) throw new CertificateError('the signing certificate file holds no encrypted (PKCS#8 shrouded) private key');
  const certBags = pfx.getBags({ bagType: forge.pki.oids.certBag! })[forge.pki.oids.certBag!] ?? [];
  const cert = certBags
    .map((b) => b.cert)
    .find((c): c is forge.pki.Certificate => {
      const pub = c?.publicKey as forge.pki.rsa.PublicKey | undefined;
      return !!pub && pub.n.compareTo(key.n) === 0 && pub.e.compareTo(key.e) === 0;
    });
  if (!cert) throw new CertificateError('no certificate in the file matches its private key');
  // See certificateName: such an issuer name would make every signature invalid, so say so now.
  if (!cert.issuer.attributes.every((a) => isAscii(a.value))) {
    throw new CertificateError('the certificate issuer name has non-ASCII letters, which the signing library cannot write correctly; use a certificate whose issuer name is ASCII');
  }
  return describe(source, p12, passphrase, cert);
}

export async function readConfiguredCertificate(path: string, passphrase: string): Promise<OrganizationCertificate> {
  return loadOrganizationCertificate(await readFile(path), passphrase, 'configured');
}

export type ResolveOptions = {
  organizationName: string;
  /** A configured P12 wins over everything else. */
  configured?: { path: string; passphrase: string } | undefined;
  /** The P12 kept from an earlier start, if any. */
  stored?: { p12: Buffer } | undefined;
  /** Passphrase of the stored or to-be-generated P12. */
  passphrase: string;
  now?: Date;
};

/**
 * The certificate to sign with: configured, else stored, else newly generated. `created` tells
 * the caller to store the new one (and record that in the audit log).
 */
export async function resolveOrganizationCertificate(o: ResolveOptions): Promise<{ certificate: OrganizationCertificate; created: boolean }> {
  if (o.configured) return { certificate: await readConfiguredCertificate(o.configured.path, o.configured.passphrase), created: false };
  if (o.stored) return { certificate: loadStoredCertificate(o.stored.p12, o.passphrase), created: false };
  return { certificate: generateOrganizationCertificate({ organizationName: o.organizationName, passphrase: o.passphrase, now: o.now }), created: true };
}
