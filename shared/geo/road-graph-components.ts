// Undirected connected components of the built network, largest by length first.

export interface ComponentSummary {
  id: number;
  nodes: number;
  segments: number;
  lengthMeters: number;
  shareOfLength: number;
  bbox: [number, number, number, number];
}

interface Edge {
  fromNode: number;
  toNode: number;
  lengthMeters: number;
}

function findRoot(parent: Int32Array, v: number): number {
  while (parent[v] !== v) {
    parent[v] = parent[parent[v]!]!;
    v = parent[v]!;
  }
  return v;
}

/**
 * Labels each segment with its component. Components are numbered by total length,
 * descending (ties by lowest node id), so component 0 is the main network.
 */
export function connectedComponents(
  nodes: readonly { lon: number; lat: number }[],
  segments: readonly Edge[],
): { segmentComponent: number[]; components: ComponentSummary[] } {
  const parent = new Int32Array(nodes.length);
  for (let i = 0; i < parent.length; i += 1) parent[i] = i;
  for (const s of segments) {
    const a = findRoot(parent, s.fromNode);
    const b = findRoot(parent, s.toNode);
    if (a !== b) parent[Math.max(a, b)] = Math.min(a, b);
  }
  const byRoot = new Map<number, ComponentSummary>();
  const summaryOf = (root: number) => {
    let c = byRoot.get(root);
    if (!c) {
      c = { id: -1, nodes: 0, segments: 0, lengthMeters: 0, shareOfLength: 0, bbox: [Infinity, Infinity, -Infinity, -Infinity] };
      byRoot.set(root, c);
    }
    return c;
  };
  for (const [v, n] of nodes.entries()) {
    const c = summaryOf(findRoot(parent, v));
    c.nodes += 1;
    c.bbox = [Math.min(c.bbox[0], n.lon), Math.min(c.bbox[1], n.lat), Math.max(c.bbox[2], n.lon), Math.max(c.bbox[3], n.lat)];
  }
  let total = 0;
  for (const s of segments) {
    const c = summaryOf(findRoot(parent, s.fromNode));
    c.segments += 1;
    c.lengthMeters += s.lengthMeters;
    total += s.lengthMeters;
  }
  const ordered = [...byRoot.entries()].sort((p, q) => q[1].lengthMeters - p[1].lengthMeters || p[0] - q[0]);
  const idOfRoot = new Map<number, number>();
  for (const [i, [root, c]] of ordered.entries()) {
    c.id = i;
    c.shareOfLength = total > 0 ? c.lengthMeters / total : 0;
    idOfRoot.set(root, i);
  }
  return {
    segmentComponent: segments.map((s) => idOfRoot.get(findRoot(parent, s.fromNode))!),
    components: ordered.map(([, c]) => c),
  };
}
