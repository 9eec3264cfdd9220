// The body of the briefing verifier's worker thread (verify-in-worker.ts): one upload in, the
// verification out. Nothing here touches the database or the network.
import { verifyPdf, type PdfVerification } from './verify-pdf';

export type VerifyTask = { pdf: Uint8Array; certificates: string[] };

export default function verifyTask({ pdf, certificates }: VerifyTask): PdfVerification {
  return verifyPdf(Buffer.from(pdf.buffer, pdf.byteOffset, pdf.byteLength), certificates);
}
