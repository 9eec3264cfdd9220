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

// WCAG 2.1 relative luminance and contrast ratio (W3C, "Web Content Accessibility Guidelines
// 2.1", definitions of relative luminance and contrast ratio).
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((v) => (v <= 0.03928 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
}

describe('contrast', () => {
  it('checks the formula on the WCAG end points: black on white is 21:1', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(contrast('#ffffff', '#ffffff')).toBe(1);
  });

  it('keeps every road class at 3:1 or more on a light basemap (WCAG 2.1 SC 1.4.11)', () => {
    // White and a typical light cream basemap tone (common practice for light basemaps).
    for (const background of ['#ffffff', '#f2efe9']) {
      for (const c of drivableRoadClasses) expect(contrast(roadClassLooks[c].color, background), `${c} on ${background}`).toBeGreaterThanOrEqual(3);
    }
  });

  it('keeps the legend true: each row is drawn in the colour of its class', () => {
    for (const row of roadLegend().filter((r) => !r.dashed)) {
      const look = Object.values(roadClassLooks).find((l) => l.label === row.label);
      expect(look?.color, row.label).toBe(row.color);
    }
  });

  it('gives white text 4.5:1 on the accent, and warning text 4.5:1 on white (WCAG 2.1 SC 1.4.3)', async () => {
    const { vuetifyThemeColours } = await import('../../src/plugins/theme-colours');
    expect(contrast(vuetifyThemeColours.accent, '#ffffff')).toBeGreaterThanOrEqual(4.5);
    expect(contrast(vuetifyThemeColours.warning, '#ffffff')).toBeGreaterThanOrEqual(4.5);
    expect(contrast(vuetifyThemeColours.primary, '#ffffff')).toBeGreaterThanOrEqual(4.5);
  });
});
