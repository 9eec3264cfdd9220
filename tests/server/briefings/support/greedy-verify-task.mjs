// A stand-in for the verifier's task that takes memory until it is stopped, to show the heap budget.
export default function greedy() {
  const kept = [];
  for (;;) kept.push(new Array(100_000).fill(kept.length));
}
