// The road network as an SVG figure for the briefing: roads by class, evacuation zones,
// shelters and exits, the choke points with their rank, a legend and a scale bar.
// Drawn from the stored geometries on the server (no tiles, no screenshot), north up, with the
// equirectangular projection of map-projection.ts.
import { labelBox, placeLabels } from './label-placement';
import type { UnitSystem } from '../../../shared/api/units';
import { METERS_PER_FOOT, METERS_PER_MILE } from '../../../shared/format/units';
import type { BriefingMapInput, LonLat, MapSegment } from './briefing-input';
import { boundsOf, equirectangularAbout, fitToBox, type PageFit } from './map-projection';
import { n, polylinePoints, svgText } from './svg-text';
import { CHOKE_POINT_COLOUR } from '../../../shared/format/colours';
import { formatCount } from '../../../shared/format/numbers';

export type ChokePoint = { segmentId: number; rank: number };

export type MapSvgInput = BriefingMapInput & {
  chokePoints: ChokePoint[];
  /** The organisation's units for the scale bar (metric when absent). */
  unitSystem?: UnitSystem | undefined;
  /** Page units (pt); the map keeps its aspect ratio inside. */
  width?: number;
  height?: number;
};

type RoadStyle = { stroke: string; width: number; order: number; legend: 'major' | 'connector' | 'local' };

// Darker and wider for the roads that carry more; the choke points are the only violet on the page.
const roadStyles: Record<string, RoadStyle> = {
  motorway: { stroke: '#3d4852', width: 3.4, order: 6, legend: 'major' },
  trunk: { stroke: '#3d4852', width: 3.0, order: 6, legend: 'major' },
  motorway_link: { stroke: '#3d4852', width: 1.8, order: 5, legend: 'major' },
  trunk_link: { stroke: '#3d4852', width: 1.8, order: 5, legend: 'major' },
  primary: { stroke: '#5f6b76', width: 2.5, order: 4, legend: 'major' },
  secondary: { stroke: '#6f7b86', width: 2.1, order: 3, legend: 'connector' },
  primary_link: { stroke: '#5f6b76', width: 1.6, order: 3, legend: 'major' },
  secondary_link: { stroke: '#6f7b86', width: 1.5, order: 3, legend: 'connector' },
  tertiary: { stroke: '#87929c', width: 1.7, order: 2, legend: 'connector' },
  tertiary_link: { stroke: '#87929c', width: 1.3, order: 2, legend: 'connector' },
};
const localRoad: RoadStyle = { stroke: '#aab3bb', width: 1.0, order: 1, legend: 'local' };

export function roadStyle(roadClass: string): RoadStyle {
  return roadStyles[roadClass] ?? localRoad;
}

export const MAP_COLOURS = {
  choke: CHOKE_POINT_COLOUR,
  zoneFill: '#364fc7',
  zoneText: '#283a94',
  shelter: '#2b8a3e',
  frame: '#ced4da',
  text: '#343a40',
};

const SCALE_STEPS_M = [25, 50, 100, 200, 250, 500, 1_000, 2_000, 2_500, 5_000, 10_000, 20_000, 25_000, 50_000, 100_000];
// Round US customary distances: feet below a quarter mile, then miles.
const SCALE_STEPS_FT = [100, 200, 500, 1_000];
const SCALE_STEPS_MI = [0.25, 0.5, 1, 2, 5, 10, 20, 50];

type ScaleStep = { meters: number; label: string };

function scaleSteps(system: UnitSystem): ScaleStep[] {
  if (system === 'metric') return SCALE_STEPS_M.map((m) => ({ meters: m, label: m >= 1000 ? `${m / 1000} km` : `${m} m` }));
  return [
    ...SCALE_STEPS_FT.map((ft) => ({ meters: ft * METERS_PER_FOOT, label: `${ft.toLocaleString('en-US')} ft` })),
    ...SCALE_STEPS_MI.map((mi) => ({ meters: mi * METERS_PER_MILE, label: `${mi} mi` })),
  ];
}

/** The longest round distance (in the unit system) whose bar is at most `maxPage` long. */
export function scaleBarStep(scale: number, maxPage: number, system: UnitSystem = 'metric'): ScaleStep {
  const steps = scaleSteps(system);
  let best = steps[0]!;
  for (const s of steps) if (s.meters * scale <= maxPage) best = s;
  return best;
}

/** The longest round metric distance whose bar is at most `maxPage` long, in metres. */
export function scaleBarLength(scale: number, maxPage: number): number {
  return scaleBarStep(scale, maxPage, 'metric').meters;
}

/** The point halfway along a polyline (by length), where a rank badge sits. */
export function midpointAlong(points: readonly (readonly [number, number])[]): [number, number] {
  if (points.length === 0) return [0, 0];
  let total = 0;
  for (let i = 1; i < points.length; i++) total += Math.hypot(points[i]![0] - points[i - 1]![0], points[i]![1] - points[i - 1]![1]);
  let left = total / 2;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]!;
    const b = points[i]!;
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
    if (len >= left && len > 0) return [a[0] + ((b[0] - a[0]) * left) / len, a[1] + ((b[1] - a[1]) * left) / len];
    left -= len;
  }
  const last = points[points.length - 1]!;
  return [last[0], last[1]];
}

/** Area-weighted centroid of a ring on the page (falls back to the vertex mean). */
function ringCentroid(ring: readonly (readonly [number, number])[]): [number, number] {
  let a = 0;
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < ring.length; i++) {
    const [x0, y0] = ring[i]!;
    const [x1, y1] = ring[(i + 1) % ring.length]!;
    const cross = x0 * y1 - x1 * y0;
    a += cross;
    cx += (x0 + x1) * cross;
    cy += (y0 + y1) * cross;
  }
  if (Math.abs(a) < 1e-9) {
    const sx = ring.reduce((s, p) => s + p[0], 0);
    const sy = ring.reduce((s, p) => s + p[1], 0);
    return [sx / Math.max(ring.length, 1), sy / Math.max(ring.length, 1)];
  }
  return [cx / (3 * a), cy / (3 * a)];
}

function ringArea(ring: readonly (readonly [number, number])[]): number {
  let a = 0;
  for (let i = 0; i < ring.length; i++) {
    const [x0, y0] = ring[i]!;
    const [x1, y1] = ring[(i + 1) % ring.length]!;
    a += x0 * y1 - x1 * y0;
  }
  return Math.abs(a) / 2;
}

function allPositions(input: BriefingMapInput): LonLat[] {
  return [
    ...input.segments.flatMap((s) => s.coordinates),
    ...input.zones.flatMap((z) => z.rings.flat()),
    ...input.shelters.map((s) => s.location),
  ];
}

function centreOf(points: LonLat[]): LonLat {
  const b = boundsOf(points);
  return b ? [(b.minX + b.maxX) / 2, (b.minY + b.maxY) / 2] : [0, 0];
}

function badge(x: number, y: number, rank: number): string {
  return (
    `<circle cx="${n(x)}" cy="${n(y)}" r="6.5" fill="${MAP_COLOURS.choke}" stroke="#ffffff" stroke-width="1.3"/>` +
    svgText(x, y + 2.9, String(rank), { size: 7.5, fill: '#ffffff', anchor: 'middle', weight: 'bold' })
  );
}

const SHELTER_LABEL_SIZE = 7.5;

function shelterMarker(x: number, y: number): string {
  return `<rect x="${n(x - 4.5)}" y="${n(y - 4.5)}" width="9" height="9" fill="${MAP_COLOURS.shelter}" stroke="#ffffff" stroke-width="1.2"/>`;
}

function drawRoads(segments: MapSegment[], fit: PageFit, project: (p: LonLat) => [number, number], chokeIds: Set<number>): string {
  const ordered = [...segments].sort((a, b) => roadStyle(a.roadClass).order - roadStyle(b.roadClass).order);
  const out: string[] = [];
  for (const s of ordered) {
    if (s.coordinates.length < 2 || chokeIds.has(s.id)) continue;
    const st = roadStyle(s.roadClass);
    const pts = s.coordinates.map((c) => fit.toPage(project(c)));
    out.push(`<polyline points="${polylinePoints(pts)}" fill="none" stroke="${st.stroke}" stroke-width="${st.width}" stroke-linecap="round" stroke-linejoin="round"/>`);
  }
  return out.join('');
}

function drawLegend(x: number, y: number, width: number, scale: number, system: UnitSystem): string {
  const out: string[] = [];
  const t = (tx: number, ty: number, s: string) => svgText(tx, ty, s, { size: 7.5, fill: MAP_COLOURS.text });
  const line = (x0: number, yy: number, colour: string, w: number) =>
    `<line x1="${n(x0)}" y1="${n(yy)}" x2="${n(x0 + 22)}" y2="${n(yy)}" stroke="${colour}" stroke-width="${w}" stroke-linecap="round"/>`;
  const row1 = y + 12;
  const row2 = y + 30;
  out.push(line(x, row1, roadStyle('primary').stroke, 2.6), t(x + 28, row1 + 2.6, 'Motorway, trunk, primary road'));
  out.push(line(x, row2, roadStyle('tertiary').stroke, 1.8), t(x + 28, row2 + 2.6, 'Secondary or tertiary road'));
  const c2 = x + 158;
  out.push(line(c2, row1, localRoad.stroke, 1.1), t(c2 + 28, row1 + 2.6, 'Local street'));
  out.push(line(c2, row2, MAP_COLOURS.choke, 3.6), badge(c2 + 11, row2, 1), t(c2 + 28, row2 + 2.6, 'Choke point and its rank'));
  const c3 = x + 300;
  out.push(
    `<rect x="${n(c3)}" y="${n(row1 - 5)}" width="22" height="10" fill="${MAP_COLOURS.zoneFill}" fill-opacity="0.12" stroke="${MAP_COLOURS.zoneFill}" stroke-width="0.9" stroke-dasharray="3 2"/>`,
    t(c3 + 28, row1 + 2.6, 'Evacuation zone'),
  );
  out.push(shelterMarker(c3 + 11, row2), t(c3 + 28, row2 + 2.6, 'Shelter or exit'));

  // Scale bar, right-aligned: two alternating halves so the midpoint can be read off.
  // At most 100 pt, so a bar of round miles (longer than one of round km) stays clear of the legend's zone label.
  const bar = scaleBarStep(scale, Math.min(100, width * 0.2), system);
  const barW = bar.meters * scale;
  // Room on the right for the end label, centred on the bar's end ("10 km" is about 20 pt wide).
  const bx = x + width - barW - 16;
  const by = row1 + 4;
  out.push(
    `<rect x="${n(bx)}" y="${n(by)}" width="${n(barW / 2)}" height="4" fill="${MAP_COLOURS.text}"/>`,
    `<rect x="${n(bx + barW / 2)}" y="${n(by)}" width="${n(barW / 2)}" height="4" fill="#ffffff" stroke="${MAP_COLOURS.text}" stroke-width="0.6"/>`,
    `<rect x="${n(bx)}" y="${n(by)}" width="${n(barW)}" height="4" fill="none" stroke="${MAP_COLOURS.text}" stroke-width="0.6"/>`,
    svgText(bx, by - 3, '0', { size: 7, fill: MAP_COLOURS.text, anchor: 'middle' }),
    svgText(bx + barW, by - 3, bar.label, { size: 7, fill: MAP_COLOURS.text, anchor: 'middle' }),
    svgText(bx + barW / 2, by + 14, 'Scale', { size: 6.5, fill: '#6c757d', anchor: 'middle' }),
  );
  return out.join('');
}

/** The note on the road classes left out at this scale, or null when every road is drawn. */
export function leftOutNote(leftOut: BriefingMapInput['leftOut']): string | null {
  if (!leftOut?.length) return null;
  const segments = leftOut.reduce((s, c) => s + c.segments, 0);
  const names = leftOut.map((c) => c.roadClass.replace(/_/g, ' ')).join(', ');
  return `Not drawn at this scale: ${names} roads (${formatCount(segments)} segments)`;
}

function northArrow(x: number, y: number): string {
  return (
    `<path d="M ${n(x)} ${n(y)} L ${n(x + 5)} ${n(y + 14)} L ${n(x)} ${n(y + 10.5)} L ${n(x - 5)} ${n(y + 14)} Z" fill="${MAP_COLOURS.text}"/>` +
    svgText(x, y + 24, 'N', { size: 8, fill: MAP_COLOURS.text, anchor: 'middle', weight: 'bold', halo: true })
  );
}

/**
 * The map as an SVG string (width × height in pt). Choke points are drawn last, in violet, with
 * the rank of their best (lowest) entry in the choke-point table at their midpoint.
 */
export function mapSvg(input: MapSvgInput): string {
  const width = input.width ?? 516;
  const height = input.height ?? 400;
  const legendHeight = 46;
  const pad = 14;
  const mapBox = { x: pad, y: pad, width: width - 2 * pad, height: height - legendHeight - 2 * pad };
  const positions = allPositions(input);
  const frame = `<rect x="0.5" y="0.5" width="${width - 1}" height="${height - legendHeight - 1}" fill="#fbfcfd" stroke="${MAP_COLOURS.frame}" stroke-width="1"/>`;
  const head = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">`;
  if (positions.length === 0) {
    return `${head}${frame}${svgText(width / 2, (height - legendHeight) / 2, 'No road geometry was stored with this run.', { size: 9, fill: MAP_COLOURS.text, anchor: 'middle' })}</svg>`;
  }

  const projection = equirectangularAbout(centreOf(positions));
  const project = projection.toMetres;
  const fit = fitToBox(boundsOf(positions.map(project))!, mapBox);
  const page = (p: LonLat) => fit.toPage(project(p));

  const rankBySegment = new Map<number, number>();
  for (const c of input.chokePoints) rankBySegment.set(c.segmentId, Math.min(c.rank, rankBySegment.get(c.segmentId) ?? Infinity));
  const chokeIds = new Set(rankBySegment.keys());

  const zones = input.zones.map((z) => {
    const rings = z.rings.map((r) => r.map(page));
    const d = rings.map((r) => `M ${r.map(([x, y]) => `${n(x)} ${n(y)}`).join(' L ')} Z`).join(' ');
    const largest = [...rings].sort((a, b) => ringArea(b) - ringArea(a))[0] ?? [];
    return { d, name: z.name, label: ringCentroid(largest) };
  });
  // Fills under the roads, outlines over them: a zone's edge stays visible through a dense layer.
  const zoneFills = zones.map((z) => `<path d="${z.d}" fill="${MAP_COLOURS.zoneFill}" fill-opacity="0.10" fill-rule="evenodd" stroke="none"/>`).join('');
  const zoneOutlines = zones
    .map((z) => `<path d="${z.d}" fill="none" stroke="${MAP_COLOURS.zoneFill}" stroke-opacity="0.75" stroke-width="1" stroke-dasharray="4 2"/>`)
    .join('');
  const note = leftOutNote(input.leftOut);

  const chokes = input.segments
    .filter((s) => chokeIds.has(s.id) && s.coordinates.length >= 2)
    .map((s) => ({ s, pts: s.coordinates.map(page), rank: rankBySegment.get(s.id)! }))
    .sort((a, b) => b.rank - a.rank);
  const chokeLines = chokes
    .map(({ s, pts }) => {
      const w = Math.max(roadStyle(s.roadClass).width + 1.6, 3.6);
      return (
        `<polyline points="${polylinePoints(pts)}" fill="none" stroke="#ffffff" stroke-width="${n(w + 2.4)}" stroke-linecap="round" stroke-linejoin="round"/>` +
        `<polyline points="${polylinePoints(pts)}" fill="none" stroke="${MAP_COLOURS.choke}" stroke-width="${n(w)}" stroke-linecap="round" stroke-linejoin="round"/>`
      );
    })
    .join('');
  const badges = chokes.map(({ pts, rank }) => badge(...midpointAlong(pts), rank)).join('');

  const zoneLabels = zones.map((z) => svgText(z.label[0], z.label[1] + 3, z.name, { size: 8, fill: MAP_COLOURS.zoneText, anchor: 'middle', weight: 'bold', halo: true })).join('');
  // Shelter names keep clear of the zone names and of each other (label-placement.ts).
  const zoneBoxes = zones.map((z) => labelBox(z.label[0], z.label[1] + 3, z.name, 8, 'middle'));
  const markers = input.shelters.map((s) => {
    const [x, y] = page(s.location);
    return { x, y, text: s.name };
  });
  const placed = placeLabels(markers, SHELTER_LABEL_SIZE, { width, height: height - legendHeight }, zoneBoxes);
  const shelters =
    markers.map((m) => shelterMarker(m.x, m.y)).join('') +
    markers
      .map((m, i) => {
        const at = placed[i]!;
        return svgText(at.x, at.y, m.text, { size: SHELTER_LABEL_SIZE, fill: '#1e5c2b', anchor: at.anchor, weight: 'bold', halo: true });
      })
      .join('');

  return [
    head,
    frame,
    zoneFills,
    drawRoads(input.segments, fit, project, chokeIds),
    zoneOutlines,
    chokeLines,
    shelters,
    zoneLabels,
    badges,
    note ? svgText(6, height - legendHeight - 6, note, { size: 7, fill: MAP_COLOURS.text, halo: true }) : '',
    northArrow(width - 24, 12),
    drawLegend(4, height - legendHeight + 4, width - 8, fit.scale, input.unitSystem ?? 'metric'),
    '</svg>',
  ].join('');
}
