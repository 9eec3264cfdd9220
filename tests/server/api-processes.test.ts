// Several API processes on one port (API_PROCESSES=2, node:cluster), as the real entry point
// starts them: connections go to both; the sign-in rate limit counts across them (per-process
// counts would let twice the attempts through); a process that dies is replaced; SIGTERM to the
// first process stops them all, cleanly.
import { spawn, type ChildProcess } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import http from 'node:http';
import net from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from './support/test-app';
import { demoAccounts } from '../../server/seed/demo-accounts';

const root = path.resolve(import.meta.dirname, '../..');
const ATTEMPTS = 4;

let ctx: TestContext;
let primary: ChildProcess;
let exited: Promise<number | null>;
let port: number;
const logLines: Array<{ pid?: number; req?: { url?: string } }> = [];
let output = '';
// What the last wait saw, for the message when it times out.
let lastSeen = '';

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer().listen(0, '127.0.0.1', () => {
      const p = (server.address() as net.AddressInfo).port;
      server.close(() => resolve(p));
    });
    server.on('error', reject);
  });
}

/**
 * The API processes `pid` started, from /proc: its children running the entry point. (tsx may
 * also have an esbuild child there, when the primary's files are not in its cache yet.)
 */
function childrenOf(pid: number): number[] {
  const out: number[] = [];
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, 'utf8');
      if (Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]) !== pid) continue;
      if (readFileSync(`/proc/${entry}/cmdline`, 'utf8').split('\0').some((arg) => arg.endsWith('server/index.ts'))) out.push(Number(entry));
    } catch {
      // gone meanwhile
    }
  }
  return out;
}

/** One request on a connection of its own, so node:cluster hands each to the next process. */
function send(method: string, url: string, headers: Record<string, string> = {}, body?: string): Promise<{ status: number; headers: http.IncomingHttpHeaders; body: string }> {
  return new Promise((resolve, reject) => {
    const req = http.request({ host: '127.0.0.1', port, method, path: url, agent: false, headers: { ...headers, ...(body ? { 'content-type': 'application/json' } : {}) } }, (res) => {
      let text = '';
      res.on('data', (c: Buffer) => (text += c.toString()));
      res.on('end', () => resolve({ status: res.statusCode!, headers: res.headers, body: text }));
    });
    req.on('error', reject);
    req.end(body);
  });
}

async function until<T>(what: string, timeoutMs: number, probe: () => Promise<T | undefined> | T | undefined): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await Promise.resolve(probe()).catch(() => undefined);
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what} (last seen: ${lastSeen}); output:\n${output.slice(-3000)}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

beforeAll(async () => {
  ctx = await createTestContext();
  port = await freePort();
  primary = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: root,
    env: {
      PATH: process.env.PATH ?? '',
      NODE_ENV: 'development',
      LOG_LEVEL: 'info',
      DATABASE_URL: ctx.url,
      HOST: '127.0.0.1',
      PORT: String(port),
      API_PROCESSES: '2',
      DEV_OUTBOX: 'off',
      SIGN_IN_ATTEMPTS_PER_WINDOW: String(ATTEMPTS),
      SHUTDOWN_GRACE_SECONDS: '2',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  exited = new Promise((resolve) => primary.on('exit', (code) => resolve(code)));
  const take = (chunk: Buffer) => {
    output += chunk.toString();
    for (const line of chunk.toString().split('\n')) {
      if (line.startsWith('{')) logLines.push(JSON.parse(line) as (typeof logLines)[number]);
    }
  };
  primary.stdout!.on('data', take);
  primary.stderr!.on('data', take);
  // Ready when both processes have answered (their pids show in the request log).
  await until('two API processes, both answering', 120_000, async () => {
    const children = childrenOf(primary.pid!);
    lastSeen = `children ${JSON.stringify(children)}, pids that answered ${JSON.stringify([...new Set(logLines.map((l) => l.pid))])}`;
    if (children.length !== 2) return undefined;
    await Promise.all([send('GET', '/readyz'), send('GET', '/readyz'), send('GET', '/readyz')]);
    return children.every((pid) => logLines.some((l) => l.pid === pid && l.req?.url === '/readyz')) ? true : undefined;
  });
}, 150_000);

afterAll(async () => {
  if (primary && primary.exitCode === null) primary.kill('SIGKILL');
  for (const pid of primary?.pid ? childrenOf(primary.pid) : []) process.kill(pid, 'SIGKILL');
  await ctx?.drop();
});

describe('API_PROCESSES=2', () => {
  it('counts sign-in attempts across both processes', async () => {
    const first = await send('GET', '/api/auth/session');
    expect(first.status).toBe(200);
    const cookie = first.headers['set-cookie']![0]!.split(';')[0]!;
    const csrf = (JSON.parse(first.body) as { csrfToken: string }).csrfToken;
    // Each round is a new address-and-account key. node:cluster does not promise to spread
    // connections over the processes, so a round that one process took whole proves nothing:
    // try another. One attempt after another: a burst answered at once can be refused early
    // (SECURITY.md, known limits), never let through.
    for (let round = 1; ; round++) {
      const email = `nobody-${round}@cutline.example`;
      const logged = logLines.length;
      const statuses: number[] = [];
      for (let i = 0; i < 2 * ATTEMPTS; i++) {
        // A connection of its own each time. (The session made by one process carries the CSRF check in the other.)
        statuses.push((await send('POST', '/api/auth/sign-in', { cookie, 'x-csrf-token': csrf }, JSON.stringify({ email, password: 'not the password at all' }))).status);
      }
      const pids = await until('every attempt logged', 10_000, () => {
        const seen = logLines.slice(logged).filter((l) => l.req?.url === '/api/auth/sign-in');
        return seen.length === 2 * ATTEMPTS ? new Set(seen.map((l) => l.pid)) : undefined;
      });
      if (pids.size < 2 && round < 10) continue;
      expect(pids.size).toBe(2);
      // Counted apart, each process would let up to ATTEMPTS through, more than ATTEMPTS in all
      // once both took some; counted together, the first ATTEMPTS and no more.
      expect(statuses).toEqual([...Array<number>(ATTEMPTS).fill(401), ...Array<number>(ATTEMPTS).fill(429)]);
      return;
    }
  });

  it('starts a new process in place of one that dies', async () => {
    const [victim] = childrenOf(primary.pid!);
    process.kill(victim!, 'SIGKILL');
    // Replaced once the new process answers: its pid shows in the request log.
    await until('a replacement that answers', 60_000, async () => {
      const now = childrenOf(primary.pid!);
      if (now.length !== 2 || now.includes(victim!)) return undefined;
      await Promise.all([send('GET', '/readyz'), send('GET', '/readyz'), send('GET', '/readyz')]);
      return now.every((pid) => logLines.some((l) => l.pid === pid)) ? true : undefined;
    });
    expect(output).toContain(`API process ${victim} exited (SIGKILL); starting another`);
  }, 70_000);

  it('stops every process on SIGTERM and exits cleanly', async () => {
    const children = childrenOf(primary.pid!);
    primary.kill('SIGTERM');
    expect(await exited).toBe(0);
    expect(children.filter((pid) => readdirSync('/proc').includes(String(pid)))).toEqual([]);
    expect(output.match(/SIGTERM: API process \d+ finishing requests/g)).toHaveLength(2);
  }, 30_000);
});
