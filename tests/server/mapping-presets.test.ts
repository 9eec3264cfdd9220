// Field-mapping presets on the real database: a planner saves one (the same name replaces it), a
// viewer lists but may not save or delete, another organisation sees none of them, a malformed
// mapping is refused with nothing written, and each write leaves its audit row.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mappingPresetListSchema, mappingPresetSchema } from '../../shared/api/mapping-presets';
import { countRows, createTestContext, signIn, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

let ctx: TestContext;
let planner: SignedInAgent;
let viewer: SignedInAgent;
let stranger: SignedInAgent;

const preset = (name: string, lanes = 'NUM_LANES') => ({
  name,
  kind: 'roads',
  fieldNames: ['RD_CLASS', 'NUM_LANES', 'FULLNAME'],
  mapping: { roads: { roadClass: 'RD_CLASS', lanes, name: 'FULLNAME', classValues: { '1': 'primary', '9': 'drop' }, onewayValues: { F: 'forward' }, speedUnit: 'mph' }, source: { crs: 'EPSG:2227' } },
});
const post = (who: SignedInAgent, body: unknown) => who.agent.post('/api/mapping-presets').set('x-csrf-token', who.csrf).send(body as object);
const list = async (who: SignedInAgent) => mappingPresetListSchema.parse((await who.agent.get('/api/mapping-presets').expect(200)).body).presets;

beforeAll(async () => {
  ctx = await createTestContext();
  planner = await signInAs(ctx.app, 'planner');
  viewer = await signInAs(ctx.app, 'viewer');
  stranger = await signIn(ctx.app, 'planner@other.example', 'other-planner-2026');
});
afterAll(async () => {
  expect(ctx.errors).toEqual([]);
  await ctx.drop();
});

describe('mapping presets', () => {
  it('a planner saves one; saving the same name again replaces it', async () => {
    const first = mappingPresetSchema.parse((await post(planner, preset('County centrelines')).expect(201)).body);
    expect(first.mapping.roads).toMatchObject({ roadClass: 'RD_CLASS', classValues: { '1': 'primary', '9': 'drop' }, speedUnit: 'mph' });
    const again = mappingPresetSchema.parse((await post(planner, preset('County centrelines', 'LANES_TOTAL')).expect(201)).body);
    expect(again.id).toBe(first.id);
    const presets = await list(viewer);
    expect(presets).toHaveLength(1);
    expect(presets[0]!.mapping.roads?.lanes).toBe('LANES_TOTAL');
    const { rows } = await ctx.pool.query(`SELECT action FROM audit_events WHERE entity_type = 'mapping-preset' ORDER BY id`);
    expect(rows.map((r) => r.action)).toEqual(['mapping-preset.save', 'mapping-preset.save']);
  });

  it('a viewer may list but not save or delete', async () => {
    const before = await countRows(ctx, 'mapping_presets');
    await post(viewer, preset('Viewer try')).expect(403);
    const [p] = await list(viewer);
    await viewer.agent.delete(`/api/mapping-presets/${p!.id}`).set('x-csrf-token', viewer.csrf).expect(403);
    expect(await countRows(ctx, 'mapping_presets')).toBe(before);
  });

  it('another organisation sees none and cannot delete one (404)', async () => {
    expect(await list(stranger)).toEqual([]);
    const [p] = await list(viewer);
    await stranger.agent.delete(`/api/mapping-presets/${p!.id}`).set('x-csrf-token', stranger.csrf).expect(404);
    expect(await list(viewer)).toHaveLength(1);
  });

  it('refuses malformed presets readably and writes nothing', async () => {
    const before = await countRows(ctx, 'mapping_presets');
    const bad = [
      { ...preset(''), name: '   ' },
      { ...preset('x'), kind: 'bridges' },
      { ...preset('x'), mapping: { roads: { roadClass: 'RD_CLASS', classValues: { '1': 'runway' } } } },
      { ...preset('x'), mapping: { roads: { roadClass: 'RD_CLASS', speedUnit: 'furlongs' } } },
      { ...preset('x'), fieldNames: Array.from({ length: 501 }, (_, i) => `C${i}`) },
      { ...preset('x'), name: 'n'.repeat(121) },
    ];
    for (const body of bad) {
      const res = await post(planner, body).expect(400);
      expect(res.body.error.message).toBeTruthy();
    }
    expect(await countRows(ctx, 'mapping_presets')).toBe(before);
  });

  it('a planner deletes one', async () => {
    const [p] = await list(planner);
    await planner.agent.delete(`/api/mapping-presets/${p!.id}`).set('x-csrf-token', planner.csrf).expect(204);
    expect(await list(planner)).toEqual([]);
  });
});
