// The dependency audit's rule (server/cli/audit-verdict.ts) on reports in the
// shape `npm audit --json` prints (auditReportVersion 2). The report below follows a recorded
// npm audit output for maplibre-gl (advisory GHSA-jrc7-96c5-q579, critical) published in a
// public repository's notes, plus a transitive chain where `via` names another package.
import { describe, expect, it } from 'vitest';
import { acceptedAdvisoriesSchema, auditReportSchema, auditVerdict } from '../../server/cli/audit-verdict';

const report = auditReportSchema.parse({
  auditReportVersion: 2,
  vulnerabilities: {
    'maplibre-gl': {
      name: 'maplibre-gl',
      severity: 'critical',
      isDirect: true,
      via: [
        {
          source: 1193680,
          name: 'maplibre-gl',
          dependency: 'maplibre-gl',
          title: 'MapLibre GL JS: XSS Sanitizer Bypass in DOM.sanitize() via Live NamedNodeMap Removal Skip',
          url: 'https://github.com/advisories/GHSA-jrc7-96c5-q579',
          severity: 'critical',
          cwe: ['CWE-79'],
          range: '<=6.4.0',
        },
      ],
      effects: [],
      range: '<=6.4.0',
      nodes: ['node_modules/maplibre-gl'],
    },
    'wrapper-lib': { name: 'wrapper-lib', severity: 'high', isDirect: true, via: ['inner-lib'], effects: [], range: '*', nodes: [] },
    'inner-lib': {
      name: 'inner-lib',
      severity: 'high',
      isDirect: false,
      via: [{ source: 1, name: 'inner-lib', title: 'Prototype pollution', url: 'https://github.com/advisories/GHSA-2222-3333-4444', severity: 'high', range: '<2' }],
      effects: ['wrapper-lib'],
      range: '<2',
      nodes: [],
    },
    'quiet-lib': {
      name: 'quiet-lib',
      severity: 'moderate',
      via: [{ source: 2, name: 'quiet-lib', title: 'ReDoS', url: 'https://github.com/advisories/GHSA-5555-6666-7777', severity: 'moderate', range: '<1' }],
    },
  },
  metadata: { vulnerabilities: { info: 0, low: 0, moderate: 1, high: 2, critical: 1, total: 4 } },
});

const acceptance = (advisory: string, pkg: string, expires: string) => ({
  advisory,
  package: pkg,
  reason: 'The affected function is never called from the server or the client.',
  reviewedBy: 'Security reviewer',
  expires,
});

describe('auditVerdict', () => {
  it('fails on every advisory at high or above, once each, and ignores moderate ones', () => {
    const v = auditVerdict(report, [], '2026-12-02');
    expect(v.failing.map((f) => `${f.advisory} ${f.package} ${f.severity}`).sort()).toEqual([
      'GHSA-2222-3333-4444 inner-lib high',
      'GHSA-jrc7-96c5-q579 maplibre-gl critical',
    ]);
  });

  it('passes an advisory accepted after review until the acceptance expires', () => {
    const accepted = [acceptance('GHSA-jrc7-96c5-q579', 'maplibre-gl', '2027-01-31'), acceptance('GHSA-2222-3333-4444', 'inner-lib', '2026-12-01')];
    const v = auditVerdict(report, acceptedAdvisoriesSchema.parse(accepted), '2026-12-02');
    expect(v.accepted.map((f) => f.package)).toEqual(['maplibre-gl']);
    expect(v.failing.map((f) => f.package)).toEqual(['inner-lib']);
    expect(v.expired.map((a) => a.package)).toEqual(['inner-lib']);
  });

  it('accepts only the advisory and package named', () => {
    const v = auditVerdict(report, acceptedAdvisoriesSchema.parse([acceptance('GHSA-jrc7-96c5-q579', 'other-package', '2027-01-31')]), '2026-12-02');
    expect(v.failing).toHaveLength(2);
  });

  it('refuses an acceptance without a reason, reviewer, date or a real advisory id', () => {
    expect(() => acceptedAdvisoriesSchema.parse([{ ...acceptance('GHSA-jrc7-96c5-q579', 'x', '2027-01-01'), reason: 'ok' }])).toThrow(/Say why/);
    expect(() => acceptedAdvisoriesSchema.parse([acceptance('CVE-2024-1234', 'x', '2027-01-01')])).toThrow(/GitHub advisory id/);
    expect(() => acceptedAdvisoriesSchema.parse([acceptance('GHSA-jrc7-96c5-q579', 'x', 'next year')])).toThrow(/YYYY-MM-DD/);
  });

  it('passes a clean report', () => {
    expect(auditVerdict(auditReportSchema.parse({ auditReportVersion: 2, vulnerabilities: {} }), [], '2026-12-02').failing).toEqual([]);
  });
});
