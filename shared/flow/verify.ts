// The independent check of a result (networkx's validate_flows/validate_cuts): it trusts nothing
// the algorithm computed except the reported flows and the reported source side.
// A feasible flow whose value equals the capacity of some cut is maximum (max-flow/min-cut
// theorem), so a passing check is a proof of optimality. O(V + E), cheap enough for production.

import { arcCapacity, arcHead, arcTail, type FlowNetwork } from './flow-network';

export interface VerifyReport {
  ok: boolean;
  /** Human-readable findings, at most MAX_REPORTED_PROBLEMS of them. */
  problems: string[];
}

export interface VerifiableFlow {
  readonly source: number;
  readonly sink: number;
  /** Nodes at or above the limit must carry no flow (defaults to all nodes). */
  readonly nodeLimit?: number;
  readonly value: number;
  readonly flow: ArrayLike<number>;
  readonly minCut: { readonly sourceSide: ArrayLike<number>; readonly cutArcs?: ArrayLike<number>; readonly capacity?: number };
}

const MAX_REPORTED_PROBLEMS = 20;

/**
 * Checks capacity bounds (0 ≤ flow ≤ capacity, integral), conservation at every node other than
 * the terminals, that the value is the net outflow of the source and the net inflow of the sink,
 * and that the reported source side holds the source but not the sink and has cut capacity equal
 * to the value (every cut arc saturated, every arc back into it empty).
 */
export function verify(network: FlowNetwork, result: VerifiableFlow): VerifyReport {
  const problems: string[] = [];
  const report = (message: string): void => {
    if (problems.length < MAX_REPORTED_PROBLEMS) problems.push(message);
  };
  const n = network.nodeCount;
  const nodeLimit = result.nodeLimit ?? n;
  const { source, sink, flow, value } = result;
  const side = result.minCut.sourceSide;
  if (flow.length !== network.arcCount) report(`flow has ${flow.length} entries for ${network.arcCount} arcs`);
  if (side.length !== n) report(`source side has ${side.length} entries for ${n} nodes`);

  const balance = new Float64Array(n);
  let cutCapacity = 0;
  let cutArcCount = 0;
  for (let i = 0; i < network.arcCount; i++) {
    const f = flow[i] ?? 0;
    const c = arcCapacity(network, i);
    const t = arcTail(network, i);
    const h = arcHead(network, i);
    if (!Number.isInteger(f) || f < 0 || f > c) report(`arc ${i} (${t}→${h}): flow ${f} outside [0, ${c}]`);
    if (f !== 0 && (t >= nodeLimit || h >= nodeLimit)) report(`arc ${i} (${t}→${h}): flow ${f} beyond the node limit`);
    balance[t]! -= f;
    balance[h]! += f;
    if (h >= nodeLimit || t >= nodeLimit) continue;
    const tailIn = side[t] === 1;
    const headIn = side[h] === 1;
    if (tailIn && !headIn) {
      cutCapacity += c;
      cutArcCount++;
      if (f !== c) report(`cut arc ${i} (${t}→${h}) carries ${f} of ${c}`);
    } else if (!tailIn && headIn && f !== 0) {
      report(`arc ${i} (${t}→${h}) enters the source side with flow ${f}`);
    }
  }
  for (let v = 0; v < n; v++) {
    if (v !== source && v !== sink && balance[v] !== 0) report(`node ${v}: inflow − outflow = ${balance[v]}`);
  }
  if (-balance[source]! !== value) report(`value ${value} but the source sends ${-balance[source]!}`);
  if (balance[sink]! !== value) report(`value ${value} but the sink receives ${balance[sink]!}`);
  if (side[source] !== 1) report('the source is not on the source side of the cut');
  if (side[sink] === 1) report('the sink is on the source side of the cut');
  if (cutCapacity !== value) report(`cut capacity ${cutCapacity} differs from value ${value}`);
  const { cutArcs, capacity } = result.minCut;
  if (cutArcs && cutArcs.length !== cutArcCount) report(`${cutArcs.length} cut arcs listed, ${cutArcCount} found`);
  if (capacity !== undefined && capacity !== cutCapacity) report(`cut capacity ${capacity} listed, ${cutCapacity} found`);
  return { ok: problems.length === 0, problems };
}
