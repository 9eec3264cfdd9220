// Migration 0011 rewrites the ramp row's capacity source in stored capacity tables (the demo
// plan's included) to the current default, and leaves every other row and a planner's own
// wording alone.
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { createTestDatabase, type TestDatabase } from './support/database';
import { seedDemo } from '../../server/seed/seed-demo';
import { defaultCapacityTable, MOTORWAY_LINK_CAPACITY_SOURCE } from '../../shared/model/capacity-defaults';
import type { CapacityTable } from '../../shared/api/capacity-table';

const MIGRATION = new URL('../../drizzle/0011_ramp-capacity-source.sql', import.meta.url);
// The earlier default began like this; what followed named the lookup it was taken from.
const EARLIER_RAMP_SOURCE = 'ramp capacity 1,450–1,550 veh/h/ln, a regional lookup table (C); midpoint';

let database: TestDatabase;
let demoPlanId: string;

async function storeTable(planId: string, table: CapacityTable) {
  await database.db.execute(sql`INSERT INTO capacity_tables (plan_id, "table") VALUES (${planId}, ${JSON.stringify(table)}::jsonb)
    ON CONFLICT (plan_id) DO UPDATE SET "table" = EXCLUDED."table"`);
}
async function storedTable(planId: string): Promise<CapacityTable> {
  const { rows } = await database.pool.query('SELECT "table" FROM capacity_tables WHERE plan_id = $1', [planId]);
  return rows[0].table as CapacityTable;
}
function withRampSource(source: string): CapacityTable {
  const table = defaultCapacityTable();
  table.rows = table.rows.map((r) => (r.roadClass === 'motorway_link' ? { ...r, capacitySource: source } : r));
  return table;
}
async function migrate() {
  for (const statement of readFileSync(MIGRATION, 'utf8').split('--> statement-breakpoint')) {
    await database.pool.query(statement);
  }
}

beforeAll(async () => {
  database = await createTestDatabase();
  await seedDemo(database.db, 4);
  const { rows } = await database.pool.query('SELECT id FROM plans ORDER BY created_at LIMIT 1');
  demoPlanId = rows[0].id;
});
afterAll(async () => {
  await database.drop();
});

describe('migration 0011: ramp capacity source', () => {
  it('rewrites the earlier ramp source in the demo plan\'s stored table and keeps the other rows', async () => {
    const before = withRampSource(EARLIER_RAMP_SOURCE);
    before.capacityFactor = 0.86;
    await storeTable(demoPlanId, before);
    await migrate();
    const after = await storedTable(demoPlanId);
    const ramp = after.rows.find((r) => r.roadClass === 'motorway_link')!;
    expect(ramp.capacitySource).toBe(MOTORWAY_LINK_CAPACITY_SOURCE);
    expect(ramp.capacityVehPerHourPerLane).toBe(1500);
    expect(after.rows.map((r) => r.roadClass)).toEqual(before.rows.map((r) => r.roadClass));
    expect(after.rows.filter((r) => r.roadClass !== 'motorway_link')).toEqual(before.rows.filter((r) => r.roadClass !== 'motorway_link'));
    expect(after.capacityFactor).toBe(0.86);
  });

  it('keeps a source a planner wrote', async () => {
    await storeTable(demoPlanId, withRampSource('county ramp counts, 2024'));
    await migrate();
    expect((await storedTable(demoPlanId)).rows.find((r) => r.roadClass === 'motorway_link')!.capacitySource).toBe('county ramp counts, 2024');
  });
});
