// The workspace and the briefing print the same strings for the same result: the headline
// tiles as mounted on screen against the briefing's document, and the choke-point table in the
// same order with the same capacity and share strings. The result is the briefing fixture (test
// data, tests/fixtures/briefing/demo-town-briefing.ts), once as stored and once not cleared.
import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { createPinia } from 'pinia';
import type { RunResult } from '../../shared/api/runs';
import { ignoreStylesheets } from './support/ignore-stylesheets';

// The briefing side is server code, outside the client's type-check project: loaded by path.
type BriefingModule = { buildBriefingDocument: (input: unknown) => { content: unknown } };
type FixtureModule = { briefingInput: (overrides?: { result?: RunResult }) => unknown; result: RunResult };
const serverPath = (p: string) => new URL(p, import.meta.url).href;
const { buildBriefingDocument } = (await import(/* @vite-ignore */ serverPath('../../server/services/briefings/briefing-document.ts'))) as BriefingModule;
const { briefingInput, result: storedResult } = (await import(/* @vite-ignore */ serverPath('../fixtures/briefing/demo-town-briefing.ts'))) as FixtureModule;

await ignoreStylesheets();
const { createVuetify } = await import('vuetify');
const { default: FindingsHeadline } = await import('../../src/components/workspace/FindingsHeadline.vue');
const { default: FindingsChokePointTable } = await import('../../src/components/workspace/FindingsChokePointTable.vue');
const { default: FindingsTripTimes } = await import('../../src/components/workspace/FindingsTripTimes.vue');

/** Every text string in a pdfmake document definition, in document order. */
function documentStrings(node: unknown, out: string[] = []): string[] {
  if (typeof node === 'string') out.push(node);
  else if (Array.isArray(node)) node.forEach((n) => documentStrings(n, out));
  else if (node && typeof node === 'object') {
    for (const [key, value] of Object.entries(node)) if (key !== 'svg' && key !== 'style' && key !== 'color' && key !== 'alignment') documentStrings(value, out);
  }
  return out;
}

/** The body rows of the briefing table whose header has a cell with this text. */
function briefingTableRows(node: unknown, headerCell: string): string[][] | null {
  if (Array.isArray(node)) {
    for (const n of node) {
      const found = briefingTableRows(n, headerCell);
      if (found) return found;
    }
  } else if (node && typeof node === 'object') {
    const table = (node as { table?: { body?: { text?: string }[][] } }).table;
    if (table?.body?.[0]?.some((c) => c.text === headerCell)) return table.body.slice(1).map((row) => row.map((c) => String(c.text)));
    for (const value of Object.values(node)) {
      const found = briefingTableRows(value, headerCell);
      if (found) return found;
    }
  }
  return null;
}

const notCleared: RunResult = {
  ...storedResult,
  headline: { ...storedResult.headline, deliveredVehicles: 2640, deliveredPersons: 6336, clearanceMinutes: null, p95Minutes: null },
  // Trip times more than one step off free flow, with a step to try.
  routeTiming: {
    ...storedResult.routeTiming!,
    largestSeconds: 480,
    worst: { ...storedResult.routeTiming!.worst!, modelledSeconds: 940 },
    suggestedStepSeconds: 180,
  },
};

const mountOptions = () => ({ global: { plugins: [createPinia(), createVuetify()] } });
const squeeze = (s: string) => s.replace(/\s+/g, ' ').trim();

describe.each([
  ['as stored', storedResult],
  ['not cleared within the horizon', notCleared],
])('screen and briefing, result %s', (_name, result) => {
  const briefing = buildBriefingDocument(briefingInput({ result }));
  const printed = new Set(documentStrings(briefing.content).map(squeeze));

  it('print every headline label, value and note of the screen tiles', () => {
    const screen = mount(FindingsHeadline, { props: { result }, ...mountOptions() });
    const tiles = screen.findAll('[data-test^="headline-"]').filter((w) => w.attributes('data-test') !== 'headline-value');
    expect(tiles.length).toBe(4);
    const onScreen: string[] = [];
    for (const tile of tiles) {
      for (const el of tile.findAll('div, span')) if (el.element.children.length === 0 && el.text().trim() !== '') onScreen.push(squeeze(el.text()));
    }
    // The percentile tile shows "50 %" beside its value where the briefing writes "50 % arrived after".
    const rowLabels = new Set(['Share arrived after', '50 %', '90 %', '95 %']);
    const missing = onScreen.filter((s) => !rowLabels.has(s) && !printed.has(s));
    expect(onScreen.length).toBeGreaterThan(10);
    expect(missing).toEqual([]);
    for (const pct of ['50 %', '90 %', '95 %']) expect(printed.has(`${pct} arrived after`)).toBe(true);
  });

  it('print the same trip-time summary, and past one step the same warning, on screen and in the briefing', () => {
    const screen = mount(FindingsTripTimes, { props: { timing: result.routeTiming! }, ...mountOptions() });
    const summary = squeeze(screen.find('[data-test="trip-times-summary"]').text());
    expect(summary).toMatch(/^Fastest trips from each zone/);
    // The Method section quotes the summary inside its own paragraph.
    expect([...printed].some((s) => s.includes(summary))).toBe(true);
    const warning = screen.find('[data-test="trip-times-warning"]');
    if (result === notCleared) {
      const text = squeeze(warning.text());
      expect(text).toContain('Analyse again with a time step of 3 minutes');
      expect(printed.has(text)).toBe(true);
    } else {
      expect(warning.exists()).toBe(false);
      expect([...printed].some((s) => s.includes('Analyse again'))).toBe(false);
    }
  });

  it('rank the choke points in the same order with the same capacity and share', () => {
    const screen = mount(FindingsChokePointTable, { props: { result }, ...mountOptions() });
    const screenRows = screen.findAll('[data-test="choke-point-row"]').map((row) => {
      const cells = row.findAll('td').map((td) => squeeze(td.text()));
      return { name: squeeze(row.find('td .font-weight-medium').text()), capacity: cells[1], share: cells[2] };
    });
    const pdfRows = briefingTableRows(briefing.content, 'Share of\nlimit')!;
    expect(screenRows.length).toBe(3);
    expect(pdfRows.map((r) => ({ rank: r[0], capacity: r[4], share: r[5] }))).toEqual(screenRows.map((r, i) => ({ rank: String(i + 1), capacity: r.capacity, share: r.share })));
    screenRows.forEach((r, i) => expect(pdfRows[i]![1]).toContain(r.name));
  });
});
