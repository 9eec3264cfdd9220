// The body of the briefing verifier's worker thread (verify-in-worker.ts): one upload in, the
// verification out. Nothing here touches the database or the network.
import type { MessagePort } from 'node:worker_threads';
import { verifyPdf, type PdfVerification } from './verify-pdf';

export type VerifyTask = { pdf: Uint8Array; certificates: string[]; started?: MessagePort };

export default function verifyTask({ pdf, certificates, started }: VerifyTask): PdfVerification {
  // The caller's time budget starts now, not while this thread was starting up.
  started?.postMessage('started');
  return verifyPdf(Buffer.from(pdf.buffer, pdf.byteOffset, pdf.byteLength), certificates);
}
