// The plan's capacity table as planners edit it: every changed value needs its own source, each
// change is in the history with who, when, and each cell before and after; viewers read it and
// its history but cannot change it; another organisation's plan is a 404; nothing is written
// when a change is refused.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CapacityTable } from '../../shared/api/capacity-table';
import { speedFromKmh, speedToKmh } from '../../shared/format/units';
import { defaultCapacityTable } from '../../shared/model/capacity-defaults';
import { demoPlanId } from './support/demo-run';
import { countRows, createTestContext, otherAccounts, signIn, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

let ctx: TestContext;
let planner: SignedInAgent;
let viewer: SignedInAgent;
let planId: string;

beforeAll(async () => {
  ctx = await createTestContext();
  [planner, viewer] = await Promise.all([signInAs(ctx.app, 'planner'), signInAs(ctx.app, 'viewer')]);
  planId = await demoPlanId(ctx.db, ctx.demoOrganizationId);
});
afterAll(async () => ctx?.drop());

const put = (agent: SignedInAgent, table: CapacityTable) => agent.agent.put(`/api/plans/${planId}/capacity-table`).set('x-csrf-token', agent.csrf).send(table);

describe('editing the capacity table', () => {
  it('refuses a changed value whose source was left as it was, naming the field, and writes nothing', async () => {
    const before = (await viewer.agent.get(`/api/plans/${planId}/capacity-table`).expect(200)).body as CapacityTable;
    const audit = await countRows(ctx, 'audit_events');
    const i = before.rows.findIndex((r) => r.roadClass === 'secondary');
    const table = structuredClone(before);
    table.rows[i]!.capacityVehPerHourPerLane = 700;
    const res = await put(planner, table).expect(400);
    expect(res.body.error.fields).toEqual([{ path: `rows.${i}.capacitySource`, message: expect.stringContaining('give its source') }]);
    expect(await countRows(ctx, 'audit_events')).toBe(audit);
    expect((await viewer.agent.get(`/api/plans/${planId}/capacity-table`).expect(200)).body).toEqual(before);
  });

  it('takes a value with its new source, keeps a speed entered in mph exact, and records each cell in the history', async () => {
    const before = (await viewer.agent.get(`/api/plans/${planId}/capacity-table`).expect(200)).body as CapacityTable;
    const i = before.rows.findIndex((r) => r.roadClass === 'secondary');
    const table = structuredClone(before);
    table.rows[i]!.capacityVehPerHourPerLane = 700;
    table.rows[i]!.capacitySource = 'County traffic counts, Harbor Avenue, 2026 (drill)';
    table.rows[i]!.speedKmh = speedToKmh(35, 'us-customary');
    table.rows[i]!.speedSource = 'posted limit 35 mph';
    await put(planner, table).expect(200);

    const read = (await viewer.agent.get(`/api/plans/${planId}/capacity-table`).expect(200)).body as CapacityTable;
    expect(speedFromKmh(read.rows[i]!.speedKmh, 'us-customary')).toBe(35);

    const history = await viewer.agent.get(`/api/plans/${planId}/capacity-table/history`).expect(200);
    expect(history.body.entries).toHaveLength(1);
    expect(history.body.entries[0]).toMatchObject({ actorName: 'Tomas Everly' });
    expect(history.body.entries[0].changes).toEqual(
      expect.arrayContaining([
        { roadClass: 'secondary', field: 'capacityVehPerHourPerLane', from: before.rows[i]!.capacityVehPerHourPerLane, to: 700 },
        { roadClass: 'secondary', field: 'capacitySource', from: before.rows[i]!.capacitySource, to: 'County traffic counts, Harbor Avenue, 2026 (drill)' },
        { roadClass: 'secondary', field: 'speedSource', from: before.rows[i]!.speedSource, to: 'posted limit 35 mph' },
      ]),
    );
    expect(history.body.entries[0].changes).toHaveLength(4);
  });

  it('is read, history too, by viewers, who cannot change it', async () => {
    await put(viewer, defaultCapacityTable()).expect(403);
    await viewer.agent.get(`/api/plans/${planId}/capacity-table/history`).expect(200);
  });

  it('is a 404 to another organisation, history included', async () => {
    const account = otherAccounts.find((a) => a.role === 'planner')!;
    const other = await signIn(ctx.app, account.email, account.password);
    await other.agent.get(`/api/plans/${planId}/capacity-table/history`).expect(404);
    await put(other, defaultCapacityTable()).expect(404);
  });

  it('pages its history', async () => {
    const res = await viewer.agent.get(`/api/plans/${planId}/capacity-table/history?limit=201`).expect(400);
    expect(JSON.stringify(res.body)).toContain('At most 200');
  });
});
