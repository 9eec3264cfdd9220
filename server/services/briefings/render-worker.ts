// Runs in a worker thread (render-in-worker.ts): a briefing's input in, its PDF bytes out.
// Building the page (the map's SVG of every road) and pdfmake's layout are the heavy parts.
import type { BriefingInput } from './briefing-input';
import { buildBriefingDocument } from './briefing-document';
import { renderPdf } from './render-pdf';

export default async function renderBriefingPdf(input: BriefingInput): Promise<Uint8Array> {
  const pdf = await renderPdf(buildBriefingDocument(input));
  return new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.byteLength);
}
