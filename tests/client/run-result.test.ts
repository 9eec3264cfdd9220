// What the findings say about a result: the headline in words, choke points by impact, one
// utilisation per segment, the curve in hours, and a popup that escapes what the data says.
import { describe, expect, it } from 'vitest';
import { runResultSchema, type RunResult } from '../../shared/api/runs';
import { curveCsv } from '../../shared/model/run-export-csv';
import { rankChokePoints } from '../../shared/format/choke-points';
import { extrapolatedClearanceMinutes } from '../../shared/format/headline';
import { chokePointContext, chokePointPopupHtml, curvePoints, cutShare, cutWindowsText, headlineTiles, laneGainText, roadTitle, segmentLoad } from '../../src/format/run-result';

function result(over: Partial<RunResult['headline']> = {}): RunResult {
  return runResultSchema.parse({
    headline: {
      steadyStateVehiclesPerHour: 5600,
      steadyStatePersonsPerHour: 12320,
      demandVehicles: 10000,
      demandPersons: 22000,
      deliveredVehicles: 9000,
      deliveredPersons: 19800,
      horizonMinutes: 360,
      clearanceMinutes: null,
      p50Minutes: 95,
      p90Minutes: 290,
      p95Minutes: null,
      ...over,
    },
    curve: { stepMinutes: 1, deliveredVehicles: [0, 10, 50, 120] },
    zones: [],
    shelters: [],
    bottlenecks: [
      { segmentId: 5, direction: 'forward', name: 'Ferry <Lane>', roadClass: 'tertiary', capacityVehiclesPerHour: 750, shareOfCut: 750 / 5600, cutWindows: [[10, 360]], inStaticCut: true, gainPerExtraLaneVehiclesPerHour: 0 },
      { segmentId: 3, direction: 'forward', name: 'Sable Bridge', roadClass: 'primary', capacityVehiclesPerHour: 2000, shareOfCut: 2000 / 5600, cutWindows: [[5, 360]], inStaticCut: true, gainPerExtraLaneVehiclesPerHour: 1000 },
      { segmentId: 4, direction: 'forward', name: 'Mill Bridge', roadClass: 'primary', capacityVehiclesPerHour: 2000, shareOfCut: 2000 / 5600, cutWindows: [[5, 360]], inStaticCut: true, gainPerExtraLaneVehiclesPerHour: 1200 },
    ],
    fixes: [],
    stats: { engineVersion: '1', algorithm: 'dinic', nodes: 10, arcs: 20, expandedNodes: 100, expandedArcs: 200, augmentations: 5, solveMs: 12, peakMemoryBytes: 1, verified: true },
  });
}

describe('run result wording', () => {
  it('gives the four headline figures in words that claim arrivals, not safety', () => {
    expect(headlineTiles(result({ deliveredPersons: 21_990 }))[1]!.notes[0]).toBe('99.9 % of 22,000 persons leaving are at a shelter or exit.');
    const tiles = headlineTiles(result());
    expect(tiles.map((t) => t.key)).toEqual(['throughput', 'arrived', 'clearance', 'percentiles']);
    expect(tiles[0]!.value).toBe('12,320 persons/h');
    expect(tiles[0]!.notes[0]).toContain('5,600 veh/h');
    expect(tiles[1]!.label).toBe('Arrived within 6 h');
    expect(tiles[1]!.notes).toEqual(['90 % of 22,000 persons leaving are at a shelter or exit.', 'Vehicles arrived: 9,000 of 10,000.']);
    expect(tiles[2]!.value).toBe('Over 6 h');
    expect(tiles[2]!.notes[0]).toBe('90 % arrived by the 6 h horizon.');
    expect(tiles[3]!.label).toBe('Share arrived after');
    expect(tiles[3]!.value).toBe('1 h 35 min · 4 h 50 min · Over 6 h');
    expect(tiles[3]!.rows).toEqual([
      { label: '50 %', value: '1 h 35 min' },
      { label: '90 %', value: '4 h 50 min' },
      { label: '95 %', value: 'Over 6 h' },
    ]);
    expect(headlineTiles(result({ clearanceMinutes: 250 }))[2]!.value).toBe('4 h 10 min');
    for (const t of tiles) expect(JSON.stringify(t)).not.toMatch(/\bsafe/i);
  });

  it('extrapolates the last clearance from the horizon\'s last hour, and says it is an extrapolation', () => {
    // 1,000 vehicles still to arrive; the last 60 one-minute steps brought 600 (10 per minute),
    // so at that rate the rest need 100 min more: 360 + 100 = 460 min = 7 h 40 min.
    const delivered = Array.from({ length: 361 }, (_, i) => (i <= 300 ? Math.round(i * 28) : 8400 + (i - 300) * 10));
    const r = { ...result(), curve: { stepMinutes: 1, deliveredVehicles: delivered } };
    expect(delivered[360]).toBe(9000);
    expect(extrapolatedClearanceMinutes(r)).toBeCloseTo(460, 9);
    expect(headlineTiles(r)[2]!.notes[1]).toBe("About 7 h 40 min if the last hour's arrival rate holds (an extrapolation, not a model result).");
    // A flat last hour: nothing to carry on, and it says so.
    const flat = { ...r, curve: { stepMinutes: 1, deliveredVehicles: delivered.map((v, i) => (i > 290 ? delivered[290]! : v)) } };
    expect(extrapolatedClearanceMinutes(flat)).toBeNull();
    expect(headlineTiles(flat)[2]!.notes[1]).toMatch(/^No arrivals in the horizon's last hour/);
    // Everyone arrived: no extrapolation.
    expect(extrapolatedClearanceMinutes({ ...r, headline: { ...r.headline, clearanceMinutes: 300 } })).toBeNull();
  });

  it('orders choke points by share of the cut, then by what one more lane gains', () => {
    expect(rankChokePoints(result().bottlenecks, 0).map((b) => b.segmentId)).toEqual([4, 3, 5]);
  });

  it('splits a road’s figures into its two directions, the busier one giving its colour', () => {
    const load = segmentLoad({
      segmentId: 3,
      forward: { capacityVehiclesPerHour: 2000, flowVehiclesPerHour: 2000, utilisation: 1, inStaticCut: true },
      backward: null,
      utilisation: 1,
      shareOfCut: 0.36,
      limitingMinutes: 355,
    });
    expect(load.utilisation).toBe(1);
    expect(load.forward).toMatchObject({ segmentId: 3, direction: 'forward', flowVehiclesPerHour: 2000, inStaticCut: true });
    expect(load.backward).toBeNull();
  });

  it('puts the curve in hours after the order, step i at i × step, as curve.csv does', () => {
    const r = result();
    expect(curvePoints(r)).toEqual([
      { x: 0, y: 0 },
      { x: 0.017, y: 10 },
      { x: 0.033, y: 50 },
      { x: 0.05, y: 120 },
    ]);
    const csvMinutes = curveCsv(r).trim().split('\r\n').slice(1).map((line) => Number(line.split(',')[1]));
    expect(curvePoints(r).map((p) => Math.round(p.x * 60))).toEqual(csvMinutes);
  });

  it('gives a road only in the steady-state cut its share of that cut (capacity over the maximum flow)', () => {
    // The demo town: four bridges of 2,000 + 2,000 + 850 + 750 = 5,600 veh/h carry the cut
    // (server/seed/demo-town/README.md); the engine gave no time-expanded share for them.
    const staticOnly = result().bottlenecks.map((b) => ({ ...b, shareOfCut: 0, cutWindows: [] as [number, number][] }));
    const shares = staticOnly.map((b) => cutShare(b, 5600));
    expect(shares.reduce((a, b) => a + b, 0)).toBeCloseTo((750 + 2000 + 2000) / 5600, 12);
    expect(cutShare({ ...staticOnly[0]!, inStaticCut: false }, 5600)).toBe(0);
    expect(cutWindowsText(staticOnly[0]!)).toBe('once traffic is steady');
    expect(rankChokePoints(staticOnly, 5600).map((b) => b.segmentId)).toEqual([4, 3, 5]);
  });

  it('tells a gain of nothing from a gain not worked out', () => {
    const b = result().bottlenecks[0]!;
    expect(laneGainText(b, true)).toBe('nothing (another road limits next)');
    expect(laneGainText(b, false)).toBe('not worked out in this run');
    expect(laneGainText(result().bottlenecks[2]!, false)).toBe('+1,200 veh/h');
    expect(chokePointContext(result())).toEqual({ steadyStateVehiclesPerHour: 5600, gainsComputed: false });
  });

  it('names unnamed roads by class and escapes names in the popup', () => {
    expect(roadTitle({ name: '', roadClass: 'living_street', segmentId: 12 })).toBe('Unnamed living street (segment 12)');
    const html = chokePointPopupHtml(result().bottlenecks[0]!, 'north-east', { steadyStateVehiclesPerHour: 5600, gainsComputed: true });
    expect(html).toContain('Ferry &lt;Lane&gt;');
    expect(html).not.toContain('<Lane>');
    expect(html).toContain('heading north-east');
    expect(html).toContain('750 veh/h');
    expect(html).toContain('13 %');
    expect(html).toContain('0:10–6:00');
    expect(html).toContain('nothing (another road limits next)');
  });
});

describe('the curve tooltip', () => {
  it('says the time as a duration, never raw decimal hours', async () => {
    const { curveTooltipTitle } = await import('../../src/format/run-result');
    expect(curveTooltipTitle(1.5833333333)).toBe('1 h 35 min after the order');
    expect(curveTooltipTitle(0.25)).toBe('15 min after the order');
    expect(curveTooltipTitle(3)).toBe('3 h after the order');
    expect(curveTooltipTitle(2.0833333)).not.toMatch(/\d\.\d/);
  });
});
