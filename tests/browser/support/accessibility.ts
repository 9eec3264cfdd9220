// axe-core (Deque's open-source accessibility engine, through @axe-core/playwright) on the page
// as it stands: every rule axe runs by default (WCAG 2.0/2.1 A and AA and best practices), and
// no violation of serious or critical impact allowed. Findings are listed with their rule and
// the elements they concern, so a failure says what to fix.
import { AxeBuilder } from '@axe-core/playwright';
import type { Page } from 'playwright-core';

export async function seriousAccessibilityViolations(page: Page): Promise<string[]> {
  const results = await new AxeBuilder({ page }).analyze();
  return results.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id} (${v.impact}): ${v.help} — ${v.nodes.slice(0, 4).map((n) => `${n.target.join(' ')}${v.id === 'color-contrast' ? ` [${(n.failureSummary ?? '').replace(/\s+/g, ' ').slice(0, 160)}]` : ''}`).join(' | ')}`);
}
