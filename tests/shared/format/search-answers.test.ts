// How the zone routes and the departure order are drawn: which roads count as a zone's corridors,
// the colour and width of each line, and each zone's release window and rank.
import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import type { releaseOrderAnswerSchema, zoneRoutesAnswerSchema } from '../../../shared/api/proposals';
import { CORRIDOR_SHARE, releaseOrderSentence, releaseWindows, routeLineWidth, zoneRouteColour, zoneRouteLines } from '../../../shared/format/search-answers';

const road = (segmentId: number, vehicles: number, direction: 'forward' | 'backward' = 'forward') => ({ segmentId, direction, name: `Road ${segmentId}`, roadClass: 'primary', vehicles });
const zone = (zoneId: number, delivered: number, roads: ReturnType<typeof road>[]) => ({
  zoneId,
  name: `Zone ${zoneId}`,
  vehicles: delivered,
  deliveredVehicles: delivered,
  shelters: [],
  mainRoads: [],
  roads,
  departureWindowMinutes: null,
  arrivalWindowMinutes: null,
});

describe('zone route lines', () => {
  const answer: z.infer<typeof zoneRoutesAnswerSchema> = {
    kind: 'zone-routes',
    clearanceMinutes: 60,
    zones: [
      // Zone 1: 1,000 vehicles; road 12 carries 100 (= 10 %, kept), road 13 carries 99 (dropped).
      zone(1, 1000, [road(11, 1000), road(12, 60), road(12, 40, 'backward'), road(13, 99)]),
      // Zone 2 shares road 11 with more vehicles: the line takes zone 2's colour.
      zone(2, 2000, [road(11, 1500), road(21, 500)]),
      zone(3, 0, []),
    ],
  };

  it('keeps each zone’s roads carrying at least the corridor share (both directions summed), coloured by the zone with most vehicles', () => {
    expect(CORRIDOR_SHARE).toBe(0.1);
    const lines = zoneRouteLines(answer);
    expect(lines.map((l) => l.segmentId)).toEqual([11, 21, 12]);
    const shared = lines[0]!;
    expect(shared.vehicles).toBe(2500);
    expect(shared.zones.map((z) => z.zoneId)).toEqual([2, 1]);
    expect(shared.colour).toBe(zoneRouteColour(1));
    expect(lines[2]!.vehicles).toBe(100);
    expect(lines[2]!.colour).toBe(zoneRouteColour(0));
  });

  it('gives zones their own colours, repeating after eight, and wider lines for more vehicles', () => {
    const colours = Array.from({ length: 8 }, (_, i) => zoneRouteColour(i));
    expect(new Set(colours).size).toBe(8);
    expect(zoneRouteColour(8)).toBe(colours[0]);
    expect(routeLineWidth(0, 100)).toBe(3);
    expect(routeLineWidth(100, 100)).toBe(10);
    expect(routeLineWidth(25, 100)).toBeCloseTo(3 + 7 * 0.5);
    expect(routeLineWidth(5, 0)).toBe(3);
  });
});

describe('release windows', () => {
  const zoneOrder = (zoneId: number, first: number | null, last: number | null, departuresByStep: number[]) => ({
    zoneId,
    name: `Zone ${zoneId}`,
    vehicles: 10,
    firstDepartureMinutes: first,
    lastDepartureMinutes: last,
    departuresByStep,
  });
  const answer: z.infer<typeof releaseOrderAnswerSchema> = {
    kind: 'release-order',
    stepMinutes: 5,
    quickestClearanceMinutes: 95,
    expectedClearanceMinutes: 240,
    scheduleClearanceMinutes: 95,
    waitsMovedHome: true,
    demandVehicles: 40,
    quickestDeliveredByStep: [],
    expectedDeliveredByStep: [0, 5, 10],
    zones: [
      // Steps of 5 min: half of zone 1's 10 vehicles have left by the end of step 7 (40 min).
      zoneOrder(1, 30, 55, [0, 0, 0, 0, 0, 0, 2, 3, 3, 1, 0, 1]),
      // Zones 2 and 3 both start at once; zone 3 empties faster (half by 5 min, zone 2 by 15 min).
      zoneOrder(2, 0, 25, [1, 1, 3, 1, 2, 2]),
      zoneOrder(3, 0, 10, [6, 2, 2]),
      zoneOrder(4, null, null, []),
    ],
  };

  it('ranks zones by when half their vehicles have left, windows ending with the last step, dark first', () => {
    const w = releaseWindows(answer);
    expect(w.map((x) => x.halfGoneMinutes)).toEqual([40, 15, 5, null]);
    expect(w.map((x) => x.rank)).toEqual([3, 2, 1, null]);
    expect(w[0]!.window).toEqual([30, 60]);
    expect(w[2]!.label).toBe('leaves 0 min–15 min, half by 5 min');
    expect(w[0]!.label).toBe('leaves 30 min–1 h, half by 40 min');
    expect(w[2]!.colour).toBe('#7f2704');
    expect(w[0]!.colour).toBe('#fdd0a2');
    expect(w[3]!.label).toBe('no departures');
  });

  it('says the quickest clearance against the expected one, and the horizon when either does not clear', () => {
    expect(releaseOrderSentence(answer)).toBe('The roads could clear everyone in 1 h 35 min if zones left in this order; with the expected departures it takes 4 h.');
    expect(releaseOrderSentence({ ...answer, expectedClearanceMinutes: null })).toBe(
      'The roads could clear everyone in 1 h 35 min if zones left in this order; with the expected departures not everyone has arrived within the horizon of 10 min.',
    );
    expect(releaseOrderSentence({ ...answer, quickestClearanceMinutes: null, expectedClearanceMinutes: null })).toMatch(
      /^Even if zones left in the best order, the roads could not clear everyone within the horizon of 10 min; /,
    );
  });
});
