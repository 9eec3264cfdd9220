// Roads as an official reads them: "Mill Bridge Road (eastbound)" rather than segment 17 forward.
// The compass direction comes from the segment's geometry (first to last vertex, reversed for
// "backward"); without geometry the stored direction is named as such.
import type { RoadRef } from '../../../shared/api/runs';
import type { BriefingMapInput, LonLat } from './briefing-input';
import { bearingDegrees, equirectangularAbout, travelDirection } from './map-projection';

export type RoadNamer = {
  name: (ref: RoadRef) => string;
  direction: (ref: RoadRef) => string;
  /** "Mill Bridge Road (eastbound)". */
  label: (ref: RoadRef) => string;
};

export function roadNamer(map: BriefingMapInput): RoadNamer {
  const geometry = new Map<number, LonLat[]>(map.segments.map((s) => [s.id, s.coordinates]));
  const direction = (ref: RoadRef) => {
    const coords = geometry.get(ref.segmentId);
    if (!coords || coords.length < 2) return ref.direction === 'forward' ? 'as drawn' : 'against drawn direction';
    const first = coords[0]!;
    const last = coords[coords.length - 1]!;
    const [from, to] = ref.direction === 'forward' ? [first, last] : [last, first];
    const project = equirectangularAbout(from).toMetres;
    return travelDirection(bearingDegrees(project(from), project(to)));
  };
  const name = (ref: RoadRef) => ref.name.trim() || `Unnamed ${ref.roadClass.replace(/_/g, ' ')} road (segment ${ref.segmentId})`;
  return { name, direction, label: (ref) => `${name(ref)} (${direction(ref)})` };
}
