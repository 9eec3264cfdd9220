// Comparing runs: headline differences against the first run, and which choke points appear,
// vanish or stay between them. Pure, so the comparison page and any export agree.
import type { RunHeadline, RunResult } from '../api/runs';

export type ChokePointPresence = {
  segmentId: number;
  direction: 'forward' | 'backward';
  name: string;
  /** For each compared run, in order: is this road in its (static or time-expanded) cut? */
  inRun: boolean[];
  change: 'everywhere' | 'appears' | 'vanishes' | 'varies';
};

const key = (b: { segmentId: number; direction: string }) => `${b.segmentId}:${b.direction}`;

export function chokePointPresence(results: readonly RunResult[]): ChokePointPresence[] {
  const all = new Map<string, { segmentId: number; direction: 'forward' | 'backward'; name: string }>();
  const sets = results.map((r) => {
    const s = new Set<string>();
    for (const b of r.bottlenecks) {
      s.add(key(b));
      if (!all.has(key(b))) all.set(key(b), { segmentId: b.segmentId, direction: b.direction, name: b.name });
    }
    return s;
  });
  return [...all.entries()].map(([k, road]) => {
    const inRun = sets.map((s) => s.has(k));
    const first = inRun[0];
    const rest = inRun.slice(1);
    const change: ChokePointPresence['change'] = inRun.every(Boolean)
      ? 'everywhere'
      : !first && rest.every(Boolean)
        ? 'appears'
        : first && rest.every((x) => !x)
          ? 'vanishes'
          : 'varies';
    return { ...road, inRun, change };
  });
}

export const headlineKeys = [
  'steadyStateVehiclesPerHour',
  'steadyStatePersonsPerHour',
  'deliveredPersons',
  'clearanceMinutes',
  'p50Minutes',
  'p90Minutes',
  'p95Minutes',
] as const satisfies readonly (keyof RunHeadline)[];

/** Each headline figure of each run minus the first run's; null where either is null. */
export function headlineDifferences(results: readonly RunResult[]): Record<(typeof headlineKeys)[number], (number | null)[]> {
  const first = results[0]?.headline;
  const out = {} as Record<(typeof headlineKeys)[number], (number | null)[]>;
  for (const k of headlineKeys) {
    out[k] = results.map((r) => {
      const a = first?.[k];
      const b = r.headline[k];
      return a === null || a === undefined || b === null ? null : b - a;
    });
  }
  return out;
}
