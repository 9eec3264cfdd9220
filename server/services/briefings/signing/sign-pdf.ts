// Embeds a PDF signature (CMS, detached, adbe.pkcs7.detached) made with the organisation's
// certificate: @signpdf's plain placeholder on the finished file, then P12Signer (STACK.md §11).
//
// The signer's name, role and time must already be on the page (render the briefing with
// status 'signed' first, see sign-briefing.ts): the signature covers every byte of the file
// except the signature value itself, so they are covered too. The same time goes into the
// signature dictionary (/M) and the CMS signingTime attribute, so all three agree.
import { plainAddPlaceholder } from '@signpdf/placeholder-plain';
import { P12Signer } from '@signpdf/signer-p12';
import { SignPdf } from '@signpdf/signpdf';
import type { OrganizationCertificate } from './organization-certificate';

export type SignPdfOptions = {
  certificate: OrganizationCertificate;
  signerName: string;
  signerRole: string;
  signedAt: Date;
  organizationName: string;
  contactInfo?: string;
};

export const APP_NAME = 'Cutline';

/**
 * Room reserved for the CMS, in bytes. A self-signed certificate needs about 1.5 kB; a chain
 * from a certificate authority more, so the room grows with the P12 (which holds the chain).
 */
function signatureRoom(certificate: OrganizationCertificate): number {
  return Math.max(8192, certificate.p12.length + 4096);
}

export async function signPdf(pdf: Buffer, o: SignPdfOptions): Promise<Buffer> {
  if (o.signedAt.getTime() < o.certificate.notBefore.getTime() || o.signedAt.getTime() > o.certificate.notAfter.getTime()) {
    throw new Error('the organisation certificate is not valid at the signing time');
  }
  const withPlaceholder = plainAddPlaceholder({
    pdfBuffer: pdf,
    reason: `Signed off by ${o.signerName}, ${o.signerRole}`,
    contactInfo: o.contactInfo ?? '',
    name: o.signerName,
    location: o.organizationName,
    signingTime: o.signedAt,
    signatureLength: signatureRoom(o.certificate),
    appName: APP_NAME,
  });
  const signer = new P12Signer(o.certificate.p12, { passphrase: o.certificate.passphrase });
  return new SignPdf().sign(withPlaceholder, signer, o.signedAt);
}
