// The briefing map at county scale: which road classes are drawn (map-roads.ts), and that the
// figure says what it leaves out and keeps zone outlines over the roads (map-svg.ts). Class
// lengths are those of the generated county (tests/bench/county/README.md) and of a 40 × 40 one.
import { describe, expect, it } from 'vitest';
import { planMapRoads, MERGE_ABOVE_SEGMENTS, MIN_ROAD_SPACING_PT } from '../../../server/services/briefings/map-roads';
import { mapSvg } from '../../../server/services/briefings/map-svg';

const county = [
  { roadClass: 'residential', segments: 143_280, lengthMeters: 14_312_813 },
  { roadClass: 'primary', segments: 5_978, lengthMeters: 597_229 },
  { roadClass: 'tertiary', segments: 17_910, lengthMeters: 1_789_102 },
  { roadClass: 'secondary', segments: 11_940, lengthMeters: 1_192_734 },
];
const countyExtent = { widthMeters: 29_900, heightMeters: 29_900 };

describe('roads on the briefing map', () => {
  it('leaves the local streets and collectors of a county out, keeps the arterials, and merges them', () => {
    const plan = planMapRoads(county, countyExtent);
    expect(plan.drawn).toEqual(['primary', 'secondary']);
    expect(plan.leftOut).toEqual([
      { roadClass: 'tertiary', segments: 17_910 },
      { roadClass: 'residential', segments: 143_280 },
    ]);
    expect(plan.merge).toBe(true);
    // Spacing of what is drawn, by the grid rule d = 2·A / L, stays at or above the limit.
    const side = 29_900 * plan.scale;
    const drawnLength = (597_229 + 1_192_734) * plan.scale;
    expect((2 * side * side) / drawnLength).toBeGreaterThanOrEqual(MIN_ROAD_SPACING_PT);
    expect(plan.toleranceMeters).toBeCloseTo(0.5 / plan.scale);
  });

  it('draws every road of a town one by one', () => {
    const town = [
      { roadClass: 'residential', segments: 2_800, lengthMeters: 280_000 },
      { roadClass: 'secondary', segments: 288, lengthMeters: 28_800 },
    ];
    const plan = planMapRoads(town, { widthMeters: 3_900, heightMeters: 3_900 });
    expect(plan.drawn).toEqual(['secondary', 'residential']);
    expect(plan.leftOut).toEqual([]);
    expect(plan.merge).toBe(false);
    expect(3_088).toBeLessThan(MERGE_ABOVE_SEGMENTS);
  });

  it('always draws the most important class, however dense', () => {
    const plan = planMapRoads([{ roadClass: 'residential', segments: 10, lengthMeters: 1e9 }], countyExtent);
    expect(plan.drawn).toEqual(['residential']);
  });

  it('says on the map what it left out, and draws zone outlines over the roads', () => {
    const road = { id: -1, roadClass: 'primary', coordinates: [[-36, 42], [-35.7, 42]] as [number, number][] };
    const zone = { id: 1, name: 'Ashgrove', rings: [[[-36, 42], [-35.9, 42], [-35.9, 42.1], [-36, 42]]] as [number, number][][] };
    const svg = mapSvg({ segments: [road], zones: [zone], shelters: [], chokePoints: [], leftOut: [{ roadClass: 'residential', segments: 143_280 }] });
    expect(svg).toContain('Not drawn at this scale: residential roads (143,280 segments)');
    expect(svg.indexOf('stroke-dasharray="4 2"')).toBeGreaterThan(svg.lastIndexOf('<polyline'));
    expect(mapSvg({ segments: [road], zones: [zone], shelters: [], chokePoints: [] })).not.toContain('Not drawn at this scale');
  });
});
