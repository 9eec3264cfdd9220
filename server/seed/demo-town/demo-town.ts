// Veltmoor, an invented river town for the demo plan: a residential grid on the west bank,
// the river, four bridges, a motorway on the east side with two interchanges, and the
// shelters and exits beyond. Everyone on the west bank must cross a bridge, so the bridges
// are the choke points a planner should find. No real place or person is depicted; the
// coordinates lie in the open North Atlantic on purpose so it cannot be mistaken for one.
import type { Feature, FeatureCollection, LineString, Point, Polygon, Position } from 'geojson';

export const TOWN_NAME = 'Veltmoor';

// South-west corner of the study area, and metres per degree there (equirectangular).
const LON0 = -38.5;
const LAT0 = 44.2;
const M_PER_DEG_LAT = (Math.PI / 180) * 6371008.8;
const M_PER_DEG_LON = M_PER_DEG_LAT * Math.cos((LAT0 * Math.PI) / 180);

/** Local metres (x east, y north) → [lon, lat], 7 decimals (about 1 cm). */
export function toLonLat(x: number, y: number): Position {
  const r = (v: number) => Math.round(v * 1e7) / 1e7;
  return [r(LON0 + x / M_PER_DEG_LON), r(LAT0 + y / M_PER_DEG_LAT)];
}

type Tags = Record<string, string>;

const WIDTH = 6000;
const HEIGHT = 5000;
/** West-bank grid: blocks of 150 m. */
const WEST_XS = Array.from({ length: 18 }, (_, i) => 150 * (i + 1)); // 150 … 2700
const WEST_YS = Array.from({ length: 32 }, (_, k) => 150 * (k + 1)); // 150 … 4800
const WHARF_X = 2775;
const EAST_BANK_X = 3250;
const EAST_XS = Array.from({ length: 10 }, (_, i) => 3300 + 200 * i); // 3300 … 5100
const MOTORWAY_NB_X = 5615;
const MOTORWAY_SB_X = 5585;
const INTERCHANGE_X = 5500;

/**
 * The river crossings: the row they carry, what kind of road, and the road on either side when it
 * differs. Mill Bridge is the old narrow one between four-lane approaches, so one more lane on it
 * alone carries more; the others are as wide as their approaches, so widening one alone does not.
 */
const BRIDGES: readonly { y: number; name: string; tags: Tags; approach?: Tags }[] = [
  { y: 1200, name: 'Quay Bridge', tags: { highway: 'primary', lanes: '4', maxspeed: '50' } },
  { y: 2550, name: 'Market Bridge', tags: { highway: 'primary', lanes: '4', maxspeed: '50' } },
  { y: 3750, name: 'Heron Bridge', tags: { highway: 'secondary', maxspeed: '50' } },
  { y: 4500, name: 'Mill Bridge', tags: { highway: 'tertiary', maxspeed: '30' }, approach: { highway: 'secondary', lanes: '4', maxspeed: '50' } },
];
const INTERCHANGE_YS = [1200, 2550];
const EAST_YS = [...new Set([600, 900, 1200, 1500, 1800, 2100, 2550, 2850, 3150, 3450, 3750, 4050, 4350, 4500])].sort((a, b) => a - b);

const STREET_NAMES = ['Alder', 'Birch', 'Cedar', 'Dogwood', 'Elm', 'Fir', 'Gorse', 'Hazel', 'Ivy', 'Juniper', 'Larch', 'Maple', 'Nettle', 'Oak', 'Poplar', 'Rowan', 'Sorrel', 'Thistle'];

function line(coords: [number, number][], tags: Tags, id: string): Feature<LineString> {
  return { type: 'Feature', id, properties: tags, geometry: { type: 'LineString', coordinates: coords.map(([x, y]) => toLonLat(x, y)) } };
}

function through(points: number[], fixed: number, axis: 'x' | 'y'): [number, number][] {
  return points.map((p) => (axis === 'x' ? [p, fixed] : [fixed, p]));
}

function ordinal(n: number): string {
  const teen = n % 100 >= 11 && n % 100 <= 13;
  return `${n}${teen ? 'th' : (['th', 'st', 'nd', 'rd'][n % 10] ?? 'th')}`;
}

function bridgeAt(y: number) {
  return BRIDGES.find((b) => b.y === y);
}

export function demoRoads(): FeatureCollection<LineString> {
  const features: Feature<LineString>[] = [];

  // West-bank rows (east–west). Bridge rows are arterials and leave the grid at the bank.
  for (const [k, y] of WEST_YS.entries()) {
    const bridge = bridgeAt(y);
    const tags: Tags = bridge ? { ...(bridge.approach ?? bridge.tags), name: bridge.name.replace(/ Bridge$/, ' Road') } : { highway: 'residential', name: `${ordinal(k + 1)} Street` };
    const xs = bridge ? [0, ...WEST_XS] : [...WEST_XS, WHARF_X];
    features.push(line(through(xs, y, 'x'), tags, `row-${y}`));
  }
  // West-bank columns (north–south), with a one-way pair downtown.
  for (const [i, x] of WEST_XS.entries()) {
    let tags: Tags = { highway: 'residential', name: `${STREET_NAMES[i]} Street` };
    let ys = WEST_YS;
    if (x === 1350) tags = { highway: 'secondary', name: 'Harbour Avenue', oneway: 'yes', lanes: '2', maxspeed: '50' };
    if (x === 1500) tags = { highway: 'secondary', name: 'Chapel Avenue', oneway: '-1', lanes: '2', maxspeed: '30 mph' };
    if (x === 150) ys = [0, ...WEST_YS, HEIGHT];
    features.push(line(through(ys, x, 'y'), tags, `column-${x}`));
  }
  // Wharf Road along the west bank passes under every bridge without meeting it.
  const wharfYs = WEST_YS.filter((y) => !bridgeAt(y));
  features.push(line(through(wharfYs, WHARF_X, 'y'), { highway: 'residential', name: 'Wharf Road' }, 'wharf-road'));

  // The bridges: from the last grid column over Wharf Road and the river to the east bank.
  for (const b of BRIDGES) {
    features.push(line([[2700, b.y], [EAST_BANK_X, b.y]], { ...b.tags, name: b.name, bridge: 'yes', layer: '1' }, `bridge-${b.y}`));
  }

  // East bank: arterials continue to the interchanges or, for Heron, over the motorway to the edge.
  for (const y of EAST_YS) {
    const bridge = bridgeAt(y);
    const xs = [EAST_BANK_X, ...EAST_XS];
    if (bridge && INTERCHANGE_YS.includes(y)) {
      features.push(line(through([...xs, INTERCHANGE_X], y, 'x'), { ...bridge.tags, name: `${bridge.name.replace(' Bridge', '')} Road` }, `east-row-${y}`));
    } else if (bridge && y === 3750) {
      features.push(line(through([...xs, INTERCHANGE_X], y, 'x'), { ...bridge.tags, name: 'Heron Road' }, `east-row-${y}`));
      features.push(line([[INTERCHANGE_X, y], [WIDTH, y]], { ...bridge.tags, name: 'Heron Overpass', bridge: 'yes', layer: '1' }, 'heron-overpass'));
    } else if (bridge) {
      features.push(line(through(xs, y, 'x'), { ...(bridge.approach ?? bridge.tags), name: 'Mill Road' }, `east-row-${y}`));
    } else {
      features.push(line(through(EAST_XS, y, 'x'), { highway: 'residential', name: `East ${y / 150} Lane` }, `east-row-${y}`));
    }
  }
  for (const [i, x] of EAST_XS.entries()) {
    features.push(line(through(EAST_YS, x, 'y'), { highway: i % 3 === 0 ? 'tertiary' : 'residential', name: `${STREET_NAMES[i]} Rise` }, `east-column-${x}`));
  }

  // The motorway: two one-way carriageways (motorways are one-way by OSM convention).
  const nbYs = [0, ...INTERCHANGE_YS.flatMap((y) => [y - 200, y + 200]), HEIGHT];
  features.push(line(through(nbYs, MOTORWAY_NB_X, 'y'), { highway: 'motorway', name: 'Coastal Motorway northbound', maxspeed: '110' }, 'motorway-nb'));
  features.push(line(through([...nbYs].reverse(), MOTORWAY_SB_X, 'y'), { highway: 'motorway', name: 'Coastal Motorway southbound', maxspeed: '110' }, 'motorway-sb'));
  // Ramps at each interchange; the ones to and from the far carriageway fly over the near one.
  for (const y of INTERCHANGE_YS) {
    const ramp = { highway: 'motorway_link', oneway: 'yes' };
    const over = { ...ramp, bridge: 'yes', layer: '1' };
    features.push(line([[INTERCHANGE_X, y], [MOTORWAY_NB_X, y + 200]], { ...over, name: 'on-ramp north' }, `ramp-${y}-nb-on`));
    features.push(line([[MOTORWAY_NB_X, y - 200], [INTERCHANGE_X, y]], { ...over, name: 'off-ramp north' }, `ramp-${y}-nb-off`));
    features.push(line([[INTERCHANGE_X, y], [MOTORWAY_SB_X, y - 200]], { ...ramp, name: 'on-ramp south' }, `ramp-${y}-sb-on`));
    features.push(line([[MOTORWAY_SB_X, y + 200], [INTERCHANGE_X, y]], { ...ramp, name: 'off-ramp south' }, `ramp-${y}-sb-off`));
  }

  // Not roads for cars: a river path and the river itself (the import drops and counts them).
  features.push(line(through(EAST_YS, 3200, 'y'), { highway: 'footway', name: 'River Walk' }, 'river-walk'));
  const river: [number, number][] = [];
  for (let y = 0; y <= HEIGHT; y += 100) river.push([3000 + 60 * Math.sin(y / 700), y]);
  features.push(line(river, { waterway: 'river', name: 'Sable River' }, 'river'));

  return { type: 'FeatureCollection', features };
}

function rectangle(x0: number, y0: number, x1: number, y1: number): Polygon {
  return { type: 'Polygon', coordinates: [[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]].map(([x, y]) => toLonLat(x!, y!))] };
}

/** Evacuation zones: six on the west bank, the flood side of the river. */
export function demoZones(): FeatureCollection<Polygon> {
  const zone = (id: string, name: string, population: number, box: [number, number, number, number], curve: Record<string, unknown>): Feature<Polygon> => ({
    type: 'Feature',
    id,
    properties: { name, population, participationRate: 0.85, personsPerVehicle: 2.2, ...curve },
    geometry: rectangle(...box),
  });
  const logistic = { departure: 'logistic', responseRatePerHour: 1.2, halfLoadingHours: 1.5 };
  return {
    type: 'FeatureCollection',
    features: [
      zone('z-south-hill', 'South Hill', 3200, [0, 0, 1425, 1725], logistic),
      zone('z-old-town', 'Old Town', 5400, [1425, 0, 2850, 1725], logistic),
      zone('z-millbrook', 'Millbrook', 4100, [0, 1725, 1425, 3375], { departure: 'uniform', durationHours: 2 }),
      zone('z-riverside', 'Riverside', 6300, [1425, 1725, 2850, 3375], { departure: 'rayleigh', sigmaHours: 1 }),
      zone('z-north-flats', 'North Flats', 3600, [0, 3375, 1425, 4950], logistic),
      zone('z-canal-quarter', 'Canal Quarter', 4700, [1425, 3375, 2850, 4950], { departure: 'allAtOnce' }),
    ],
  };
}

/** Shelters on the east bank and three unbounded exits at the study-area edge. */
export function demoShelters(): FeatureCollection<Point> {
  const point = (id: string, name: string, capacityPersons: number | null, x: number, y: number): Feature<Point> => ({
    type: 'Feature',
    id,
    properties: { name, capacityPersons },
    geometry: { type: 'Point', coordinates: toLonLat(x, y) },
  });
  return {
    type: 'FeatureCollection',
    features: [
      point('s-eastside-school', 'Eastside School', 1500, 3905, 1805),
      point('s-fairground-hall', 'Fairground Hall', 3000, 4700, 2850),
      point('s-hilltop-centre', 'Hilltop Community Centre', 900, 4300, 600),
      point('x-motorway-north', 'Motorway exit north', null, MOTORWAY_NB_X, HEIGHT),
      point('x-motorway-south', 'Motorway exit south', null, MOTORWAY_SB_X, 0),
      point('x-heron-east', 'Heron Road exit east', null, WIDTH, 3750),
    ],
  };
}
