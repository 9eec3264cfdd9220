// Shelter names on the briefing map: a county's shelters can sit a few hundred metres apart,
// and names written at one fixed offset ran into each other (seen on the rendered county page).
import { describe, expect, it } from 'vitest';
import { labelBox, overlapArea, placeLabels, type Box } from '../../../server/services/briefings/label-placement';
import { mapSvg } from '../../../server/services/briefings/map-svg';

const frame = { width: 500, height: 300 };
const inside = (b: Box) => b.x >= 0 && b.y >= 0 && b.x + b.width <= frame.width && b.y + b.height <= frame.height;

describe('placing shelter names', () => {
  it('keeps the names of markers a few points apart clear of each other, and none is dropped', () => {
    const markers = Array.from({ length: 6 }, (_, i) => ({ x: 200 + (i % 2) * 6, y: 120 + Math.floor(i / 2) * 9, text: `Shelter number ${i + 1}` }));
    const placed = placeLabels(markers, 7.5, frame);
    expect(placed).toHaveLength(6);
    let overlapping = 0;
    for (let i = 0; i < placed.length; i++) for (let j = i + 1; j < placed.length; j++) if (overlapArea(placed[i]!.box, placed[j]!.box) > 0) overlapping++;
    expect(overlapping).toBe(0);
    expect(placed.every((p) => inside(p.box))).toBe(true);
  });

  it('writes to the left near the right edge, and below near the top', () => {
    const [right] = placeLabels([{ x: 495, y: 150, text: 'Eastgate Hall' }], 7.5, frame);
    expect(right!.anchor).toBe('end');
    expect(inside(right!.box)).toBe(true);
    const [top] = placeLabels([{ x: 100, y: 2, text: 'Hilltop School' }], 7.5, frame);
    expect(top!.y).toBeGreaterThan(2);
    expect(inside(top!.box)).toBe(true);
  });

  it('keeps clear of a zone name already on the map', () => {
    const zone = labelBox(130, 100, 'Riverside', 8, 'middle');
    const [placed] = placeLabels([{ x: 120, y: 108, text: 'Riverside School' }], 7.5, frame, [zone]);
    expect(overlapArea(placed!.box, zone)).toBe(0);
  });

  it('draws each shelter name of the map clear of the others', () => {
    const shelter = (id: number, lon: number, name: string) => ({ id, name, location: [lon, 42] as [number, number] });
    const road = { id: -1, roadClass: 'primary', coordinates: [[-36, 42], [-35.7, 42.1]] as [number, number][] };
    const svg = mapSvg({
      segments: [road],
      zones: [],
      shelters: [shelter(1, -35.85, 'Northfield Community Hall'), shelter(2, -35.849, 'Northfield Sports Centre'), shelter(3, -35.848, 'Northfield School')],
      chokePoints: [],
    });
    const labels = [...svg.matchAll(/<text x="([\d.]+)" y="([\d.]+)"[^>]*text-anchor="(start|end)"[^>]*>(Northfield[^<]*)<\/text>/g)].map((m) =>
      labelBox(Number(m[1]), Number(m[2]), m[4]!, 7.5, m[3] as 'start' | 'end'),
    );
    expect(labels).toHaveLength(3);
    expect(overlapArea(labels[0]!, labels[1]!) + overlapArea(labels[0]!, labels[2]!) + overlapArea(labels[1]!, labels[2]!)).toBe(0);
  });
});
