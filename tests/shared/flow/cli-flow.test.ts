// The command `npm run --silent flow -- FILE`: one JSON object on stdout for a good file (CLRS
// 3rd ed. Fig. 26.1 → 23), FILE:LINE on stderr and exit code 2 for a malformed one.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../../../', import.meta.url));
const fixture = (name: string): string => fileURLToPath(new URL(`./fixtures/${name}`, import.meta.url));
const run = (...args: string[]) => spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/flow.ts', ...args], { cwd: root, encoding: 'utf8' });

describe('flow command', () => {
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

  it('exits with 2 on an unknown algorithm', () => {
    expect(run(fixture('clrs-26-1.max'), '--algorithm', 'guess').status).toBe(2);
  });
});
