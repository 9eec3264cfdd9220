// How a scenario's changes look on the editor's map, over the roads: closures dashed red, lane
// changes blue, contraflow corridors teal with an arrow for the direction served; each over a
// white casing so it reads on any road colour. Pure: path options only.
import type { LineStyle } from './road-style';
import type { ScenarioOverlay } from '@shared/api/scenarios';

export type SegmentChange = 'closed' | 'lanes' | 'corridor';

/** What the scenario does to each road it touches, for the map. */
export function changesBySegment(overlay: ScenarioOverlay): Map<number, SegmentChange[]> {
  const out = new Map<number, SegmentChange[]>();
  const add = (id: number, change: SegmentChange) => out.set(id, [...(out.get(id) ?? []), change]);
  for (const c of overlay.closures) add(c.segmentId, 'closed');
  for (const l of overlay.laneChanges) add(l.segmentId, 'lanes');
  for (const c of overlay.contraflow) for (const id of c.segmentIds) add(id, 'corridor');
  return out;
}

export const scenarioChangeLooks: Record<SegmentChange, { label: string; line: LineStyle }> = {
  closed: { label: 'Closed in this scenario', line: { color: '#8e0000', weight: 7, opacity: 1, dashArray: '10 5', lineCap: 'butt' } },
  lanes: { label: 'Lanes or speed changed', line: { color: '#1565c0', weight: 6, opacity: 1, lineCap: 'round' } },
  corridor: { label: 'Contraflow corridor', line: { color: '#00796b', weight: 7, opacity: 1, lineCap: 'round' } },
};

export const scenarioCasing: LineStyle = { color: '#ffffff', weight: 11, opacity: 0.9, lineCap: 'round' };
export const pickedRoadRing: LineStyle = { color: '#b5521f', weight: 3, opacity: 1, lineCap: 'round' };

/** A closure wins over the other marks: a closed road carries nothing whatever its lanes. */
export function dominantChange(changes: readonly SegmentChange[]): SegmentChange | null {
  if (changes.includes('closed')) return 'closed';
  if (changes.includes('corridor')) return 'corridor';
  return changes.includes('lanes') ? 'lanes' : null;
}
