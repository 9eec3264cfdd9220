// Two administrators demoting (or removing) each other at the same moment must not leave the
// organization without one: the service locks all of its administrator memberships before it
// checks that another remains. Before, each transaction saw the other still an administrator
// and both went through.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signIn, signInAs, type SignedInAgent, type TestContext } from './support/test-app';

let ctx: TestContext;
let first: SignedInAgent;
beforeAll(async () => {
  // No per-process cache of sessions and roles: each request reads the role as it is now.
  ctx = await createTestContext({ AUTH_CACHE_MILLISECONDS: '0' });
  first = await signInAs(ctx.app, 'admin');
});
afterAll(async () => {
  await ctx.drop();
});

const adminCount = async () =>
  Number((await ctx.pool.query(`SELECT count(*) AS n FROM memberships WHERE organization_id = $1 AND role = 'admin'`, [ctx.demoOrganizationId])).rows[0].n);

describe('administrators demoting each other at once', () => {
  it('leaves at least one administrator, every time', async () => {
    const firstId = ctx.userIds['admin@cutline.example']!;
    for (let round = 0; round < 6; round++) {
      // A second administrator, made for this round.
      const email = `second-admin-${round}@cutline.example`;
      const made = await first.agent
        .post('/api/members')
        .set('x-csrf-token', first.csrf)
        .send({ email, displayName: `Second Admin ${round}`, role: 'admin', password: `second-admin-${round}-2026` });
      expect(made.status, JSON.stringify(made.body)).toBe(201);
      const secondId = made.body.userId as string;
      const second = await signIn(ctx.app, email, `second-admin-${round}-2026`);
      expect(await adminCount()).toBe(2);

      const remove = round % 2 === 1;
      const act = (who: SignedInAgent, target: string) =>
        remove ? who.agent.delete(`/api/members/${target}`).set('x-csrf-token', who.csrf) : who.agent.patch(`/api/members/${target}`).set('x-csrf-token', who.csrf).send({ role: 'viewer' });
      const [a, b] = await Promise.all([act(first, secondId), act(second, firstId)]);
      const statuses = [a.status, b.status].sort();
      // One goes through; the other is refused with the reason (or, having lost its own role first, forbidden).
      expect(statuses[0], JSON.stringify([a.body, b.body])).toBe(remove ? 204 : 200);
      expect([403, 409]).toContain(statuses[1]);
      expect(await adminCount()).toBe(1);

      // Back to one known administrator (the first) for the next round.
      const { rows } = await ctx.pool.query(`SELECT user_id FROM memberships WHERE organization_id = $1 AND role = 'admin'`, [ctx.demoOrganizationId]);
      if (rows[0].user_id !== firstId) {
        await ctx.pool.query(`INSERT INTO memberships (user_id, organization_id, role) VALUES ($1, $2, 'admin') ON CONFLICT (user_id, organization_id) DO UPDATE SET role = 'admin'`, [firstId, ctx.demoOrganizationId]);
        await ctx.pool.query(`DELETE FROM memberships WHERE organization_id = $1 AND user_id = $2`, [ctx.demoOrganizationId, rows[0].user_id]);
      } else {
        await ctx.pool.query(`DELETE FROM memberships WHERE organization_id = $1 AND user_id = $2`, [ctx.demoOrganizationId, secondId]);
      }
      first = await signInAs(ctx.app, 'admin');
    }
  }, 180_000);
});
