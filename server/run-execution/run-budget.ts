// The server's per-run budget from its settings: time-expanded arcs and the bytes they take
// (shared/model/run-budget.ts estimates both and words a refusal with a coarser step that fits).
import type { Config } from '../config';
import type { RunBudget } from '../../shared/model/run-budget';

export function runBudget(config: Pick<Config, 'RUN_MAX_EXPANDED_ARCS' | 'RUN_MAX_EXPANDED_MEGABYTES'>): RunBudget {
  return { maxExpandedArcs: config.RUN_MAX_EXPANDED_ARCS, maxBytes: config.RUN_MAX_EXPANDED_MEGABYTES * 2 ** 20 };
}
