// The briefing's pages for searches, read back by poppler (pdftotext; an outside reader): the
// quickest departure order's sentence, and "where each zone goes" on a page of its own with the
// cautions, its map and its table. The answers are written by hand over the fixture's invented
// town (tests/fixtures/briefing/demo-town-briefing.ts, test data). Pages are rendered to PNG under
// tests/output/briefing/ for a look by eye.
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import type { ProposalResult } from '../../../shared/api/proposals';
import { proposalCaution } from '../../../shared/api/proposals';
import { CAUTION_LEAD } from '../../../shared/api/caution';
import { zoneRouteColour, zoneRouteLines } from '../../../shared/format/search-answers';
import { renderBriefing } from '../../../server/services/briefings/render-briefing';
import { zoneRoutesSvg } from '../../../server/services/briefings/zone-routes-svg';
import { briefingInput, segments, shelters, zones } from '../../fixtures/briefing/demo-town-briefing';
import { pdfToPng, pdfToText } from './support/poppler';

const outDir = fileURLToPath(new URL('../../output/briefing/', import.meta.url));
const road = (segmentId: number, vehicles: number) => ({ segmentId, direction: 'forward' as const, name: `Road ${segmentId}`, roadClass: 'secondary', vehicles });
const routesZone = (zoneId: number, name: string, shelter: [number, string], roadIds: number[], vehicles: number, leaves: [number, number]) => ({
  zoneId,
  name,
  vehicles,
  deliveredVehicles: vehicles,
  shelters: [{ shelterId: shelter[0], name: shelter[1], vehicles }],
  mainRoads: roadIds.slice(0, 2).map((id) => road(id, vehicles)),
  roads: roadIds.map((id) => road(id, vehicles)),
  departureWindowMinutes: leaves,
  arrivalWindowMinutes: [leaves[0] + 10, leaves[1] + 15] as [number, number],
});

const zoneRoutes: ProposalResult = {
  answer: {
    kind: 'zone-routes',
    clearanceMinutes: 135,
    zones: [
      routesZone(1, 'North Hollow', [1, 'Ridge School'], [11, 21, 26, 33, 40], 1200, [0, 95]),
      routesZone(2, 'Riverside', [1, 'Ridge School'], [10, 20, 27, 32, 40], 1000, [0, 80]),
      routesZone(3, 'Old Mill', [2, 'Fairground Hall'], [12, 22, 24, 30, 41], 800, [5, 70]),
    ],
  },
  limits: [],
  overlay: null,
  caution: proposalCaution,
  engineVersion: 'test',
  solveMs: 1,
};

const releaseOrder: ProposalResult = {
  answer: {
    kind: 'release-order',
    stepMinutes: 5,
    quickestClearanceMinutes: 95,
    expectedClearanceMinutes: 135,
    scheduleClearanceMinutes: 95,
    waitsMovedHome: true,
    demandVehicles: 3000,
    quickestDeliveredByStep: [],
    expectedDeliveredByStep: [],
    zones: [
      { zoneId: 1, name: 'North Hollow', vehicles: 1200, firstDepartureMinutes: 0, lastDepartureMinutes: 40, departuresByStep: [400, 400, 100, 100, 50, 50, 50, 50, 0] },
      { zoneId: 2, name: 'Riverside', vehicles: 1000, firstDepartureMinutes: 20, lastDepartureMinutes: 60, departuresByStep: [] },
      { zoneId: 3, name: 'Old Mill', vehicles: 800, firstDepartureMinutes: 45, lastDepartureMinutes: 75, departuresByStep: [] },
    ],
  },
  limits: [],
  overlay: null,
  caution: proposalCaution,
  engineVersion: 'test',
  solveMs: 1,
};

let pages: string[];
/** Reading order with every run of white space as one space. */
const flat = (text: string) => text.replace(/\s+/g, ' ').trim();

beforeAll(async () => {
  // Zone routes first in the stored list: the page puts them last, on a page of their own.
  const rendered = await renderBriefing(briefingInput({ searches: [zoneRoutes, releaseOrder] }));
  pages = pdfToText(rendered.pdf, false).split('\f').map(flat);
  pdfToPng(rendered.pdf, outDir, 'searches');
}, 60_000);

describe('searches in the briefing', () => {
  it('says what the quickest departure order gains against the expected departures', () => {
    const all = pages.join(' ');
    expect(all).toContain('The roads could clear everyone in 1 h 35 min if zones left in this order; with the expected departures it takes 2 h 15 min.');
    // North Hollow: 800 of its 1,200 vehicles have left by the end of the second 5-minute step.
    expect(all).toMatch(/North Hollow 1,200 0 min 10 min 45 min/);
  });

  it('gives where each zone goes a page of its own, with both cautions, the map and each zone’s row', () => {
    const page = pages.find((p) => p.includes('Where each zone goes') && p.includes('Figure. Each zone’s corridors'));
    expect(page, 'a page that starts with the zone routes').toBeDefined();
    expect(page).toContain(CAUTION_LEAD);
    expect(page).toContain(proposalCaution);
    expect(page).toContain('one optimal plan of possibly many');
    expect(page).toContain('clears in 2 h 15 min');
    // The table: zone, shelter with vehicles, main corridors, departure and arrival windows.
    expect(page).toContain('North Hollow Ridge School (1,200) Road 11 (1,200), Road 21 (1,200) 0 min–1 h 35 min 10 min–1 h 50 min');
    expect(page).toContain('Old Mill Fairground Hall (800) Road 12 (800), Road 22 (800) 5 min–1 h 10 min 15 min–1 h 25 min');
    // Only the zone routes on this page: the departure order is on the page before.
    expect(page).not.toContain('if zones left in this order');
    expect(pages.indexOf(page!)).toBeGreaterThan(pages.findIndex((p) => p.includes('if zones left in this order')));
  });
});

describe('the zone routes figure', () => {
  const map = { segments, zones, shelters };
  const colours = zoneRoutes.answer.kind === 'zone-routes' ? zoneRoutes.answer.zones.map((z, i) => ({ zoneId: z.zoneId, name: z.name, colour: zoneRouteColour(i) })) : [];
  const lines = zoneRoutes.answer.kind === 'zone-routes' ? zoneRouteLines(zoneRoutes.answer) : [];

  it('draws each corridor once in the colour of the zone with most vehicles on it', () => {
    const svg = zoneRoutesSvg({ map, lines, zones: colours });
    const drawn = [...svg.matchAll(/stroke="(#[0-9a-f]{6})"[^>]*data-segment="(\d+)"/g)].map((m) => [Number(m[2]), m[1]] as const);
    expect(new Map(drawn)).toEqual(new Map(lines.map((l) => [l.segmentId, l.colour])));
    // Road 40 is shared by North Hollow (1,200) and Riverside (1,000): North Hollow's colour.
    expect(new Map(drawn).get(40)).toBe(zoneRouteColour(0));
    for (const z of colours) expect(svg).toContain(`>${z.name}</text>`);
  });

  it('leaves out a corridor whose geometry the briefing does not hold, and says so when it has none at all', () => {
    const svg = zoneRoutesSvg({ map: { ...map, segments: segments.filter((s) => s.id !== 40) }, lines, zones: colours });
    expect(svg).not.toContain('data-segment="40"');
    expect(zoneRoutesSvg({ map: { segments: [], zones: [], shelters: [] }, lines, zones: colours })).toContain('No road geometry was stored with this run.');
  });
});
