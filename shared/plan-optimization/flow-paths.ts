// Decomposes a time-expanded flow into source–sink paths (the flow decomposition theorem; the
// expanded network is acyclic, so no cycles remain) and reports each path as the arcs it uses,
// by kind. The engine's own decomposeTrips summarises zones and shelters only; the optimisations
// need the roads and the steps along each path.

import { ExpandedArcKind, type FlowState, type TimeExpandedNetwork } from '../flow';

export interface ExpandedPath {
  /** Input arcs of the expanded network, source to sink. */
  arcs: number[];
  vehicles: number;
  zone: number;
  shelter: number;
  /** Step of the zone-entry arc (the vehicles enter the roads). */
  entryStep: number;
  /** Holdover steps at the entry node right after entering, before the first road. */
  waitsAtEntry: number;
  /** Step at which the vehicles reach the shelter. */
  arrivalStep: number;
  /** Road indices in order. */
  roads: number[];
}

export function stepOfNode(expanded: TimeExpandedNetwork, node: number): number {
  return Math.floor((node - expanded.layerBase) / expanded.layerSize);
}

/** Calls visit once per path; the state is not changed. O(E + Σ path lengths). */
export function forEachFlowPath(expanded: TimeExpandedNetwork, state: FlowState, visit: (path: ExpandedPath) => void): void {
  const { network, source, sink, arcKind, arcRef } = expanded;
  const { firstOut, head, capacity, mate, residualOfArc } = network;
  const arcOfResidual = new Int32Array(capacity.length).fill(-1);
  for (let a = 0; a < network.arcCount; a++) arcOfResidual[residualOfArc[a]!] = a;
  const remaining = state.residual.slice();
  const nextArc = firstOut.slice(0, network.nodeCount);
  const trail: number[] = [];
  for (;;) {
    trail.length = 0;
    let v = source;
    while (v !== sink) {
      let r = nextArc[v]!;
      const end = firstOut[v + 1]!;
      while (r < end && (arcOfResidual[r] === -1 || capacity[r]! - remaining[r]! <= 0)) r++;
      nextArc[v] = r;
      if (r === end) break;
      trail.push(r);
      v = head[r]!;
    }
    if (v !== sink) return;
    let amount = Infinity;
    for (const r of trail) amount = Math.min(amount, capacity[r]! - remaining[r]!);
    for (const r of trail) remaining[r]! += amount;
    const arcs = trail.map((r) => arcOfResidual[r]!);
    let zone = -1;
    let shelter = -1;
    let entryStep = -1;
    let waits = 0;
    let counting = false;
    let arrivalStep = -1;
    const roads: number[] = [];
    arcs.forEach((a, i) => {
      const kind = arcKind[a];
      const r = trail[i]!;
      if (kind === ExpandedArcKind.Release) zone = arcRef[a]!;
      else if (kind === ExpandedArcKind.ZoneEntry) {
        entryStep = stepOfNode(expanded, head[r]!);
        counting = true;
      } else if (kind === ExpandedArcKind.Holdover) {
        if (counting) waits++;
      } else if (kind === ExpandedArcKind.Road) {
        counting = false;
        roads.push(arcRef[a]!);
      } else if (kind === ExpandedArcKind.ShelterArrival) {
        counting = false;
        shelter = arcRef[a]!;
        arrivalStep = stepOfNode(expanded, head[mate[r]!]!);
      }
    });
    visit({ arcs, vehicles: amount, zone, shelter, entryStep, waitsAtEntry: waits, arrivalStep, roads });
  }
}
