// fast-check generators of small random flow networks (source 0, sink n − 1), with parallel
// and antiparallel arcs, self-loops, zero and occasionally unbounded capacities.
import fc from 'fast-check';
import { UNBOUNDED_CAPACITY, type ArcInput } from '../../../../shared/flow';

export interface RandomGraph {
  nodeCount: number;
  arcs: ArcInput[];
  source: number;
  sink: number;
}

export function randomGraph(options: { maxNodes?: number; maxArcs?: number; maxCapacity?: number; unbounded?: boolean } = {}): fc.Arbitrary<RandomGraph> {
  const { maxNodes = 10, maxArcs = 30, maxCapacity = 20, unbounded = true } = options;
  return fc.integer({ min: 2, max: maxNodes }).chain((nodeCount) => {
    const node = fc.integer({ min: 0, max: nodeCount - 1 });
    const capacity = unbounded
      ? fc.oneof({ weight: 20, arbitrary: fc.integer({ min: 0, max: maxCapacity }) }, { weight: 1, arbitrary: fc.constant(UNBOUNDED_CAPACITY) })
      : fc.integer({ min: 0, max: maxCapacity });
    return fc.record({
      nodeCount: fc.constant(nodeCount),
      arcs: fc.array(fc.record({ from: node, to: node, capacity }), { maxLength: maxArcs }),
      source: fc.constant(0),
      sink: fc.constant(nodeCount - 1),
    });
  });
}
