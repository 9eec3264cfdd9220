// How two search answers are drawn, shared by the workspace map, the Findings tab and the
// briefing so they agree: "where each zone goes" as one coloured line per road its vehicles use
// (the zone's colour, wider for more vehicles), and the quickest departure order as each zone's
// release window, coloured from the first zone to leave (dark) to the last (light).
import type { z } from 'zod';
import type { releaseOrderAnswerSchema, zoneRoutesAnswerSchema } from '../api/proposals';
import { formatDuration } from './numbers';

type ZoneRoutesAnswer = z.infer<typeof zoneRoutesAnswerSchema>;
type ReleaseOrderAnswer = z.infer<typeof releaseOrderAnswerSchema>;

/**
 * One colour per zone, in the answer's zone order, repeating after eight. Chosen apart from the
 * map's other marks (the choke points' violet, the utilisation bands, the scenario's red, blue and
 * teal are not shown beside a zone-routes answer).
 */
export const ZONE_ROUTE_COLOURS = ['#d9480f', '#1864ab', '#2b8a3e', '#c2255c', '#e67700', '#0b7285', '#5c940d', '#364fc7'] as const;

export const zoneRouteColour = (zoneIndex: number): string => ZONE_ROUTE_COLOURS[zoneIndex % ZONE_ROUTE_COLOURS.length]!;

/**
 * A road is drawn for a zone when it carries at least this share of the zone's delivered
 * vehicles: the zone's corridors, not every side street a few vehicles use.
 */
export const CORRIDOR_SHARE = 0.1;

export type ZoneRouteLine = {
  segmentId: number;
  /** Vehicles of all zones on the segment (both directions). */
  vehicles: number;
  /** The zone with the most vehicles on it gives the line its colour. */
  colour: string;
  zones: { zoneId: number; name: string; vehicles: number }[];
};

/** Every segment that is a corridor of at least one zone, most vehicles first. */
export function zoneRouteLines(answer: ZoneRoutesAnswer, share = CORRIDOR_SHARE): ZoneRouteLine[] {
  const bySegment = new Map<number, { zoneIndex: number; zoneId: number; name: string; vehicles: number }[]>();
  answer.zones.forEach((zone, zoneIndex) => {
    if (zone.deliveredVehicles <= 0) return;
    const perSegment = new Map<number, number>();
    for (const r of zone.roads) perSegment.set(r.segmentId, (perSegment.get(r.segmentId) ?? 0) + r.vehicles);
    for (const [segmentId, vehicles] of perSegment) {
      if (vehicles < share * zone.deliveredVehicles) continue;
      const list = bySegment.get(segmentId) ?? [];
      list.push({ zoneIndex, zoneId: zone.zoneId, name: zone.name, vehicles });
      bySegment.set(segmentId, list);
    }
  });
  return [...bySegment.entries()]
    .map(([segmentId, list]) => {
      list.sort((a, b) => b.vehicles - a.vehicles || a.zoneIndex - b.zoneIndex);
      return {
        segmentId,
        vehicles: list.reduce((s, x) => s + x.vehicles, 0),
        colour: zoneRouteColour(list[0]!.zoneIndex),
        zones: list.map(({ zoneId, name, vehicles }) => ({ zoneId, name, vehicles })),
      };
    })
    .sort((a, b) => b.vehicles - a.vehicles || a.segmentId - b.segmentId);
}

/** Line width for a corridor: from `min` for the fewest vehicles to `max` for the most, by square root (area reads as volume). */
export function routeLineWidth(vehicles: number, mostVehicles: number, min = 3, max = 10): number {
  if (mostVehicles <= 0) return min;
  return min + (max - min) * Math.sqrt(Math.max(0, Math.min(1, vehicles / mostVehicles)));
}

export type ReleaseWindow = {
  zoneId: number;
  name: string;
  /** Minutes after the order: [first departure, end of the last departure step]. */
  window: [number, number] | null;
  /** Minutes after the order by which half the zone's vehicles have left (end of that step). */
  halfGoneMinutes: number | null;
  /** 1 = half gone first; zones at the same time share a rank. */
  rank: number | null;
  colour: string;
  /** Under the zone's name on the map: the window and when half have left. */
  label: string;
};

/** Dark to light, first to leave to last (one hue, so the order reads without a key). */
const WINDOW_RAMP = ['#7f2704', '#a63603', '#d94801', '#f16913', '#fd8d3c', '#fdae6b', '#fdd0a2'];
const NO_DEPARTURE = '#adb5bd';

function halfGoneStep(departuresByStep: readonly number[]): number | null {
  const total = departuresByStep.reduce((s, n) => s + n, 0);
  if (total <= 0) return null;
  let sum = 0;
  for (let i = 0; i < departuresByStep.length; i++) {
    sum += departuresByStep[i]!;
    if (sum >= total / 2) return i;
  }
  return departuresByStep.length - 1;
}

/**
 * Each zone's release window in the quickest order. In the optimum many zones start at once and
 * differ in how fast they empty, so the order (rank and colour) is by the time half of each zone
 * has left; the colour runs over that time, darkest for the earliest.
 */
export function releaseWindows(answer: ReleaseOrderAnswer): ReleaseWindow[] {
  const halves = answer.zones.map((z) => {
    const step = halfGoneStep(z.departuresByStep);
    return step === null ? null : (step + 1) * answer.stepMinutes;
  });
  const distinct = [...new Set(halves.filter((h): h is number => h !== null))].sort((a, b) => a - b);
  const lo = distinct[0] ?? 0;
  const hi = distinct.at(-1) ?? 0;
  return answer.zones.map((z, i) => {
    const half = halves[i]!;
    if (z.firstDepartureMinutes === null || z.lastDepartureMinutes === null || half === null) {
      return { zoneId: z.zoneId, name: z.name, window: null, halfGoneMinutes: null, rank: null, colour: NO_DEPARTURE, label: 'no departures' };
    }
    const position = hi > lo ? (half - lo) / (hi - lo) : 0;
    const window: [number, number] = [z.firstDepartureMinutes, z.lastDepartureMinutes + answer.stepMinutes];
    return {
      zoneId: z.zoneId,
      name: z.name,
      window,
      halfGoneMinutes: half,
      rank: distinct.indexOf(half) + 1,
      colour: WINDOW_RAMP[Math.round(position * (WINDOW_RAMP.length - 1))]!,
      label: `leaves ${formatDuration(window[0])}–${formatDuration(window[1])}, half by ${formatDuration(half)}`,
    };
  });
}

/** The sentence that sets the quickest order against the expected departures, for screen and briefing alike. */
export function releaseOrderSentence(
  answer: Pick<ReleaseOrderAnswer, 'quickestClearanceMinutes' | 'expectedClearanceMinutes' | 'stepMinutes' | 'expectedDeliveredByStep'>,
): string {
  const horizon = answer.expectedDeliveredByStep.length > 1 ? ` of ${formatDuration((answer.expectedDeliveredByStep.length - 1) * answer.stepMinutes)}` : '';
  const quickest =
    answer.quickestClearanceMinutes === null
      ? `Even if zones left in the best order, the roads could not clear everyone within the horizon${horizon}`
      : `The roads could clear everyone in ${formatDuration(answer.quickestClearanceMinutes)} if zones left in this order`;
  const expected =
    answer.expectedClearanceMinutes === null
      ? `with the expected departures not everyone has arrived within the horizon${horizon}`
      : `with the expected departures it takes ${formatDuration(answer.expectedClearanceMinutes)}`;
  return `${quickest}; ${expected}.`;
}
