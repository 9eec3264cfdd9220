// The mutable half of a flow computation: residual capacities, kept apart from the immutable
// network so that a run can be continued (warm start), copied (what-if runs) or discarded.

import type { FlowNetwork } from './flow-network';

/**
 * Residual capacity of every residual arc. The flow on input arc i is
 * residual[mate[residualOfArc[i]]]; a fresh state (no flow) equals network.capacity.
 */
export interface FlowState {
  readonly residual: Int32Array;
}

/** A state with zero flow on every arc. 8 bytes per arc. */
export function createFlowState(network: FlowNetwork): FlowState {
  return { residual: network.capacity.slice() };
}

/** An independent copy, for what-if runs that must not disturb the original. */
export function copyFlowState(state: FlowState): FlowState {
  return { residual: state.residual.slice() };
}

/** Flow on input arc i in the given state. */
export function flowOnArc(network: FlowNetwork, state: FlowState, arc: number): number {
  return state.residual[network.mate[network.residualOfArc[arc]!]!]!;
}

/** Flow on every input arc (a new array, index = input arc). */
export function arcFlows(network: FlowNetwork, state: FlowState): Int32Array {
  const { residualOfArc, mate } = network;
  const { residual } = state;
  const flows = new Int32Array(network.arcCount);
  for (let i = 0; i < flows.length; i++) flows[i] = residual[mate[residualOfArc[i]!]!]!;
  return flows;
}

/**
 * Net flow out of node v, counting only arcs whose other end is below nodeLimit. In residual
 * terms it is Σ (capacity − residual) over v's residual arcs: a forward arc contributes its flow,
 * a reverse arc minus the flow of its mate.
 */
export function netOutflow(
  network: FlowNetwork,
  state: FlowState,
  v: number,
  nodeLimit = network.nodeCount,
): number {
  const { firstOut, head, capacity } = network;
  const { residual } = state;
  let sum = 0;
  for (let r = firstOut[v]!, end = firstOut[v + 1]!; r < end; r++) {
    if (head[r]! < nodeLimit) sum += capacity[r]! - residual[r]!;
  }
  return sum;
}
