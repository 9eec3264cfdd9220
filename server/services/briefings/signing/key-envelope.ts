// How a generated organisation signing key is kept in the database: a PKCS#12 encrypted with
// AES-256-CBC under PBKDF2-HMAC-SHA256 (PBES2, RFC 8018), whose password is itself derived from
// SIGNING_KEY_PASSPHRASE with scrypt (RFC 7914; N = 2^15, r = 8, p = 1) and a random salt kept
// beside it. scrypt makes each guess at the passphrase cost memory and time, which the
// PKCS#12's own iteration count (at most 65,535 as node-forge writes it) cannot. Stored as
// MAGIC ‖ salt (16 bytes) ‖ PKCS#12; older rows without the magic are plain 3DES PKCS#12 files
// under the passphrase itself, and still open.
import { randomBytes, scryptSync } from 'node:crypto';

const MAGIC = Buffer.from('CLKEY1\0\0', 'latin1');
const SALT_BYTES = 16;

/** The PKCS#12 password for a passphrase and salt. */
export function derivePkcs12Password(passphrase: string, salt: Buffer): string {
  return scryptSync(passphrase, salt, 32, { N: 1 << 15, r: 8, p: 1, maxmem: 64 * 1024 * 1024 }).toString('base64url');
}

export function newKeySalt(): Buffer {
  return randomBytes(SALT_BYTES);
}

export function sealKey(p12: Buffer, salt: Buffer): Buffer {
  return Buffer.concat([MAGIC, salt, p12]);
}

/** The salt and PKCS#12 of a stored key, or null for an older plain PKCS#12. */
export function openKey(stored: Buffer): { salt: Buffer; p12: Buffer } | null {
  if (stored.length <= MAGIC.length + SALT_BYTES || !stored.subarray(0, MAGIC.length).equals(MAGIC)) return null;
  return { salt: stored.subarray(MAGIC.length, MAGIC.length + SALT_BYTES), p12: stored.subarray(MAGIC.length + SALT_BYTES) };
}
