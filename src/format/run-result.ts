// What the findings show, computed from a stored run result: the headline figures in words,
// bottlenecks in order of impact, utilisation per road segment for the map, the curve series,
// and the popup of a choke point. Pure: no Vue, no Leaflet.
import { cutShare } from '@shared/model/cut-share';
import type { ArcFlow, Bottleneck, RunResult, RunStatus } from '@shared/api/runs';
import { formatCount, formatDuration, formatPerHour, formatShare, formatWindows } from './numbers';

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
  detail: string;
  /** Labelled values shown as rows instead of one figure (the 50/90/95 % times). */
  rows?: { label: string; value: string }[];
};

export function headlineTiles(result: RunResult): HeadlineTile[] {
  const h = result.headline;
  const share = h.demandPersons > 0 ? h.deliveredPersons / h.demandPersons : 0;
  return [
    {
      key: 'throughput',
      label: 'Evacuees per hour',
      value: formatCount(h.steadyStatePersonsPerHour),
      detail: `${formatPerHour(h.steadyStateVehiclesPerHour)} once traffic is steady (an upper bound)`,
    },
    {
      key: 'delivered',
      label: `Safe within ${formatDuration(h.horizonMinutes)}`,
      value: formatCount(h.deliveredPersons),
      detail: `${formatShare(share)} of ${formatCount(h.demandPersons)} evacuating persons`,
    },
    {
      key: 'clearance',
      label: 'Clearance time',
      value: h.clearanceMinutes === null ? `Over ${formatDuration(h.horizonMinutes)}` : formatDuration(h.clearanceMinutes),
      detail:
        h.clearanceMinutes === null
          ? `Not everyone is safe within the ${formatDuration(h.horizonMinutes)} horizon.`
          : 'until the last vehicle reaches safety',
    },
    {
      key: 'percentiles',
      label: 'Share safe after',
      value: [h.p50Minutes, h.p90Minutes, h.p95Minutes].map((m) => (m === null ? '–' : formatDuration(m))).join(' · '),
      detail: '',
      rows: (
        [
          ['50 %', h.p50Minutes],
          ['90 %', h.p90Minutes],
          ['95 %', h.p95Minutes],
        ] as const
      ).map(([label, m]) => ({ label, value: m === null ? 'not within' : formatDuration(m) })),
    },
  ];
}

export { cutShare };

/** When a choke point limits the evacuation, in words. */
export function cutWindowsText(b: Bottleneck): string {
  if (b.cutWindows.length > 0) return formatWindows(b.cutWindows);
  return b.inStaticCut ? 'once traffic is steady' : 'none';
}

/** Largest share of the cut first; equal shares by what one more lane gains. */
export function bottlenecksByImpact(bottlenecks: readonly Bottleneck[], steadyStateVehiclesPerHour = 0): Bottleneck[] {
  const share = (b: Bottleneck) => cutShare(b, steadyStateVehiclesPerHour);
  return [...bottlenecks].sort(
    (a, b) => share(b) - share(a) || b.gainPerExtraLaneVehiclesPerHour - a.gainPerExtraLaneVehiclesPerHour || a.segmentId - b.segmentId,
  );
}

export type SegmentLoad = { utilisation: number; forward: ArcFlow | null; backward: ArcFlow | null };

/** One entry per segment: the busier direction decides its colour. */
export function loadBySegment(arcs: readonly ArcFlow[]): Map<number, SegmentLoad> {
  const loads = new Map<number, SegmentLoad>();
  for (const arc of arcs) {
    const load = loads.get(arc.segmentId) ?? { utilisation: 0, forward: null, backward: null };
    load[arc.direction] = arc;
    load.utilisation = Math.max(load.utilisation, arc.utilisation);
    loads.set(arc.segmentId, load);
  }
  return loads;
}

export const bottleneckKey = (b: Pick<Bottleneck, 'segmentId' | 'direction'>) => `${b.segmentId}:${b.direction}`;

/** Cumulative vehicles safe by each step, as chart points (x in hours after the order; step i
 *  is at i × stepMinutes, as in the server's curve.csv). */
export function curvePoints(result: RunResult): { x: number; y: number }[] {
  const { stepMinutes, deliveredVehicles } = result.curve;
  return deliveredVehicles.map((y, i) => ({ x: Math.round((i * stepMinutes * 1000) / 60) / 1000, y }));
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

export function roadTitle(b: Pick<Bottleneck, 'name' | 'roadClass' | 'segmentId'>): string {
  return b.name.trim() || `Unnamed ${b.roadClass.replaceAll('_', ' ')} (segment ${b.segmentId})`;
}

/** What one more lane would add, or why nothing is shown. */
export function laneGainText(b: Bottleneck, gainsComputed: boolean): string {
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
export function chokePointPopupHtml(b: Bottleneck, heading: string | null, context: ChokePointContext): string {
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
