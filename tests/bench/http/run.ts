// `npm run bench:http [-- --seconds 10] [-- --readme] [-- --profile] [-- --api-processes 2]`: the API under load on
// loopback. Starts PostgreSQL if needed, creates and seeds a throwaway database, starts the API
// server and one run worker as separate processes (production settings, warn-level logs), signs
// clients in, then for --seconds runs 200 read and 20 write connections at once (autocannon;
// --read-connections, --write-connections) while a paced client keeps runs queued for the
// worker. Prints one table; --readme writes it into tests/bench/http/README.md (one block per
// load shape). Processes and the database are removed at the end, also on failure or Ctrl+C.
// Results also go to tests/output/http-bench/results.json.
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { demoAccounts } from '../../../server/seed/demo-accounts';
import { commitDescription, startBenchStack, type BenchStack } from './bench-stack';
import { prepareFixture } from './bench-fixture';
import { runLoadGroup } from './load-group';
import { readRequests, writeRequests } from './load-mix';
import { formatReport } from './report';
import { startRunStarter } from './run-starter';
import { signIn, signInAll } from './sign-in';
import { workerRunsBetween } from './worker-runs';
import { databaseCpuSince, databaseCpuSnapshot } from './database-cpu';
import { formatRouteCosts, measureEachRoute } from './each-route';

const root = fileURLToPath(new URL('../../../', import.meta.url));
const here = fileURLToPath(new URL('./', import.meta.url));
const out = `${root}tests/output/http-bench/`;
const READ_P99_TARGET_MS = 250;

const { values } = parseArgs({
  options: {
    seconds: { type: 'string', default: '60' },
    'read-connections': { type: 'string', default: '200' },
    'write-connections': { type: 'string', default: '20' },
    'warmup-seconds': { type: 'string', default: '5' },
    // API processes sharing the port (the product's API_PROCESSES, default 1).
    'api-processes': { type: 'string', default: '1' },
    // The worker's CPU priority (the product's WORKER_NICENESS, default 10); 0 to compare.
    'worker-niceness': { type: 'string', default: '10' },
    // Each connection sends this many requests per second, as a client with a person behind it
    // does; unset, each sends the next as soon as the answer arrives (the saturating closed loop).
    rate: { type: 'string', default: '' },
    readme: { type: 'boolean', default: false },
    // Writes a V8 CPU profile of the API server to tests/output/http-bench/ (open it in Chrome's DevTools).
    profile: { type: 'boolean', default: false },
    // Instead of the mixed load: each read route alone for --seconds with this many connections (each-route.ts).
    'each-route': { type: 'boolean', default: false },
    'each-route-connections': { type: 'string', default: '50' },
  },
});
const seconds = Number(values.seconds);
const readConnections = Number(values['read-connections']);
const writeConnections = Number(values['write-connections']);
const warmupSeconds = Number(values['warmup-seconds']);
const apiProcesses = Number(values['api-processes']);
const eachRouteConnections = Number(values['each-route-connections']);
const workerNiceness = Number(values['worker-niceness']);
if (!Number.isInteger(workerNiceness) || workerNiceness < 0 || workerNiceness > 19) throw new Error('--worker-niceness must be a whole number from 0 to 19');
const rate = values.rate ? Number(values.rate) : undefined;
if (rate !== undefined && !(rate > 0)) throw new Error('--rate must be a positive number of requests per second per connection');
for (const [name, v] of Object.entries({ seconds, readConnections, writeConnections, apiProcesses, eachRouteConnections })) {
  if (!Number.isInteger(v) || v < 1) throw new Error(`--${name} must be a positive whole number`);
}
mkdirSync(out, { recursive: true });
const say = (s: string) => process.stderr.write(`[bench:http] ${s}\n`);
const loadAverage = () => os.loadavg().map((x) => x.toFixed(2)).join(' ');

const machine = () => `${os.cpus()[0]?.model ?? 'unknown'} × ${os.cpus().length}, ${Math.round(os.totalmem() / 2 ** 30)} GiB, Node ${process.version}`;
const processesDescription = () =>
  `${apiProcesses} API process${apiProcesses === 1 ? '' : 'es'} (API_PROCESSES), the worker at niceness ${workerNiceness} (WORKER_NICENESS)`;

// One block per load shape, so a lighter run does not replace the 200 + 20 one.
function writeReadmeBlock(id: string, text: string): void {
  const readme = `${here}README.md`;
  const start = `<!-- bench:${id}:start -->`;
  const end = `<!-- bench:${id}:end -->`;
  const current = readFileSync(readme, 'utf8');
  const block = `${start}\n${text}\n${end}`;
  writeFileSync(readme, current.includes(start) ? current.replace(new RegExp(`${start}[\\s\\S]*${end}`), block) : `${current.trimEnd()}\n\n${block}\n`);
}

let stack: BenchStack | null = null;
// A function, so that the finally below reads the stack main() started.
const stopStack = async () => stack?.stop();

async function main(): Promise<void> {
  say(`load average before: ${loadAverage()}`);
  stack = await startBenchStack({
    root,
    out,
    worker: true,
    env: { API_PROCESSES: String(apiProcesses), WORKER_NICENESS: String(workerNiceness) },
    apiNodeArgs: values.profile ? ['--cpu-prof', `--cpu-prof-dir=${out}`] : [],
    say,
  });
  const { baseUrl, api, databaseUrl } = stack;
  const worker = stack.worker!;

  say('signing in');
  const readSessions = await signInAll(baseUrl, demoAccounts, 8);
  const writers = demoAccounts.filter((a) => a.role === 'planner' || a.role === 'admin');
  const writeSessions = await signInAll(baseUrl, writers, 5);
  const planner = demoAccounts.find((a) => a.role === 'planner')!;
  const runStarterSession = await signIn(baseUrl, planner.email, planner.password);

  say('finding the demo plan and solving a first run');
  const fixture = await prepareFixture(baseUrl, runStarterSession, 300_000);
  say(`first run solved in ${fixture.firstRunSeconds.toFixed(1)} s`);

  if (values['each-route']) {
    say(`each read route alone for ${seconds} s with ${eachRouteConnections} connections`);
    const loadAverageBefore = loadAverage();
    const costs = await measureEachRoute(baseUrl, readRequests(fixture), readSessions, eachRouteConnections, seconds, api, databaseUrl);
    const text = formatRouteCosts(
      `Measured ${new Date().toISOString()} on ${machine()}, commit ${commitDescription(root, 'tests/bench/http/README.md')}; ${processesDescription()}; ` +
        `each read route alone for ${seconds} s (after 1 s not measured) with ${eachRouteConnections} connections, no writes, no runs started; ` +
        `load average (1, 5, 15 min) ${loadAverageBefore} before, ${loadAverage()} after. CPU per request: the API ${apiProcesses === 1 ? 'process' : 'processes'} and this database's PostgreSQL backends.`,
      costs,
    );
    process.stdout.write(`${text}\n`);
    if (values.readme) writeReadmeBlock(`each-route-${eachRouteConnections}-connections-${seconds}s${apiProcesses === 1 ? '' : `-${apiProcesses}-api-processes`}`, text);
    return;
  }

  if (warmupSeconds > 0) {
    say(`warming up for ${warmupSeconds} s (not measured)`);
    await Promise.all([
      runLoadGroup('reads', baseUrl, readRequests(fixture), readSessions, Math.min(20, readConnections), warmupSeconds).done,
      runLoadGroup('writes', baseUrl, writeRequests(fixture), writeSessions, Math.min(2, writeConnections), warmupSeconds).done,
    ]);
  }

  say(`measuring for ${seconds} s: ${readConnections} read and ${writeConnections} write connections${rate ? `, ${rate} requests/s each` : ''}, runs kept queued`);
  const loadAverageBefore = loadAverage();
  const cpuBefore = { api: api.cpuSeconds(), worker: worker.cpuSeconds(), bench: process.cpuUsage(), database: await databaseCpuSnapshot(databaseUrl) };
  const from = new Date();
  // Two runs waiting or running keeps the worker busy without a backlog; one start every 3 s at
  // most is 20 a minute, inside the default RUN_STARTS_PER_MINUTE of 30.
  const starter = startRunStarter(baseUrl, runStarterSession, fixture.planId, 2, 3000);
  const groups = await Promise.all([
    runLoadGroup('reads', baseUrl, readRequests(fixture), readSessions, readConnections, seconds, rate).done,
    runLoadGroup('writes', baseUrl, writeRequests(fixture), writeSessions, writeConnections, seconds, rate).done,
  ]);
  const runStarts = await starter.stop();
  const to = new Date();
  const cpuAfter = { api: api.cpuSeconds(), worker: worker.cpuSeconds(), bench: process.cpuUsage(cpuBefore.bench), database: await databaseCpuSince(databaseUrl, cpuBefore.database) };
  const loadAverageAfter = loadAverage();
  const workerRuns = await workerRunsBetween(databaseUrl, from, to);
  const spent = (a: number | null, b: number | null) => (a === null || b === null ? null : b - a);

  const header =
    `Measured ${from.toISOString()} on ${machine()}, ` +
    `commit ${commitDescription(root, 'tests/bench/http/README.md')}; ${seconds} s after a ${warmupSeconds} s warm-up; ` +
    `${processesDescription()}; ` +
    `load average (1, 5, 15 min) ${loadAverageBefore} before the load.` +
    (rate
      ? ` Paced: each connection sends ${rate} request${rate === 1 ? '' : 's'} per second (autocannon connectionRate), the connections opened in 10 groups spread over ${rate === 1 ? 'one second' : 'one interval'} so that they do not all send at the same instant; latencies are from send to answer, and autocannon's own p99, corrected for coordinated omission, is ${groups.map((g) => `${g.autocannon.latency.p99} ms for ${g.group}`).join(' and ')}.`
      : ' Closed loop: each connection sends its next request as soon as the answer arrives.');
  const { text, readTargetMet } = formatReport({
    header,
    groups,
    runStarts,
    workerRuns,
    cpu: [
      { name: 'API', seconds: spent(cpuBefore.api, cpuAfter.api) },
      { name: 'worker', seconds: spent(cpuBefore.worker, cpuAfter.worker) },
      { name: 'PostgreSQL (this database)', seconds: cpuAfter.database },
      { name: 'bench (autocannon)', seconds: (cpuAfter.bench.user + cpuAfter.bench.system) / 1e6 },
    ],
    loadAverageAfter,
    readP99TargetMs: READ_P99_TARGET_MS,
  });
  process.stdout.write(`${text}\n`);
  writeFileSync(
    `${out}results.json`,
    JSON.stringify(
      {
        header,
        groups: groups.map((g) => ({ ...g, latenciesMs: undefined, byRoute: Object.fromEntries([...g.byRoute].map(([k, v]) => [k, { count: v.latenciesMs.length, statuses: Object.fromEntries(v.statuses) }])) })),
        runStarts,
        workerRuns,
        loadAverageAfter,
      },
      null,
      2,
    ),
  );
  if (values.readme) writeReadmeBlock(`${readConnections}-reads-${writeConnections}-writes-${seconds}s${rate ? `-${rate}-per-second` : ''}${apiProcesses === 1 ? '' : `-${apiProcesses}-api-processes`}`, text);
  if (!readTargetMet) process.exitCode = 1;
}

try {
  await main();
} catch (e) {
  process.exitCode = 2;
  say(e instanceof Error ? (e.stack ?? e.message) : String(e));
} finally {
  await stopStack();
}
