// The certificate of optimality: the nodes reachable from the source in the final residual
// digraph (the source side of a minimum cut) and the arcs leaving that set. Whatever maximum
// flow an algorithm found, this set is the same: it is the smallest source side of any
// minimum cut, so every algorithm reports the same cut.

import type { FlowNetwork } from './flow-network';

export interface MinimumCut {
  /** sourceSide[v] = 1 when v is reachable from the source in the residual digraph. */
  readonly sourceSide: Uint8Array;
  /** Input arcs from the source side to the sink side, ascending. Each one is saturated. */
  readonly cutArcs: Int32Array;
  /** Σ capacity of cutArcs; equals the flow value when the flow is maximum. */
  readonly capacity: number;
}

/** Nodes reachable from `source` by arcs with residual capacity, among nodes < nodeLimit. O(E). */
export function reachableFromSource(
  network: FlowNetwork,
  residual: Int32Array,
  source: number,
  nodeLimit = network.nodeCount,
): Uint8Array {
  const { firstOut, head } = network;
  const seen = new Uint8Array(network.nodeCount);
  const queue = new Int32Array(nodeLimit);
  let queueHead = 0;
  let queueTail = 0;
  seen[source] = 1;
  queue[queueTail++] = source;
  while (queueHead < queueTail) {
    const u = queue[queueHead++]!;
    for (let r = firstOut[u]!, end = firstOut[u + 1]!; r < end; r++) {
      const v = head[r]!;
      if (v < nodeLimit && residual[r]! > 0 && seen[v] === 0) {
        seen[v] = 1;
        queue[queueTail++] = v;
      }
    }
  }
  return seen;
}

/** Arcs leaving `sourceSide` (heads below nodeLimit) and their total capacity. */
export function cutOf(
  network: FlowNetwork,
  sourceSide: Uint8Array,
  nodeLimit = network.nodeCount,
): { cutArcs: Int32Array; capacity: number } {
  const { head, mate, capacity, residualOfArc } = network;
  const arcs: number[] = [];
  let total = 0;
  for (let i = 0; i < network.arcCount; i++) {
    const r = residualOfArc[i]!;
    const h = head[r]!;
    if (h < nodeLimit && sourceSide[h] === 0 && sourceSide[head[mate[r]!]!] === 1) {
      arcs.push(i);
      total += capacity[r]!;
    }
  }
  return { cutArcs: Int32Array.from(arcs), capacity: total };
}

/** The minimum cut read off a maximum flow's residual capacities. */
export function minimumCut(
  network: FlowNetwork,
  residual: Int32Array,
  source: number,
  nodeLimit = network.nodeCount,
): MinimumCut {
  const sourceSide = reachableFromSource(network, residual, source, nodeLimit);
  return { sourceSide, ...cutOf(network, sourceSide, nodeLimit) };
}
