// Roads before an analysis: darker and wider for the bigger classes, wider with more lanes,
// closed roads dashed red, and missing lane data falling back to the class's usual count.
import { describe, expect, it } from 'vitest';
import { drivableRoadClasses } from '../../shared/api/road-attributes';
import { DEFAULT_CAPACITY_ROWS } from '../../shared/model/capacity-defaults';
import { closedRoadColor, lanesShown, roadClassLooks, roadLegend, roadStyle, roadWeight } from '../../src/map/road-style';

const road = (over: Partial<Parameters<typeof roadStyle>[0]> = {}) => ({
  roadClass: 'primary' as const,
  lanesForward: null,
  lanesBackward: null,
  closed: false,
  ...over,
});

describe('road style', () => {
  it('has a look for every drivable class', () => {
    for (const c of drivableRoadClasses) expect(roadClassLooks[c]).toBeDefined();
  });

  it('uses the same usual lane counts as the plan defaults (shared/model/capacity-defaults)', () => {
    for (const row of DEFAULT_CAPACITY_ROWS) expect(roadClassLooks[row.roadClass].defaultLanes).toBe(row.lanesPerDirection);
  });

  it('falls back to the class lanes when the data gives none, and takes the busier direction', () => {
    expect(lanesShown(road())).toBe(2);
    expect(lanesShown(road({ roadClass: 'residential' }))).toBe(1);
    expect(lanesShown(road({ lanesForward: 1, lanesBackward: 3 }))).toBe(3);
    expect(lanesShown(road({ lanesForward: 0, lanesBackward: 0 }))).toBe(1);
  });

  it('gets wider with lanes and with the class, and thinner when zoomed out', () => {
    expect(roadWeight(road({ lanesForward: 3, lanesBackward: 3 }), 14)).toBeGreaterThan(roadWeight(road({ lanesForward: 1, lanesBackward: 1 }), 14));
    expect(roadWeight(road({ roadClass: 'motorway', lanesForward: 2 }), 14)).toBeGreaterThan(roadWeight(road({ roadClass: 'residential', lanesForward: 2 }), 14));
    expect(roadWeight(road(), 10)).toBeLessThan(roadWeight(road(), 14));
    expect(roadWeight(road({ roadClass: 'motorway', lanesForward: 16 }), 18)).toBeLessThanOrEqual(9);
  });

  it('draws closed roads dashed in red whatever their class', () => {
    const style = roadStyle(road({ roadClass: 'motorway', closed: true }), 14);
    expect(style.color).toBe(closedRoadColor);
    expect(style.dashArray).toBeDefined();
    expect(roadStyle(road(), 14).dashArray).toBeUndefined();
  });

  it('lists each look once in the legend, closed last', () => {
    const rows = roadLegend();
    expect(new Set(rows.map((r) => r.label)).size).toBe(rows.length);
    expect(rows.at(-1)).toMatchObject({ label: 'Closed', dashed: true });
  });
});
