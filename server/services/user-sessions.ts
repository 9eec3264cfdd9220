// Ending a person's sessions when their password changes or is reset, or when a removed member
// is added again: a session opened with the old password (perhaps by whoever learned it) must
// not outlive it. Sessions are connect-pg-simple rows whose `sess` holds passport's user id.
import { and, ne, sql } from 'drizzle-orm';
import type { Database, Tx } from '../db/client';
import { sessions } from '../db/schema';

/** Deletes every stored session signed in as `userId`, but the one named `keepSessionId` (the caller's own). Returns how many ended. */
export async function endSessionsOf(db: Database | Tx, userId: string, keepSessionId?: string): Promise<number> {
  const ofUser = sql`${sessions.sess}->'passport'->>'user' = ${userId}`;
  const ended = await db
    .delete(sessions)
    .where(keepSessionId ? and(ofUser, ne(sessions.sid, keepSessionId)) : ofUser)
    .returning({ sid: sessions.sid });
  return ended.length;
}
