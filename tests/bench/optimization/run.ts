// Times each search on the demo town and on the generated county (tests/bench/county, 179,108
// segments). Figures go into README.md beside this file; never run in tests.
//   npx tsx tests/bench/optimization/run.ts [demo|county|all] [--layout explicit|implicit|auto] [--county-hours H] [--clearance-tests N]
// The searches over time run on the layout given (default auto: as the product chooses under its
// default run budget, shared/model/search-budget.ts). On the county they run on the implicit
// network at a one-minute step; run the county once, never in a loop (several GB, many minutes).
import { antiparallelPairs, bestContraflow, bestLaneImprovements, bestReleaseOrder, rankClosures, zoneRoutes, type ExpandedLayout } from '../../../shared/plan-optimization';
import type { EvacuationProblem } from '../../../shared/flow';
import { chooseSearchLayout } from '../../../shared/model/search-budget';
import { loadGlpkSolver } from '../../../server/optimization/glpk-solver';
import { countyProblem, demoProblem } from './demo-problem';

const which = process.argv[2] ?? 'all';
const option = (name: string): string | undefined => {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : undefined;
};
const layoutOption = (option('--layout') ?? 'auto') as ExpandedLayout | 'auto';
const countyHours = Number(option('--county-hours') ?? 6);
const clearanceTests = Number(option('--clearance-tests') ?? 20);
// The product's default run budget (server/config.ts: RUN_MAX_EXPANDED_ARCS, RUN_MAX_EXPANDED_MEGABYTES).
const DEFAULT_BUDGET = { maxExpandedArcs: 600_000_000, maxBytes: 6144 * 2 ** 20 };
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

const rss = () => `${Math.round(process.memoryUsage().rss / 2 ** 20)} MiB RSS now, ${Math.round(process.resourceUsage().maxRSS / 1024)} MiB peak so far`;

function all(name: string, problem: EvacuationProblem) {
  console.log(`\n${name}: ${problem.nodeCount} junctions, ${problem.roads.length} roads, ${problem.zones.length} zones, Δ = ${problem.timeStepSeconds} s, T = ${problem.horizonSteps}`);
  const pairs = antiparallelPairs(problem);
  const layoutOf = (kind: 'contraflow' | 'closures' | 'release-order' | 'zone-routes'): ExpandedLayout => {
    if (layoutOption !== 'auto') return layoutOption;
    const choice = chooseSearchLayout(kind, problem, DEFAULT_BUDGET);
    if (choice.layout === null) throw new Error(choice.refusal);
    return choice.layout;
  };
  time('best contraflow, steady state', () => bestContraflow(problem, pairs, { timeExpanded: false }), (r) => `${r.steady.baseVehPerHour} → ${r.steady.achievedVehPerHour} veh/h (${r.steady.method}, ${r.steady.corridors.length} corridors of ${pairs.length} pairs)`);
  time('best contraflow, steady, at most 3 corridors', () => bestContraflow(problem, pairs, { timeExpanded: false, maxCorridors: 3 }), (r) => `${r.steady.achievedVehPerHour} of bound ${r.steady.boundVehPerHour} veh/h (${r.steady.method})`);
  time('200 closures, steady state only', () => rankClosures(problem, { clearance: false, maxCandidates: 200 }), (r) => `${r.impacts.length} roads, worst −${r.impacts.map((i) => i.lossVehPerHour).sort((a, b) => b - a)[0]} veh/h`);
  time('best 2 added lanes', () => bestLaneImprovements(problem, { budget: 2, maxLanesPerRoad: 1 }, solver), (r) => `${r.baseVehPerHour} → ${r.achievedVehPerHour} veh/h (${r.method}, bound ${r.boundVehPerHour})`);
  const layout = { contraflow: layoutOf('contraflow'), closures: layoutOf('closures'), release: layoutOf('release-order'), routes: layoutOf('zone-routes') };
  // Cheapest over time first (one curve), the contraflow bound (four) last.
  time(`zone routes (${layout.routes})`, () => zoneRoutes(problem, { layout: layout.routes }), (r) => `${r.zones.length} zones, clearance ${r.clearanceStep}, delivered ${r.zones.reduce((s, z) => s + z.deliveredVehicles, 0)}; ${rss()}`);
  time(`quickest release order (${layout.release})`, () => bestReleaseOrder(problem, { layout: layout.release }), (r) => `clearance ${r.quickestClearanceStep} steps vs ${r.expectedClearanceStep} expected; delivered ${r.quickestDeliveredAtHorizon} vs ${r.expectedDeliveredAtHorizon}; schedule clears ${r.scheduleClearanceStep}; ${rss()}`);
  time(`200 closures, clearance for the worst ${clearanceTests} (${layout.closures})`, () => rankClosures(problem, { maxCandidates: 200, maxClearanceTests: clearanceTests, layout: layout.closures }), (r) => `${r.impacts.length} roads, ${r.impacts.filter((i) => i.clearanceTested).length} with clearance (${r.clearanceLayout}, ${r.freshSolves} afresh); base clearance ${r.baseClearanceStep}, delivered ${r.baseDeliveredAtHorizon}; worst ${JSON.stringify(r.impacts[0] ?? null)}; ${rss()}`);
  time(`best contraflow, time-expanded bound (${layout.contraflow})`, () => bestContraflow(problem, pairs, { layout: layout.contraflow }), (r) => `clearance ${r.timeExpanded!.base.clearanceStep} → ${r.timeExpanded!.chosen.clearanceStep} steps (${r.timeExpanded!.chosen.from}), bound ${r.timeExpanded!.bound.clearanceStep}; delivered ${r.timeExpanded!.base.deliveredAtHorizon} → ${r.timeExpanded!.chosen.deliveredAtHorizon} of bound ${r.timeExpanded!.bound.deliveredAtHorizon}; ${rss()}`);
}

console.log(`load average at start: ${(await import('node:os')).loadavg().map((l) => l.toFixed(1)).join(', ')}`);
if (which === 'demo' || which === 'all') {
  all('Demo town (product defaults Δ = 60 s, 6 h)', demoProblem(60, 360));
}
if (which === 'county' || which === 'all') {
  const started = performance.now();
  const county = countyProblem(60, Math.round(countyHours * 60));
  console.log(`county built in ${((performance.now() - started) / 1000).toFixed(1)} s`);
  all('Generated county (300 × 300 blocks)', county);
}
