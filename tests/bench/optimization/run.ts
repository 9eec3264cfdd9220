// Times each search on the demo town and on the generated county (tests/bench/county, 179,108
// segments). Figures go into README.md beside this file; never run in tests.
//   npx tsx tests/bench/optimization/run.ts [demo|county|all]
import { antiparallelPairs, bestContraflow, bestLaneImprovements, bestReleaseOrder, rankClosures, zoneRoutes } from '../../../shared/plan-optimization';
import type { EvacuationProblem } from '../../../shared/flow';
import { loadGlpkSolver } from '../../../server/optimization/glpk-solver';
import { countyProblem, demoProblem } from './demo-problem';

const which = process.argv[2] ?? 'all';
const solver = await loadGlpkSolver();

// Wall-clock time, and the CPU time of this process (user + system), which a machine shared with
// other work changes much less than the wall clock.
function time<T>(label: string, fn: () => T, describe: (r: T) => string): T {
  const started = performance.now();
  const cpu = process.cpuUsage();
  const r = fn();
  const used = process.cpuUsage(cpu);
  const wall = ((performance.now() - started) / 1000).toFixed(1).padStart(7);
  const cpuSeconds = ((used.user + used.system) / 1e6).toFixed(1).padStart(6);
  console.log(`${label.padEnd(46)} ${wall} s wall ${cpuSeconds} s CPU  ${describe(r)}`);
  return r;
}

function all(name: string, problem: EvacuationProblem, county: boolean) {
  console.log(`\n${name}: ${problem.nodeCount} junctions, ${problem.roads.length} roads, ${problem.zones.length} zones, Δ = ${problem.timeStepSeconds} s, T = ${problem.horizonSteps}`);
  const pairs = antiparallelPairs(problem);
  time('best contraflow, steady state', () => bestContraflow(problem, pairs, { timeExpanded: false }), (r) => `${r.steady.baseVehPerHour} → ${r.steady.achievedVehPerHour} veh/h (${r.steady.method}, ${r.steady.corridors.length} corridors of ${pairs.length} pairs)`);
  time('best contraflow, steady, at most 3 corridors', () => bestContraflow(problem, pairs, { timeExpanded: false, maxCorridors: 3 }), (r) => `${r.steady.achievedVehPerHour} of bound ${r.steady.boundVehPerHour} veh/h (${r.steady.method})`);
  if (county) {
    // The time-expanded searches need the county's whole evacuation over time: its 96,000 vehicles
    // at the base 10,000 veh/h take nearly 10 hours, and 358,216 roads × 600 one-minute steps is
    // about 215 million arcs, far past RUN_MAX_EXPANDED_ARCS (30 million): the product refuses it.
    time('200 closures, steady state only', () => rankClosures(problem, { clearance: false, maxCandidates: 200 }), (r) => `${r.impacts.length} roads, worst −${r.impacts.map((i) => i.lossVehPerHour).sort((a, b) => b - a)[0]} veh/h`);
    time('best 2 added lanes (steady state)', () => bestLaneImprovements(problem, { budget: 2, maxLanesPerRoad: 1 }, solver), (r) => `${r.baseVehPerHour} → ${r.achievedVehPerHour} veh/h (${r.method}, bound ${r.boundVehPerHour})`);
    return;
  }
  time('best contraflow, with time-expanded bound', () => bestContraflow(problem, pairs), (r) => `clearance ${r.timeExpanded!.base.clearanceStep} → ${r.timeExpanded!.chosen.clearanceStep} steps, bound ${r.timeExpanded!.bound.clearanceStep}`);
  time('200 closures, steady state only', () => rankClosures(problem, { clearance: false, maxCandidates: 200 }), (r) => `${r.impacts.length} roads, worst −${r.impacts.map((i) => i.lossVehPerHour).sort((a, b) => b - a)[0]} veh/h`);
  time('200 closures, clearance for the worst 20', () => rankClosures(problem, { maxCandidates: 200 }), (r) => `${r.impacts.length} roads, ${r.impacts.filter((i) => i.clearanceTested).length} with clearance`);
  time('best 2 added lanes', () => bestLaneImprovements(problem, { budget: 2, maxLanesPerRoad: 1 }, solver), (r) => `${r.baseVehPerHour} → ${r.achievedVehPerHour} veh/h (${r.method}, bound ${r.boundVehPerHour})`);
  time('quickest release order', () => bestReleaseOrder(problem), (r) => `clearance ${r.quickestClearanceStep} steps vs ${r.expectedClearanceStep} expected`);
  time('zone routes', () => zoneRoutes(problem), (r) => `${r.zones.length} zones`);
}

console.log(`load average at start: ${(await import('node:os')).loadavg().map((l) => l.toFixed(1)).join(', ')}`);
if (which === 'demo' || which === 'all') {
  all('Demo town (product defaults Δ = 60 s, 6 h)', demoProblem(60, 360), false);
}
if (which === 'county' || which === 'all') {
  const started = performance.now();
  const county = countyProblem(60, 600);
  console.log(`county built in ${((performance.now() - started) / 1000).toFixed(1)} s`);
  all('Generated county (300 × 300 blocks)', county, true);
}
