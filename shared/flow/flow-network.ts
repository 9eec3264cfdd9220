// The digraph every algorithm runs on: a forward-star (CSR) layout of residual arcs in typed
// arrays. Each arc i of the input becomes a pair of residual arcs, the forward one with the arc's
// capacity and its mate (the reverse arc) with capacity 0. Pairs are never merged, even for
// antiparallel input arcs, so a residual capacity never exceeds its own arc's capacity and the
// flow on arc i can always be read back as the residual capacity of its mate.

import { isValidCapacity } from './capacity';
import { FlowInputError } from './errors';

/**
 * A flow network in forward-star form. Residual arcs of node v are the indices
 * firstOut[v] .. firstOut[v + 1] − 1. Immutable once built: algorithms keep their residual
 * capacities in a separate FlowState, so one network can serve many runs.
 *
 * Memory: 28 bytes per input arc (head, mate, capacity for both residual arcs, plus
 * residualOfArc) and 4 bytes per node; a FlowState adds 8 bytes per arc.
 */
export interface FlowNetwork {
  readonly nodeCount: number;
  /** Number of input arcs; residual arcs number twice as many. */
  readonly arcCount: number;
  /** Length nodeCount + 1. */
  readonly firstOut: Int32Array;
  /** Head node of each residual arc (length 2·arcCount). */
  readonly head: Int32Array;
  /** The paired residual arc: mate[mate[r]] = r; the tail of r is head[mate[r]]. */
  readonly mate: Int32Array;
  /** Capacity of each residual arc in the empty flow: the arc's capacity forward, 0 backward. */
  readonly capacity: Int32Array;
  /** Index of the forward residual arc of input arc i (length arcCount). */
  readonly residualOfArc: Int32Array;
}

/** One input arc. Capacities are integers in [0, UNBOUNDED_CAPACITY]. */
export interface ArcInput {
  from: number;
  to: number;
  capacity: number;
}

/**
 * Builds a network from a list of arcs; arc i of the list is arc i of the network.
 * O(n + m). Self-loops are kept (they never carry flow) so arc indices stay aligned.
 *
 * @throws FlowInputError for a node outside 0..nodeCount − 1 or an invalid capacity.
 * @example
 *   const net = buildNetwork(3, [{ from: 0, to: 1, capacity: 2 }, { from: 1, to: 2, capacity: 1 }]);
 *   maxFlow(net, 0, 2).value; // 1
 */
export function buildNetwork(nodeCount: number, arcs: readonly ArcInput[]): FlowNetwork {
  const m = arcs.length;
  const tails = new Int32Array(m);
  const heads = new Int32Array(m);
  const capacities = new Int32Array(m);
  for (let i = 0; i < m; i++) {
    const arc = arcs[i]!;
    checkArc(nodeCount, i, arc.from, arc.to, arc.capacity);
    tails[i] = arc.from;
    heads[i] = arc.to;
    capacities[i] = arc.capacity;
  }
  return buildNetworkFromArrays(nodeCount, tails, heads, capacities);
}

/**
 * Builds a network from parallel typed arrays (the fast path for generated networks with
 * millions of arcs). The arrays are read, not kept.
 *
 * @throws FlowInputError as buildNetwork.
 */
export function buildNetworkFromArrays(
  nodeCount: number,
  tails: Int32Array,
  heads: Int32Array,
  capacities: Int32Array | Float64Array,
): FlowNetwork {
  if (!Number.isInteger(nodeCount) || nodeCount < 0) {
    throw new FlowInputError(`node count must be a non-negative integer, got ${nodeCount}`);
  }
  const m = tails.length;
  if (heads.length !== m || capacities.length !== m) {
    throw new FlowInputError('tails, heads and capacities must have the same length');
  }
  if (2 * m > 0x7fffffff) throw new FlowInputError(`too many arcs: ${m}`);

  const firstOut = new Int32Array(nodeCount + 1);
  for (let i = 0; i < m; i++) {
    const t = tails[i]!;
    const h = heads[i]!;
    const c = capacities[i]!;
    if (!(t >= 0 && t < nodeCount && h >= 0 && h < nodeCount) || !isValidCapacity(c)) {
      checkArc(nodeCount, i, t, h, c);
    }
    firstOut[t + 1]!++;
    firstOut[h + 1]!++;
  }
  for (let v = 0; v < nodeCount; v++) firstOut[v + 1]! += firstOut[v]!;

  const next = firstOut.slice(0, nodeCount);
  const head = new Int32Array(2 * m);
  const mate = new Int32Array(2 * m);
  const capacity = new Int32Array(2 * m);
  const residualOfArc = new Int32Array(m);
  for (let i = 0; i < m; i++) {
    const t = tails[i]!;
    const h = heads[i]!;
    const forward = next[t]!++;
    const backward = next[h]!++;
    head[forward] = h;
    head[backward] = t;
    mate[forward] = backward;
    mate[backward] = forward;
    capacity[forward] = capacities[i]!;
    residualOfArc[i] = forward;
  }
  return { nodeCount, arcCount: m, firstOut, head, mate, capacity, residualOfArc };
}

/** Tail node of input arc i. */
export function arcTail(network: FlowNetwork, arc: number): number {
  return network.head[network.mate[network.residualOfArc[arc]!]!]!;
}

/** Head node of input arc i. */
export function arcHead(network: FlowNetwork, arc: number): number {
  return network.head[network.residualOfArc[arc]!]!;
}

/** Capacity of input arc i. */
export function arcCapacity(network: FlowNetwork, arc: number): number {
  return network.capacity[network.residualOfArc[arc]!]!;
}

function checkArc(nodeCount: number, i: number, from: number, to: number, capacity: number): void {
  for (const [name, node] of [['from', from], ['to', to]] as const) {
    if (!Number.isInteger(node) || node < 0 || node >= nodeCount) {
      throw new FlowInputError(`arc ${i}: ${name} node ${node} is outside 0..${nodeCount - 1}`);
    }
  }
  if (!isValidCapacity(capacity)) {
    throw new FlowInputError(
      `arc ${i}: capacity ${capacity} is not an integer in [0, UNBOUNDED_CAPACITY]`,
    );
  }
}
