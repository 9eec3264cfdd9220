// The self-contained input of one proposal: the run input it optimises (engine problem and the
// labels back to segments, zones and shelters), the request, and the candidate segments the
// request's limits (classes, drawn area, chosen set) came to when it was started.
import type { ParsedProposalRequest } from '../../shared/api/proposals';
import type { RunBudget } from '../../shared/model/run-budget';
import type { RunInput } from '../../shared/model/run-input';

export type ProposalInput = {
  run: RunInput;
  request: ParsedProposalRequest;
  /** Segment ids that may change (or be tested); null = no limit. */
  candidateSegmentIds: number[] | null;
  /** The hash a run of the same problem carries (runs.input_hash): the briefing of that run prints this search. */
  runInputHash?: string;
  /** The run budget when it was started: a search over time runs on the layout that fits it (shared/model/search-budget.ts). */
  budget?: RunBudget;
};
