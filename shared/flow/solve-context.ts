// What every algorithm receives. Algorithms mutate `residual` and count into `stats`, nothing else.

import type { FlowNetwork } from './flow-network';

/** Counters the algorithms fill in; which ones move depends on the algorithm. */
export interface MaxFlowStats {
  /** Augmenting paths (Edmonds–Karp, Dinic). */
  augmentations: number;
  /** Breadth-first searches that built a level graph (Dinic) or found a path (Edmonds–Karp). */
  phases: number;
  /** Push operations (push-relabel). */
  pushes: number;
  /** Relabel operations (push-relabel). */
  relabels: number;
  /** Global relabellings, i.e. exact distance labels by breadth-first search (push-relabel). */
  globalRelabels: number;
  /** Wall time of the algorithm itself (not reading off the cut), present only when the caller passed `now`. */
  elapsedMs?: number;
}

export interface SolveContext {
  readonly network: FlowNetwork;
  readonly residual: Int32Array;
  readonly source: number;
  readonly sink: number;
  /** Only nodes with index < nodeLimit take part; arcs into the others are ignored. */
  readonly nodeLimit: number;
  readonly stats: MaxFlowStats;
  /** Polled between augmentations or phases; true aborts with FlowAbortedError. */
  readonly shouldAbort: (() => boolean) | undefined;
}

export function emptyStats(): MaxFlowStats {
  return { augmentations: 0, phases: 0, pushes: 0, relabels: 0, globalRelabels: 0 };
}
