// Briefing PDFs are laid out in a worker thread within a time and a memory budget (warm threads of
// server/budgeted-pool.ts): a render past either is stopped with a reason a person can read, the
// API answers meanwhile, and the next render works. (What the PDF says is briefing-pdf.test.ts's;
// this is about where and within what.)
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { createTestContext } from '../support/test-app';
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

  it('while a render runs past its budget, the API answers; the render then fails with the reason', async () => {
    const ctx = await createTestContext();
    try {
      // Warm first, so the budget below is all layout.
      await renderBriefingPdfInWorker(briefingInput(), { seconds: 120, megabytes: 512 });
      const input = briefingInput();
      input.map = { ...input.map, segments: gridSegments(200) };
      let settled = false;
      const render = renderBriefingPdfInWorker(input, { seconds: 1, megabytes: 512 }).finally(() => (settled = true));
      render.catch(() => undefined);
      // Health checks answer while the layout runs in its thread.
      let answeredMeanwhile = 0;
      while (!settled) {
        await request(ctx.app).get('/healthz').expect(200);
        if (!settled) answeredMeanwhile += 1;
      }
      expect(answeredMeanwhile).toBeGreaterThanOrEqual(3);
      await expect(render).rejects.toThrow(new RenderFailure('The briefing took longer than its budget of 1 s to lay out and was stopped.'));
    } finally {
      await ctx.drop();
    }
  }, 180_000);

  it('stops a render past its memory budget with the reason, and the next render works', async () => {
    const input = briefingInput();
    input.map = { ...input.map, segments: gridSegments(200) };
    await expect(renderBriefingPdfInWorker(input, { seconds: 120, megabytes: 32 })).rejects.toThrow(/more than its memory budget of 32 MB/);
    const pdf = await renderBriefingPdfInWorker(briefingInput(), { seconds: 120, megabytes: 512 });
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
  }, 180_000);
});
