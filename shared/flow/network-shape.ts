// What `auto` looks at before it solves: a few figures of the network's shape, read off a fixed
// sample of about a thousand arcs (microseconds, whatever the size), and the algorithm they point to.
//
// Why these figures: incremental BFS is fast where each augmenting path carries a lot (a path
// carries a whole road's capacity on road graphs and their time-expanded copies) and slow where
// long paths each carry little, which happens when capacities are drawn from a wide continuous
// range (the GENRMF-like and random level families); push-relabel is the other way round (measured
// in tests/bench/flow/README.md). Road capacities come from a short table of road classes and
// lane counts (docs/model.md §3: 300 to 2,000 veh/h per lane), so almost no road has a quarter of
// the median road's capacity, and few distinct values occur; randomly drawn capacities put a tenth
// or more of the arcs below a quarter of the median, with hundreds of distinct values.
// Choosing push-relabel for a road graph costs 8–50×, so push-relabel is chosen only on both signs
// together. Road graphs (most arcs have a reverse twin) get Boykov–Kolmogorov, time-expanded
// networks (almost no arc has one) incremental BFS; any other shape gets incremental BFS with the
// handover to push-relabel armed (handover.ts), the safety net where the shape is unclear.

import { UNBOUNDED_CAPACITY } from './capacity';
import type { FlowNetwork } from './flow-network';

/** `auto` runs Edmonds–Karp (the reference method) up to this many arcs. */
export const AUTO_THRESHOLD_ARCS = 5_000;

/** Share of the finite arcs below a quarter of the median capacity from which capacities count as spread. */
export const SPREAD_LOW_SHARE = 0.05;
/** Distinct capacities among the sampled arcs from which capacities count as drawn from a wide range. */
export const SPREAD_DISTINCT_VALUES = 64;
/** Share of arcs with a reverse twin from which a network counts as mostly two-way (a road graph). */
export const TWO_WAY_SHARE = 0.5;
/** Share of arcs with a reverse twin below which a network counts as one-way (time-expanded copies). */
export const ONE_WAY_SHARE = 0.05;
/** Residual arcs drawn (about half are input arcs) for the figures. */
const SAMPLE_DRAWS = 2048;
/** A neighbour with more residual arcs than this is not searched for a reverse twin. */
const TWIN_SCAN_LIMIT = 256;

/**
 * The figures `auto` decides by, from a fixed pseudo-random sample of arcs (the same sample for
 * the same network, so the same choice); arcs touching the source or the sink are left out.
 */
export interface ShapeFigures {
  /** Sampled arcs: positive capacity, both ends below the node limit, neither end a terminal. */
  sampledArcs: number;
  /** Share of them u → v for which an arc v → u exists too (two-way roads have one). */
  twoWayShare: number;
  /** Median capacity of the finite sampled arcs. */
  medianCapacity: number;
  /** Share of the finite sampled arcs whose capacity is below a quarter of the median. */
  lowCapacityShare: number;
  /** Distinct capacities among the finite sampled arcs. */
  distinctCapacities: number;
}

/** How `auto` saw the network; our own words, shown beside the algorithm in results. */
export type NetworkShape = 'small' | 'spread-capacities' | 'two-way' | 'one-way' | 'mixed';

export type AutoStart = 'edmonds-karp' | 'push-relabel' | 'boykov-kolmogorov' | 'incremental-bfs';

export interface AutoChoice {
  shape: NetworkShape;
  /** The algorithm `auto` starts with. */
  start: AutoStart;
  /** True when incremental BFS may still hand over to push-relabel (handover.ts). */
  handover: boolean;
  /** One sentence with the figures that decided. */
  reason: string;
  /** Absent for 'small' (not computed). */
  figures?: ShapeFigures;
}

/**
 * The shape figures of the network restricted to nodes below nodeLimit, from SAMPLE_DRAWS residual
 * arcs drawn by a fixed xorshift sequence (every arc when there are fewer). Work: about
 * SAMPLE_DRAWS × the degree of a node, whatever the network's size; no node-sized array.
 */
export function shapeFigures(network: FlowNetwork, source: number, sink: number, nodeLimit = network.nodeCount): ShapeFigures {
  const { firstOut, head, mate, capacity } = network;
  const total = firstOut[nodeLimit]!;
  const draws = Math.min(SAMPLE_DRAWS, total);
  const values = new Int32Array(draws);
  let finite = 0;
  let sampled = 0;
  let twins = 0;
  let x = 0x9e3779b9 | 0;
  for (let k = 0; k < draws; k++) {
    let r = k;
    if (total > SAMPLE_DRAWS) {
      // xorshift32 (Marsaglia 2003): a fixed, well-spread sequence, so the choice is repeatable.
      x ^= x << 13;
      x ^= x >>> 17;
      x ^= x << 5;
      r = (x >>> 0) % total;
    }
    const c = capacity[r]!;
    const v = head[r]!;
    if (c <= 0 || v >= nodeLimit) continue;
    const u = head[mate[r]!]!;
    if (u === source || u === sink || v === source || v === sink || u === v) continue;
    sampled++;
    if (c < UNBOUNDED_CAPACITY) values[finite++] = c;
    const end = firstOut[v + 1]!;
    if (end - firstOut[v]! > TWIN_SCAN_LIMIT) continue;
    for (let q = firstOut[v]!; q < end; q++) {
      if (head[q] === u && capacity[q]! > 0) {
        twins++;
        break;
      }
    }
  }
  const sorted = values.subarray(0, finite).sort();
  const median = finite > 0 ? sorted[(finite - 1) >> 1]! : 0;
  let low = 0;
  let distinct = 0;
  for (let k = 0; k < finite; k++) {
    if (4 * sorted[k]! < median) low++;
    if (k === 0 || sorted[k] !== sorted[k - 1]) distinct++;
  }
  return {
    sampledArcs: sampled,
    twoWayShare: sampled > 0 ? twins / sampled : 0,
    medianCapacity: median,
    lowCapacityShare: finite > 0 ? low / finite : 0,
    distinctCapacities: distinct,
  };
}

const percent = (x: number): string => `${(100 * x).toFixed(1)} %`;

/** The algorithm `auto` starts with on this network, and why. */
export function chooseAuto(network: FlowNetwork, source: number, sink: number, nodeLimit = network.nodeCount): AutoChoice {
  const arcs = network.firstOut[nodeLimit]! / 2;
  if (arcs <= AUTO_THRESHOLD_ARCS) {
    return { shape: 'small', start: 'edmonds-karp', handover: false, reason: `${arcs} arcs, at most ${AUTO_THRESHOLD_ARCS}: Edmonds–Karp, the reference method` };
  }
  const figures = shapeFigures(network, source, sink, nodeLimit);
  const { twoWayShare, lowCapacityShare, distinctCapacities, medianCapacity } = figures;
  const capacities = `${percent(lowCapacityShare)} of sampled capacities below a quarter of the median ${medianCapacity}, ${distinctCapacities} distinct`;
  if (lowCapacityShare >= SPREAD_LOW_SHARE && distinctCapacities >= SPREAD_DISTINCT_VALUES) {
    return {
      shape: 'spread-capacities',
      start: 'push-relabel',
      handover: false,
      reason: `capacities drawn from a wide range (${capacities}): augmenting paths would each carry little, so push-relabel`,
      figures,
    };
  }
  // Many low capacities without many distinct values fits neither family: 'mixed'.
  const lowOnly = lowCapacityShare >= SPREAD_LOW_SHARE;
  const twin = `${percent(twoWayShare)} of sampled arcs have a reverse twin`;
  let shape: NetworkShape;
  let what: string;
  if (lowOnly) {
    shape = 'mixed';
    what = `${capacities}: many low capacities but few distinct values, unlike road graphs and random families alike`;
  } else if (twoWayShare >= TWO_WAY_SHARE) {
    shape = 'two-way';
    what = `${twin}, as two-way roads do, and ${capacities}: a road graph`;
  } else if (twoWayShare < ONE_WAY_SHARE) {
    shape = 'one-way';
    what = `${twin} and ${capacities}: one-way layers, as in a time-expanded network`;
  } else {
    shape = 'mixed';
    what = `${twin} and ${capacities}: neither clearly road-like nor time-expanded`;
  }
  // Road graphs: Boykov–Kolmogorov, measured as fast as incremental BFS to 30 % faster on the
  // bench's static cities (tests/bench/flow/README.md). Time-expanded networks: incremental BFS, which
  // measured 8× faster than Boykov–Kolmogorov on the 4-million-arc one. The handover is the safety
  // net where the shape is unclear; on a recognised road graph or time-expanded network it would
  // only misfire (a small city can pass 0.01 augmentations per arc).
  const start: AutoStart = shape === 'two-way' ? 'boykov-kolmogorov' : 'incremental-bfs';
  const handover = shape === 'mixed';
  return {
    shape,
    start,
    handover,
    reason: `${what}; ${start === 'boykov-kolmogorov' ? 'Boykov–Kolmogorov' : 'incremental BFS'}${handover ? ', handing over to push-relabel if its paths carry little' : ''}`,
    figures,
  };
}
