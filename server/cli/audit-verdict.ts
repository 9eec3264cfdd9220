// Decides what `npm audit --omit=dev --json` found: every advisory at or above the threshold
// fails the run unless it was reviewed and accepted (docker-free-scripts/audit/accepted-advisories.json) and the
// acceptance has not expired. Pure, so the rule is tested on recorded reports.
import { z } from 'zod';

const severities = ['info', 'low', 'moderate', 'high', 'critical'] as const;
type Severity = (typeof severities)[number];

const advisorySchema = z.object({ source: z.number().optional(), name: z.string(), title: z.string().default(''), url: z.string(), severity: z.enum(severities).optional() });
export const auditReportSchema = z.object({
  vulnerabilities: z.record(z.string(), z.object({ name: z.string(), severity: z.enum(severities), via: z.array(z.union([z.string(), advisorySchema])) })).default({}),
});
export type AuditReport = z.infer<typeof auditReportSchema>;

export const acceptedAdvisoriesSchema = z.array(
  z.object({
    // The GitHub advisory id, e.g. GHSA-xxxx-xxxx-xxxx, as in the advisory's URL.
    advisory: z.string().regex(/^GHSA(-[23456789cfghjmpqrvwx]{4}){3}$/, 'A GitHub advisory id (GHSA-xxxx-xxxx-xxxx).'),
    package: z.string().min(1),
    reason: z.string().min(20, 'Say why the advisory does not apply or is tolerable, in a sentence.'),
    reviewedBy: z.string().min(2),
    // An acceptance is looked at again: after this date it no longer counts.
    expires: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'A date, YYYY-MM-DD.'),
  }),
);
export type AcceptedAdvisory = z.infer<typeof acceptedAdvisoriesSchema>[number];

export type Finding = { advisory: string; package: string; severity: Severity; title: string; url: string };
export type Verdict = { failing: Finding[]; accepted: Finding[]; expired: AcceptedAdvisory[] };

const advisoryId = (url: string) => /GHSA(-[a-z0-9]{4}){3}/i.exec(url)?.[0] ?? url;

export function auditVerdict(report: AuditReport, accepted: AcceptedAdvisory[], today: string, threshold: Severity = 'high'): Verdict {
  const atLeast = (s: Severity) => severities.indexOf(s) >= severities.indexOf(threshold);
  const findings = new Map<string, Finding>();
  // Only direct advisories count; a string in `via` names another package whose advisories are listed there.
  for (const vulnerability of Object.values(report.vulnerabilities)) {
    for (const via of vulnerability.via) {
      if (typeof via === 'string') continue;
      const severity = via.severity ?? vulnerability.severity;
      if (!atLeast(severity)) continue;
      const finding = { advisory: advisoryId(via.url), package: via.name, severity, title: via.title, url: via.url };
      findings.set(`${finding.advisory}|${finding.package}`, finding);
    }
  }
  const live = accepted.filter((a) => a.expires >= today);
  const expired = accepted.filter((a) => a.expires < today);
  const isAccepted = (f: Finding) => live.some((a) => a.advisory.toLowerCase() === f.advisory.toLowerCase() && a.package === f.package);
  const all = [...findings.values()];
  return { failing: all.filter((f) => !isAccepted(f)), accepted: all.filter(isAccepted), expired };
}
