// The max-flow format of the 1st DIMACS Implementation Challenge (1990–91):
//   c <comment>          any number, anywhere
//   p max <nodes> <arcs> exactly one, before any n or a line
//   n <id> s             the source; n <id> t the sink (ids are 1-based)
//   a <from> <to> <cap>  exactly <arcs> of them
// Internally nodes are 0-based; capacities must be integers in [0, UNBOUNDED_CAPACITY].

import { UNBOUNDED_CAPACITY } from './capacity';
import { FlowInputError } from './errors';
import { arcCapacity, arcHead, arcTail, type FlowNetwork } from './flow-network';

/** A max-flow instance as the format holds it (0-based nodes). */
export interface DimacsMaxFlow {
  nodeCount: number;
  source: number;
  sink: number;
  tails: Int32Array;
  heads: Int32Array;
  capacities: Int32Array;
}

/** A malformed file; `line` is 1-based. */
export class DimacsParseError extends FlowInputError {
  override readonly name: string = 'DimacsParseError';
  constructor(
    readonly line: number,
    readonly reason: string,
  ) {
    super(`line ${line}: ${reason}`);
  }
}

const INTEGER = /^\d+$/;

/**
 * Parses a DIMACS max-flow file. O(length of the text).
 * @throws DimacsParseError naming the first offending line.
 */
export function parseDimacsMaxFlow(text: string): DimacsMaxFlow {
  let nodeCount = -1;
  let arcTotal = 0;
  let arcs = 0;
  let source = -1;
  let sink = -1;
  let tails = new Int32Array(0);
  let heads = new Int32Array(0);
  let capacities = new Int32Array(0);
  let lineNumber = 0;
  let position = 0;
  const fail = (reason: string): never => {
    throw new DimacsParseError(lineNumber, reason);
  };
  const nodeId = (token: string | undefined, what: string): number => {
    if (token === undefined || !INTEGER.test(token)) fail(`${what} must be a node id, got ${token ?? 'nothing'}`);
    const id = Number(token);
    if (id < 1 || id > nodeCount) fail(`${what} ${id} is outside 1..${nodeCount}`);
    return id - 1;
  };

  while (position < text.length) {
    let end = text.indexOf('\n', position);
    if (end < 0) end = text.length;
    const line = text.slice(position, end);
    position = end + 1;
    lineNumber++;
    const tokens = line.trim().split(/\s+/);
    const kind = tokens[0];
    if (kind === '' || kind === 'c') continue;
    if (kind === 'p') {
      if (nodeCount >= 0) fail('second problem line');
      if (tokens.length !== 4 || tokens[1] !== 'max' || !INTEGER.test(tokens[2]!) || !INTEGER.test(tokens[3]!)) {
        fail(`expected "p max <nodes> <arcs>", got "${line.trim()}"`);
      }
      nodeCount = Number(tokens[2]);
      arcTotal = Number(tokens[3]);
      if (nodeCount < 2) fail('a max-flow problem needs at least 2 nodes');
      if (arcTotal > 0x3fffffff) fail(`too many arcs: ${arcTotal}`);
      tails = new Int32Array(arcTotal);
      heads = new Int32Array(arcTotal);
      capacities = new Int32Array(arcTotal);
      continue;
    }
    if (nodeCount < 0) fail(`expected the problem line "p max <nodes> <arcs>" before "${kind}"`);
    if (kind === 'n') {
      if (tokens.length !== 3) fail(`expected "n <id> s" or "n <id> t", got "${line.trim()}"`);
      const id = nodeId(tokens[1], 'node');
      if (tokens[2] === 's') {
        if (source >= 0) fail('second source line');
        source = id;
      } else if (tokens[2] === 't') {
        if (sink >= 0) fail('second sink line');
        sink = id;
      } else fail(`node designator must be s or t, got ${tokens[2]}`);
      if (source >= 0 && source === sink) fail('source and sink are the same node');
      continue;
    }
    if (kind === 'a') {
      if (tokens.length !== 4) fail(`expected "a <from> <to> <capacity>", got "${line.trim()}"`);
      if (arcs >= arcTotal) fail(`more arcs than the ${arcTotal} announced`);
      tails[arcs] = nodeId(tokens[1], 'arc tail');
      heads[arcs] = nodeId(tokens[2], 'arc head');
      const capacity = tokens[3]!;
      if (!INTEGER.test(capacity)) fail(`capacity must be a non-negative integer, got ${capacity}`);
      const value = Number(capacity);
      if (value > UNBOUNDED_CAPACITY) fail(`capacity ${capacity} exceeds ${UNBOUNDED_CAPACITY}`);
      capacities[arcs] = value;
      arcs++;
      continue;
    }
    fail(`unknown line type "${kind}"`);
  }
  if (nodeCount < 0) fail('no problem line "p max <nodes> <arcs>"');
  if (arcs < arcTotal) fail(`${arcs} arcs found, ${arcTotal} announced`);
  if (source < 0) fail('no source line "n <id> s"');
  if (sink < 0) fail('no sink line "n <id> t"');
  return { nodeCount, source, sink, tails, heads, capacities };
}

/** The file text in pieces of about `linesPerChunk` lines (for instances too big for one string). */
export function* dimacsMaxFlowChunks(problem: DimacsMaxFlow, comments: readonly string[] = [], linesPerChunk = 100_000): Generator<string> {
  const head = [
    ...comments.map((c) => `c ${c}`),
    `p max ${problem.nodeCount} ${problem.tails.length}`,
    `n ${problem.source + 1} s`,
    `n ${problem.sink + 1} t`,
  ];
  yield head.join('\n') + '\n';
  const { tails, heads, capacities } = problem;
  for (let start = 0; start < tails.length; start += linesPerChunk) {
    const lines: string[] = [];
    for (let i = start; i < Math.min(tails.length, start + linesPerChunk); i++) {
      lines.push(`a ${tails[i]! + 1} ${heads[i]! + 1} ${capacities[i]!}`);
    }
    yield lines.join('\n') + '\n';
  }
}

/** The whole file as one string. */
export function formatDimacsMaxFlow(problem: DimacsMaxFlow, comments: readonly string[] = []): string {
  return [...dimacsMaxFlowChunks(problem, comments)].join('');
}

/** The instance a network and its terminals form (arcs in input order). */
export function networkToDimacs(network: FlowNetwork, source: number, sink: number): DimacsMaxFlow {
  const m = network.arcCount;
  const tails = new Int32Array(m);
  const heads = new Int32Array(m);
  const capacities = new Int32Array(m);
  for (let i = 0; i < m; i++) {
    tails[i] = arcTail(network, i);
    heads[i] = arcHead(network, i);
    capacities[i] = arcCapacity(network, i);
  }
  return { nodeCount: network.nodeCount, source, sink, tails, heads, capacities };
}
