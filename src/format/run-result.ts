// What the findings show, computed from a stored run result: the headline figures in words,
// utilisation per road segment for the map, the curve series,
// and the popup of a choke point. Pure: no Vue, no Leaflet.
import { cutShare } from '@shared/model/cut-share';
import type { ArcFlow, ChokePoint, RoadResult, RunResult, RunStatus } from '@shared/api/runs';
import { formatHours, formatPerHour, formatShare, formatWindows } from '@shared/format/numbers';
import { headlineFigures, NINETY_PERCENT_NOTE, type HeadlineFigure } from '@shared/format/headline';

export const runStatusLabels: Record<RunStatus, string> = {
  queued: 'Waiting to start',
  running: 'Working',
  succeeded: 'Finished',
  failed: 'Failed',
  cancelled: 'Stopped',
};

export const runIsActive = (status: RunStatus) => status === 'queued' || status === 'running';

export type HeadlineTile = {
  key: string;
  label: string;
  value: string;
  notes: string[];
  /** Labelled values shown as rows instead of one figure (the 50/90/95 % times). */
  rows?: { label: string; value: string }[];
};

/** Four tiles from the headline figures the briefing prints (shared/format/headline.ts): the
 *  first three as they are, the 50/90/95 % times as rows of one tile. */
export function headlineTiles(result: RunResult): HeadlineTile[] {
  const figures = headlineFigures(result);
  const byKey = (k: HeadlineFigure['key']) => figures.find((f) => f.key === k)!;
  const times = (['p50', 'p90', 'p95'] as const).map(byKey);
  return [
    ...(['throughput', 'arrived', 'clearance'] as const).map((k) => {
      const f = byKey(k);
      return { key: f.key, label: f.label, value: f.value, notes: f.notes };
    }),
    {
      key: 'percentiles',
      label: 'Share arrived after',
      value: times.map((f) => f.value).join(' · '),
      notes: [NINETY_PERCENT_NOTE],
      rows: times.map((f) => ({ label: f.label.replace(' arrived after', ''), value: f.value })),
    },
  ];
}

export { cutShare };

/** When a choke point limits the evacuation, in words. */
export function cutWindowsText(b: ChokePoint): string {
  if (b.cutWindows.length > 0) return formatWindows(b.cutWindows);
  return b.inStaticCut ? 'once traffic is steady' : 'none';
}

export type SegmentLoad = { utilisation: number; forward: ArcFlow | null; backward: ArcFlow | null };

/** A road's figures in a run as its two directed arcs (the busier direction decides its colour). */
export function segmentLoad(road: RoadResult): SegmentLoad {
  const arc = (direction: 'forward' | 'backward'): ArcFlow | null => {
    const d = road[direction];
    return d ? { segmentId: road.segmentId, direction, name: '', roadClass: '', ...d } : null;
  };
  return { utilisation: road.utilisation, forward: arc('forward'), backward: arc('backward') };
}

export const chokePointKey = (b: Pick<ChokePoint, 'segmentId' | 'direction'>) => `${b.segmentId}:${b.direction}`;

/** Cumulative vehicles arrived by each step, as chart points (x in hours after the order; step i
 *  is at i × stepMinutes, as in the server's curve.csv). */
export function curvePoints(result: RunResult): { x: number; y: number }[] {
  const { stepMinutes, deliveredVehicles } = result.curve;
  return deliveredVehicles.map((y, i) => ({ x: Math.round((i * stepMinutes * 1000) / 60) / 1000, y }));
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

export function roadTitle(b: Pick<ChokePoint, 'name' | 'roadClass' | 'segmentId'>): string {
  return b.name.trim() || `Unnamed ${b.roadClass.replaceAll('_', ' ')} (segment ${b.segmentId})`;
}

/** What one more lane would add, or why nothing is shown. */
export function laneGainText(b: ChokePoint, gainsComputed: boolean): string {
  if (b.gainPerExtraLaneVehiclesPerHour > 0) return `+${formatPerHour(b.gainPerExtraLaneVehiclesPerHour)}`;
  return gainsComputed ? 'nothing (another road limits next)' : 'not worked out in this run';
}

export type ChokePointContext = { steadyStateVehiclesPerHour: number; gainsComputed: boolean };

/** The context of a result the choke-point wording needs. */
export const chokePointContext = (result: RunResult): ChokePointContext => ({
  steadyStateVehiclesPerHour: result.headline.steadyStateVehiclesPerHour,
  gainsComputed: result.fixes.length > 0,
});

/** The popup of a choke point; every value from the data is escaped. */
export function chokePointPopupHtml(b: ChokePoint, heading: string | null, context: ChokePointContext): string {
  const rows: [string, string][] = [
    ['Capacity', formatPerHour(b.capacityVehiclesPerHour)],
    ['Share of the limiting capacity', formatShare(cutShare(b, context.steadyStateVehiclesPerHour))],
    ['Limiting during (h:mm after the order)', cutWindowsText(b)],
    ['One more lane would add', laneGainText(b, context.gainsComputed)],
  ];
  const direction = heading ? `heading ${heading}` : b.direction === 'forward' ? 'as drawn' : 'against the drawing direction';
  return [
    `<div class="cutline-popup"><div class="cutline-popup__title">${escapeHtml(roadTitle(b))}</div>`,
    `<div class="cutline-popup__subtitle">Choke point, ${escapeHtml(direction)}</div><table>`,
    ...rows.map(([k, v]) => `<tr><th>${escapeHtml(k)}</th><td>${escapeHtml(v)}</td></tr>`),
    '</table></div>',
  ].join('');
}

/** A curve point's tooltip title: decimal hours on the chart's x axis as a duration,
 *  1.5833 → "1 h 35 min after the order" (never "1.5833 h"). */
export function curveTooltipTitle(hours: number): string {
  return `${formatHours(hours)} after the order`;
}
