// Which way a road arc runs, in words, from its first vertex to its last: "heading north-east".
// Planners name directions of travel this way; arc ids mean nothing to them.
const points = ['north', 'north-east', 'east', 'south-east', 'south', 'south-west', 'west', 'north-west'] as const;
export type CompassPoint = (typeof points)[number];

/** Initial bearing on the sphere from a to b, degrees clockwise from north, 0–360. */
export function bearingDegrees(a: readonly [number, number], b: readonly [number, number]): number {
  const rad = Math.PI / 180;
  const [lon1, lat1] = [a[0] * rad, a[1] * rad];
  const [lon2, lat2] = [b[0] * rad, b[1] * rad];
  const y = Math.sin(lon2 - lon1) * Math.cos(lat2);
  const x = Math.cos(lat1) * Math.sin(lat2) - Math.sin(lat1) * Math.cos(lat2) * Math.cos(lon2 - lon1);
  return ((Math.atan2(y, x) / rad) + 360) % 360;
}

export function compassPoint(degrees: number): CompassPoint {
  return points[Math.round((((degrees % 360) + 360) % 360) / 45) % 8]!;
}

/** The direction of travel of one arc of a segment stored as `coordinates`. */
export function travelDirection(coordinates: readonly (readonly [number, number])[], direction: 'forward' | 'backward'): CompassPoint | null {
  const first = coordinates[0];
  const last = coordinates[coordinates.length - 1];
  if (!first || !last || (first[0] === last[0] && first[1] === last[1])) return null;
  return compassPoint(direction === 'forward' ? bearingDegrees(first, last) : bearingDegrees(last, first));
}
