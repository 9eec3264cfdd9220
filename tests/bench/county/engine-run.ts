// The engine alone on the generated county: the same pure path a run takes (road graph from the
// GeoJSON, zones and shelters attached, the engine problem with the default capacity table), then
// solveEvacuation with each phase's wall and CPU time, the expanded size, the run budget's verdict
// and this process's peak memory. One JSON line. Run it once, not in a loop: at the full size and
// a 60 s step the solve needs several GB.
//   npx tsx tests/bench/county/engine-run.ts [--size 300] [--step 60] [--horizon-minutes 360] [--budget-check-only]
import { parseArgs } from 'node:util';
import { solveEvacuation } from '../../../shared/flow';
import { buildRoadGraph } from '../../../shared/geo/build-road-graph';
import { attachShelters, attachZones } from '../../../shared/geo/attach-zones-and-shelters';
import { indexNodes } from '../../../shared/geo/node-index';
import { readShelters } from '../../../shared/geo/read-shelters';
import { readZones } from '../../../shared/geo/read-zones';
import { buildEvacuationProblem } from '../../../shared/model/build-evacuation-problem';
import { defaultCapacityTable } from '../../../shared/model/capacity-defaults';
import { budgetRefusal, expandedSize, horizonStepsOf } from '../../../shared/model/run-budget';
import { countyRoads, countyShelters, countyZones, FULL_COUNTY } from './county';

const { values } = parseArgs({
  options: {
    size: { type: 'string', default: String(FULL_COUNTY.size) },
    step: { type: 'string', default: '60' },
    'horizon-minutes': { type: 'string', default: '360' },
    'budget-check-only': { type: 'boolean', default: false },
  },
});
const spec = { ...FULL_COUNTY, size: Number(values.size) };
const step = Number(values.step);
const horizonMinutes = Number(values['horizon-minutes']);
const cpuMs = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};

const t0 = performance.now();
const graph = buildRoadGraph(countyRoads(spec));
const zones = readZones(countyZones(spec));
const shelters = readShelters(countyShelters(spec));
const index = indexNodes(graph);
const zoneAt = attachZones(index, zones);
const shelterAt = attachShelters(index, shelters);
const horizonSteps = horizonStepsOf(horizonMinutes, step);
const built = buildEvacuationProblem(
  { nodeCount: graph.nodes.length, segments: graph.segments },
  defaultCapacityTable(),
  [],
  zones.map((z, i) => ({ id: String(i), attributes: z.attributes, entryNodes: zoneAt[i]!.entryNodes })),
  shelters.map((s, i) => ({ id: String(i), attributes: s.attributes, node: shelterAt[i]!.node })),
  { timeStepSeconds: step, horizonSteps },
);
const problem = built.problem;
const prepareMs = Math.round(performance.now() - t0);
const entries = problem.zones.reduce((sum, z) => sum + z.entryNodes.length + 2, 0) + 2 * problem.shelters.length;
const estimate = expandedSize(problem.nodeCount, problem.roads.length, horizonSteps, entries);
const refusal = budgetRefusal({ nodeCount: problem.nodeCount, roads: problem.roads.length, entries }, { horizonMinutes, timeStepSeconds: step }, {
  maxExpandedArcs: 600_000_000,
  maxBytes: 6144 * 2 ** 20,
});
const head = {
  size: spec.size,
  stepSeconds: step,
  horizonSteps,
  junctions: problem.nodeCount,
  roads: problem.roads.length,
  zones: problem.zones.length,
  shelters: problem.shelters.length,
  demandVehicles: problem.zones.reduce((s, z) => s + z.vehicles, 0),
  prepareMs,
  estimate: { arcs: estimate.arcs, megabytes: Math.round(estimate.bytes / 2 ** 20) },
  defaultBudget: refusal ?? 'fits',
};
if (values['budget-check-only']) {
  process.stdout.write(`${JSON.stringify(head)}\n`);
  process.exit(0);
}

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
const r = result;
process.stdout.write(
  `${JSON.stringify({
    ...head,
    solveMs: Math.round(performance.now() - started),
    solveCpuMs: Math.round(cpuMs() - startedCpu),
    timingsMs: Object.fromEntries(Object.entries(r.stats.timingsMs ?? {}).map(([k, v]) => [k, Math.round(v)])),
    cpuTimingsMs,
    expanded: r.stats.timeExpandedNetwork,
    deliveredByHorizon: r.curve.deliveredVehiclesByStep[horizonSteps],
    clearanceStep: r.curve.clearanceStep,
    marks: r.curve.marks,
    routeTiming: { largestSeconds: Math.round(r.routeTiming.largestSeconds), typicalSeconds: Math.round(r.routeTiming.typicalSeconds), pairs: r.routeTiming.pairs },
    plannedRoutes: r.plannedRoutes,
    steadyStateVehPerHour: r.steadyState.throughputVehPerHour,
    peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024),
    loadAverage: (await import('node:os')).loadavg().map((x) => x.toFixed(2)).join(' '),
  })}\n`,
);
