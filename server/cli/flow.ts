// `npm run --silent flow -- FILE [--algorithm NAME] [--verify] [--cut]`: reads a max-flow
// instance in the DIMACS format, solves it, and prints one JSON object with the value, the
// algorithm, the size, and the times (solveMs is the algorithm alone: reading and building the
// network are reported apart). A malformed file prints FILE:LINE: reason and exits with 2.
import { readFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import {
  DimacsParseError,
  FlowInputError,
  AUTO_HANDOVER_AUGMENTATIONS_PER_ARC,
  AUTO_THRESHOLD_ARCS,
  MAX_FLOW_ALGORITHMS,
  UNBOUNDED_CAPACITY,
  buildNetworkFromArrays,
  maxFlow,
  parseDimacsMaxFlow,
  verify,
  type MaxFlowAlgorithmChoice,
} from '../../shared/flow';

const CHOICES: readonly string[] = ['auto', ...MAX_FLOW_ALGORITHMS];
const USAGE = [
  `usage: npm run --silent flow -- FILE [--algorithm ${CHOICES.join('|')}] [--verify] [--cut]`,
  'FILE: a DIMACS max-flow instance ("p max", "n … s|t", "a FROM TO CAPACITY").',
  `Capacities are integers from 0 to ${UNBOUNDED_CAPACITY} (2^31 - 1, which stands for "no limit");`,
  'a larger capacity is refused with its line number (vehicle counts never come near it).',
  `auto: Edmonds-Karp up to ${AUTO_THRESHOLD_ARCS} arcs; above, it looks at the network's shape first: push-relabel`,
  'where capacities are drawn from a wide range (many distinct values, a share far below the median), otherwise',
  `incremental BFS, handed over to push-relabel after ${AUTO_HANDOVER_AUGMENTATIONS_PER_ARC} augmentations per arc (paths that each carry little).`,
  '"algorithm" says which finished; "autoChoice" the shape seen, the algorithm started with and why.',
].join('\n');

async function main(): Promise<number> {
  let parsed;
  try {
    parsed = parseArgs({
      allowPositionals: true,
      options: {
        algorithm: { type: 'string', default: 'auto' },
        verify: { type: 'boolean', default: false },
        cut: { type: 'boolean', default: false },
        help: { type: 'boolean', short: 'h' },
      },
    });
  } catch (e) {
    console.error(`${(e as Error).message}\n${USAGE}`);
    return 2;
  }
  const { values, positionals } = parsed;
  const file = positionals[0];
  if (values.help || !file || positionals.length > 1) {
    console.error(USAGE);
    return values.help ? 0 : 2;
  }
  if (!CHOICES.includes(values.algorithm)) {
    console.error(`unknown algorithm "${values.algorithm}"\n${USAGE}`);
    return 2;
  }

  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (e) {
    console.error(`${file}: ${(e as Error).message}`);
    return 2;
  }
  const parseStart = performance.now();
  let instance;
  try {
    instance = parseDimacsMaxFlow(text);
  } catch (e) {
    if (e instanceof DimacsParseError) {
      console.error(`${file}:${e.line}: ${e.reason}`);
      return 2;
    }
    throw e;
  }
  const parseMs = performance.now() - parseStart;
  const buildStart = performance.now();
  const network = buildNetworkFromArrays(instance.nodeCount, instance.tails, instance.heads, instance.capacities);
  const buildMs = performance.now() - buildStart;

  const totalStart = performance.now();
  const result = maxFlow(network, instance.source, instance.sink, {
    algorithm: values.algorithm as MaxFlowAlgorithmChoice,
    now: () => performance.now(),
  });
  const totalMs = performance.now() - totalStart;
  const report = values.verify ? verify(network, result) : undefined;
  const { elapsedMs: _elapsed, ...counters } = result.stats;

  const output = {
    file,
    value: result.value,
    unbounded: result.unbounded,
    algorithm: result.algorithm,
    ...(result.autoChoice ? { autoChoice: { shape: result.autoChoice.shape, start: result.autoChoice.start, handover: result.autoChoice.handover, reason: result.autoChoice.reason } } : {}),
    nodes: network.nodeCount,
    arcs: network.arcCount,
    parseMs: round(parseMs),
    buildMs: round(buildMs),
    solveMs: round(result.stats.elapsedMs ?? totalMs),
    // The algorithm plus reading off the minimum cut and the arc flows.
    totalMs: round(totalMs),
    cutArcCount: result.minCut.cutArcs.length,
    ...(values.cut ? { cutArcs: Array.from(result.minCut.cutArcs, (arc) => arc + 1) } : {}),
    stats: counters,
    ...(report ? { verified: report.ok, problems: report.problems } : {}),
  };
  process.stdout.write(`${JSON.stringify(output)}\n`);
  return report && !report.ok ? 1 : 0;
}

const round = (ms: number): number => Math.round(ms * 10) / 10;

main().then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    console.error(e instanceof FlowInputError ? e.message : e);
    process.exitCode = e instanceof FlowInputError ? 2 : 1;
  },
);
