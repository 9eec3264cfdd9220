// What holds arrivals down at the moment of the time-expanded cut (ArrivalLimits), in the words
// the workspace and the briefing both use. By max-flow/min-cut the cut's capacity bounds what can
// have arrived by then; raising anything that is not part of the cut cannot raise that bound.
import type { ArrivalLimits } from '../api/runs';

export type ArrivalLimitKey = keyof ArrivalLimits['parts'];
export type ArrivalLimitPart = { key: ArrivalLimitKey; label: string; detail: string; vehicles: number; share: number };

export const arrivalLimitLabels: Record<ArrivalLimitKey, { label: string; detail: string }> = {
  roads: { label: 'Road capacity', detail: 'roads running full' },
  departures: { label: 'Departure timing', detail: 'people not yet on the road' },
  zoneRelease: { label: 'Zone release rates', detail: 'how fast a zone can put vehicles on the road' },
  storage: { label: 'Queue space on roads', detail: 'room to wait at a junction' },
  shelterIntake: { label: 'Shelter intake rates', detail: 'how fast a shelter takes arrivals in' },
  shelterCapacity: { label: 'Shelter space', detail: 'shelters full' },
};

/** The parts that hold arrivals down, largest first; parts with nothing in the cut are left out. */
export function arrivalLimitParts(limits: ArrivalLimits): ArrivalLimitPart[] {
  const keys = Object.keys(arrivalLimitLabels) as ArrivalLimitKey[];
  return keys
    .map((key) => ({ key, ...arrivalLimitLabels[key], vehicles: limits.parts[key], share: limits.vehicles > 0 ? limits.parts[key] / limits.vehicles : 0 }))
    .filter((p) => p.vehicles > 0)
    .sort((a, b) => b.vehicles - a.vehicles || keys.indexOf(a.key) - keys.indexOf(b.key));
}

export type LimitFormats = { count: (n: number) => string; share: (s: number) => string; duration: (minutes: number) => string };

/** Two or three sentences: the bound, its parts, and what no road change can do when no road is part of it. */
export function arrivalLimitSummary(limits: ArrivalLimits, f: LimitFormats): string {
  const parts = arrivalLimitParts(limits);
  if (parts.length === 0) return `Nothing can arrive within ${f.duration(limits.byMinutes)}.`;
  const named = parts.map((p) => `${p.label.toLowerCase()} ${f.share(p.share)}`).join(', ');
  const bound = `By ${f.duration(limits.byMinutes)} after the order at most ${f.count(limits.vehicles)} vehicles can have arrived. What holds that number down: ${named}.`;
  if (limits.parts.roads === 0) return `${bound} No road is part of that limit, so more lanes, contraflow or a reopened road alone cannot raise it; only a change to what is part of it can.`;
  return bound;
}
