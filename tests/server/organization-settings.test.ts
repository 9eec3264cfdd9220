// The organisation's unit system and time zone: read by every member, changed by its
// administrators only, refused with a reason when wrong, audited, never reaching another
// organisation; and a road speed entered in mph reads back as exactly what was entered.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { speedFromKmh, speedToKmh } from '../../shared/format/units';
import { demoPlanId } from './support/demo-run';
import { countRows, createTestContext, signIn, otherAccounts, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

let ctx: TestContext;
let admin: SignedInAgent;
let planner: SignedInAgent;
let viewer: SignedInAgent;

beforeAll(async () => {
  ctx = await createTestContext({ BRIEFING_TIME_ZONE: 'Europe/Berlin' });
  [admin, planner, viewer] = await Promise.all([signInAs(ctx.app, 'admin'), signInAs(ctx.app, 'planner'), signInAs(ctx.app, 'viewer')]);
});
afterAll(async () => ctx?.drop());

describe('the organisation settings', () => {
  it('start metric, in the deployment zone', async () => {
    const res = await viewer.agent.get('/api/settings/organization').expect(200);
    expect(res.body).toEqual({ unitSystem: 'metric', timeZone: null, defaultTimeZone: 'Europe/Berlin', effectiveTimeZone: 'Europe/Berlin' });
  });

  it('are changed by an administrator, audited, and read by every member', async () => {
    const auditBefore = await countRows(ctx, 'audit_events');
    const put = await admin.agent
      .put('/api/settings/organization')
      .set('x-csrf-token', admin.csrf)
      .send({ unitSystem: 'us-customary', timeZone: 'America/Chicago' })
      .expect(200);
    expect(put.body).toMatchObject({ unitSystem: 'us-customary', timeZone: 'America/Chicago', effectiveTimeZone: 'America/Chicago' });
    expect(await countRows(ctx, 'audit_events')).toBe(auditBefore + 1);
    const read = await viewer.agent.get('/api/settings/organization').expect(200);
    expect(read.body).toMatchObject({ unitSystem: 'us-customary', effectiveTimeZone: 'America/Chicago' });
  });

  it('never reach another organisation', async () => {
    const otherAdmin = otherAccounts.find((a) => a.role === 'admin')!;
    const other = await signIn(ctx.app, otherAdmin.email, otherAdmin.password);
    const res = await other.agent.get('/api/settings/organization').expect(200);
    expect(res.body).toMatchObject({ unitSystem: 'metric', timeZone: null });
  });

  it('are refused to a planner, and refused with a reason for an unknown zone, changing nothing', async () => {
    await planner.agent.put('/api/settings/organization').set('x-csrf-token', planner.csrf).send({ unitSystem: 'metric', timeZone: null }).expect(403);
    for (const body of [
      { unitSystem: 'metric', timeZone: 'Mars/Olympus_Mons' },
      { unitSystem: 'imperial', timeZone: null },
      { unitSystem: 'metric', timeZone: 'America/Chicago; drop table' },
    ]) {
      const res = await admin.agent.put('/api/settings/organization').set('x-csrf-token', admin.csrf).send(body).expect(400);
      expect(JSON.stringify(res.body)).toMatch(/time zone|Invalid option/i);
    }
    const read = await viewer.agent.get('/api/settings/organization').expect(200);
    expect(read.body).toMatchObject({ unitSystem: 'us-customary', timeZone: 'America/Chicago' });
  });

  it('go back to the deployment zone with a null zone', async () => {
    const res = await admin.agent.put('/api/settings/organization').set('x-csrf-token', admin.csrf).send({ unitSystem: 'us-customary', timeZone: null }).expect(200);
    expect(res.body).toMatchObject({ timeZone: null, effectiveTimeZone: 'Europe/Berlin' });
  });
});

describe('a road speed entered in mph', () => {
  it('reads back as exactly what was entered', async () => {
    const planId = await demoPlanId(ctx.db, ctx.demoOrganizationId);
    const list = await viewer.agent.get(`/api/plans/${planId}/segments`).query({ limit: 1 }).expect(200);
    const segment = list.body.items[0];
    for (const mph of [35, 25, 55, 45.5]) {
      await planner.agent
        .patch(`/api/plans/${planId}/segments/${segment.id}`)
        .set('x-csrf-token', planner.csrf)
        .send({ speedKmh: speedToKmh(mph, 'us-customary') })
        .expect(200);
      const read = await viewer.agent.get(`/api/plans/${planId}/segments/${segment.id}`).expect(200);
      expect(speedFromKmh(read.body.speedKmh, 'us-customary')).toBe(mph);
    }
  });
});
