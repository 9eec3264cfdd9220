// The product as the HTTP benches run it: the private PostgreSQL cluster, a throwaway database
// (migrated and seeded), the API server and, when asked, one run worker, as separate processes
// with production settings on a free loopback port. Stopped (processes ended, database dropped)
// by `stop()` or by Ctrl-C. One start-up for bench:http, bench:county and the upload bench.
import { execFileSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import net from 'node:net';
import { createBenchDatabase, ensurePostgres, type BenchDatabase } from './bench-database';
import { startProcess, waitForReady, type BenchProcess } from './server-processes';

export interface BenchStack {
  baseUrl: string;
  databaseUrl: string;
  api: BenchProcess;
  /** The run worker, when one was asked for. */
  worker: BenchProcess | null;
  stop: () => Promise<void>;
}

export interface BenchStackOptions {
  root: string;
  /** Folder for the processes' logs. */
  out: string;
  /** Log file names start with this (e.g. `upload-` gives upload-api.log). */
  logPrefix?: string;
  worker: boolean;
  /** Added to (or overriding) the production settings below. */
  env?: Record<string, string>;
  apiNodeArgs?: string[];
  say: (s: string) => void;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer().listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
    server.on('error', reject);
  });
}

export async function startBenchStack(options: BenchStackOptions): Promise<BenchStack> {
  const { root, out, say } = options;
  const prefix = options.logPrefix ?? '';
  ensurePostgres(root);
  say('creating, migrating and seeding the bench database');
  const database: BenchDatabase = await createBenchDatabase();
  const processes: BenchProcess[] = [];
  let stopping: Promise<void> | null = null;
  const stop = () => {
    stopping ??= (async () => {
      await Promise.all(processes.map((p) => p.stop().catch(() => undefined)));
      await database.drop().catch((e: unknown) => say(`could not drop ${database.name}: ${String(e)}`));
    })();
    return stopping;
  };
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.on(signal, () => {
      say(`${signal}: stopping the processes and dropping the bench database`);
      void stop().finally(() => process.exit(130));
    });
  }
  try {
    const port = await freePort();
    const env = {
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATABASE_URL: database.url,
      LOG_LEVEL: 'warn',
      // Production refuses the published development secrets; these live as long as the bench.
      SESSION_SECRET: randomBytes(24).toString('hex'),
      SIGNING_KEY_PASSPHRASE: randomBytes(24).toString('hex'),
      // Plain HTTP on loopback, with no TLS proxy in front: production's Secure cookies would never be sent back.
      COOKIE_SECURE: 'false',
      WORKER_CONCURRENCY: '1',
      // At the end a run in hand goes back to the queue soon; the database is dropped anyway.
      WORKER_SHUTDOWN_GRACE_SECONDS: '5',
      ...options.env,
    };
    const api = startProcess('api', root, 'server/index.ts', env, `${out}${prefix}api.log`, options.apiNodeArgs ?? []);
    processes.push(api);
    const worker = options.worker ? startProcess('worker', root, 'server/worker.ts', env, `${out}${prefix}worker.log`) : null;
    if (worker) processes.push(worker);
    const baseUrl = `http://127.0.0.1:${port}`;
    await waitForReady(`${baseUrl}/readyz`, api, 60_000);
    return { baseUrl, databaseUrl: database.url, api, worker, stop };
  } catch (e) {
    await stop();
    throw e;
  }
}

/** The commit measured, and whether the tree differed from it (the bench's own README excepted). */
export function commitDescription(root: string, ownReadme: string): string {
  try {
    const sha = execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: root, encoding: 'utf8' }).trim();
    const status = execFileSync('git', ['status', '--porcelain', '--untracked-files=no', '--', '.', `:!${ownReadme}`], { cwd: root, encoding: 'utf8' });
    return status.trim() ? `${sha} (with uncommitted changes in the tree)` : sha;
  } catch {
    return 'unknown';
  }
}
