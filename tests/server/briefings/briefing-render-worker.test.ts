// Briefing PDFs are laid out in a worker thread within a time and a memory budget: a render past
// either is stopped with a reason a person can read, the process goes on, and the next render
// works. (What the PDF says is briefing-pdf.test.ts's; this is about where and within what.)
import { afterAll, describe, expect, it } from 'vitest';
import { closeRenderPools, RenderFailure, renderBriefingPdfInWorker } from '../../../server/services/briefings/render-in-worker';
import type { MapSegment } from '../../../server/services/briefings/briefing-input';
import { briefingInput, km } from '../../fixtures/briefing/demo-town-briefing';
import { pdfToText, squeeze } from './support/poppler';

afterAll(closeRenderPools);

// A dense invented grid of streets: many thousands of map lines.
function gridSegments(side: number): MapSegment[] {
  const out: MapSegment[] = [];
  for (let i = 0; i < side; i++) {
    for (let j = 0; j < side; j++) {
      out.push({ id: out.length + 1, roadClass: 'residential', coordinates: [km(i * 0.05, j * 0.05), km((i + 1) * 0.05, j * 0.05)] });
      out.push({ id: out.length + 1, roadClass: 'residential', coordinates: [km(i * 0.05, j * 0.05), km(i * 0.05, (j + 1) * 0.05)] });
    }
  }
  return out;
}

describe('the briefing renderer in a worker thread', () => {
  it('renders the briefing', async () => {
    const pdf = await renderBriefingPdfInWorker(briefingInput(), { seconds: 120, megabytes: 512 });
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(squeeze(pdfToText(pdf))).toMatch(/planning aid/i);
  }, 180_000);

  it('stops a render past its time budget with the reason', async () => {
    const input = briefingInput();
    input.map = { ...input.map, segments: gridSegments(120) };
    await expect(renderBriefingPdfInWorker(input, { seconds: 0.05, megabytes: 512 })).rejects.toThrow(
      new RenderFailure('The briefing took longer than its budget of 0.05 s to lay out and was stopped.'),
    );
  }, 180_000);

  it('stops a render past its memory budget with the reason, and the next render works', async () => {
    const input = briefingInput();
    input.map = { ...input.map, segments: gridSegments(200) };
    await expect(renderBriefingPdfInWorker(input, { seconds: 120, megabytes: 32 })).rejects.toThrow(/more than its memory budget of 32 MB/);
    const pdf = await renderBriefingPdfInWorker(briefingInput(), { seconds: 120, megabytes: 512 });
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
  }, 180_000);
});
