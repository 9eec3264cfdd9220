// The worker's lower CPU priority reaches every thread: those it has when it lowers it and the
// worker threads it starts afterwards (where solves run). Run in a child process, so the test
// runner keeps its own priority. Niceness per thread is read from /proc/PID/task/TID/stat
// (field 19, proc(5)).
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';

const onLinux = (() => {
  try {
    readdirSync('/proc/self/task');
    return true;
  } catch {
    return false;
  }
})();

const child = `
import { readdirSync, readFileSync } from 'node:fs';
import { Worker } from 'node:worker_threads';
import { lowerProcessPriority } from './server/run-execution/lower-priority.ts';
const nice = () => readdirSync('/proc/self/task').map((t) => {
  const stat = readFileSync('/proc/self/task/' + t + '/stat', 'utf8');
  return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[16]);
});
const before = nice();
lowerProcessPriority(Number(process.argv.at(-1)));
const worker = new Worker("Promise.all([import('node:worker_threads'), import('node:os')]).then(([w, os]) => w.parentPort.postMessage(os.getPriority()))", { eval: true });
worker.once('message', (inThread) => {
  console.log(JSON.stringify({ before, after: nice(), inThread }));
  void worker.terminate();
});
`;

function runChild(niceness: number): { before: number[]; after: number[]; inThread: number } {
  const out = execFileSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', child, String(niceness)], { encoding: 'utf8' });
  return JSON.parse(out.trim().split('\n').at(-1)!) as { before: number[]; after: number[]; inThread: number };
}

describe.runIf(onLinux)('lowerProcessPriority', () => {
  it('sets every existing thread and the worker threads started after it', () => {
    const own = Number(readFileSync('/proc/self/stat', 'utf8').split(') ')[1]!.split(' ')[16]);
    const target = Math.min(19, own + 7);
    const { before, after, inThread } = runChild(target);
    expect(before.length).toBeGreaterThan(1);
    expect(before.every((n) => n === own)).toBe(true);
    expect(after.length).toBeGreaterThanOrEqual(before.length);
    expect(after.every((n) => n === target)).toBe(true);
    expect(inThread).toBe(target);
  });
});
