import type { ProposalAnswer, SearchLimit } from '../api/proposals';
export interface SearchLimitContext {
    /** The run's horizon in minutes. */
    horizonMinutes: number;
    /** Closures: the most roads asked for. */
    maxRoads?: number;
}
export declare function searchLimits(answer: ProposalAnswer, context: SearchLimitContext): SearchLimit[];
/** The reason stored when a search is stopped at the runs' time or memory budget. */
export declare function searchBudgetReason(kind: 'time' | 'memory', budget: {
    timeSeconds: number;
    memoryMegabytes: number;
}): string;
