// A briefing from input to PDF bytes, with the two hashes a caller stores.
import type { BriefingInput } from './briefing-input';
import { contentSha256, sha256Hex } from './content-fingerprint';
import { renderBriefingPdfInWorker, type RenderBudget } from './render-in-worker';

export type RenderedBriefing = {
  pdf: Buffer;
  /** Printed in the footer: the hash of the briefing's content (content-fingerprint.ts). */
  contentSha256: string;
  /** The hash of these exact bytes; store it, it cannot be printed inside them. */
  fileSha256: string;
};

export async function renderBriefing(input: BriefingInput, budget?: RenderBudget): Promise<RenderedBriefing> {
  const pdf = await renderBriefingPdfInWorker(input, budget);
  return { pdf, contentSha256: contentSha256(input), fileSha256: sha256Hex(pdf) };
}
