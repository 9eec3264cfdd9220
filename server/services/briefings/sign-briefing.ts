// Signing a briefing: render it as signed (name, role and time on the title page and in the
// file's metadata), then embed the digital signature over those bytes.
import type { BriefingInput, BriefingPerson } from './briefing-input';
import { contentSha256, sha256Hex } from './content-fingerprint';
import { renderBriefingPdfInWorker, type RenderBudget } from './render-in-worker';
import type { OrganizationCertificate } from './signing/organization-certificate';
import { signPdf } from './signing/sign-pdf';

export type SignedBriefing = { pdf: Buffer; contentSha256: string; fileSha256: string; signedAt: Date };

export async function signBriefing(
  input: BriefingInput,
  signer: BriefingPerson,
  certificate: OrganizationCertificate,
  signedAt: Date = new Date(),
  budget?: RenderBudget,
): Promise<SignedBriefing> {
  // PDF dates and the CMS signingTime carry whole seconds; the page should say the same.
  const at = new Date(Math.floor(signedAt.getTime() / 1000) * 1000);
  const signedInput: BriefingInput = { ...input, status: 'signed', returned: undefined, signature: { ...signer, signedAt: at } };
  const unsigned = await renderBriefingPdfInWorker(signedInput, budget);
  const pdf = await signPdf(unsigned, {
    certificate,
    signerName: signer.name,
    signerRole: signer.role,
    signedAt: at,
    organizationName: input.organizationName,
  });
  return { pdf, contentSha256: contentSha256(signedInput), fileSha256: sha256Hex(pdf), signedAt: at };
}
