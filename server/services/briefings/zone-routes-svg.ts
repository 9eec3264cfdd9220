// "Where each zone goes" as an SVG figure for the briefing: the roads in light grey, each zone's
// corridors in the zone's colour (the workspace map's colours, shared/format/search-answers),
// wider for more vehicles, the zones outlined in their colour and the shelters and exits, with a
// key of the zones. Same projection and fit as the road map (map-svg.ts).
import type { BriefingMapInput, LonLat } from './briefing-input';
import { boundsOf, equirectangularAbout, fitToBox } from './map-projection';
import { MAP_COLOURS } from './map-svg';
import { n, polylinePoints, svgText } from './svg-text';
import type { ZoneRouteLine } from '../../../shared/format/search-answers';

export type ZoneRoutesSvgInput = {
  map: BriefingMapInput;
  lines: readonly ZoneRouteLine[];
  /** The zones in the answer's order with their colours (the key). */
  zones: readonly { zoneId: number; name: string; colour: string }[];
  width?: number;
  height?: number;
};

/** Page width of a corridor line: 1.5 pt for the fewest vehicles to 6 pt for the most (by square root). */
export function corridorWidthPt(vehicles: number, most: number): number {
  return most <= 0 ? 1.5 : 1.5 + 4.5 * Math.sqrt(Math.max(0, Math.min(1, vehicles / most)));
}

export function zoneRoutesSvg(input: ZoneRoutesSvgInput): string {
  const width = input.width ?? 516;
  const height = input.height ?? 330;
  const keyRows = Math.ceil(input.zones.length / 3);
  const keyHeight = 10 + keyRows * 13;
  const pad = 14;
  const box = { x: pad, y: pad, width: width - 2 * pad, height: height - keyHeight - 2 * pad };
  const head = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">`;
  const frame = `<rect x="0.5" y="0.5" width="${width - 1}" height="${height - keyHeight - 1}" fill="#fbfcfd" stroke="${MAP_COLOURS.frame}" stroke-width="1"/>`;
  const { segments, zones, shelters } = input.map;
  const positions: LonLat[] = [...segments.flatMap((s) => s.coordinates), ...zones.flatMap((z) => z.rings.flat()), ...shelters.map((s) => s.location)];
  const corners = boundsOf(positions);
  if (!corners) {
    return `${head}${frame}${svgText(width / 2, (height - keyHeight) / 2, 'No road geometry was stored with this run.', { size: 9, fill: MAP_COLOURS.text, anchor: 'middle' })}</svg>`;
  }
  const project = equirectangularAbout([(corners.minX + corners.maxX) / 2, (corners.minY + corners.maxY) / 2]).toMetres;
  const fit = fitToBox(boundsOf(positions.map(project))!, box);
  const page = (p: LonLat) => fit.toPage(project(p));

  const roads = segments
    .filter((s) => s.coordinates.length >= 2)
    .map((s) => `<polyline points="${polylinePoints(s.coordinates.map(page))}" fill="none" stroke="#ced4da" stroke-width="0.9" stroke-linecap="round" stroke-linejoin="round"/>`)
    .join('');
  const colourOf = new Map(input.zones.map((z) => [z.zoneId, z.colour]));
  const outlines = zones
    .map((z) => {
      const d = z.rings.map((r) => `M ${r.map(page).map(([x, y]) => `${n(x)} ${n(y)}`).join(' L ')} Z`).join(' ');
      const colour = colourOf.get(z.id) ?? MAP_COLOURS.zoneFill;
      return `<path d="${d}" fill="${colour}" fill-opacity="0.08" fill-rule="evenodd" stroke="${colour}" stroke-width="1.2" stroke-dasharray="4 2"/>`;
    })
    .join('');
  const geometry = new Map(segments.map((s) => [s.id, s.coordinates]));
  const most = input.lines.reduce((m, l) => Math.max(m, l.vehicles), 0);
  const corridors = [...input.lines]
    .reverse()
    .flatMap((l) => {
      const c = geometry.get(l.segmentId);
      if (!c || c.length < 2) return [];
      const pts = polylinePoints(c.map(page));
      const w = corridorWidthPt(l.vehicles, most);
      return [
        `<polyline points="${pts}" fill="none" stroke="#ffffff" stroke-width="${n(w + 1.6)}" stroke-linecap="round" stroke-linejoin="round"/>` +
          `<polyline points="${pts}" fill="none" stroke="${l.colour}" stroke-width="${n(w)}" stroke-linecap="round" stroke-linejoin="round" data-segment="${l.segmentId}"/>`,
      ];
    })
    .join('');
  const shelterMarks = shelters
    .map((s) => {
      const [x, y] = page(s.location);
      const right = x < width - 110;
      return (
        `<rect x="${n(x - 4.5)}" y="${n(y - 4.5)}" width="9" height="9" fill="${MAP_COLOURS.shelter}" stroke="#ffffff" stroke-width="1.2"/>` +
        svgText(right ? x + 3 : x - 3, y - 8, s.name, { size: 7.5, fill: '#1e5c2b', anchor: right ? 'start' : 'end', weight: 'bold', halo: true })
      );
    })
    .join('');
  const zoneLabels = zones
    .map((z) => {
      const ring = z.rings[0]?.map(page) ?? [];
      if (ring.length === 0) return '';
      const x = ring.reduce((s, p) => s + p[0], 0) / ring.length;
      const y = ring.reduce((s, p) => s + p[1], 0) / ring.length;
      return svgText(x, y + 3, z.name, { size: 8, fill: colourOf.get(z.id) ?? MAP_COLOURS.zoneText, anchor: 'middle', weight: 'bold', halo: true });
    })
    .join('');
  const key = input.zones
    .map((z, i) => {
      const x = 6 + (i % 3) * ((width - 12) / 3);
      const y = height - keyHeight + 14 + Math.floor(i / 3) * 13;
      return `<line x1="${n(x)}" y1="${n(y)}" x2="${n(x + 22)}" y2="${n(y)}" stroke="${z.colour}" stroke-width="3.5" stroke-linecap="round"/>` + svgText(x + 28, y + 2.6, z.name, { size: 7.5, fill: MAP_COLOURS.text });
    })
    .join('');
  return [head, frame, outlines, roads, corridors, shelterMarks, zoneLabels, key, '</svg>'].join('');
}
