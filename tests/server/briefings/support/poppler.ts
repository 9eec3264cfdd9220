// Debian's poppler-utils (pdftotext, pdfsig, pdftoppm, pdfinfo) as the outside check of our
// PDFs: a reader that is not ours says what the file shows and whether its signature holds.
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

function withFile<T>(pdf: Buffer, fn: (file: string) => T): T {
  const dir = mkdtempSync(path.join(tmpdir(), 'cutline-pdf-'));
  try {
    const file = path.join(dir, 'briefing.pdf');
    writeFileSync(file, pdf);
    return fn(file);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function run(cmd: string, args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(cmd, args, { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  if (r.error) throw new Error(`${cmd} is not available (apt-get install -y poppler-utils): ${r.error.message}`);
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The text of every page; -layout keeps table rows on one line. */
export function pdfToText(pdf: Buffer, layout = true): string {
  return withFile(pdf, (f) => run('pdftotext', [...(layout ? ['-layout'] : []), '-enc', 'UTF-8', f, '-']).stdout);
}

export function pdfSig(pdf: Buffer): string {
  return withFile(pdf, (f) => {
    const r = run('pdfsig', [f]);
    return r.stdout + r.stderr;
  });
}

export function pdfInfo(pdf: Buffer): string {
  return withFile(pdf, (f) => run('pdfinfo', ['-custom', f]).stdout + run('pdfinfo', [f]).stdout);
}

/** Renders every page to PNG under outDir (prefix-1.png, prefix-2.png…) and returns the paths. */
export function pdfToPng(pdf: Buffer, outDir: string, prefix: string, dpi = 110): string[] {
  mkdirSync(outDir, { recursive: true });
  for (const f of readdirSync(outDir)) if (f.startsWith(`${prefix}-`) && f.endsWith('.png')) rmSync(path.join(outDir, f));
  withFile(pdf, (f) => {
    const r = run('pdftoppm', ['-r', String(dpi), '-png', f, path.join(outDir, prefix)]);
    if (r.status !== 0) throw new Error(`pdftoppm failed: ${r.stderr}`);
  });
  return readdirSync(outDir)
    .filter((f) => f.startsWith(`${prefix}-`) && f.endsWith('.png'))
    .sort()
    .map((f) => path.join(outDir, f));
}

/** Collapses runs of spaces so a test can look for a phrase that -layout spread out. */
export function squeeze(text: string): string {
  return text.replace(/[ \t]+/g, ' ');
}
