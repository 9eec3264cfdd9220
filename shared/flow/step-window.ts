// The steps at which a node's copy can take part in an evacuation at all: a copy (v, θ) that no
// zone's departures can reach by step θ, or from which no shelter can be reached by the horizon T,
// lies on no path from the source to the sink of the time-expanded network. The expanded network
// is acyclic, so every unit of any flow lies on such a path: arcs touching those copies carry
// nothing in any flow, at any horizon t ≤ T, and leaving them out changes no maximum flow. Nor
// does it change a minimum cut read from the residual: a copy no zone reaches is never on the
// source side (nothing flows through it to lead there backwards), and an arc into a copy that
// reaches no shelter carries nothing, so it is never saturated and never a cut arc.
//
// The window is computed on the roads alone (Dijkstra over whole steps τ_e, with Dial's buckets),
// ignoring closures, storage and the shelters' limits, which only remove paths: the window is a
// superset of the copies that matter, so the pruning is safe. It is what makes the network of a
// large area with long routes noticeably smaller (the corners near no zone early on, the roads far
// from every shelter near the horizon).

/** earliest[v]: first step a copy of v can be reached (T + 1 if never); latest[v]: last step from which a shelter is reachable by T (−1 if none). */
export interface StepWindow {
  readonly earliest: Int32Array;
  readonly latest: Int32Array;
}

export interface StepWindowInput {
  nodeCount: number;
  horizonSteps: number;
  /** Road ends and whole-step travel times (index = road); roads with stepCapacity 0 carry nothing. */
  roadFrom: ArrayLike<number>;
  roadTo: ArrayLike<number>;
  travelSteps: Int32Array;
  stepCapacity: Int32Array;
  /** Per zone: its entry nodes and the first step with departures (or −1 for none). */
  zoneEntries: readonly (readonly number[])[];
  zoneFirstRelease: readonly number[];
  shelterNodes: readonly number[];
}

export function stepWindow(input: StepWindowInput): StepWindow {
  const { nodeCount: N, horizonSteps: T } = input;
  const earliest = stepDistances(input, true);
  const toShelter = stepDistances(input, false);
  const latest = new Int32Array(N);
  for (let v = 0; v < N; v++) latest[v] = toShelter[v]! > T ? -1 : T - toShelter[v]!;
  return { earliest, latest };
}

/**
 * Whole-step distances capped at T + 1: forward from the zones' entry nodes (each starting at its
 * zone's first departure step), or backward to the shelters.
 */
function stepDistances(input: StepWindowInput, forward: boolean): Int32Array {
  const { nodeCount: N, horizonSteps: T, roadFrom, roadTo, travelSteps, stepCapacity } = input;
  const R = travelSteps.length;
  const first = new Int32Array(N + 1);
  for (let e = 0; e < R; e++) if (stepCapacity[e]! > 0) first[(forward ? roadFrom[e]! : roadTo[e]!) + 1]!++;
  for (let v = 0; v < N; v++) first[v + 1]! += first[v]!;
  const fill = first.slice(0, N);
  const adjacent = new Int32Array(first[N]!);
  for (let e = 0; e < R; e++) if (stepCapacity[e]! > 0) adjacent[fill[forward ? roadFrom[e]! : roadTo[e]!]!++] = e;

  const never = T + 1;
  const dist = new Int32Array(N).fill(never);
  const buckets: number[][] = Array.from({ length: T + 1 }, () => []);
  const seed = (v: number, d: number): void => {
    if (d < dist[v]!) {
      dist[v] = d;
      buckets[d]!.push(v);
    }
  };
  if (forward) {
    input.zoneEntries.forEach((entries, z) => {
      const start = input.zoneFirstRelease[z]!;
      if (start >= 0 && start <= T) for (const v of entries) seed(v, start);
    });
  } else {
    for (const v of input.shelterNodes) seed(v, 0);
  }
  for (let d = 0; d <= T; d++) {
    const bucket = buckets[d]!;
    // Zero-step roads append to the bucket being scanned, so its length is read each time round.
    for (let i = 0; i < bucket.length; i++) {
      const v = bucket[i]!;
      if (dist[v] !== d) continue; // reached sooner since
      for (let k = first[v]!, end = first[v + 1]!; k < end; k++) {
        const e = adjacent[k]!;
        const w = forward ? roadTo[e]! : roadFrom[e]!;
        const dw = d + travelSteps[e]!;
        if (dw <= T && dw < dist[w]!) {
          dist[w] = dw;
          buckets[dw]!.push(w);
        }
      }
    }
    buckets[d] = [];
  }
  return dist;
}
