// With API_PROCESSES above 1, `server/index.ts` runs this in the first process: it starts that
// many API processes on the one port, one after another (node:cluster hands each new connection
// to one of them), holds the rate-limit counts they share, starts a new process in place of one
// that dies, and passes Ctrl+C and SIGTERM on so that each finishes its requests first.
import cluster from 'node:cluster';
import { ClusterMemoryStorePrimary } from '@express-rate-limit/cluster-memory-store';

// More deaths than this per process within a minute is a fault a restart will not cure (a port
// in use, a database that refuses): stop rather than loop.
const RESTARTS_PER_MINUTE_PER_PROCESS = 3;

export function runApiPrimary(count: number): void {
  new ClusterMemoryStorePrimary().init();
  let stopping = false;
  const deaths: number[] = [];

  function stop(signal: NodeJS.Signals): void {
    if (stopping) return;
    stopping = true;
    const running = Object.values(cluster.workers ?? {});
    if (running.length === 0) process.exit(process.exitCode ?? 0);
    for (const w of running) w?.process.kill(signal);
  }

  cluster.on('exit', (worker, code, signal) => {
    if (stopping) {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(process.exitCode ?? 0);
      return;
    }
    const now = Date.now();
    deaths.push(now);
    while (deaths[0]! < now - 60_000) deaths.shift();
    const how = signal ?? `code ${code}`;
    if (deaths.length > RESTARTS_PER_MINUTE_PER_PROCESS * count) {
      console.error(`[api] API process ${worker.process.pid} exited (${how}); ${deaths.length} exits within a minute, stopping`);
      process.exitCode = 1;
      stop('SIGTERM');
      return;
    }
    console.error(`[api] API process ${worker.process.pid} exited (${how}); starting another`);
    cluster.fork();
  });

  // One after another: each starts once the one before listens, so that they do not all set up
  // the run queue in a new database at the same moment, nor load at once on a busy machine.
  let forked = 0;
  const forkNext = () => {
    if (stopping || forked >= count) return;
    forked += 1;
    cluster.fork();
  };
  cluster.on('listening', forkNext);
  forkNext();
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}
