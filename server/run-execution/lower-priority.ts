// Lowers this process's CPU priority. On Linux niceness belongs to each thread: every thread the
// process has now is set, and threads started later (a solve's worker thread) inherit it from
// the main thread that starts them. A thread already lower than asked stays as it is.
import { readdirSync } from 'node:fs';
import os from 'node:os';

export function lowerProcessPriority(niceness: number): void {
  let threadIds: number[] = [];
  try {
    threadIds = readdirSync('/proc/self/task').map(Number);
  } catch {
    // No /proc: the whole process, where the system sets it per process.
  }
  for (const tid of threadIds) os.setPriority(tid, Math.max(niceness, os.getPriority(tid)));
  os.setPriority(Math.max(niceness, os.getPriority()));
}
