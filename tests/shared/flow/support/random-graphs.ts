// fast-check generators of small random flow networks (source 0, sink n − 1), with parallel
// and antiparallel arcs, self-loops, zero and occasionally unbounded capacities. With `bundles`,
// each graph also holds that many bundles of at least n parallel and antiparallel arcs between
// one pair of nodes, and the whole arc list is shuffled, so a node can have more residual arcs
// to one neighbour than the graph has nodes, in any order.
import fc from 'fast-check';
import { UNBOUNDED_CAPACITY, type ArcInput } from '../../../../shared/flow';

export interface RandomGraph {
  nodeCount: number;
  arcs: ArcInput[];
  source: number;
  sink: number;
}

export interface RandomGraphOptions {
  maxNodes?: number;
  maxArcs?: number;
  maxCapacity?: number;
  unbounded?: boolean;
  /** Bundles of n to 3n parallel and antiparallel arcs between one pair; default none. */
  bundles?: number;
}

export function randomGraph(options: RandomGraphOptions = {}): fc.Arbitrary<RandomGraph> {
  const { maxNodes = 10, maxArcs = 30, maxCapacity = 20, unbounded = true, bundles = 0 } = options;
  return fc.integer({ min: 2, max: maxNodes }).chain((nodeCount) => {
    const node = fc.integer({ min: 0, max: nodeCount - 1 });
    const capacity = unbounded
      ? fc.oneof({ weight: 20, arbitrary: fc.integer({ min: 0, max: maxCapacity }) }, { weight: 1, arbitrary: fc.constant(UNBOUNDED_CAPACITY) })
      : fc.integer({ min: 0, max: maxCapacity });
    const bundle = fc
      .record({
        from: node,
        to: node,
        // true = this arc runs from → to, false = antiparallel; mostly one way, as a road bundle.
        directions: fc.array(fc.boolean(), { minLength: nodeCount, maxLength: 3 * nodeCount }),
        forwardShare: fc.integer({ min: 1, max: 9 }),
        capacities: fc.array(fc.integer({ min: 0, max: Math.min(3, maxCapacity) }), { minLength: 3 * nodeCount, maxLength: 3 * nodeCount }),
      })
      .map(({ from, to, directions, forwardShare, capacities }) =>
        directions.map((flip, i): ArcInput => {
          const forward = flip || i % 10 < forwardShare;
          return forward ? { from, to, capacity: capacities[i]! } : { from: to, to: from, capacity: capacities[i]! };
        }),
      );
    return fc
      .record({
        plain: fc.array(fc.record({ from: node, to: node, capacity }), { maxLength: maxArcs }),
        bundled: fc.array(bundle, { minLength: bundles, maxLength: bundles }),
        order: fc.array(fc.nat(), { minLength: 0, maxLength: maxArcs + bundles * 3 * nodeCount }),
      })
      .map(({ plain, bundled, order }) => {
        const arcs = [...plain, ...bundled.flat()];
        if (bundles > 0) {
          // Fisher–Yates with the generated numbers: the order is part of the case (and shrinks).
          for (let i = arcs.length - 1; i > 0; i--) {
            const j = (order[i] ?? 0) % (i + 1);
            [arcs[i], arcs[j]] = [arcs[j]!, arcs[i]!];
          }
        }
        return { nodeCount, arcs, source: 0, sink: nodeCount - 1 };
      });
  });
}
