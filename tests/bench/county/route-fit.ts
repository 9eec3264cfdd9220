// Steps fitted to a plan, on the generated county: solve once with the rounding against node
// potentials (at --first-step, default the step itself), fit each junction's phase to the roads
// that plan drives (fittedTravelSteps in shared/flow/route-timing.ts), solve again with those
// steps, and print both solves' trip-time figures (routeTiming, plannedRoutes), curve marks,
// times and this process's peak memory. One JSON line. Keep to --size 150 or less while others
// run county-sized work: the full size at 60 s needs two solves of several GB.
//   npx tsx tests/bench/county/route-fit.ts [--size 100] [--step 60] [--first-step 300] [--horizon-minutes 360]
import { loadavg } from 'node:os';
import { parseArgs } from 'node:util';
import { fittedTravelSteps, solveEvacuation, type EvacuationResult } from '../../../shared/flow';
import { buildRoadGraph } from '../../../shared/geo/build-road-graph';
import { attachShelters, attachZones } from '../../../shared/geo/attach-zones-and-shelters';
import { indexNodes } from '../../../shared/geo/node-index';
import { readShelters } from '../../../shared/geo/read-shelters';
import { readZones } from '../../../shared/geo/read-zones';
import { buildEvacuationProblem } from '../../../shared/model/build-evacuation-problem';
import { defaultCapacityTable } from '../../../shared/model/capacity-defaults';
import { horizonStepsOf } from '../../../shared/model/run-budget';
import { countyRoads, countyShelters, countyZones, FULL_COUNTY } from './county';

const { values } = parseArgs({
  options: {
    size: { type: 'string', default: '100' },
    step: { type: 'string', default: '60' },
    'first-step': { type: 'string' },
    'horizon-minutes': { type: 'string', default: '360' },
  },
});
const spec = { ...FULL_COUNTY, size: Number(values.size) };
const step = Number(values.step);
const firstStep = Number(values['first-step'] ?? values.step);
const horizonMinutes = Number(values['horizon-minutes']);

const graph = buildRoadGraph(countyRoads(spec));
const zones = readZones(countyZones(spec));
const shelters = readShelters(countyShelters(spec));
const index = indexNodes(graph);
const zoneAt = attachZones(index, zones);
const shelterAt = attachShelters(index, shelters);
/** The county's problem at a step; the roads (and their indices) are the same at every step. */
const problemAt = (dt: number) =>
  buildEvacuationProblem(
    { nodeCount: graph.nodes.length, segments: graph.segments },
    defaultCapacityTable(),
    [],
    zones.map((z, i) => ({ id: String(i), attributes: z.attributes, entryNodes: zoneAt[i]!.entryNodes })),
    shelters.map((s, i) => ({ id: String(i), attributes: s.attributes, node: shelterAt[i]!.node })),
    { timeStepSeconds: dt, horizonSteps: horizonStepsOf(horizonMinutes, dt) },
  ).problem;

const figures = (r: EvacuationResult) => ({
  clearanceStep: r.curve.clearanceStep,
  marks: r.curve.marks,
  delivered: r.curve.deliveredVehiclesByStep[r.horizonSteps],
  routeTiming: { largestSeconds: Math.round(r.routeTiming.largestSeconds), typicalSeconds: Math.round(r.routeTiming.typicalSeconds) },
  plannedRoutes: {
    vehicles: r.plannedRoutes.vehicles,
    largestSeconds: Math.round(r.plannedRoutes.largestSeconds),
    typicalSeconds: Math.round(r.plannedRoutes.typicalSeconds),
    withinOneStepShare: Math.round(1000 * r.plannedRoutes.withinOneStepShare) / 1000,
  },
});

const problem = problemAt(step);
let t = performance.now();
const base = solveEvacuation(problem);
const baseMs = Math.round(performance.now() - t);
t = performance.now();
const first = firstStep === step ? base : solveEvacuation(problemAt(firstStep));
const steps = fittedTravelSteps(problem, first.plan.roads.totalVehicles);
const fitMs = Math.round(performance.now() - t);
t = performance.now();
const fitted = solveEvacuation(problem, { roadTravelSteps: steps });
const fittedMs = Math.round(performance.now() - t);
process.stdout.write(
  `${JSON.stringify({
    size: spec.size,
    stepSeconds: step,
    firstStepSeconds: firstStep,
    roads: problem.roads.length,
    demandVehicles: base.demandVehicles,
    potentials: { ...figures(base), solveMs: baseMs },
    fitted: { ...figures(fitted), firstSolveAndFitMs: fitMs, solveMs: fittedMs },
    peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024),
    loadAverage: loadavg().map((x) => x.toFixed(2)).join(' '),
  })}\n`,
);
