// The command `npm run --silent flow -- FILE`: one JSON object on stdout for a good file (CLRS
// 3rd ed. Fig. 26.1 → 23), FILE:LINE on stderr and exit code 2 for a malformed one.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../../../', import.meta.url));
const fixture = (name: string): string => fileURLToPath(new URL(`./fixtures/${name}`, import.meta.url));
// A time limit, so that a solver that never finishes fails the test instead of stalling the run.
const run = (...args: string[]) =>
  spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/flow.ts', ...args], { cwd: root, encoding: 'utf8', timeout: 60_000 });

/** Writes a DIMACS file in a fresh temporary folder and passes its path to `use`. */
function withDimacs(text: string, use: (file: string) => void): void {
  const folder = mkdtempSync(join(tmpdir(), 'cutline-flow-'));
  try {
    const file = join(folder, 'instance.max');
    writeFileSync(file, text);
    use(file);
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}

// 9 nodes (source 1, sink 9 in DIMACS numbering): bundles of up to 35 parallel arcs 2→9 and 8→3
// with antiparallel ones, shuffled (a case fast-check found). Incremental BFS once listed a
// node's children once per parallel arc into a list sized by node count, dropped the rest, and
// never finished. Maximum flow 2, also by Edmonds–Karp (the reference) in the same test.
const PARALLEL_BUNDLES: readonly (readonly [number, number, number])[] = [
  [1, 8, 1], [4, 0, 1], [7, 2, 2], [8, 1, 1], [2, 7, 0], [7, 2, 2], [7, 2, 2], [8, 1, 2], [1, 8, 0], [1, 8, 2], [1, 8, 2], [1, 8, 1], [7, 2, 2], [7, 2, 2], [2, 7, 1], [2, 7, 1], [1, 8, 0], [1, 8, 0], [1, 8, 1], [8, 1, 2], [1, 8, 1], [7, 2, 1], [1, 8, 1], [1, 8, 1], [1, 8, 1], [7, 2, 2], [1, 8, 2], [1, 8, 2], [7, 2, 1], [8, 1, 1], [8, 1, 1], [3, 7, 2], [7, 2, 2], [7, 2, 2], [1, 8, 2], [1, 8, 1], [7, 2, 1], [7, 2, 2], [8, 3, 3], [7, 7, 2], [7, 2, 2], [8, 1, 1], [7, 2, 1], [8, 1, 1], [5, 3, 3], [1, 8, 1], [7, 2, 1], [1, 8, 2], [7, 2, 2], [7, 2, 2], [7, 2, 1], [2, 7, 0], [1, 8, 1], [0, 7, 2], [1, 8, 1], [7, 2, 1], [7, 2, 1], [7, 2, 2], [1, 8, 2], [7, 2, 2], [7, 2, 2], [1, 8, 1], [7, 2, 2], [7, 2, 1], [2, 7, 0], [1, 8, 0], [7, 2, 2], [7, 2, 2], [8, 1, 1], [7, 2, 1], [7, 2, 2], [4, 6, 2], [1, 8, 0], [8, 1, 2], [1, 8, 1], [1, 8, 0], [7, 1, 3], [1, 8, 1], [7, 2, 1], [7, 2, 1], [7, 2, 1],
];

// Each case starts a Node process; on a busy machine that alone can take seconds.
describe('flow command', { timeout: 120_000 }, () => {
  it('prints value, algorithm, size and solve time as one JSON object', () => {
    const { status, stdout } = run(fixture('clrs-26-1.max'), '--algorithm', 'dinic', '--verify');
    expect(status).toBe(0);
    const output = JSON.parse(stdout) as Record<string, unknown>;
    expect(output).toMatchObject({ value: 23, algorithm: 'dinic', nodes: 6, arcs: 9, verified: true, cutArcCount: 3 });
    expect(typeof output.solveMs).toBe('number');
    expect(stdout.trim().split('\n')).toHaveLength(1);
  });

  it('names the line of a malformed file and exits with 2', () => {
    const { status, stderr, stdout } = run(fixture('malformed-capacity.max'));
    expect(status).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toMatch(/malformed-capacity\.max:5: capacity must be a non-negative integer, got ten/);
  });

  it('finishes on many parallel arcs, also under auto above 5,000 arcs, and says what auto saw', () => {
    const lines = ['p max 9 ' + (PARALLEL_BUNDLES.length + 5000), 'n 1 s', 'n 9 t'];
    for (const [from, to, capacity] of PARALLEL_BUNDLES) lines.push(`a ${from + 1} ${to + 1} ${capacity}`);
    // Padding that carries nothing (arcs into the source), only to pass auto's size threshold.
    for (let i = 0; i < 5000; i++) lines.push('a 5 1 1');
    withDimacs(lines.join('\n') + '\n', (file) => {
      for (const algorithm of ['auto', 'incremental-bfs', 'edmonds-karp']) {
        const { status, stdout } = run(file, '--algorithm', algorithm, '--verify');
        expect(status).toBe(0);
        const output = JSON.parse(stdout) as Record<string, unknown>;
        expect(output).toMatchObject({ value: 2, verified: true });
        if (algorithm === 'auto') {
          // Which algorithm ran and why: the shape it saw decides (here the bundles' reverse twins).
          const choice = output.autoChoice as { shape: string; start: string; reason: string };
          expect(choice.start).toBe(output.algorithm);
          expect(choice.shape).toBe('two-way');
          expect(choice.reason).toMatch(/reverse twin.*Boykov–Kolmogorov/);
        } else expect(output.autoChoice).toBeUndefined();
      }
    });
  }, 180_000);

  it('finishes when one node has more parallel arcs to a child than the graph has nodes', () => {
    // The review's own case: 7 nodes, s → v of capacity 1, then 20 parallel v → A listed before
    // v → B, both paths on to t. Maximum flow 1 (one unit leaves s), also by Edmonds–Karp.
    const lines = ['p max 7 26', 'n 1 s', 'n 7 t', 'a 1 2 1'];
    for (let i = 0; i < 20; i++) lines.push('a 2 3 1');
    lines.push('a 2 4 1', 'a 3 5 1', 'a 4 6 1', 'a 5 7 1', 'a 6 7 1');
    withDimacs(lines.join('\n') + '\n', (file) => {
      for (const algorithm of ['incremental-bfs', 'boykov-kolmogorov', 'edmonds-karp']) {
        const { status, stdout } = run(file, '--algorithm', algorithm, '--verify');
        expect(status).toBe(0);
        expect(JSON.parse(stdout)).toMatchObject({ value: 1, verified: true, algorithm });
      }
    });
  }, 180_000);

  it('refuses a capacity above 2^31 - 1 with its line, and says so in its help', () => {
    withDimacs('p max 2 1\nn 1 s\nn 2 t\na 1 2 2147483648\n', (file) => {
      const { status, stderr } = run(file);
      expect(status).toBe(2);
      expect(stderr).toMatch(/instance\.max:4: capacity 2147483648 exceeds 2147483647/);
    });
    const help = run('--help');
    expect(help.status).toBe(0);
    expect(help.stderr).toMatch(/Capacities are integers from 0 to 2147483647/);
    expect(help.stderr).toMatch(/auto: Edmonds-Karp up to 5000 arcs; above, it looks at the network's shape first: push-relabel/);
    expect(help.stderr).toMatch(/incremental BFS, handed over to push-relabel after 0.01 augmentations per arc/);
  }, 120_000);

  it('exits with 2 on an unknown algorithm', () => {
    expect(run(fixture('clrs-26-1.max'), '--algorithm', 'guess').status).toBe(2);
  });
});
