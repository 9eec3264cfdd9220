// The pure parts of the briefing: map projection and scale bar, the SVG figures, rankings,
// road directions, number formats and the content hash.
import { describe, expect, it } from 'vitest';
import { canonicalJson, contentSha256, sha256Hex, sha256OfStoredContent, storedBriefingContent } from '../../../server/services/briefings/content-fingerprint';
import { curveSvg, minuteStep, niceStep } from '../../../server/services/briefings/curve-svg';
import { formatCount, formatDuration, formatShare, formatSpan, formatStep } from '../../../shared/format/numbers';
import { equirectangularAbout, travelDirection } from '../../../server/services/briefings/map-projection';
import { mapSvg, midpointAlong, scaleBarLength } from '../../../server/services/briefings/map-svg';
import { chokePointRanks, rankedChokePoints, rankFixes } from '../../../server/services/briefings/rankings';
import { roadNamer } from '../../../server/services/briefings/road-labels';
import { briefingInput, km, result, segments, shelters, zones } from '../../fixtures/briefing/demo-town-briefing';

/** Haversine great-circle distance in metres. */
function haversine([lon1, lat1]: [number, number], [lon2, lat2]: [number, number], radius: number): number {
  const r = Math.PI / 180;
  const a = Math.sin(((lat2 - lat1) * r) / 2) ** 2 + Math.cos(lat1 * r) * Math.cos(lat2 * r) * Math.sin(((lon2 - lon1) * r) / 2) ** 2;
  return 2 * radius * Math.asin(Math.sqrt(a));
}

describe('map projection', () => {
  it('uses a haversine that reproduces the published check value', () => {
    // Rosetta Code "Haversine formula": (36.12, −86.67) → (33.94, −118.40), R = 6,372.8 km.
    expect(haversine([-86.67, 36.12], [-118.4, 33.94], 6_372_800) / 1000).toBeCloseTo(2887.2599506, 6);
  });

  it('agrees with the haversine distance to 0.1 % across a town', () => {
    const project = equirectangularAbout([-38, 44.5]).toMetres;
    for (const [a, b] of [
      [km(0, 0), km(5, 3.5)],
      [km(0.1, 3.6), km(5.3, -0.3)],
      [km(2, 0), km(2, 4)],
    ] as [[number, number], [number, number]][]) {
      const [x1, y1] = project(a);
      const [x2, y2] = project(b);
      const flat = Math.hypot(x2 - x1, y2 - y1);
      expect(Math.abs(flat / haversine(a, b, 6_371_008.8) - 1)).toBeLessThan(0.001);
    }
  });

  it('gives one degree of latitude within 0.1 % of the WGS84 value at 45°', () => {
    // WGS84 meridian degree at 45°: 111,131.777 m (docs/model.md §6, computed from a and 1/f).
    const [, y] = equirectangularAbout([0, 45]).toMetres([0, 46]);
    const [, y0] = equirectangularAbout([0, 45]).toMetres([0, 45]);
    expect(Math.abs((y - y0) / 111_131.777 - 1)).toBeLessThan(0.001);
  });

  it('names travel directions by compass sector', () => {
    expect([0, 44, 46, 90, 135, 180, 225, 270, 315, 359].map(travelDirection)).toEqual([
      'northbound',
      'north-eastbound',
      'north-eastbound',
      'eastbound',
      'south-eastbound',
      'southbound',
      'south-westbound',
      'westbound',
      'north-westbound',
      'northbound',
    ]);
  });
});

describe('map figure', () => {
  it('picks a round scale bar no longer than asked', () => {
    expect(scaleBarLength(0.08, 120)).toBe(1000); // 0.08 pt/m: 1 km = 80 pt
    expect(scaleBarLength(0.3, 120)).toBe(250);
    expect(scaleBarLength(0.001, 120)).toBe(100_000);
  });

  it('finds the midpoint along a bent line by length', () => {
    expect(midpointAlong([[0, 0], [10, 0], [10, 30]])).toEqual([10, 10]);
  });

  it('draws every limiting road with its rank badge, and escapes names', () => {
    const svg = mapSvg({
      segments,
      zones: [...zones, { id: 9, name: 'Mill & Quay <east>', rings: [[km(3.5, 1), km(4, 1), km(4, 1.5), km(3.5, 1)]] }],
      shelters,
      chokePoints: chokePointRanks(result),
    });
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg).toContain('Mill &amp; Quay &lt;east&gt;');
    expect(svg).not.toContain('<east>');
    const badges = [...svg.matchAll(/fill="#ffffff">(\d)<\/text>/g)].map((m) => m[1]);
    // Rank 1 in the legend, then the three ranked roads.
    expect(badges.sort()).toEqual(['1', '1', '2', '3']);
    expect((svg.match(/stroke="#4a1d7a"/g) ?? []).length).toBe(3 + 1);
  });

  it('says so when there is no geometry instead of drawing an empty frame', () => {
    expect(mapSvg({ segments: [], zones: [], shelters: [], chokePoints: [] })).toContain('No road geometry was stored with this run.');
  });
});

describe('curve figure', () => {
  it('chooses readable axis steps', () => {
    expect(niceStep(3300, 6)).toBe(1000);
    expect(niceStep(7920, 6)).toBe(2000);
    expect(niceStep(45, 6)).toBe(10);
    expect(minuteStep(180)).toBe(30);
    expect(minuteStep(360)).toBe(60);
    expect(minuteStep(72 * 60)).toBe(480);
  });

  it('marks 50/90/95 % and clearance, or says the horizon was not enough', () => {
    const base = { stepMinutes: 5, deliveredVehicles: result.curve.deliveredVehicles, demandVehicles: 3000, horizonMinutes: 180, p50Minutes: 70, p90Minutes: 110, p95Minutes: 120 };
    const cleared = curveSvg({ ...base, clearanceMinutes: 130, personsPerVehicle: 2.4 });
    for (const label of ['50 % by 1 h 10 min', '90 % by 1 h 50 min', '95 % by 2 h', 'All arrived by 2 h 10 min', 'To move: 3,000 vehicles', 'Persons (at 2.4 per vehicle)']) {
      expect(cleared).toContain(label);
    }
    const open = curveSvg({ ...base, p95Minutes: null, clearanceMinutes: null });
    expect(open).not.toContain('95 % by');
    expect(open).toContain('Not everyone has arrived within 3 h');
  });
});

describe('rankings and road names', () => {
  it('ranks limiting roads by share of the limit and fixes by gain', () => {
    expect(rankedChokePoints(result).map((b) => b.name)).toEqual(['Mill Bridge Road', 'Quarry Lane', 'Harbor Avenue']);
    expect(rankFixes(result).map((f) => [f.name, f.gainVehiclesPerHour])).toEqual([
      ['Mill Bridge Road', 600],
      ['Ferry Street', 520],
      ['Quarry Lane', 450],
      ['Harbor Avenue', 400],
    ]);
    expect(chokePointRanks(result)).toEqual([
      { segmentId: 20, rank: 1 },
      { segmentId: 21, rank: 2 },
      { segmentId: 22, rank: 3 },
    ]);
  });

  it('reads the direction from the geometry, reversed for the backward direction', () => {
    const names = roadNamer({ segments, zones, shelters });
    const quarry = { segmentId: 21, name: 'Quarry Lane', roadClass: 'tertiary' };
    expect(names.label({ ...quarry, direction: 'forward' })).toBe('Quarry Lane (north-eastbound)');
    expect(names.label({ ...quarry, direction: 'backward' })).toBe('Quarry Lane (south-westbound)');
    expect(names.name({ segmentId: 99, name: ' ', roadClass: 'living_street', direction: 'forward' })).toBe('Unnamed living street road (segment 99)');
    expect(names.direction({ segmentId: 99, name: 'x', roadClass: 'primary', direction: 'forward' })).toBe('as drawn');
  });
});

describe('number formats', () => {
  it('writes figures the way the tables print them', () => {
    expect(formatCount(4319.6)).toBe('4,320');
    expect(formatCount(-0.2)).toBe('0');
    expect(formatDuration(130)).toBe('2 h 10 min');
    expect(formatDuration(120)).toBe('2 h');
    expect(formatDuration(45)).toBe('45 min');
    expect(formatShare(0.048)).toBe('4.8 %');
    expect(formatShare(1)).toBe('100 %');
    expect(formatSpan(180)).toBe('3 hours');
    expect(formatSpan(90)).toBe('90 minutes');
    expect(formatStep(300)).toBe('5 minutes');
    expect(formatStep(30)).toBe('30 seconds');
  });
});

describe('content hash', () => {
  it('computes SHA-256 as published (FIPS 180-2, Appendix B.1: "abc")', () => {
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('writes canonical JSON: sorted keys, no undefined members, ISO dates, no non-finite numbers', () => {
    expect(canonicalJson({ b: 1, a: [true, null, { d: 'x', c: undefined }], t: new Date('2026-01-02T03:04:05Z') })).toBe('{"a":[true,null,{"d":"x"}],"b":1,"t":"2026-01-02T03:04:05.000Z"}');
    expect(canonicalJson({ z: 1, a: 2 })).toBe(canonicalJson({ a: 2, z: 1 }));
    expect(() => canonicalJson({ x: Number.NaN })).toThrow(/no JSON form/);
  });

  it('covers the figures but not the status or the sign-off', () => {
    const base = contentSha256(briefingInput());
    expect(contentSha256(briefingInput({ status: 'signed', signature: { name: 'A', role: 'B', signedAt: new Date() } }))).toBe(base);
    expect(contentSha256(briefingInput({ timeZone: 'America/Chicago', pageSize: 'A4' }))).toBe(base);
    const changed = { ...result, headline: { ...result.headline, steadyStatePersonsPerHour: 5281 } };
    expect(contentSha256(briefingInput({ result: changed }))).not.toBe(base);
    expect(contentSha256(briefingInput({ planName: 'Another plan' }))).not.toBe(base);
  });

  it('can be recomputed from the stored JSON', () => {
    const stored = storedBriefingContent(briefingInput());
    expect(typeof stored.createdAt).toBe('string');
    expect(sha256OfStoredContent(JSON.parse(JSON.stringify(stored)))).toBe(contentSha256(briefingInput()));
  });
});
