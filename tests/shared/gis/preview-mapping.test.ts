// The mapping step's preview reads each feature with the import's own readers: kept roads get
// their class, lanes and capacity from the class table, dropped ones their reason; zones and
// shelters their population and capacity, or the problem that would refuse the file.
import { describe, expect, it } from 'vitest';
import type { PreviewFeature, PropertyMapping } from '../../../shared/api/road-import';
import { distinctValues, guessColumns, previewMapping, previewSummary } from '../../../shared/geo/preview-mapping';
import { DEFAULT_CAPACITY_ROWS } from '../../../shared/model/capacity-defaults';

const line = (index: number, properties: Record<string, unknown>): PreviewFeature => ({
  index,
  geometry: { type: 'LineString', coordinates: [[-122.28, 37.81], [-122.279, 37.811]] },
  properties,
});

const mapping: PropertyMapping = {
  roadClass: 'RDCLASS',
  classValues: { '2': 'primary', '5': 'residential', '9': 'drop' },
  onewayValues: { F: 'forward', T: 'backward', B: 'both' },
  lanes: 'NUMLANES',
  oneway: 'DIRCODE',
  speedUnit: 'mph',
  speed: 'SPD',
};

describe('previewMapping (roads)', () => {
  const features = [
    line(0, { RDCLASS: '2', NUMLANES: 4, DIRCODE: 'B', SPD: 35 }),
    line(1, { RDCLASS: '5', NUMLANES: null, DIRCODE: 'F' }),
    line(2, { RDCLASS: '9', NUMLANES: 1 }),
    line(3, { RDCLASS: '77' }),
    { index: 4, geometry: { type: 'Point', coordinates: [-122.28, 37.81] }, properties: { RDCLASS: '2' } },
  ];
  const out = previewMapping('roads', features, { roads: mapping }, 'shapefile');

  it('gives kept roads their class, lanes per direction and capacity from the class table', () => {
    const primary = DEFAULT_CAPACITY_ROWS.find((r) => r.roadClass === 'primary')!;
    expect(out[0]).toMatchObject({ state: 'kept', roadClass: 'primary', lanes: 2, capacityVehPerHour: 2 * primary.capacityVehPerHourPerLane });
    const residential = DEFAULT_CAPACITY_ROWS.find((r) => r.roadClass === 'residential')!;
    // No lanes given: the class default; 'F' in the county's convention is one-way along the drawing.
    expect(out[1]).toMatchObject({ state: 'kept', roadClass: 'residential', lanes: residential.lanesPerDirection });
    expect(out[1]!.label).toContain('one-way');
  });

  it('names what is dropped and why', () => {
    expect(out[2]).toMatchObject({ state: 'dropped', reason: 'unknownClass' });
    expect(out[3]).toMatchObject({ state: 'dropped', reason: 'unknownClass' });
    expect(out[4]).toMatchObject({ state: 'dropped', reason: 'notALine' });
    const summary = previewSummary(out);
    expect(summary.kept).toBe(2);
    expect(summary.reasons.map((r) => [r.features, r.refuses])).toEqual([[2, false], [1, false]]);
  });

  it('reads the one-way convention through the value table (T = against the drawing)', () => {
    const [against] = previewMapping('roads', [line(0, { RDCLASS: '5', DIRCODE: 'T' })], { roads: mapping }, 'shapefile');
    const [unmapped] = previewMapping('roads', [line(0, { RDCLASS: '5', DIRCODE: 'T' })], { roads: { ...mapping, onewayValues: {} } }, 'shapefile');
    expect(against!.label).toContain('one-way');
    // Read as an OSM-style value, "T" is not a one-way spelling: both ways.
    expect(unmapped!.label).toContain('each way');
  });

  it('refuses a feature the import would refuse', () => {
    const [bad] = previewMapping('roads', [{ index: 0, geometry: { type: 'LineString', coordinates: [[500, 500]] }, properties: { RDCLASS: '2' } }], { roads: mapping }, 'geojson');
    expect(bad!.state).toBe('refused');
  });
});

describe('previewMapping (zones and shelters)', () => {
  it('reads population through the mapping, and a missing one refuses the file', () => {
    const square = { type: 'Polygon', coordinates: [[[0, 0], [0.01, 0], [0.01, 0.01], [0, 0.01], [0, 0]]] };
    const out = previewMapping('zones', [
      { index: 0, geometry: square, properties: { TRACT: 'North', POP2020: '1200', PART: 80 } },
      { index: 1, geometry: square, properties: { TRACT: 'South' } },
    ], { zones: { name: 'TRACT', population: 'POP2020', participationRate: 'PART' } }, 'geopackage');
    expect(out[0]).toMatchObject({ state: 'kept', population: 1200 });
    expect(out[1]!.state).toBe('refused');
  });

  it('turns CSV points into zones, as the import does', () => {
    const [zone] = previewMapping('zones', [{ index: 0, geometry: { type: 'Point', coordinates: [-122.27, 37.8] }, properties: { POP: 50 } }], { zones: { population: 'POP' } }, 'csv');
    expect(zone).toMatchObject({ state: 'kept', population: 50 });
    expect(zone!.geometry!.type).toBe('Polygon');
  });

  it('reads shelter capacity through the mapping', () => {
    const [s] = previewMapping('shelters', [{ index: 0, geometry: { type: 'Point', coordinates: [-122.27, 37.8] }, properties: { SITE: 'Gym', MAXOCC: '350' } }], { shelters: { name: 'SITE', capacityPersons: 'MAXOCC' } }, 'csv');
    expect(s).toMatchObject({ state: 'kept', capacityPersons: 350 });
  });
});

describe('column guesses and value lists', () => {
  it('guesses county-style column names', () => {
    const f = (name: string) => ({ name, type: 'text' as const, samples: [], distinct: 0, distinctCapped: false, empty: 0 });
    expect(guessColumns([f('RD_CLASS'), f('NUM_LANES'), f('SPEED_LIM'), f('ONE_WAY'), f('FULLNAME'), f('Z_LEVEL')])).toEqual({
      roadClass: 'RD_CLASS', lanes: 'NUM_LANES', speed: 'SPEED_LIM', oneway: 'ONE_WAY', name: 'FULLNAME', layer: 'Z_LEVEL',
    });
  });

  it('lists a column’s distinct values from the preview and the samples', () => {
    const field = { name: 'C', type: 'text' as const, samples: ['10', '2'], distinct: 3, distinctCapped: false, empty: 0 };
    expect(distinctValues([line(0, { C: '3' }), line(1, { C: '2' }), line(2, { C: null })], field)).toEqual(['2', '3', '10']);
  });
});
