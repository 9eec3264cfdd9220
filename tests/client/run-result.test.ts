// What the findings say about a result: the headline in words, choke points by impact, one
// utilisation per segment, the curve in hours, and a popup that escapes what the data says.
import { describe, expect, it } from 'vitest';
import { runResultSchema, type RunResult } from '../../shared/api/runs';
import { curveCsv } from '../../shared/model/run-export-csv';
import { bottlenecksByImpact, chokePointContext, chokePointPopupHtml, curvePoints, cutShare, cutWindowsText, headlineTiles, laneGainText, loadBySegment, roadTitle } from '../../src/format/run-result';

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
    arcs: [
      { segmentId: 3, direction: 'forward', name: 'Sable Bridge', roadClass: 'primary', capacityVehiclesPerHour: 2000, flowVehiclesPerHour: 2000, utilisation: 1, inStaticCut: true },
      { segmentId: 3, direction: 'backward', name: 'Sable Bridge', roadClass: 'primary', capacityVehiclesPerHour: 2000, flowVehiclesPerHour: 0, utilisation: 0, inStaticCut: false },
      { segmentId: 9, direction: 'forward', name: '', roadClass: 'residential', capacityVehiclesPerHour: 600, flowVehiclesPerHour: 150, utilisation: 0.25, inStaticCut: false },
    ],
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
  it('gives the four headline figures in words, "not within the horizon" when clearance is missing', () => {
    expect(headlineTiles(result({ deliveredPersons: 21_990 }))[1]!.detail).toBe('99.9 % of 22,000 evacuating persons');
    const tiles = headlineTiles(result());
    expect(tiles.map((t) => t.key)).toEqual(['throughput', 'delivered', 'clearance', 'percentiles']);
    expect(tiles[0]!.value).toBe('12,320');
    expect(tiles[0]!.detail).toContain('5,600 veh/h');
    expect(tiles[1]!.label).toBe('Safe within 6 h');
    expect(tiles[1]!.detail).toBe('90 % of 22,000 evacuating persons');
    expect(tiles[2]!.value).toBe('Over 6 h');
    expect(tiles[2]!.detail).toBe('Not everyone is safe within the 6 h horizon.');
    expect(tiles[3]!.value).toBe('1 h 35 min · 4 h 50 min · –');
    expect(tiles[3]!.rows).toEqual([
      { label: '50 %', value: '1 h 35 min' },
      { label: '90 %', value: '4 h 50 min' },
      { label: '95 %', value: 'not within' },
    ]);
    expect(headlineTiles(result({ clearanceMinutes: 250 }))[2]!.value).toBe('4 h 10 min');
  });

  it('orders choke points by share of the cut, then by what one more lane gains', () => {
    expect(bottlenecksByImpact(result().bottlenecks).map((b) => b.segmentId)).toEqual([4, 3, 5]);
  });

  it('keeps the busier direction per segment for the map colour', () => {
    const loads = loadBySegment(result().arcs);
    expect(loads.get(3)?.utilisation).toBe(1);
    expect(loads.get(3)?.backward?.flowVehiclesPerHour).toBe(0);
    expect(loads.get(9)?.forward?.utilisation).toBe(0.25);
    expect(loads.has(5)).toBe(false);
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
    expect(bottlenecksByImpact(staticOnly, 5600).map((b) => b.segmentId)).toEqual([4, 3, 5]);
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
