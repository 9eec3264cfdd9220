// Runs `npm audit --omit=dev --json` and applies the verdict (audit-verdict.ts). Exit 1 when an
// unaccepted advisory at high severity or above is found; see docker-free-scripts/audit/README.md.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import { acceptedAdvisoriesSchema, auditReportSchema, auditVerdict } from './audit-verdict';

const say = (line: string) => process.stderr.write(`[cutline] ${line}\n`);
const accepted = acceptedAdvisoriesSchema.parse(JSON.parse(fs.readFileSync(new URL('../../docker-free-scripts/audit/accepted-advisories.json', import.meta.url), 'utf8')));
const run = spawnSync('npm', ['audit', '--omit=dev', '--json'], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
let raw: unknown;
try {
  raw = JSON.parse(run.stdout);
} catch {
  raw = undefined;
}
const report = auditReportSchema.safeParse(raw);
const unreachable = !report.success || (typeof raw === 'object' && raw !== null && 'error' in raw);
if (unreachable) {
  const detail = (run.stderr || run.stdout).split('\n').find((l) => /audit|error/i.test(l)) ?? 'no report';
  if (process.env.CUTLINE_AUDIT_REQUIRED === '1') {
    say(`dependency audit failed: the advisory service could not be used (${detail.trim()})`);
    process.exit(1);
  }
  say('WARNING: NO DEPENDENCY AUDIT WAS PERFORMED: the registry refused its advisory service');
  say(`  (${detail.trim()}); set CUTLINE_AUDIT_REQUIRED=1 to make this fail the run`);
  process.exit(0);
}
const verdict = auditVerdict(report.data, accepted, new Date().toISOString().slice(0, 10));
for (const a of verdict.expired) say(`accepted advisory ${a.advisory} (${a.package}) expired on ${a.expires}: review it again`);
for (const f of verdict.accepted) say(`accepted after review: ${f.advisory} ${f.package} (${f.severity}) ${f.title}`);
for (const f of verdict.failing) say(`${f.severity.toUpperCase()}: ${f.package}: ${f.title} ${f.url}`);
if (verdict.failing.length) {
  say(`dependency audit: ${verdict.failing.length} advisories at high severity or above; fix them or accept them after review (docker-free-scripts/audit/README.md)`);
  process.exit(1);
}
say('dependency audit: no unaccepted advisory at high severity or above');
