// The model counts vehicles that have arrived at a shelter or an exit within the horizon; it
// knows nothing about anyone's safety. No text that users read — screens, the briefing, e-mails,
// exports — may say "safe" or "safety" about evacuees. Identifiers such as safeParse do not
// match the whole-word pattern.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../../', import.meta.url));
const USER_FACING = ['src', 'server/services/briefings', 'shared/format', 'shared/model/run-export-csv.ts', 'shared/model/arrival-limits.ts', 'shared/api/caution.ts'];

function filesUnder(path: string): string[] {
  const full = join(root, path);
  if (statSync(full).isFile()) return [path];
  return readdirSync(full).flatMap((name) => filesUnder(join(path, name)));
}

export const OVERCLAIM = /\b(safe|safely|safety)\b/i;

describe('wording that does not overclaim', () => {
  it('no user-facing text says evacuees are safe', () => {
    const files = USER_FACING.flatMap(filesUnder).filter((f) => /\.(ts|vue)$/.test(f));
    expect(files.length).toBeGreaterThan(50);
    const hits = files.flatMap((f) =>
      readFileSync(join(root, f), 'utf8')
        .split('\n')
        .map((line, i) => [line, i] as const)
        .filter(([line]) => OVERCLAIM.test(line))
        .map(([line, i]) => `${f}:${i + 1}: ${line.trim()}`),
    );
    expect(hits).toEqual([]);
  });

  it('catches the old words', () => {
    for (const old of ['Safe within 6 h', 'Vehicles safe', 'Persons safe', 'Share safe after', 'until the last vehicle reaches safety']) expect(old).toMatch(OVERCLAIM);
    expect('safeParse(x)').not.toMatch(OVERCLAIM);
  });
});
