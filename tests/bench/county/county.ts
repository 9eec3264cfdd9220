// Quellbrook County, an invented county for benchmarks and scale tests: a square grid of
// 100 m blocks (300 × 300 junctions by default, 179,108 road segments), a river running north
// to south east of the middle, crossed by 8 bridges only, six evacuation zones on the west
// bank and six destinations on the east bank (three shelters, three unbounded exits at the
// eastern edge). Street classes differ so that minor streets and arterials carry different
// capacities and show at different zooms. Everything here is made up; the coordinates lie in
// the open North Atlantic so it cannot be mistaken for a real place.
//
// Deterministic: the same size and seed give byte-identical files. The seed chooses minor
// street speeds, the bridges' widths and the zones' populations and departure curves.
import type { Feature, FeatureCollection, LineString, Point, Polygon, Position } from 'geojson';
import { seededRandom } from '../flow/seeded-random';

export const COUNTY_NAME = 'Quellbrook County';

export interface CountySpec {
  /** Junctions per row and per column (the grid is size × size). */
  size: number;
  seed: number;
}

export const FULL_COUNTY: CountySpec = { size: 300, seed: 15 };

const BLOCK_METERS = 100;
const BRIDGES = 8;
const LON0 = -36;
const LAT0 = 42;
const M_PER_DEG_LAT = (Math.PI / 180) * 6371008.8;
const M_PER_DEG_LON = M_PER_DEG_LAT * Math.cos((LAT0 * Math.PI) / 180);

/** Local metres (x east, y north) → [lon, lat], 7 decimals (about 1 cm). */
function toLonLat(x: number, y: number): Position {
  const r = (v: number) => Math.round(v * 1e7) / 1e7;
  return [r(LON0 + x / M_PER_DEG_LON), r(LAT0 + y / M_PER_DEG_LAT)];
}

type Tags = Record<string, string>;

function ordinal(n: number): string {
  const teen = n % 100 >= 11 && n % 100 <= 13;
  return `${n}${teen ? 'th' : (['th', 'st', 'nd', 'rd'][n % 10] ?? 'th')}`;
}

/** The class of grid line `k` (a row or a column): arterials every 10 and 30 lines, collectors every 5. */
function lineTags(k: number, minorSpeed: string): Tags {
  if (k % 30 === 0) return { highway: 'primary', lanes: '4', maxspeed: '60' };
  if (k % 10 === 0) return { highway: 'secondary', lanes: '2', maxspeed: '50' };
  if (k % 5 === 0) return { highway: 'tertiary', maxspeed: '50' };
  return { highway: 'residential', maxspeed: minorSpeed };
}

/** Where things are in the county, in grid indices. */
export function countyLayout(spec: CountySpec) {
  const n = spec.size;
  // The river flows between column riverWest and riverWest + 1.
  const riverWest = Math.floor((n * 2) / 3);
  // Bridges carry arterial rows (multiples of 10 where the grid is large enough), spread evenly.
  const step = n >= 100 ? 10 : 1;
  const bridgeRows = [...new Set(Array.from({ length: BRIDGES }, (_, b) => Math.min(n - 1, Math.round(((b + 0.5) * n) / BRIDGES / step) * step)))];
  return { n, riverWest, bridgeRows };
}

/**
 * The road layer: each street is cut into features between arterial crossings (as mapped road
 * data usually is), vertices shared at every junction, so the import splits it into one segment
 * per block. Rows crossing the river stop at its banks except where a bridge carries them.
 */
export function countyRoads(spec: CountySpec): FeatureCollection<LineString> {
  const { n, riverWest, bridgeRows } = countyLayout(spec);
  const random = seededRandom(spec.seed);
  const features: Feature<LineString>[] = [];
  const push = (points: [number, number][], tags: Tags, id: string) => {
    if (points.length < 2) return;
    features.push({ type: 'Feature', id, properties: tags, geometry: { type: 'LineString', coordinates: points.map(([i, j]) => toLonLat(i * BLOCK_METERS, j * BLOCK_METERS)) } });
  };
  // A street from grid index a to b along one line, cut at every tenth line.
  const street = (from: number, to: number, at: (k: number) => [number, number], tags: Tags, id: string) => {
    let start = from;
    for (let k = from + 1; k <= to; k++) {
      if (k === to || k % 10 === 0) {
        push(Array.from({ length: k - start + 1 }, (_, m) => at(start + m)), tags, `${id}-${start}`);
        start = k;
      }
    }
  };
  const bridgeWidths = new Map(bridgeRows.map((row) => [row, random() < 0.5 ? '2' : '4']));
  for (let j = 0; j < n; j++) {
    const tags = { ...lineTags(j, random() < 0.5 ? '30' : '40'), name: `${ordinal(j + 1)} Street` };
    const at = (i: number): [number, number] => [i, j];
    street(0, riverWest, at, tags, `row-${j}-w`);
    street(riverWest + 1, n - 1, at, tags, `row-${j}-e`);
    const lanes = bridgeWidths.get(j);
    if (lanes) push([at(riverWest), at(riverWest + 1)], { highway: 'primary', lanes, maxspeed: '50', bridge: 'yes', layer: '1', name: `${ordinal(j + 1)} Street Bridge` }, `bridge-${j}`);
  }
  for (let i = 0; i < n; i++) {
    const tags = { ...lineTags(i, random() < 0.5 ? '30' : '40'), name: `${ordinal(i + 1)} Avenue` };
    street(0, n - 1, (j) => [i, j], tags, `column-${i}`);
  }
  // The river itself: not a road (the import drops and counts it).
  const riverX = (riverWest + 0.5) * BLOCK_METERS;
  const river: Position[] = [];
  for (let y = -BLOCK_METERS; y <= n * BLOCK_METERS; y += 500) river.push(toLonLat(riverX + 20 * Math.sin(y / 900), y));
  features.push({ type: 'Feature', id: 'river', properties: { waterway: 'river', name: 'Quell River' }, geometry: { type: 'LineString', coordinates: river } });
  return { type: 'FeatureCollection', features };
}

const ZONE_NAMES = ['Ashgrove', 'Brindle Flats', 'Cobble Hill', 'Dunmore Reach', 'Elderwick', 'Fallow Green'];
const CURVES: Record<string, unknown>[] = [
  { departure: 'logistic', responseRatePerHour: 1.2, halfLoadingHours: 1.5 },
  { departure: 'uniform', durationHours: 3 },
  { departure: 'rayleigh', sigmaHours: 1.2 },
];

/**
 * Six zones tiling the west bank (two columns × three bands). Populations vary by seed around
 * 40,000 and sum to 240,000; everyone leaves, 2.5 persons per vehicle: 96,000 vehicles.
 */
export function countyZones(spec: CountySpec): FeatureCollection<Polygon> {
  const { n, riverWest } = countyLayout(spec);
  const random = seededRandom(spec.seed * 7919 + 1);
  const half = BLOCK_METERS / 2;
  const xs = [-half, Math.round(riverWest / 2) * BLOCK_METERS - half, riverWest * BLOCK_METERS - half];
  const ys = [-half, Math.round(n / 3) * BLOCK_METERS - half, Math.round((2 * n) / 3) * BLOCK_METERS - half, n * BLOCK_METERS - half];
  const weights = Array.from({ length: 6 }, () => 0.8 + 0.4 * random());
  const total = 240_000 * (n / 300) ** 2;
  const sum = weights.reduce((a, b) => a + b, 0);
  const populations = weights.map((w) => Math.round((total * w) / sum / 100) * 100);
  const features: Feature<Polygon>[] = [];
  for (let band = 0; band < 3; band++) {
    for (let side = 0; side < 2; side++) {
      const k = band * 2 + side;
      const [x0, x1, y0, y1] = [xs[side]!, xs[side + 1]!, ys[band]!, ys[band + 1]!];
      features.push({
        type: 'Feature',
        id: `zone-${k + 1}`,
        properties: { name: ZONE_NAMES[k]!, population: populations[k]!, participationRate: 1, personsPerVehicle: 2.5, ...CURVES[Math.floor(random() * CURVES.length)]! },
        geometry: { type: 'Polygon', coordinates: [[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]].map(([x, y]) => toLonLat(x!, y!))] },
      });
    }
  }
  return { type: 'FeatureCollection', features };
}

/** Three shelters on the east bank and three unbounded exits on the eastern edge, at arterial rows. */
export function countyShelters(spec: CountySpec): FeatureCollection<Point> {
  const { n, riverWest } = countyLayout(spec);
  const east = n - 1;
  const mid = Math.round((riverWest + east) / 2);
  const row = (share: number) => Math.min(n - 1, Math.round((share * n) / 10) * 10 || Math.round(share * n));
  const point = (id: string, name: string, capacityPersons: number | null, i: number, j: number): Feature<Point> => ({
    type: 'Feature',
    id,
    properties: { name, capacityPersons },
    geometry: { type: 'Point', coordinates: toLonLat(i * BLOCK_METERS, j * BLOCK_METERS) },
  });
  const capacity = Math.round((40_000 * (n / 300) ** 2) / 100) * 100;
  return {
    type: 'FeatureCollection',
    features: [
      point('shelter-north', 'Northfield Hall', capacity, mid, row(0.8)),
      point('shelter-centre', 'Quellbrook Fair Grounds', capacity, mid, row(0.5)),
      point('shelter-south', 'Southmead School', capacity, mid, row(0.2)),
      point('exit-north', 'North-east exit', null, east, row(0.9)),
      point('exit-east', 'East exit', null, east, row(0.5)),
      point('exit-south', 'South-east exit', null, east, row(0.1)),
    ],
  };
}
