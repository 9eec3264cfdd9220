// The engine's internal keys (maximum-flow methods, solving phases) in the words users read, on
// screen and in the briefing. A key without words falls back to itself, and the test in
// tests/shared/format/engine-words.test.ts fails until every engine key has words here.

export const ALGORITHM_WORDS: Readonly<Record<string, string>> = {
  auto: 'chosen by network size and shape',
  'edmonds-karp': 'Edmonds–Karp (shortest augmenting paths)',
  dinic: 'Dinic (blocking flows)',
  'push-relabel': 'Goldberg–Tarjan push-relabel',
  'boykov-kolmogorov': 'Boykov–Kolmogorov (search trees kept between augmentations)',
  'incremental-bfs': 'augmenting paths carried over from step to step (incremental breadth-first search)',
};

export function algorithmWords(key: string): string {
  return ALGORITHM_WORDS[key] ?? key;
}

export const PHASE_WORDS: Readonly<Record<string, string>> = {
  preparing: 'preparing the network',
  prepared: 'network prepared',
  starting: 'starting',
  'steady-state': 'steady-state flow',
  expand: 'building the time-by-time network',
  curve: 'arrivals over time',
  bottlenecks: 'finding the choke points',
  fixes: 'testing one more lane per choke point',
  verify: 'checking the result',
  saving: 'saving the figures',
  tiles: 'drawing the whole-plan map',
  done: 'done',
  failed: 'failed',
};

/** A run's phase in words; phases the server already writes as sentences pass through. */
export function phaseWords(phase: string): string {
  return PHASE_WORDS[phase] ?? phase;
}
