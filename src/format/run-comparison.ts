// The comparison page's figures: which runs the address names, a label per run, the headline
// table with each run's difference from the first, and the words and colours of the choke-point
// changes. Pure: the sums come from shared/model/compare-runs.ts, this file only words them.
import { headlineDifferences, headlineKeys, type ChokePointPresence } from '@shared/model/compare-runs';
import type { Run, RunResult } from '@shared/api/runs';
import type { Scenario } from '@shared/api/scenarios';
import { formatCount, formatDuration } from '@shared/format/numbers';
import { formatCompactLocalDateTime } from './local-time';

const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** `?runs=id1,id2`: the valid ids in order, each once. */
export function runIdsFromQuery(value: unknown): string[] {
  const text = Array.isArray(value) ? value.join(',') : typeof value === 'string' ? value : '';
  const ids = text.split(',').map((s) => s.trim()).filter((s) => uuid.test(s));
  return [...new Set(ids)];
}

/** "Bridge closed" or "Base plan", with when it was started in the organisation's zone:
 *  "Bridge closed · 5 Dec 2026, 13:56 CST". */
export function runLabel(run: Pick<Run, 'scenarioId' | 'createdAt'>, scenarios: readonly Pick<Scenario, 'id' | 'name'>[]): string {
  const name = run.scenarioId === null ? 'Base plan' : (scenarios.find((s) => s.id === run.scenarioId)?.name ?? 'Deleted scenario');
  return `${name} · ${formatCompactLocalDateTime(run.createdAt)}`;
}

type HeadlineKey = (typeof headlineKeys)[number];

const rowMeta: Record<HeadlineKey, { label: string; kind: 'perHour' | 'count' | 'minutes'; unit: string; better: 'higher' | 'lower' }> = {
  steadyStatePersonsPerHour: { label: 'Evacuees per hour, steady state', kind: 'perHour', unit: 'persons/h', better: 'higher' },
  steadyStateVehiclesPerHour: { label: 'Vehicles per hour, steady state', kind: 'perHour', unit: 'veh/h', better: 'higher' },
  deliveredPersons: { label: 'Persons at a shelter or exit within the horizon', kind: 'count', unit: 'persons', better: 'higher' },
  clearanceMinutes: { label: 'Clearance time', kind: 'minutes', unit: '', better: 'lower' },
  p50Minutes: { label: 'Half arrived after', kind: 'minutes', unit: '', better: 'lower' },
  p90Minutes: { label: '90 % arrived after', kind: 'minutes', unit: '', better: 'lower' },
  p95Minutes: { label: '95 % arrived after', kind: 'minutes', unit: '', better: 'lower' },
};

export type ComparisonCell = { value: string; difference: string; tone: 'better' | 'worse' | 'same' | 'none' };
export type ComparisonRow = { key: HeadlineKey; label: string; cells: ComparisonCell[] };

function formatValue(kind: 'perHour' | 'count' | 'minutes', unit: string, value: number | null, horizonMinutes: number): string {
  if (kind === 'minutes') return value === null ? `over ${formatDuration(horizonMinutes)}` : formatDuration(value);
  return `${formatCount(value ?? 0)} ${unit}`;
}

function formatDifference(kind: 'perHour' | 'count' | 'minutes', unit: string, d: number): string {
  const sign = d > 0 ? '+' : d < 0 ? '−' : '±';
  const size = Math.abs(d);
  return kind === 'minutes' ? `${sign}${formatDuration(size)}` : `${sign}${formatCount(size)} ${unit}`;
}

/** One row per headline figure; the first run's cells carry no difference. */
export function comparisonRows(results: readonly RunResult[]): ComparisonRow[] {
  const differences = headlineDifferences(results);
  const order: HeadlineKey[] = ['steadyStatePersonsPerHour', 'steadyStateVehiclesPerHour', 'deliveredPersons', 'clearanceMinutes', 'p50Minutes', 'p90Minutes', 'p95Minutes'];
  return order.map((key) => {
    const meta = rowMeta[key];
    const cells = results.map((r, i): ComparisonCell => {
      const value = formatValue(meta.kind, meta.unit, r.headline[key], r.headline.horizonMinutes);
      if (i === 0) return { value, difference: '', tone: 'none' };
      const d = differences[key][i];
      // A time that came within the horizon in one run and not in the other has no difference.
      if (d === null || d === undefined) return { value, difference: r.headline[key] === results[0]!.headline[key] ? '' : 'not comparable', tone: 'none' };
      // Half a unit is below what the table shows: the same.
      if (Math.abs(d) < 0.5) return { value, difference: 'no change', tone: 'same' };
      const up = d > 0;
      return { value, difference: formatDifference(meta.kind, meta.unit, d), tone: up === (meta.better === 'higher') ? 'better' : 'worse' };
    });
    return { key, label: meta.label, cells };
  });
}

export type PresenceLook = { label: string; color: string; dashed: boolean; help: string };

/** Our colours for the four kinds of change, told apart by dash as well as colour. */
export const presenceLooks: Record<ChokePointPresence['change'], PresenceLook> = {
  everywhere: { label: 'Limits in every run', color: '#4a1d7a', dashed: false, help: 'a choke point whatever changes' },
  appears: { label: 'New choke point', color: '#c2185b', dashed: false, help: 'not in the first run, in all the others' },
  vanishes: { label: 'No longer limits', color: '#2e7d32', dashed: true, help: 'in the first run only' },
  varies: { label: 'Limits in some runs', color: '#ef8f00', dashed: true, help: 'see the table for which' },
};

/** Choke points in a stable reading order: new ones, gone ones, mixed, then the steady ones. */
export function presenceByChange(presence: readonly ChokePointPresence[]): ChokePointPresence[] {
  const rank: Record<ChokePointPresence['change'], number> = { appears: 0, vanishes: 1, varies: 2, everywhere: 3 };
  return [...presence].sort((a, b) => rank[a.change] - rank[b.change] || a.name.localeCompare(b.name) || a.segmentId - b.segmentId);
}

/** "3 new, 1 gone, 2 in every run". */
export function presenceSummary(presence: readonly ChokePointPresence[]): string {
  const count = (c: ChokePointPresence['change']) => presence.filter((p) => p.change === c).length;
  const parts = [
    count('appears') ? `${count('appears')} new` : '',
    count('vanishes') ? `${count('vanishes')} no longer limiting` : '',
    count('varies') ? `${count('varies')} in some runs` : '',
    count('everywhere') ? `${count('everywhere')} in every run` : '',
  ].filter(Boolean);
  return parts.length ? parts.join(', ') : 'No choke points in these runs';
}

/** Distinct line colours for up to eight runs on one chart (first run darkest). */
export const runColors = ['#1d3b53', '#c2185b', '#2e7d32', '#ef8f00', '#6a3fb5', '#00838f', '#8d6e63', '#5c6bc0'];
export const runColor = (i: number) => runColors[i % runColors.length]!;

/** The order ticked runs are compared in: base-plan runs first (the natural reference), then
 *  oldest first, so that differences read as "what the scenario changes". */
export function comparisonOrder<R extends Pick<Run, 'id' | 'scenarioId' | 'createdAt'>>(runs: readonly R[]): string[] {
  return [...runs]
    .sort((a, b) => Number(a.scenarioId !== null) - Number(b.scenarioId !== null) || a.createdAt.localeCompare(b.createdAt) || a.id.localeCompare(b.id))
    .map((r) => r.id);
}
