// The field-mapping step: the chosen file's schema read from the server, first guesses from its
// column names, the planner's choices and value tables, the preview reading each feature as the
// import will, and the answer the import job gets (or nothing, on cancel).
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { FileSchema } from '../../shared/api/road-import';
import { ApiError } from '../../src/api/api-error';
import { roadInputColumns, roadInputsMapping } from '../../shared/format/inputs-export';

vi.mock('../../src/api/file-schema', () => ({ readFileSchema: vi.fn() }));
vi.mock('../../src/api/mapping-presets', () => ({ listMappingPresets: vi.fn(), saveMappingPreset: vi.fn(), deleteMappingPreset: vi.fn() }));
const schemaApi = await import('../../src/api/file-schema');
const presetsApi = await import('../../src/api/mapping-presets');
const { useFieldMappingStore } = await import('../../src/stores/field-mapping');
const { useFileUpload } = await import('../../src/composables/use-file-upload');

const planId = '00000000-0000-4000-8000-00000000000a';
const field = (name: string, samples: string[] = []) => ({ name, type: 'text' as const, samples, distinct: samples.length, distinctCapped: false, empty: 0 });
const line = (index: number, properties: Record<string, unknown>) => ({ index, geometry: { type: 'LineString', coordinates: [[-122.28, 37.81], [-122.279, 37.811]] }, properties });

const countySchema: FileSchema = {
  fileName: 'centerlines.zip',
  format: 'shapefile',
  layers: [],
  layer: null,
  featureCount: 3,
  geometryTypes: { LineString: 3 },
  fields: [field('RD_CLASS', ['ART', 'LOC', 'TRL']), field('NUM_LANES'), field('ONE_WAY', ['B', 'F']), field('FULLNAME')],
  sourceCrs: { epsg: 2227, name: 'NAD83 / California zone 3 (ftUS)', definition: '+proj=lcc' },
  extent: [-122.29, 37.8, -122.27, 37.82],
  preview: [
    line(0, { RD_CLASS: 'ART', NUM_LANES: 4, ONE_WAY: 'B', FULLNAME: 'Market St' }),
    line(1, { RD_CLASS: 'LOC', NUM_LANES: 2, ONE_WAY: 'F', FULLNAME: 'Elm Ct' }),
    line(2, { RD_CLASS: 'TRL', FULLNAME: 'Ridge Path' }),
  ],
};

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(createPinia());
  vi.mocked(presetsApi.listMappingPresets).mockResolvedValue([]);
});

describe('field-mapping store', () => {
  it('reads the schema, guesses the columns, and answers the road mapping with the value tables', async () => {
    vi.mocked(schemaApi.readFileSchema).mockResolvedValue(countySchema);
    const m = useFieldMappingStore();
    const answer = m.ask(planId, 'roads', new File(['x'], 'centerlines.zip'));
    await vi.waitFor(() => expect(m.schema).not.toBeNull());
    expect(m.open).toBe(true);
    expect(m.roads).toMatchObject({ roadClass: 'RD_CLASS', lanes: 'NUM_LANES', oneway: 'ONE_WAY', name: 'FULLNAME' });
    expect(m.classCodes).toEqual(['ART', 'LOC', 'TRL']);
    // Before the value table is filled, none of the county's codes is a class: all left out.
    expect(m.summary.kept).toBe(0);
    m.roads.classValues['ART'] = 'primary';
    m.roads.classValues['LOC'] = 'residential';
    m.roads.classValues['TRL'] = 'drop';
    m.roads.onewayValues['F'] = 'forward';
    expect(m.summary.kept).toBe(2);
    expect(m.preview[1]!.label).toContain('one-way');
    m.confirm();
    const got = await answer;
    expect(m.open).toBe(false);
    expect(got).toEqual({
      kind: 'roads',
      options: {
        propertyMapping: expect.objectContaining({ roadClass: 'RD_CLASS', classValues: { ART: 'primary', LOC: 'residential', TRL: 'drop' }, onewayValues: { F: 'forward' }, lanes: 'NUM_LANES', name: 'FULLNAME' }),
        source: { layer: undefined, crs: undefined, xColumn: undefined, yColumn: undefined },
      },
    });
  });

  it('takes a road file Cutline wrote with the mapping it was written for: directional lanes, closure, capacity per lane, speed in its unit', async () => {
    const columns = roadInputColumns('us-customary').map((c) => field(c.name));
    vi.mocked(schemaApi.readFileSchema).mockResolvedValue({
      ...countySchema,
      fileName: 'plan-inputs.gpkg',
      format: 'geopackage',
      fields: columns,
      preview: [line(0, { road_class: 'primary', lanes_fwd: 3, lanes_bwd: 2, oneway: false, speed_mph: 35, closed: true, cap_lane: 1350, name: 'Weir Street' })],
    });
    const m = useFieldMappingStore();
    const answer = m.ask(planId, 'roads', new File(['x'], 'plan-inputs.gpkg'));
    await vi.waitFor(() => expect(m.schema).not.toBeNull());
    expect(m.summary.kept).toBe(1);
    m.confirm();
    const got = await answer;
    const { classValues, onewayValues, ...expected } = roadInputsMapping('us-customary');
    expect(got?.options).toMatchObject({ propertyMapping: { ...expected, classValues, onewayValues } });
  });

  it('shows the server\'s refusal (a projected file with no CRS) and reads again with the CRS given', async () => {
    vi.mocked(schemaApi.readFileSchema)
      .mockRejectedValueOnce(new ApiError(400, 'invalid_request', 'x', [], { code: 'wrongCrs', message: 'The file looks projected; try EPSG:2227 or EPSG:26910.', badFeatures: [] }))
      .mockResolvedValueOnce(countySchema);
    const m = useFieldMappingStore();
    void m.ask(planId, 'roads', new File(['x'], 'a.zip'));
    await vi.waitFor(() => expect(m.error).toContain('EPSG:2227'));
    m.source.crs = 'EPSG:2227';
    await m.readSchema();
    expect(vi.mocked(schemaApi.readFileSchema).mock.calls[1]![2]).toMatchObject({ crs: 'EPSG:2227' });
    expect(m.error).toBe('');
    expect(m.schema?.sourceCrs?.epsg).toBe(2227);
  });

  it('answers zone columns, and says a feature without population would refuse the file', async () => {
    const square = { type: 'Polygon', coordinates: [[[0, 0], [0.01, 0], [0.01, 0.01], [0, 0.01], [0, 0]]] };
    vi.mocked(schemaApi.readFileSchema).mockResolvedValue({
      ...countySchema, format: 'geopackage', geometryTypes: { Polygon: 2 }, fields: [field('TRACT'), field('POP')],
      preview: [{ index: 0, geometry: square, properties: { TRACT: 'N', POP: 10 } }, { index: 1, geometry: square, properties: { TRACT: 'S' } }],
    });
    const m = useFieldMappingStore();
    const answer = m.ask(planId, 'zones', new File(['x'], 'zones.gpkg'));
    await vi.waitFor(() => expect(m.schema).not.toBeNull());
    expect(m.zones.population).toBe('POP');
    expect(m.refuses).toBe(true);
    m.zones.name = 'TRACT';
    m.confirm();
    expect(await answer).toMatchObject({ kind: 'zones', options: { fields: { name: 'TRACT', population: 'POP' } } });
  });

  it('cancel sends nothing: the upload composable stops before the file goes', async () => {
    vi.mocked(schemaApi.readFileSchema).mockResolvedValue(countySchema);
    const m = useFieldMappingStore();
    const send = vi.fn(async () => 'sent');
    const upload = useFileUpload(send, async (file) => (await m.ask(planId, 'shelters', file))?.options ?? null);
    const target = { files: [new File(['x'], 's.csv')], value: 's.csv' };
    const done = upload.picked({ target } as unknown as Event);
    await vi.waitFor(() => expect(m.open).toBe(true));
    m.cancel();
    await done;
    expect(send).not.toHaveBeenCalled();
    expect(upload.busy.value).toBe(false);
  });

  it('saves the choices as a preset, and applies it to the next file with the same columns', async () => {
    vi.mocked(schemaApi.readFileSchema).mockResolvedValue(countySchema);
    let m = useFieldMappingStore();
    void m.ask(planId, 'roads', new File(['x'], 'centerlines.zip'));
    await vi.waitFor(() => expect(m.schema).not.toBeNull());
    m.roads.classValues['ART'] = 'primary';
    m.roads.speedUnit = 'mph';
    vi.mocked(presetsApi.saveMappingPreset).mockImplementation(async (input) => ({ ...input, id: '00000000-0000-4000-8000-000000000001', createdAt: '', updatedAt: '' }));
    await m.savePreset('County centrelines');
    const saved = vi.mocked(presetsApi.saveMappingPreset).mock.calls[0]![0];
    expect(saved).toMatchObject({ name: 'County centrelines', kind: 'roads', fieldNames: ['RD_CLASS', 'NUM_LANES', 'ONE_WAY', 'FULLNAME'] });
    expect(saved.mapping.roads).toMatchObject({ roadClass: 'RD_CLASS', classValues: { ART: 'primary' }, speedUnit: 'mph' });
    m.cancel();

    // Next time (a fresh page): the saved preset comes from the server and applies at once.
    setActivePinia(createPinia());
    vi.mocked(presetsApi.listMappingPresets).mockResolvedValue([{ ...saved, id: '00000000-0000-4000-8000-000000000001', createdAt: '', updatedAt: '' }]);
    m = useFieldMappingStore();
    void m.ask(planId, 'roads', new File(['x'], 'next-year.zip'));
    await vi.waitFor(() => expect(m.schema).not.toBeNull());
    expect(m.appliedPreset).toBe('County centrelines');
    expect(m.roads.classValues).toEqual({ ART: 'primary' });
    expect(m.roads.speedUnit).toBe('mph');
    // A zone file is not offered a road preset.
    m.cancel();
    void m.ask(planId, 'zones', new File(['x'], 'zones.zip'));
    await vi.waitFor(() => expect(m.schema).not.toBeNull());
    expect(m.offered).toEqual([]);
    expect(m.appliedPreset).toBe('');
  });
});
