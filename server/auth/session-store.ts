// Sessions in PostgreSQL (connect-pg-simple, table `sessions`). With rolling sessions,
// express-session "touches" the stored session on every request that leaves it unchanged, to
// move its expiry on: an UPDATE, with its commit, on every read. This store moves a session's
// expiry on at most once per `touchIntervalMs` from this process, so the idle timeout runs at
// most that much short and reads no longer write. A session read is also kept for `readCacheMs`,
// so a burst of requests from one browser reads the table once; this process forgets it when it
// writes or destroys the session, another process's sign-out shows within that time.
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type pg from 'pg';
import { createRecentCache } from '../services/recent-cache';

export function createSessionStore(pool: pg.Pool, touchIntervalMs = 60_000, readCacheMs = 0): session.Store {
  const PgStore = connectPgSimple(session);

  class ThrottledTouchStore extends PgStore {
    // Sessions whose expiry this process wrote within the interval (a forgotten one is only written again).
    readonly #written = createRecentCache<true>(touchIntervalMs);
    // Session id → the session as last read, as JSON (each request gets its own copy).
    readonly #read = createRecentCache<string>(readCacheMs);

    override get(sid: string, fn: (err: unknown, session?: session.SessionData | null) => void): void {
      const hit = this.#read.get(sid);
      if (hit !== undefined) return fn(null, JSON.parse(hit) as session.SessionData);
      super.get(sid, (err: unknown, sess?: session.SessionData | null) => {
        if (!err && sess) this.#read.set(sid, JSON.stringify(sess));
        fn(err, sess);
      });
    }

    override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
      this.#read.forget(sid);
      this.#written.set(sid, true);
      super.set(sid, sess, fn);
    }

    override touch(sid: string, sess: session.SessionData, fn?: () => void): void {
      if (this.#written.get(sid)) {
        fn?.();
        return;
      }
      this.#written.set(sid, true);
      super.touch(sid, sess, fn);
    }

    override destroy(sid: string, fn?: (err?: unknown) => void): void {
      this.#read.forget(sid);
      this.#written.forget(sid);
      super.destroy(sid, fn);
    }
  }

  return new ThrottledTouchStore({ pool, tableName: 'sessions', createTableIfMissing: false });
}
