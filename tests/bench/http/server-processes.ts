// The API server and a run worker as real separate processes, as they are deployed: started with
// the product's own entry points, their output kept in a log file, their CPU time read from /proc
// (with that of the processes they start: API_PROCESSES), stopped with SIGTERM (SIGKILL if they
// do not exit).
import { spawn, type ChildProcess } from 'node:child_process';
import { appendFileSync, closeSync, openSync, readdirSync, readFileSync } from 'node:fs';

// USER_HZ: the unit of utime and stime in /proc/PID/stat; 100 on Linux on every common architecture.
const CLOCK_TICKS_PER_SECOND = 100;

// Fields after the parenthesised command: state is field 3, ppid 4, utime 14 and stime 15.
function statFields(pid: number): string[] | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    return stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  } catch {
    return null;
  }
}

/** User + system CPU seconds process `pid` (all its threads) and its children have used so far; null if it is gone. */
export function cpuSecondsOf(pid: number): number | null {
  const own = statFields(pid);
  if (!own) return null;
  let ticks = Number(own[11]) + Number(own[12]);
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    const fields = statFields(Number(entry));
    if (fields && Number(fields[1]) === pid) ticks += Number(fields[11]) + Number(fields[12]);
  }
  return ticks / CLOCK_TICKS_PER_SECOND;
}

export type BenchProcess = {
  name: string;
  pid: number;
  /** User + system CPU seconds the process (all its threads) and its children have used so far; null once it has exited. */
  cpuSeconds: () => number | null;
  stop: () => Promise<void>;
  exited: () => boolean;
};

export function startProcess(name: string, root: string, entry: string, env: Record<string, string>, logFile: string, nodeArgs: string[] = []): BenchProcess {
  // The process writes its log file itself: through a pipe to this process, its writes would wait
  // whenever this one is busy (Node writes to pipes synchronously), and a server's latency would
  // include the benchmark client's own work.
  const fd = openSync(logFile, 'w');
  const child: ChildProcess = spawn(process.execPath, [...nodeArgs, '--import', 'tsx', entry], {
    cwd: root,
    env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '', ...env },
    stdio: ['ignore', fd, fd],
  });
  closeSync(fd);
  let done = false;
  const exit = new Promise<void>((resolve) =>
    child.on('exit', (code, signal) => {
      done = true;
      appendFileSync(logFile, `[bench] ${name} exited (${signal ?? `code ${code}`})\n`);
      resolve();
    }),
  );
  const pid = child.pid!;
  return {
    name,
    pid,
    exited: () => done,
    cpuSeconds: () => (done ? null : cpuSecondsOf(pid)),
    stop: async () => {
      if (done) return;
      child.kill('SIGTERM');
      const killer = setTimeout(() => child.kill('SIGKILL'), 40_000);
      await exit;
      clearTimeout(killer);
    },
  };
}

/** Polls the URL until it answers 200; throws after the timeout, or at once if the process exited. */
export async function waitForReady(url: string, proc: BenchProcess, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (proc.exited()) throw new Error(`${proc.name} exited before it was ready (see its log)`);
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`${proc.name} was not ready at ${url} after ${timeoutMs} ms`);
}
