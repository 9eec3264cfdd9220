// Sweeps: the values a sweep form asks for, in the planner's units (participation in per cent,
// capacity as a factor), the progress of a sweep's runs, and its summary series. Pure.
import type { Sweep, SweepParameter } from '@shared/api/sweeps';
import type { RunStatus } from '@shared/api/runs';
import { runIsActive } from './run-result';

/** The form's unit for each swept parameter, and what the server stores. */
export const sweepMeta: Record<SweepParameter, { label: string; unit: string; toStored: (v: number) => number; fromStored: (v: number) => number; defaults: { from: number; to: number; step: number }; limits: { min: number; max: number } }> = {
  participationRate: {
    label: 'Participation',
    unit: '%',
    toStored: (v) => v / 100,
    fromStored: (v) => v * 100,
    defaults: { from: 50, to: 100, step: 10 },
    limits: { min: 0, max: 100 },
  },
  capacityFactor: {
    label: 'Capacity factor',
    unit: '×',
    toStored: (v) => v,
    fromStored: (v) => v,
    defaults: { from: 0.7, to: 1, step: 0.05 },
    limits: { min: 0.05, max: 1.5 },
  },
};

/** from, from + step, … up to `to` (included when the steps land on it), in stored units.
 *  Rounded to 1e-6 so that 0.7 + 6 × 0.05 is 1, not 0.9999999. Empty when the input is unusable. */
export function sweepValues(parameter: SweepParameter, from: number, to: number, step: number): number[] {
  if (![from, to, step].every(Number.isFinite) || step <= 0 || to < from) return [];
  const count = Math.floor((to - from) / step + 1e-9) + 1;
  if (count > 1000) return [];
  const meta = sweepMeta[parameter];
  return Array.from({ length: count }, (_, i) => Math.round(meta.toStored(from + i * step) * 1e6) / 1e6);
}

/** 0.65 → "65 %" for participation; 0.85 → "× 0.85" for capacity. */
export function formatSweepValue(parameter: SweepParameter, stored: number): string {
  if (parameter === 'participationRate') return `${Math.round(stored * 1000) / 10} %`;
  return `× ${Math.round(stored * 1000) / 1000}`;
}

export type SweepProgress = { total: number; finished: number; succeeded: number; failed: number; active: number; byStatus: Record<RunStatus, number>; done: boolean };

export function sweepProgress(sweep: Pick<Sweep, 'runs'>): SweepProgress {
  const byStatus: Record<RunStatus, number> = { queued: 0, running: 0, succeeded: 0, failed: 0, cancelled: 0 };
  for (const r of sweep.runs) byStatus[r.status]++;
  const active = sweep.runs.filter((r) => runIsActive(r.status)).length;
  return {
    total: sweep.runs.length,
    finished: sweep.runs.length - active,
    succeeded: byStatus.succeeded,
    failed: byStatus.failed + byStatus.cancelled,
    active,
    byStatus,
    done: active === 0,
  };
}

export type SweepPoint = { x: number; personsPerHour: number; clearanceMinutes: number | null; horizonMinutes: number };

/** The finished runs' headline figures by swept value, in order of the value. */
export function sweepSeries(sweep: Pick<Sweep, 'runs'>): SweepPoint[] {
  return sweep.runs
    .filter((r) => r.status === 'succeeded' && r.headline)
    .map((r) => ({ x: r.sweepValue, personsPerHour: r.headline!.steadyStatePersonsPerHour, clearanceMinutes: r.headline!.clearanceMinutes, horizonMinutes: r.headline!.horizonMinutes }))
    .sort((a, b) => a.x - b.x);
}
