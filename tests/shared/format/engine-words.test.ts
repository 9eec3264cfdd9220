// Every key the engine can report — each maximum-flow method and each solving phase — has words
// for users, so none shows up raw in the Findings footer, the progress line or the briefing.
import { describe, expect, it } from 'vitest';
import { MAX_FLOW_ALGORITHMS } from '../../../shared/flow';
import { algorithmSchema } from '../../../shared/api/runs';
import { ALGORITHM_WORDS, PHASE_WORDS, algorithmWords, phaseWords } from '../../../shared/format/engine-words';

// The phases solveEvacuation reports (EvacuationPhase in shared/flow/solve-evacuation.ts) and
// the ones the run executor writes (server/run-execution/run-executor.ts).
const ENGINE_PHASES = ['steady-state', 'expand', 'curve', 'bottlenecks', 'fixes', 'verify', 'preparing', 'prepared', 'starting', 'saving', 'tiles', 'done', 'failed'];

describe('engine keys in words', () => {
  it('names every maximum-flow method and every choice the picker offers', () => {
    for (const key of [...MAX_FLOW_ALGORITHMS, ...algorithmSchema.options]) {
      expect(ALGORITHM_WORDS[key], key).toBeDefined();
      expect(algorithmWords(key)).not.toMatch(/^[a-z]+(-[a-z]+)+$/);
    }
    expect(algorithmWords('incremental-bfs')).not.toContain('incremental-bfs');
  });

  it('words every solving phase', () => {
    for (const phase of ENGINE_PHASES) expect(PHASE_WORDS[phase], phase).toBeDefined();
    expect(phaseWords('expand')).toBe('building the time-by-time network');
    expect(phaseWords('back in the queue: its worker stopped')).toBe('back in the queue: its worker stopped');
  });
});
