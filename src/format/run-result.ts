// What the findings show, computed from a stored run result: the headline figures in words,
// bottlenecks in order of impact, utilisation per road segment for the map, the curve series,
// and the popup of a choke point. Pure: no Vue, no Leaflet.
import type { ArcFlow, Bottleneck, RunResult, RunStatus } from '@shared/api/runs';
import { formatCount, formatDuration, formatPerHour, formatShare, formatTimeWithin, formatWindows } from './numbers';

export const runStatusLabels: Record<RunStatus, string> = {
  queued: 'Waiting to start',
  running: 'Working',
  succeeded: 'Finished',
  failed: 'Failed',
  cancelled: 'Stopped',
};

export const runIsActive = (status: RunStatus) => status === 'queued' || status === 'running';

export type HeadlineTile = { key: string; label: string; value: string; detail: string };

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
      value: formatTimeWithin(h.clearanceMinutes, h.horizonMinutes),
      detail: h.clearanceMinutes === null ? 'Some people are still on the way when the horizon ends.' : 'until the last vehicle reaches safety',
    },
    {
      key: 'percentiles',
      label: '50 / 90 / 95 % safe after',
      value: [h.p50Minutes, h.p90Minutes, h.p95Minutes].map((m) => (m === null ? '–' : formatDuration(m))).join(' · '),
      detail: '– : not within the horizon',
    },
  ];
}

/** Largest share of the cut first; equal shares by what one more lane would gain. */
export function bottlenecksByImpact(bottlenecks: readonly Bottleneck[]): Bottleneck[] {
  return [...bottlenecks].sort(
    (a, b) => b.shareOfCut - a.shareOfCut || b.gainPerExtraLaneVehiclesPerHour - a.gainPerExtraLaneVehiclesPerHour || a.segmentId - b.segmentId,
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

/** The popup of a choke point; every value from the data is escaped. */
export function chokePointPopupHtml(b: Bottleneck, heading: string | null): string {
  const rows: [string, string][] = [
    ['Capacity', formatPerHour(b.capacityVehiclesPerHour)],
    ['Share of the limiting capacity', formatShare(b.shareOfCut)],
    ['Limiting during (h:mm after the order)', formatWindows(b.cutWindows)],
    ['One more lane would add', b.gainPerExtraLaneVehiclesPerHour > 0 ? formatPerHour(b.gainPerExtraLaneVehiclesPerHour) : 'nothing (another road limits next)'],
  ];
  const direction = heading ? `heading ${heading}` : b.direction === 'forward' ? 'as drawn' : 'against the drawing direction';
  return [
    `<div class="cutline-popup"><div class="cutline-popup__title">${escapeHtml(roadTitle(b))}</div>`,
    `<div class="cutline-popup__subtitle">Choke point, ${escapeHtml(direction)}</div><table>`,
    ...rows.map(([k, v]) => `<tr><th>${escapeHtml(k)}</th><td>${escapeHtml(v)}</td></tr>`),
    '</table></div>',
  ].join('');
}
