// Sessions in PostgreSQL (connect-pg-simple, table `sessions`). With rolling sessions,
// express-session "touches" the stored session on every request that leaves it unchanged, to
// move its expiry on: an UPDATE, with its commit, on every read. This store moves a session's
// expiry on at most once per `touchIntervalMs` from this process, so the idle timeout runs at
// most that much short and reads no longer write.
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type pg from 'pg';

export function createSessionStore(pool: pg.Pool, touchIntervalMs = 60_000): session.Store {
  const PgStore = connectPgSimple(session);

  class ThrottledTouchStore extends PgStore {
    // Session id → when its expiry was last written, oldest first (re-inserted on every write).
    readonly #written = new Map<string, number>();

    #remember(sid: string): void {
      const now = Date.now();
      this.#written.delete(sid);
      this.#written.set(sid, now);
      for (const [oldSid, at] of this.#written) {
        if (now - at < touchIntervalMs) break;
        this.#written.delete(oldSid);
      }
    }

    override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
      this.#remember(sid);
      super.set(sid, sess, fn);
    }

    override touch(sid: string, sess: session.SessionData, fn?: () => void): void {
      const at = this.#written.get(sid);
      if (at !== undefined && Date.now() - at < touchIntervalMs) {
        fn?.();
        return;
      }
      this.#remember(sid);
      super.touch(sid, sess, fn);
    }

    override destroy(sid: string, fn?: (err?: unknown) => void): void {
      this.#written.delete(sid);
      super.destroy(sid, fn);
    }
  }

  return new ThrottledTouchStore({ pool, tableName: 'sessions', createTableIfMissing: false });
}
