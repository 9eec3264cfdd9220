// Generated organisation signing keys as the database keeps them: a PKCS#12 under AES-256-CBC
// with PBKDF2-HMAC-SHA256 (checked with `openssl pkcs12 -info`, an outside reader), whose
// password is derived from the passphrase with scrypt and a salt kept beside it. Before, keys
// were 3DES PKCS#12 files with node-forge's default 2,048 SHA-1 rounds under the passphrase
// itself. Older keys still open; a wrong passphrase opens nothing; signing still verifies.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import forge from 'node-forge';
import { describe, expect, it } from 'vitest';
import { CertificateError, generateOrganizationCertificate, loadStoredCertificate } from '../../../server/services/briefings/signing/organization-certificate';
import { openKey } from '../../../server/services/briefings/signing/key-envelope';
import { signBriefing } from '../../../server/services/briefings/sign-briefing';
import { verifyPdf } from '../../../server/services/briefings/signing/verify-pdf';
import { briefingInput, signer } from '../../fixtures/briefing/demo-town-briefing';

const passphrase = 'a long signing passphrase for the test office';

function opensslInfo(p12: Buffer, password: string): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'cutline-p12-'));
  try {
    writeFileSync(path.join(dir, 'k.p12'), p12);
    const r = spawnSync('openssl', ['pkcs12', '-info', '-in', path.join(dir, 'k.p12'), '-noout', '-passin', `pass:${password}`], { encoding: 'utf8' });
    return `${r.stdout}${r.stderr}`;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe('stored signing keys', () => {
  const generated = generateOrganizationCertificate({ organizationName: 'Demo Emergency Management Office', passphrase, now: new Date('2026-12-02T14:00:00Z') });

  it('are AES-256 under PBKDF2-HMAC-SHA256 (openssl), behind a scrypt-derived password', () => {
    const sealed = openKey(generated.stored!);
    expect(sealed).not.toBeNull();
    expect(sealed!.p12.equals(generated.p12)).toBe(true);
    // The passphrase itself does not open the PKCS#12; the derived password does.
    expect(generated.passphrase).not.toBe(passphrase);
    const info = opensslInfo(generated.p12, generated.passphrase);
    expect(info).toMatch(/Shrouded Keybag: PBES2, PBKDF2, AES-256-CBC, Iteration 10000, PRF hmacWithSHA256/);
    expect(info).not.toMatch(/3DES|pbeWithSHA1And3-KeyTripleDES/i);
    expect(opensslInfo(generated.p12, passphrase)).toMatch(/Mac verify error|invalid password/i);
  });

  it('open with the passphrase, not without it, and sign briefings that verify', async () => {
    const loaded = loadStoredCertificate(generated.stored!, passphrase);
    expect(loaded.fingerprintSha256).toBe(generated.fingerprintSha256);
    expect(() => loadStoredCertificate(generated.stored!, 'another passphrase entirely, also long')).toThrow(CertificateError);
    const signed = await signBriefing(briefingInput(), signer, loaded, new Date('2026-12-02T14:05:33Z'));
    expect(verifyPdf(signed.pdf, [loaded.certificatePem]).valid).toBe(true);
  }, 60_000);

  it('still open when kept the older way (3DES PKCS#12 under the passphrase itself)', () => {
    const keys = forge.pki.rsa.generateKeyPair({ bits: 1024, e: 0x10001 });
    const cert = forge.pki.createCertificate();
    cert.publicKey = keys.publicKey;
    cert.serialNumber = '01';
    cert.validity.notBefore = new Date('2026-01-01T00:00:00Z');
    cert.validity.notAfter = new Date('2036-01-01T00:00:00Z');
    cert.setSubject([{ name: 'commonName', value: 'Older key' }]);
    cert.setIssuer([{ name: 'commonName', value: 'Older key' }]);
    cert.sign(keys.privateKey, forge.md.sha256.create());
    const old = Buffer.from(forge.asn1.toDer(forge.pkcs12.toPkcs12Asn1(keys.privateKey, [cert], passphrase, { algorithm: '3des' })).getBytes(), 'binary');
    const loaded = loadStoredCertificate(old, passphrase);
    expect(loaded.subject).toContain('Older key');
    expect(loaded.stored!.equals(old)).toBe(true);
  });
});
