// The briefing PDF read back by poppler (pdftotext, pdfinfo): the headline figures are the
// fixture run's stored figures, the cautions are there, every page is numbered and carries the
// briefing id and content hash. Expected strings are written out by hand from the fixture
// (tests/fixtures/briefing/demo-town-briefing.ts, test data), not produced by our formatter.
// Pages are also rendered to PNG under tests/output/briefing/ for a look by eye.
import { createHash } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { statSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { renderBriefing, type RenderedBriefing } from '../../../server/services/briefings/render-briefing';
import { signBriefing } from '../../../server/services/briefings/sign-briefing';
import { generateOrganizationCertificate } from '../../../server/services/briefings/signing/organization-certificate';
import { storedBriefingContent } from '../../../server/services/briefings/content-fingerprint';
import { briefingInput, result, signer } from '../../fixtures/briefing/demo-town-briefing';
import { pdfInfo, pdfToPng, pdfToText, squeeze } from './support/poppler';

const outDir = fileURLToPath(new URL('../../output/briefing/', import.meta.url));

let draft: RenderedBriefing;
let draftText: string;
let signedPdf: Buffer;
let signedText: string;

beforeAll(async () => {
  draft = await renderBriefing(briefingInput());
  draftText = squeeze(pdfToText(draft.pdf));
  const certificate = generateOrganizationCertificate({
    organizationName: 'Demo Emergency Management Office',
    passphrase: 'test passphrase 1',
    // Issued just before the fixed signing time below, so the signature is valid on any later day.
    now: new Date('2026-12-02T14:00:00Z'),
  });
  signedPdf = (await signBriefing(briefingInput(), signer, certificate, new Date('2026-12-02T14:05:33Z'))).pdf;
  signedText = squeeze(pdfToText(signedPdf));
});

describe('the fixture itself', () => {
  it('holds the figures these tests expect (change both together)', () => {
    expect(result.headline).toEqual({
      steadyStateVehiclesPerHour: 2200,
      steadyStatePersonsPerHour: 5280,
      demandVehicles: 3000,
      demandPersons: 7200,
      deliveredVehicles: 3000,
      deliveredPersons: 7200,
      horizonMinutes: 180,
      clearanceMinutes: 130,
      p50Minutes: 70,
      p90Minutes: 110,
      p95Minutes: 120,
    });
  });
});

describe.each([
  ['draft', () => draftText],
  ['signed', () => signedText],
])('the %s briefing, as pdftotext reads it', (_name, text) => {
  it('shows the headline figures of the run', () => {
    const t = text();
    expect(t).toContain('5,280 persons/h');
    expect(t).toContain('2,200 veh/h once traffic is steady');
    expect(t).toContain('Arrived within 3 h');
    expect(t).toContain('7,200 persons');
    // The panels' notes wrap in three columns: whole sentences are checked on the document
    // definition in screen-and-briefing.test.ts; here the pieces that fit on one line.
    expect(t).toContain('100 % of 7,200 persons leaving are at a');
    expect(t).toContain('Vehicles arrived: 3,000 of 3,000.');
    expect(t).toContain('2 h 10 min');
    expect(t).toContain('(US NRC NUREG/CR-7002,');
    expect(t).not.toMatch(/\bsafe\b/i);
    expect(t).toContain('70 minutes after the order');
    expect(t).toContain('110 minutes after the order');
    expect(t).toContain('120 minutes after the order');
  });

  it('says the same in the plain-words summary', () => {
    const t = text().replace(/\s+/g, ' ');
    expect(t).toContain('at most about 5,280 people (2,200 vehicles) per hour');
    expect(t).toContain('All 7,200 people expected to leave (3,000 vehicles) arrive at a shelter or exit within the 3 hours studied');
    expect(t).toContain('Half have arrived after 1 h 10 min, 90 % after 1 h 50 min, 95 % after 2 h.');
  });

  it('carries the cautions', () => {
    const t = text().replace(/\s+/g, ' ');
    expect(t).toContain('Cautions and limits');
    expect(t).toContain('A planning aid, not an order.');
    expect(t).toContain('It is not an evacuation order, a timetable or an instruction to the public');
    expect(t).toContain('Traffic in real evacuations has run well below handbook lane capacities');
    expect(t).toContain('how many residents leave and when, how many vehicles each household takes');
    expect(t).toContain('local traffic counts');
    expect(t).toContain('Defer to the jurisdiction’s emergency operations plan and to local emergency management codes');
    expect(t).toContain('licensed traffic engineer');
  });

  it('ranks the limiting roads by their share of the limit and names their direction', () => {
    const t = text();
    expect(t).toMatch(/1 Mill Bridge Road eastbound secondary 850 39 % yes 20–115 min 600/);
    expect(t).toMatch(/2 Quarry Lane north-eastbound tertiary 750 34 % yes 25–130 min 450/);
    expect(t).toMatch(/3 Harbor Avenue eastbound residential 600 27 % yes 15–60, 75–125 min 400/);
  });

  it('says what holds arrivals down', () => {
    const t = text().replace(/\s+/g, ' ');
    expect(t).toContain('What holds arrivals down');
    expect(t).toContain('By 2 h 05 min after the order at most 2,970 vehicles can have arrived. What holds that number down: road capacity 100 %.');
    expect(t).toMatch(/Road capacity \(roads running full\) 2,970 100 %/);
    expect(t).not.toContain('No road is part of that limit');
  });

  it('ranks the fixes by their gain and leaves out the one that gains nothing', () => {
    const t = text();
    const fixes = t.slice(t.indexOf('Most valuable fixes'), t.indexOf('Evacuation zones'));
    expect(fixes).toMatch(/1 Add a lane Mill Bridge Road eastbound \+600 \+1,440/);
    expect(fixes).toMatch(/2 Reopen the road Ferry Street eastbound \+520 \+1,248/);
    expect(fixes).toMatch(/3 Add a lane Quarry Lane north-eastbound \+450 \+1,080/);
    expect(fixes).toMatch(/4 Add a lane Harbor Avenue eastbound \+400 \+960/);
    expect(fixes).not.toContain('Ridge Road');
  });

  it('has the per-zone and per-shelter tables', () => {
    const t = text();
    expect(t).toMatch(/North Hollow 3,000 1,200 1,200 100 % 750 2 h 10 min/);
    expect(t).toMatch(/Riverside 2,400 1,000 1,000 100 % 850 1 h 55 min/);
    expect(t).toMatch(/Old Mill 1,800 800 800 100 % 600 2 h 05 min/);
    expect(t).toMatch(/All zones 7,200 3,000 3,000 100 % 2,200 2 h 10 min/);
    expect(t).toMatch(/Ridge School 4,000 3,960 1,650 99 % 1,200/);
    expect(t).toMatch(/Fairground Hall not stated 3,240 1,350 — 1,000/);
  });

  it('lists the assumptions', () => {
    const t = text();
    expect(t).toContain('Data version 3: road layer imported 28 November 2026');
    expect(t).toContain('Horizon 3 hours after the evacuation order');
    expect(t).toContain('Time step 5 minutes');
    expect(t).toContain('Persons per vehicle 2.4');
    const flat = t.replace(/\s+/g, ' ');
    // The default persons per vehicle keeps its "from memory"; participation, the factor's preset
    // and the jam density used for queue space are stated with their sources.
    expect(flat).toContain('the default of 2 is from memory: about 2.5 persons per household');
    expect(flat).toContain('Participation 80 %, 90 % of residents leave (by zone); the default of 80 % follows Baker (1991)');
    expect(flat).toContain('equals the preset “No adjustment”');
    expect(flat).toContain('Queue space jam density 118.06 veh/km per lane — HCM 6th ed. Exhibit 25-2');
    expect(t).toContain('logistic S-curve, response rate 1.5 per hour');
    expect(t).toContain('algorithm Dinic (blocking flows) (requested: automatic choice)');
    expect(t).toMatch(/secondary 1 50 850 Capacity: 1,900 pc\/h\/ln × g\/C 0.45/);
  });

  it('draws the map and the curve with their labels', () => {
    const t = text();
    for (const label of ['North Hollow', 'Riverside', 'Old Mill', 'Ridge School', 'Fairground Hall', 'Choke point and its rank', 'Shelter or exit', 'Scale', '1 km']) expect(t).toContain(label);
    expect(t).toContain('To move: 3,000 vehicles');
    expect(t).toContain('50 % by 1 h 10 min');
    expect(t).toContain('95 % by 2 h');
    expect(t).toContain('Minutes after the evacuation order');
  });
});

describe('identification', () => {
  it('numbers every page and puts the briefing id and content hash in each footer', () => {
    const pages = Number(/Pages:\s+(\d+)/.exec(pdfInfo(draft.pdf))?.[1]);
    expect(pages).toBeGreaterThanOrEqual(5);
    for (let p = 1; p <= pages; p++) expect(draftText).toContain(`Page ${p} of ${pages}`);
    const footers = draftText.match(/Briefing 3c9f0e6a-5b2d-4a17-8e4c-7d1b2a9f6e08 · version 1/g) ?? [];
    expect(footers.length).toBe(pages);
    expect((draftText.match(new RegExp(`Content SHA-256 ${draft.contentSha256}`, 'g')) ?? []).length).toBe(pages);
  });

  it('uses as content hash the SHA-256 of the stored content with sorted keys', () => {
    // Recomputed here without our canonicaliser: sort keys with a plain recursive copy.
    const sortKeys = (v: unknown): unknown =>
      Array.isArray(v) ? v.map(sortKeys) : v && typeof v === 'object' ? Object.fromEntries(Object.keys(v).sort().map((k) => [k, sortKeys((v as Record<string, unknown>)[k])])) : v;
    const json = JSON.stringify(sortKeys(JSON.parse(JSON.stringify(storedBriefingContent(briefingInput())))));
    expect(draft.contentSha256).toBe(createHash('sha256').update(json).digest('hex'));
    expect(draft.fileSha256).toBe(createHash('sha256').update(draft.pdf).digest('hex'));
  });

  it('writes the briefing id, version, status and content hash into the PDF metadata', () => {
    const info = pdfInfo(draft.pdf);
    expect(info).toMatch(/CutlineBriefingId:\s*3c9f0e6a-5b2d-4a17-8e4c-7d1b2a9f6e08/);
    expect(info).toMatch(/CutlineBriefingVersion:\s*1/);
    expect(info).toMatch(/CutlineStatus:\s*draft/);
    expect(info).toMatch(new RegExp(`CutlineContentSha256:\\s*${draft.contentSha256}`));
    expect(info).toMatch(/Title:\s+Evacuation capacity briefing: Larkmoor river evacuation — Evening order, dry roads/);
  });

  it('keeps the content hash from draft to signed copy, and the status apart', () => {
    expect(signedText).toContain(`Content SHA-256 ${draft.contentSha256}`);
    expect(draftText).toContain('Draft — not signed');
    expect(signedText).not.toContain('not signed');
  });
});

describe('status and sign-off on the page', () => {
  it('prints the signer name, role and signing time on the signed copy', () => {
    const t = signedText.replace(/\s+/g, ' ');
    expect(t).toContain('SIGNED OFF');
    expect(t).toContain('Mina Ashcombe, Emergency Management Director');
    expect(t).toContain('Signed on 2 December 2026, 14:05 UTC for Demo Emergency Management Office.');
    expect(t).toContain('upload it at http://127.0.0.1:3000/verify');
  });

  it('marks a draft as not signed and not for distribution, with a blank signature line', () => {
    expect(draftText).toContain('DRAFT — NOT SIGNED');
    expect(draftText).toContain('Not for distribution until signed off');
  });

  it('shows who returned a briefing and their comment', async () => {
    const returned = await renderBriefing(
      briefingInput({ status: 'returned', returned: { name: 'Mina Ashcombe', role: 'Emergency Management Director', returnedAt: new Date('2026-12-01T16:30:00Z'), comment: 'Add the hospital shelter.' } }),
    );
    const t = squeeze(pdfToText(returned.pdf)).replace(/\s+/g, ' ');
    expect(t).toContain('RETURNED FOR CHANGES — NOT SIGNED');
    expect(t).toContain('Mina Ashcombe, Emergency Management Director, on 1 December 2026, 16:30 UTC:');
    expect(t).toContain('“Add the hospital shelter.”');
  });

  it('refuses a signed status without a signer, and a signer on a draft', async () => {
    await expect(renderBriefing(briefingInput({ status: 'signed' }))).rejects.toThrow(/needs signature/);
    await expect(renderBriefing(briefingInput({ signature: { ...signer, signedAt: new Date() } }))).rejects.toThrow(/cannot carry a signature/);
  });
});

describe('a run that does not clear within its horizon', () => {
  it('says so in the figures and the summary instead of printing a clearance time', async () => {
    const notCleared = {
      ...result,
      headline: { ...result.headline, deliveredVehicles: 2640, deliveredPersons: 6336, clearanceMinutes: null, p95Minutes: null },
      zones: result.zones.map((z) => (z.name === 'North Hollow' ? { ...z, deliveredVehicles: 840, clearanceMinutes: null } : z)),
    };
    const pdf = (await renderBriefing(briefingInput({ result: notCleared }))).pdf;
    const t = squeeze(pdfToText(pdf));
    const flat = t.replace(/\s+/g, ' ');
    expect(flat).toContain('Of the 7,200 people expected to leave (3,000 vehicles), 6,336 arrive at a shelter or exit within the 3 hours studied; about 864 (12 %) are still on the way');
    expect(t).toContain('Over 3 h');
    expect(t).toContain('88 % arrived by the 3 h horizon.');
    expect(t).toContain('Not within the 3 h horizon.');
    expect(t).toMatch(/North Hollow 3,000 1,200 840 70 % 750 not cleared/);
    expect(t).toMatch(/All zones 7,200 3,000 2,640 88 % 2,200 not cleared/);
    expect(t).toContain('Not everyone has arrived within 3 h');
  });
});

describe('in US customary units', () => {
  let usText = '';
  let usPdf: Buffer;
  beforeAll(async () => {
    usPdf = (await renderBriefing({ ...briefingInput(), unitSystem: 'us-customary' })).pdf;
    usText = squeeze(pdfToText(usPdf)).replace(/\s+/g, ' ');
  });

  it('prints speeds in mph, the jam density per mile and the scale in miles or feet', () => {
    // 50 km/h = 31.07 mph (1 mi = 1,609.344 m, international yard and pound agreement, 1959).
    expect(usText).toContain('Road class Lanes mph veh/h/lane Sources');
    expect(usText).toMatch(/secondary 1 31 850 Capacity/);
    // HCM 6th ed. Exhibit 25-2: 190 pc/mi/ln.
    expect(usText).toContain('Queue space jam density 190 veh/mi per lane');
    // The map's scale bar: "0" at its start, a round distance in miles or feet at its end.
    expect(usText).toMatch(/0 \d[\d.,]* (mi|ft) /);
    expect(usText).not.toContain('km/h');
  });

  it('keeps the content hash of the metric copy: units are how it reads, not what it says', () => {
    expect(storedBriefingContent({ ...briefingInput(), unitSystem: 'us-customary' })).toEqual(storedBriefingContent(briefingInput()));
  });

  it('renders its pages to PNG for review', () => {
    const pngs = pdfToPng(usPdf, outDir, 'us-customary');
    expect(pngs.length).toBeGreaterThan(1);
  });
});

describe('names beyond ASCII', () => {
  it('prints letters outside Latin-1 with the bundled fonts', async () => {
    const pdf = (await renderBriefing(briefingInput({ planName: 'Řeka Zoë: Łódź–Čapek', preparedBy: { name: 'Dvořák Þórsdóttir', role: 'Planner' } }))).pdf;
    const t = pdfToText(pdf);
    expect(t).toContain('Řeka Zoë: Łódź–Čapek');
    expect(t).toContain('Dvořák Þórsdóttir');
  });
});

describe('pages as images', () => {
  it('renders every page of the draft and the signed copy to PNG for review', () => {
    const pages = Number(/Pages:\s+(\d+)/.exec(pdfInfo(draft.pdf))?.[1]);
    const draftPngs = pdfToPng(draft.pdf, outDir, 'draft');
    const signedPngs = pdfToPng(signedPdf, outDir, 'signed');
    expect(draftPngs).toHaveLength(pages);
    expect(signedPngs).toHaveLength(pages);
    // A blank page compresses to a few kilobytes; a page with the map or tables is far larger.
    for (const png of [...draftPngs, ...signedPngs]) expect(statSync(png).size).toBeGreaterThan(20_000);
  });
});
