// The session store writes a session's new expiry at most once per interval: a read right after
// a write leaves the row alone, a read after the interval moves the expiry on, and a destroyed
// session is gone. Checked on the real `sessions` table.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SessionData, Store } from 'express-session';
import { createSessionStore } from '../../server/auth/session-store';
import { createTestDatabase, type TestDatabase } from './support/database';

let database: TestDatabase;
let store: Store;
const intervalMs = 300;

beforeAll(async () => {
  database = await createTestDatabase();
  store = createSessionStore(database.pool, intervalMs);
});
afterAll(async () => {
  (store as Store & { close: () => void }).close();
  await database.drop();
});

const sessionExpiring = (inMs: number) => ({ cookie: { expires: new Date(Date.now() + inMs), originalMaxAge: inMs } }) as unknown as SessionData;
const call = (fn: (cb: (err?: unknown) => void) => void) => new Promise<void>((resolve, reject) => fn((err) => (err ? reject(err) : resolve())));
async function storedExpiry(sid: string): Promise<number | null> {
  const { rows } = await database.pool.query<{ expire: Date }>('SELECT expire FROM sessions WHERE sid = $1', [sid]);
  return rows[0] ? rows[0].expire.getTime() : null;
}

describe('session store', () => {
  it('skips a touch within the interval after a write and writes the one after it', async () => {
    await call((cb) => store.set('s1', sessionExpiring(3_600_000), cb));
    const saved = await storedExpiry('s1');
    expect(saved).not.toBeNull();

    await call((cb) => store.touch!('s1', sessionExpiring(7_200_000), cb));
    expect(await storedExpiry('s1')).toBe(saved);

    await new Promise((r) => setTimeout(r, intervalMs + 50));
    await call((cb) => store.touch!('s1', sessionExpiring(7_200_000), cb));
    const touched = await storedExpiry('s1');
    expect(touched! - saved!).toBeGreaterThan(3_000_000);

    // And the touch it just wrote starts a new interval.
    await call((cb) => store.touch!('s1', sessionExpiring(9_000_000), cb));
    expect(await storedExpiry('s1')).toBe(touched);
  });

  it('writes the first touch of a session this process has not written', async () => {
    await database.pool.query("INSERT INTO sessions (sid, sess, expire) VALUES ('s2', '{}', now() + interval '1 hour')");
    const before = await storedExpiry('s2');
    await call((cb) => store.touch!('s2', sessionExpiring(7_200_000), cb));
    expect((await storedExpiry('s2'))! - before!).toBeGreaterThan(3_000_000);
  });

  it('forgets a destroyed session, so a new one under that id is touched again', async () => {
    await call((cb) => store.set('s3', sessionExpiring(3_600_000), cb));
    await call((cb) => store.destroy('s3', cb));
    expect(await storedExpiry('s3')).toBeNull();
    await database.pool.query("INSERT INTO sessions (sid, sess, expire) VALUES ('s3', '{}', now() + interval '1 hour')");
    const before = await storedExpiry('s3');
    await call((cb) => store.touch!('s3', sessionExpiring(7_200_000), cb));
    expect((await storedExpiry('s3'))! - before!).toBeGreaterThan(3_000_000);
  });
});
