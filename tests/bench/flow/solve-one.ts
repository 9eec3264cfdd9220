// One measurement in its own process, so that peak memory belongs to it alone. Prints one JSON
// line. Modes:
//   --instance NAME --write-dimacs FILE             write the instance's s–t network
//   --instance NAME --algorithm A [--repeat N] [--budget-ms B]   one max flow, N times (the first
//                                                   cold, the median of the others warm)
//   --instance NAME --evacuation                    solveEvacuation with per-phase timings
import { closeSync, openSync, writeSync } from 'node:fs';
import { parseArgs } from 'node:util';
import {
  FlowAbortedError,
  arcFlows,
  dimacsMaxFlowChunks,
  maximiseInPlace,
  minimumCut,
  netOutflow,
  networkToDimacs,
  solveEvacuation,
  verify,
  type MaxFlowAlgorithmChoice,
} from '../../../shared/flow';
import { findInstance, networkOf, problemOf } from './instances';

const { values } = parseArgs({
  options: {
    instance: { type: 'string' },
    algorithm: { type: 'string' },
    repeat: { type: 'string', default: '1' },
    'budget-ms': { type: 'string' },
    'write-dimacs': { type: 'string' },
    evacuation: { type: 'boolean', default: false },
  },
});
const instance = findInstance(values.instance ?? '');
const peakRssMb = (): number => Math.round(process.resourceUsage().maxRSS / 1024);
const problem = problemOf(instance);
const print = (o: object): void => void process.stdout.write(`${JSON.stringify(o)}\n`);

if (values.evacuation) {
  // Wall-clock phases from the engine's own clock, and this process's CPU time per phase from the
  // progress calls at each phase's start and end: on a shared machine the CPU time is the steadier figure.
  const cpuMs = (): number => {
    const u = process.cpuUsage();
    return (u.user + u.system) / 1000;
  };
  const cpuStart: Record<string, number> = {};
  const cpuTimingsMs: Record<string, number> = {};
  const started = performance.now();
  const startedCpu = cpuMs();
  const result = solveEvacuation(problem, {
    now: () => performance.now(),
    onProgress: (phase, fraction) => {
      if (fraction === 0) cpuStart[phase] = cpuMs();
      else if (fraction === 1 && cpuStart[phase] !== undefined) cpuTimingsMs[phase] = Math.round(cpuMs() - cpuStart[phase]!);
    },
  });
  print({
    instance: instance.name,
    totalMs: Math.round(performance.now() - started),
    totalCpuMs: Math.round(cpuMs() - startedCpu),
    timingsMs: Object.fromEntries(Object.entries(result.stats.timingsMs ?? {}).map(([k, v]) => [k, Math.round(v)])),
    cpuTimingsMs,
    nodes: result.stats.timeExpandedNetwork.nodes,
    arcs: result.stats.timeExpandedNetwork.arcs,
    demand: result.demandVehicles,
    deliveredByHorizon: result.curve.deliveredVehiclesByStep[problem.horizonSteps],
    clearanceStep: result.curve.clearanceStep,
    steadyStateVehPerHour: result.steadyState.throughputVehPerHour,
    algorithm: result.stats.algorithm,
    peakRssMb: peakRssMb(),
  });
} else {
  const { network, source, sink } = networkOf(instance, problem);
  if (values['write-dimacs']) {
    const fd = openSync(values['write-dimacs'], 'w');
    for (const chunk of dimacsMaxFlowChunks(networkToDimacs(network, source, sink), [`bench instance ${instance.name}: ${instance.description}`])) writeSync(fd, chunk);
    closeSync(fd);
    print({ instance: instance.name, nodes: network.nodeCount, arcs: network.arcCount });
  } else {
    const algorithm = (values.algorithm ?? 'auto') as MaxFlowAlgorithmChoice;
    const budget = values['budget-ms'] === undefined ? undefined : Number(values['budget-ms']);
    // Each run's wall-clock and CPU time. The first run in a fresh process includes the
    // just-in-time compilation of the solver; the later ones ("warm") are what a long-lived
    // worker sees. On a machine shared with other work the CPU time is the steadier figure.
    const cpuMs = (): number => {
      const u = process.cpuUsage();
      return (u.user + u.system) / 1000;
    };
    const runs: { wall: number; cpu: number }[] = [];
    let value = 0;
    let used = '';
    let shape: string | undefined;
    let verified = true;
    let aborted = false;
    // As in Boost's binary, the residual array is allocated before the clock starts (Boost's
    // residual map is an edge property, allocated with the graph) and filled inside it (Boost's
    // solvers set each residual to its capacity first).
    const state = { residual: new Int32Array(network.capacity.length) };
    for (let k = 0; k < Number(values.repeat); k++) {
      const started = performance.now();
      const startedCpu = cpuMs();
      const shouldAbort = budget === undefined ? undefined : () => performance.now() - started > budget;
      try {
        // The algorithm alone is timed (as in Boost's binary); the value, flows and cut are read after.
        state.residual.set(network.capacity);
        const run = maximiseInPlace(network, source, sink, state, { algorithm, shouldAbort });
        runs.push({ wall: performance.now() - started, cpu: cpuMs() - startedCpu });
        value = netOutflow(network, state, source);
        used = run.algorithm;
        shape = run.autoChoice?.shape;
        if (k === 0) {
          verified = verify(network, { source, sink, value, flow: arcFlows(network, state), minCut: minimumCut(network, state.residual, source) }).ok;
        }
      } catch (e) {
        if (!(e instanceof FlowAbortedError)) throw e;
        aborted = true;
        runs.push({ wall: performance.now() - started, cpu: cpuMs() - startedCpu });
        break;
      }
    }
    const warm = runs.length > 1 ? runs.slice(1) : runs;
    const median = (xs: number[]): number => {
      const sorted = [...xs].sort((a, b) => a - b);
      return Math.round(sorted[Math.floor((sorted.length - 1) / 2)]! * 10) / 10;
    };
    const round = (x: number): number => Math.round(x * 10) / 10;
    print({
      instance: instance.name,
      algorithm: used || algorithm,
      ...(shape ? { shape } : {}),
      nodes: network.nodeCount,
      arcs: network.arcCount,
      value: aborted ? null : value,
      aborted,
      runs: runs.length,
      warmRuns: runs.length > 1 ? warm.length : 0,
      solveMs: median(warm.map((r) => r.wall)),
      cpuMs: median(warm.map((r) => r.cpu)),
      firstMs: round(runs[0]!.wall),
      firstCpuMs: round(runs[0]!.cpu),
      verified: aborted ? null : verified,
      peakRssMb: peakRssMb(),
    });
  }
}
