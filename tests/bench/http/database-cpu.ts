// CPU time of the PostgreSQL backends serving the bench database (the API's and the worker's
// connections), read from /proc: the cluster is shared with other work, so only this
// database's backends are counted. A backend that closes during the load is missed.
import pg from 'pg';
import { cpuSecondsOf } from './server-processes';

async function backendPids(databaseUrl: string): Promise<number[]> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows } = await client.query<{ pid: number }>('SELECT pid FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid()');
    return rows.map((r) => r.pid);
  } finally {
    await client.end();
  }
}

export async function databaseCpuSnapshot(databaseUrl: string): Promise<Map<number, number>> {
  const snapshot = new Map<number, number>();
  for (const pid of await backendPids(databaseUrl)) {
    const seconds = cpuSecondsOf(pid);
    if (seconds !== null) snapshot.set(pid, seconds);
  }
  return snapshot;
}

/** CPU seconds this database's backends used since `before` (a backend opened since counts from its start). */
export async function databaseCpuSince(databaseUrl: string, before: Map<number, number>): Promise<number> {
  const after = await databaseCpuSnapshot(databaseUrl);
  let seconds = 0;
  for (const [pid, now] of after) seconds += now - (before.get(pid) ?? 0);
  return seconds;
}
