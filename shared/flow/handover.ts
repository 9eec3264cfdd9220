// The safety net `auto` arms where the network's shape is unclear (network-shape.ts decides first,
// before solving): incremental BFS first, push-relabel if the search trees make too many
// augmentations for the network's size.
//
// Why: on the product's networks (road graphs, their time-expanded copies) augmenting paths are
// few, because one path carries a whole road's capacity (measured: 0.0004–0.0055 augmentations
// per arc on the bench's road-like cities), and incremental BFS is the fastest method we have;
// push-relabel there floods the zones' unbounded supply and is 8–50× slower. On layered graphs
// with widely spread capacities (GENRMF-like frames, random level graphs) each path is long and
// carries little (0.19–0.33 augmentations per arc), and push-relabel is 10–20× faster. The count
// of augmentations per arc tells the two apart while the solve runs, at no extra cost: at
// AUTO_HANDOVER_AUGMENTATIONS_PER_ARC × arcs the flow found so far (always a feasible flow) is
// handed to push-relabel, which starts from it. The answer is the same maximum either way.

import { createIncrementalBfs } from './incremental-bfs';
import { pushRelabel } from './push-relabel';
import type { SolveContext } from './solve-context';
import { KeptWork } from './work-arrays';

/**
 * Augmentations per arc (of the nodes below the limit) after which `auto` hands over to
 * push-relabel. Between the two measured ranges above, nearer the road-like end: handing over
 * early costs the families little, handing over at all costs the road-like graphs a lot.
 */
export const AUTO_HANDOVER_AUGMENTATIONS_PER_ARC = 0.01;

/**
 * Incremental BFS until `augmentationLimit` augmentations, then push-relabel from that flow.
 * Returns the algorithm that finished.
 */
export function incrementalBfsThenPushRelabel(ctx: SolveContext, augmentationLimit: number): 'incremental-bfs' | 'push-relabel' {
  const work = new KeptWork();
  let stopped: boolean;
  try {
    const solver = createIncrementalBfs(ctx.network, ctx.residual, ctx.source, ctx.sink, ctx.nodeLimit, undefined, null, work);
    solver.maximise(ctx.stats, ctx.shouldAbort, augmentationLimit);
    stopped = solver.stoppedAtLimit;
  } finally {
    work.release();
  }
  if (!stopped) return 'incremental-bfs';
  pushRelabel(ctx);
  return 'push-relabel';
}

/** The handover point for a network with `arcs` arcs below the node limit. */
export function autoAugmentationLimit(arcs: number): number {
  return Math.ceil(AUTO_HANDOVER_AUGMENTATIONS_PER_ARC * arcs);
}
