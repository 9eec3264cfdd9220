// A pool task for the budgeted pool's tests: answers with its thread and what it was asked;
// { spin: ms } keeps the thread busy that long, { grow: true } takes memory until stopped,
// { fail: text } throws.
import { threadId } from 'node:worker_threads';

export default async function echo(task) {
  if (task.fail) throw new Error(task.fail);
  if (task.grow) {
    const kept = [];
    for (;;) kept.push(new Array(100_000).fill(kept.length));
  }
  if (task.spin) {
    const end = Date.now() + task.spin;
    while (Date.now() < end);
  }
  if (task.bytes) return new Uint8Array(task.bytes);
  return { threadId, asked: task.value };
}
