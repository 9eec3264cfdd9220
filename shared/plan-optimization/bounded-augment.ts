// Shortest augmenting paths (BFS) between two chosen nodes, moving at most `limit` units: the
// repair steps a warm start needs when an arc carrying flow is taken away. Pushing from u to v
// along residual arcs keeps conservation everywhere except at u (loses the amount) and v (gains
// it), so it can reroute an arc's flow, return a node's excess to the source, or draw a node's
// deficit from the sink.

import type { FlowNetwork, FlowState } from '../flow';

export function augmentBetween(
  network: FlowNetwork,
  state: FlowState,
  from: number,
  to: number,
  limit: number,
  nodeLimit = network.nodeCount,
): number {
  if (limit <= 0 || from === to) return 0;
  const { firstOut, head } = network;
  const { residual } = state;
  const parentArc = new Int32Array(network.nodeCount);
  const queue = new Int32Array(network.nodeCount);
  let moved = 0;
  while (moved < limit) {
    parentArc.fill(-1);
    parentArc[from] = -2;
    let readAt = 0;
    let writeAt = 0;
    queue[writeAt++] = from;
    let found = false;
    while (readAt < writeAt && !found) {
      const v = queue[readAt++]!;
      for (let r = firstOut[v]!, end = firstOut[v + 1]!; r < end; r++) {
        const w = head[r]!;
        if (residual[r]! <= 0 || w >= nodeLimit || parentArc[w] !== -1) continue;
        parentArc[w] = r;
        if (w === to) {
          found = true;
          break;
        }
        queue[writeAt++] = w;
      }
    }
    if (!found) break;
    let amount = limit - moved;
    for (let w = to; w !== from; ) {
      const r = parentArc[w]!;
      amount = Math.min(amount, residual[r]!);
      w = head[network.mate[r]!]!;
    }
    for (let w = to; w !== from; ) {
      const r = parentArc[w]!;
      residual[r]! -= amount;
      residual[network.mate[r]!]! += amount;
      w = head[network.mate[r]!]!;
    }
    moved += amount;
  }
  return moved;
}

/**
 * Takes input arc `arc` out of a feasible flow (both residuals become 0) and repairs the flow:
 * first reroutes its flow from tail to head, then returns what could not be rerouted to the
 * source and draws it from the sink. The result is a feasible flow of the network without the
 * arc; a maximum flow from it is then a warm start. Returns the flow removed from the s–t value.
 */
export function removeArcFromFlow(
  network: FlowNetwork,
  state: FlowState,
  arc: number,
  source: number,
  sink: number,
  nodeLimit = network.nodeCount,
): number {
  const r = network.residualOfArc[arc]!;
  const m = network.mate[r]!;
  const flow = state.residual[m]!;
  state.residual[r] = 0;
  state.residual[m] = 0;
  if (flow === 0) return 0;
  const tail = network.head[m]!;
  const headNode = network.head[r]!;
  const rerouted = augmentBetween(network, state, tail, headNode, flow, nodeLimit);
  const rest = flow - rerouted;
  if (rest === 0) return 0;
  // The tail's excess goes back towards the source (or is absorbed at the source itself), the
  // head's deficit is drawn from the sink. Both always succeed for a feasible flow.
  const back = tail === source ? rest : augmentBetween(network, state, tail, source, rest, nodeLimit);
  const forward = headNode === sink ? rest : augmentBetween(network, state, sink, headNode, rest, nodeLimit);
  if (back !== rest || forward !== rest) throw new Error('flow repair failed: the flow was not feasible');
  return rest;
}

