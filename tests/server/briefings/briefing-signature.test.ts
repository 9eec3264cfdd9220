// The signed briefing checked by two readers that are not ours — poppler's pdfsig and
// `openssl cms -verify` — and by verify-pdf.ts: valid as signed, invalid after one changed byte
// inside the signed range, after bytes appended, or with another organisation's certificate.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import forge from 'node-forge';
import { beforeAll, describe, expect, it } from 'vitest';
import { signBriefing, type SignedBriefing } from '../../../server/services/briefings/sign-briefing';
import { renderBriefing } from '../../../server/services/briefings/render-briefing';
import {
  CertificateError,
  generateOrganizationCertificate,
  loadStoredCertificate,
  loadOrganizationCertificate,
  readConfiguredCertificate,
  resolveOrganizationCertificate,
  type OrganizationCertificate,
} from '../../../server/services/briefings/signing/organization-certificate';
import { verifyPdf } from '../../../server/services/briefings/signing/verify-pdf';
import { briefingInput, signer } from '../../fixtures/briefing/demo-town-briefing';
import { pdfSig, pdfToText } from './support/poppler';

const signedAt = new Date('2026-12-02T14:05:33Z');
// The test certificates are issued just before that fixed signing time, so they verify on any later day.
const issuedAt = new Date('2026-12-02T14:00:00Z');
let org: OrganizationCertificate;
let other: OrganizationCertificate;
let signed: SignedBriefing;

/** A byte inside the first signed range, in the middle of a content stream. */
function offsetInsideSignedRange(pdf: Buffer): number {
  const [, firstLength] = /\/ByteRange \[(\d+) +(\d+)/.exec(pdf.toString('latin1'))!.slice(1).map(Number) as [number, number];
  const stream = pdf.indexOf('stream\n', 2000);
  expect(stream).toBeGreaterThan(0);
  const at = stream + 40;
  expect(at).toBeLessThan(firstLength);
  return at;
}

beforeAll(async () => {
  org = generateOrganizationCertificate({ organizationName: 'Demo Emergency Management Office', passphrase: 'demo signing passphrase', now: issuedAt });
  other = generateOrganizationCertificate({ organizationName: 'Other County', passphrase: 'other signing passphrase', now: issuedAt });
  signed = await signBriefing(briefingInput(), signer, org, signedAt);
});

describe('pdfsig (poppler)', () => {
  it('reports the signature of a signed briefing as valid and covering the whole document', () => {
    const out = pdfSig(signed.pdf);
    expect(out).toContain('Signature Type: adbe.pkcs7.detached');
    expect(out).toContain('Signing Hash Algorithm: SHA-256');
    expect(out).toContain('Total document signed');
    expect(out).toContain('Signature Validation: Signature is Valid.');
    expect(out).toContain('Signer Certificate Common Name: Demo Emergency Management Office - briefing signing');
    expect(out).toContain('Signing Time: Dec 02 2026 14:05:33');
  });

  it('reports a copy with one byte changed inside the signed range as invalid', () => {
    const tampered = Buffer.from(signed.pdf);
    const at = offsetInsideSignedRange(tampered);
    tampered[at] = tampered[at]! ^ 0x01;
    const out = pdfSig(tampered);
    expect(out).toContain('Signature #1');
    expect(out).not.toContain('Signature is Valid.');
    expect(out).toMatch(/Signature Validation: (Signature is Invalid|Digest Mismatch)/);
  });
});

describe('openssl cms', () => {
  it('verifies the embedded CMS over the signed byte ranges', () => {
    const text = signed.pdf.toString('latin1');
    const [a, b, c, d] = /\/ByteRange \[(\d+) +(\d+) +(\d+) +(\d+)/.exec(text)!.slice(1).map(Number) as [number, number, number, number];
    const hex = text.slice(b + 1, c - 1).replace(/(00)+$/, '');
    const dir = mkdtempSync(path.join(tmpdir(), 'cutline-cms-'));
    try {
      writeFileSync(path.join(dir, 'sig.der'), Buffer.from(hex.length % 2 ? `${hex}0` : hex, 'hex'));
      writeFileSync(path.join(dir, 'content.bin'), Buffer.concat([signed.pdf.subarray(a, a + b), signed.pdf.subarray(c, c + d)]));
      // -noverify: the certificate is self-signed; this checks the signature, not a chain of trust.
      const r = spawnSync('openssl', ['cms', '-verify', '-binary', '-inform', 'DER', '-in', path.join(dir, 'sig.der'), '-content', path.join(dir, 'content.bin'), '-noverify', '-out', '/dev/null'], {
        encoding: 'utf8',
      });
      expect(r.stderr).toContain('Verification successful');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('verifyPdf', () => {
  it('accepts the signed briefing and names the signer, the time and the briefing', () => {
    const v = verifyPdf(signed.pdf, [org.certificatePem]);
    expect(v.problems).toEqual([]);
    expect(v).toMatchObject({
      valid: true,
      signaturePresent: true,
      signatureCount: 1,
      coversWholeFile: true,
      digestMatches: true,
      cmsSignatureValid: true,
      signedByOrganization: true,
      certificateValidAtSigning: true,
      signer: { name: 'Mina Ashcombe', role: 'Emergency Management Director', certificateFingerprintSha256: org.fingerprintSha256 },
      briefing: { id: '3c9f0e6a-5b2d-4a17-8e4c-7d1b2a9f6e08', version: 1, contentSha256: signed.contentSha256, status: 'signed', organization: 'Demo Emergency Management Office' },
      fileSha256: signed.fileSha256,
    });
    expect(v.signingTime?.toISOString()).toBe('2026-12-02T14:05:33.000Z');
    expect(v.byteRange?.[0]).toBe(0);
  });

  it('rejects a copy with one byte changed inside the signed range', () => {
    const tampered = Buffer.from(signed.pdf);
    const at = offsetInsideSignedRange(tampered);
    tampered[at] = tampered[at]! ^ 0x01;
    const v = verifyPdf(tampered, [org.certificatePem]);
    expect(v.valid).toBe(false);
    expect(v.digestMatches).toBe(false);
    expect(v.problems.join(' ')).toContain('changed since it was signed');
  });

  it('rejects a copy with a changed figure in the metadata', () => {
    const text = signed.pdf.toString('latin1');
    const at = text.indexOf('(Mina Ashcombe)');
    const tampered = Buffer.from(signed.pdf);
    tampered.write('(Mina Ashcombx)', at, 'latin1');
    expect(verifyPdf(tampered, [org.certificatePem]).valid).toBe(false);
  });

  it('rejects a copy with anything appended after signing', () => {
    const appended = Buffer.concat([signed.pdf, Buffer.from('\n1 0 obj\n(more)\nendobj\n')]);
    const v = verifyPdf(appended, [org.certificatePem]);
    expect(v.valid).toBe(false);
    expect(v.coversWholeFile).toBe(false);
  });

  it('rejects a corrupted signature value', () => {
    const text = signed.pdf.toString('latin1');
    const b = Number(/\/ByteRange \[\d+ +(\d+)/.exec(text)![1]);
    const tampered = Buffer.from(signed.pdf);
    // Inside the RSA signature bytes near the end of the CMS: still parses, no longer verifies.
    const cmsHexEnd = text.indexOf('>', b) - 1;
    const hex = text.slice(b + 1, cmsHexEnd + 1).replace(/(00)+$/, '');
    const pos = b + 1 + hex.length - 20;
    tampered.write(tampered[pos] === 0x30 ? '1' : '0', pos, 'latin1');
    const v = verifyPdf(tampered, [org.certificatePem]);
    expect(v.valid).toBe(false);
    expect(v.cmsSignatureValid).toBe(false);
  });

  it('tells a briefing signed by another organisation apart', async () => {
    const theirs = await signBriefing(briefingInput({ organizationName: 'Other County' }), signer, other, signedAt);
    const v = verifyPdf(theirs.pdf, [org.certificatePem]);
    expect(v.cmsSignatureValid).toBe(true);
    expect(v.signedByOrganization).toBe(false);
    expect(v.valid).toBe(false);
    // A retired certificate of the organisation still counts.
    expect(verifyPdf(theirs.pdf, [org.certificatePem, other.certificatePem]).valid).toBe(true);
  });

  it('says an unsigned draft carries no signature, and a non-PDF is not readable', async () => {
    const draft = await renderBriefing(briefingInput());
    const v = verifyPdf(draft.pdf, [org.certificatePem]);
    expect(v).toMatchObject({ valid: false, signaturePresent: false, briefing: { id: '3c9f0e6a-5b2d-4a17-8e4c-7d1b2a9f6e08', status: 'draft' } });
    expect(verifyPdf(Buffer.from('hello'), [org.certificatePem]).problems[0]).toContain('not a readable PDF');
  });
});

describe('organisation certificate', () => {
  it('is self-signed RSA 2048 with SHA-256 and the organisation in its subject', () => {
    const cert = forge.pki.certificateFromPem(org.certificatePem);
    expect((cert.publicKey as forge.pki.rsa.PublicKey).n.bitLength()).toBe(2048);
    expect(forge.pki.oids[cert.signatureOid]).toBe('sha256WithRSAEncryption');
    expect(cert.verify(cert)).toBe(true);
    expect(org.subject).toBe('CN=Demo Emergency Management Office - briefing signing, O=Demo Emergency Management Office');
    expect(org.notAfter.getTime() - org.notBefore.getTime()).toBeGreaterThan(9 * 365 * 86_400_000);
  });

  it('reads back from its P12, and refuses a wrong passphrase', () => {
    // The P12 opens with its own password (derived from the passphrase); the stored, sealed key
    // opens with the passphrase itself.
    const again = loadOrganizationCertificate(org.p12, org.passphrase, 'generated');
    expect(again.fingerprintSha256).toBe(org.fingerprintSha256);
    expect(() => loadOrganizationCertificate(org.p12, 'wrong passphrase')).toThrow(CertificateError);
    expect(loadStoredCertificate(org.stored!, 'demo signing passphrase').fingerprintSha256).toBe(org.fingerprintSha256);
    expect(() => loadStoredCertificate(org.stored!, 'wrong passphrase')).toThrow(CertificateError);
  });

  it('uses a configured P12 file instead of generating one', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'cutline-p12-'));
    try {
      const file = path.join(dir, 'org.p12');
      writeFileSync(file, other.p12);
      const configured = await resolveOrganizationCertificate({
        organizationName: 'Demo Emergency Management Office',
        configured: { path: file, passphrase: other.passphrase },
        passphrase: 'unused passphrase',
      });
      expect(configured.created).toBe(false);
      expect(configured.certificate.source).toBe('configured');
      expect(configured.certificate.fingerprintSha256).toBe(other.fingerprintSha256);
      await expect(readConfiguredCertificate(file, 'nope')).rejects.toThrow(/wrong passphrase/);

      const stored = await resolveOrganizationCertificate({ organizationName: 'x', stored: { p12: org.stored! }, passphrase: 'demo signing passphrase' });
      expect(stored).toMatchObject({ created: false, certificate: { fingerprintSha256: org.fingerprintSha256 } });
      const fresh = await resolveOrganizationCertificate({ organizationName: 'New Office', passphrase: 'a new passphrase' });
      expect(fresh.created).toBe(true);
      expect(fresh.certificate.subject).toContain('O=New Office');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('signs for organisations and officials whose names are not ASCII', async () => {
    const name = 'Comté de Sainte-Élise Ochrana Łódź';
    const cert = generateOrganizationCertificate({ organizationName: name, passphrase: 'unicode passphrase', now: issuedAt });
    // The certificate spells the name in ASCII (see certificateName); the page spells it in full.
    expect(cert.subject).toContain('O=Comte de Sainte-Elise Ochrana Lodz');
    const official = { name: 'Zoë Dvořák', role: 'Directrice des secours' };
    const s = await signBriefing(briefingInput({ organizationName: name }), official, cert, signedAt);
    expect(pdfSig(s.pdf)).toContain('Signature is Valid.');
    const v = verifyPdf(s.pdf, [cert.certificatePem]);
    expect(v.valid).toBe(true);
    expect(v.signer).toMatchObject({ name: 'Zoë Dvořák', role: 'Directrice des secours' });
    expect(v.briefing.organization).toBe(name);
    const text = pdfToText(s.pdf);
    expect(text).toContain('Zoë Dvořák, Directrice des secours');
    expect(text).toContain(name);
  });

  it('refuses a configured certificate whose issuer name the signing library would garble', () => {
    const keys = forge.pki.rsa.generateKeyPair({ bits: 2048 });
    const cert = forge.pki.createCertificate();
    cert.publicKey = keys.publicKey;
    cert.serialNumber = '01';
    cert.validity.notBefore = new Date('2026-01-01T00:00:00Z');
    cert.validity.notAfter = new Date('2030-01-01T00:00:00Z');
    const dn = [{ name: 'commonName', value: 'Préfecture', valueTagClass: forge.asn1.Type.UTF8 as unknown as forge.asn1.Class }];
    cert.setSubject(dn);
    cert.setIssuer(dn);
    cert.sign(keys.privateKey, forge.md.sha256.create());
    const p12 = Buffer.from(forge.asn1.toDer(forge.pkcs12.toPkcs12Asn1(keys.privateKey, [cert], 'configured pass', { algorithm: '3des' })).getBytes(), 'binary');
    expect(() => loadOrganizationCertificate(p12, 'configured pass')).toThrow(/issuer name has non-ASCII letters/);
  });

  it('refuses to sign outside the certificate validity', async () => {
    const shortLived = generateOrganizationCertificate({ organizationName: 'Demo', passphrase: 'short lived 1', validDays: 1, now: new Date('2020-01-01T00:00:00Z') });
    await expect(signBriefing(briefingInput(), signer, shortLived, signedAt)).rejects.toThrow(/not valid at the signing time/);
  });
});
