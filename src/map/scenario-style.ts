// How a scenario's changes look on the editor's map, over the roads: closures dashed red, lane
// changes blue, contraflow corridors teal with an arrow for the direction served; each over a
// white casing so it reads on any road colour. Pure: path options only.
import type { LineStyle } from './road-style';
import type { SegmentChange } from '@/forms/scenario-overlay';

export const scenarioChangeLooks: Record<SegmentChange, { label: string; line: LineStyle }> = {
  closed: { label: 'Closed in this scenario', line: { color: '#8e0000', weight: 7, opacity: 1, dashArray: '10 5', lineCap: 'butt' } },
  lanes: { label: 'Lanes or speed changed', line: { color: '#1565c0', weight: 6, opacity: 1, lineCap: 'round' } },
  corridor: { label: 'Contraflow corridor', line: { color: '#00796b', weight: 7, opacity: 1, lineCap: 'round' } },
};

export const scenarioCasing: LineStyle = { color: '#ffffff', weight: 11, opacity: 0.9, lineCap: 'round' };
export const pickedRoadRing: LineStyle = { color: '#e8743b', weight: 3, opacity: 1, lineCap: 'round' };

/** A closure wins over the other marks: a closed road carries nothing whatever its lanes. */
export function dominantChange(changes: readonly SegmentChange[]): SegmentChange | null {
  if (changes.includes('closed')) return 'closed';
  if (changes.includes('corridor')) return 'corridor';
  return changes.includes('lanes') ? 'lanes' : null;
}
