// Route travel times against free flow (docs/model.md §1): on grids of roads much shorter than the
// time step, the first arrival from a zone must lie within one step of the free-flow shortest
// path time / Δ, computed here by a textbook Dijkstra (Dijkstra 1959; O(V²), written in this test,
// not the engine's). Coarse against fine: on a larger grid the 50/90/95 % times at Δ = 300 s stay
// within one coarse step of those at Δ = 60 s (both are the same physical model; the issue's
// acceptance check). The error the result reports is compared with the same Dijkstra.
import { describe, expect, it } from 'vitest';
import { fittedTravelSteps, givenTravelSteps, nodeTimePotential, routeTravelSteps, solveEvacuation, travelStepsAgainst, type EvacuationProblem, type EvacuationRoad } from '../../../shared/flow';

/** A two-way grid of `nx` × `ny` junctions, `blockMeters` apart, at `kmh`. */
function grid(nx: number, ny: number, blockMeters: number, kmh: number, capacityVehPerHour: number): { nodeCount: number; roads: EvacuationRoad[] } {
  const seconds = blockMeters / (kmh / 3.6);
  const roads: EvacuationRoad[] = [];
  const id = (x: number, y: number): number => y * nx + x;
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      if (x + 1 < nx) {
        roads.push({ from: id(x, y), to: id(x + 1, y), capacityVehPerHour, travelTimeSeconds: seconds });
        roads.push({ from: id(x + 1, y), to: id(x, y), capacityVehPerHour, travelTimeSeconds: seconds });
      }
      if (y + 1 < ny) {
        roads.push({ from: id(x, y), to: id(x, y + 1), capacityVehPerHour, travelTimeSeconds: seconds });
        roads.push({ from: id(x, y + 1), to: id(x, y), capacityVehPerHour, travelTimeSeconds: seconds });
      }
    }
  }
  return { nodeCount: nx * ny, roads };
}

/** Free-flow seconds from any of `sources` to every node: Dijkstra with an O(V²) scan. */
function dijkstra(nodeCount: number, roads: readonly EvacuationRoad[], sources: readonly number[]): number[] {
  const dist = new Array<number>(nodeCount).fill(Infinity);
  const done = new Array<boolean>(nodeCount).fill(false);
  for (const s of sources) dist[s] = 0;
  for (;;) {
    let u = -1;
    for (let v = 0; v < nodeCount; v++) if (!done[v] && dist[v]! < Infinity && (u < 0 || dist[v]! < dist[u]!)) u = v;
    if (u < 0) return dist;
    done[u] = true;
    for (const road of roads) if (road.from === u && dist[u]! + road.travelTimeSeconds < dist[road.to]!) dist[road.to] = dist[u]! + road.travelTimeSeconds;
  }
}

const firstArrivalStep = (delivered: readonly number[]): number => delivered.findIndex((d) => d > 0);

describe('route travel times', () => {
  it('first arrival on a 40 × 12 grid of 100 m roads at 50 km/h is within one 60 s step of free flow', () => {
    // 7.2 s per road. Zone on the left edge, exit on the right edge; with every road costing a
    // whole step the first vehicle arrived at step 39 instead of about 5.
    const { nodeCount, roads } = grid(40, 12, 100, 50, 600);
    const zoneNode = 6 * 40; // (0, 6)
    const shelterNode = 6 * 40 + 39; // (39, 6)
    const problem: EvacuationProblem = {
      nodeCount,
      roads,
      zones: [{ id: 'west', entryNodes: [zoneNode], vehicles: 50 }],
      shelters: [{ id: 'east', node: shelterNode, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 20,
    };
    const result = solveEvacuation(problem);
    const freeFlow = dijkstra(nodeCount, roads, [zoneNode])[shelterNode]!; // 39 × 7.2 = 280.8 s
    expect(freeFlow).toBeCloseTo(280.8, 6);
    const first = firstArrivalStep(result.curve.deliveredVehiclesByStep);
    expect(Math.abs(first - freeFlow / 60)).toBeLessThanOrEqual(1);
    // The route is a fastest one to the nearest shelter: within half a step, as reported.
    expect(result.routeTiming.largestSeconds).toBeLessThanOrEqual(30 + 1e-9);
    // So no warning names a fastest trip. The plan spreads its 50 vehicles over neighbouring rows
    // (a road against the potential each): typically 64.8 s off by the engine, just past one step,
    // and that is what the one route-time warning says.
    const routeWarnings = result.warnings.filter((w) => w.code === 'route-time-error').map((w) => w.message);
    expect(routeWarnings).toHaveLength(1);
    expect(routeWarnings[0]).toMatch(/^the routes the plan's 50 vehicles drive/);
  });

  it('first arrival from every zone to every single shelter, on grids with roads of 2–50 s, within one step', () => {
    // Several zones and shelters at once; each check solves with one shelter open so that the
    // first arrival is that pair's, and compares with Dijkstra from the zone's entry nodes.
    const cases = [
      { nx: 12, ny: 9, block: 60, kmh: 40, dt: 60 },
      { nx: 10, ny: 10, block: 250, kmh: 30, dt: 60 },
      { nx: 15, ny: 6, block: 30, kmh: 50, dt: 30 },
      { nx: 8, ny: 8, block: 400, kmh: 90, dt: 120 },
    ];
    for (const c of cases) {
      const { nodeCount, roads } = grid(c.nx, c.ny, c.block, c.kmh, 900);
      const zones = [
        { id: 'a', entryNodes: [0, 1], vehicles: 30 },
        { id: 'b', entryNodes: [nodeCount - 1], vehicles: 30 },
        { id: 'c', entryNodes: [Math.floor(nodeCount / 2)], vehicles: 30 },
      ];
      const shelterNodes = [c.nx - 1, nodeCount - c.nx, Math.floor(c.ny / 2) * c.nx];
      for (const zone of zones) {
        const free = dijkstra(nodeCount, roads, zone.entryNodes);
        for (const node of shelterNodes) {
          const problem: EvacuationProblem = {
            nodeCount,
            roads,
            zones: [zone],
            shelters: [{ id: 's', node, capacityVehicles: null }],
            timeStepSeconds: c.dt,
            horizonSteps: Math.ceil((free[node]! * 1.5) / c.dt) + 3,
          };
          const first = firstArrivalStep(solveEvacuation(problem).curve.deliveredVehiclesByStep);
          expect(Math.abs(first - free[node]! / c.dt), `${JSON.stringify(c)} zone ${zone.id} → node ${node}`).toBeLessThanOrEqual(1);
        }
      }
    }
  });

  it('reports the largest and typical difference between modelled and free-flow trips, and warns past one step', () => {
    // Two zones in a row of 7.2 s roads with exits at both ends: whichever potential the steps are
    // rounded against, some fastest trip runs against it (away from its nearest exit, or towards
    // the other zone), where each road is rounded up. The report must match Dijkstra over the
    // engine's steps, and the engine must keep the potential with the smaller largest difference.
    const { nodeCount, roads } = grid(30, 1, 100, 50, 600);
    const problem: EvacuationProblem = {
      nodeCount,
      roads,
      zones: [
        { id: 'z1', entryNodes: [10], vehicles: 10 },
        { id: 'z2', entryNodes: [20], vehicles: 10 },
      ],
      shelters: [
        { id: 'west', node: 0, capacityVehicles: null },
        { id: 'east', node: 29, capacityVehicles: null },
      ],
      timeStepSeconds: 60,
      horizonSteps: 30,
    };
    const result = solveEvacuation(problem);
    const largestBy = (steps: ArrayLike<number>): { largest: number; all: number[] } => {
      const all: number[] = [];
      for (const zone of problem.zones) {
        const free = dijkstra(nodeCount, roads, zone.entryNodes);
        const modelled = dijkstra(nodeCount, roads.map((r, e) => ({ ...r, travelTimeSeconds: steps[e]! * 60 })), zone.entryNodes);
        for (const shelter of problem.shelters) all.push(Math.abs(modelled[shelter.node]! - free[shelter.node]!));
      }
      return { largest: Math.max(...all), all: all.sort((a, b) => a - b) };
    };
    const used = largestBy(routeTravelSteps(problem).steps);
    expect(result.routeTiming.pairs).toBe(4);
    expect(result.routeTiming.largestSeconds).toBeCloseTo(used.largest, 6);
    expect(result.routeTiming.typicalSeconds).toBeCloseTo(used.all[1]!, 6);
    for (const kind of ['to-shelters', 'from-zones'] as const) {
      expect(used.largest).toBeLessThanOrEqual(largestBy(travelStepsAgainst(problem, nodeTimePotential(problem, kind))).largest + 1e-9);
    }
    const shelterSteps = travelStepsAgainst(problem, nodeTimePotential(problem, 'to-shelters'));
    // Against the shelters, each zone's fastest trip to its nearest exit is within half a step.
    for (const [zoneNode, exit] of [[10, 0], [20, 29]] as const) {
      const free = dijkstra(nodeCount, roads, [zoneNode])[exit]!;
      const modelled = dijkstra(nodeCount, roads.map((r, e) => ({ ...r, travelTimeSeconds: shelterSteps[e]! * 60 })), [zoneNode])[exit]!;
      expect(Math.abs(modelled - free)).toBeLessThanOrEqual(30 + 1e-9);
    }
    const warning = result.warnings.find((w) => w.code === 'route-time-error');
    expect(result.routeTiming.largestSeconds).toBeGreaterThan(60);
    expect(warning?.message).toMatch(/time step of \d+ s should bring it within 60 s/);
  });

  it('times the routes the plan drives: a chain of twenty 7.2 s roads is modelled in 2 steps, 24 s off its 144 s', () => {
    // One route only, so the expected figures follow from the rule by hand: the potentials to the
    // shelter telescope along the chain, Σ τ = round(144 / 60) = 2 steps = 120 s, against 144 s.
    const roads: EvacuationRoad[] = Array.from({ length: 20 }, (_, k) => ({ from: k, to: k + 1, capacityVehPerHour: 600, travelTimeSeconds: 7.2 }));
    const result = solveEvacuation({
      nodeCount: 21,
      roads,
      zones: [{ id: 'z', entryNodes: [0], vehicles: 30 }],
      shelters: [{ id: 's', node: 20, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 10,
    });
    expect(result.plan.roads.travelSteps.reduce((a, b) => a + b, 0)).toBe(2);
    expect(result.plannedRoutes.vehicles).toBe(30);
    expect(result.plannedRoutes.largestSeconds).toBeCloseTo(24, 9);
    expect(result.plannedRoutes.typicalSeconds).toBeCloseTo(24, 9);
    expect(result.plannedRoutes.withinOneStepShare).toBe(1);
  });

  it('roads of exact multiples of the step keep their plain step count', () => {
    const roads: EvacuationRoad[] = [
      { from: 0, to: 1, capacityVehPerHour: 600, travelTimeSeconds: 120 },
      { from: 1, to: 2, capacityVehPerHour: 600, travelTimeSeconds: 60 },
      { from: 0, to: 2, capacityVehPerHour: 600, travelTimeSeconds: 300 },
      { from: 2, to: 0, capacityVehPerHour: 600, travelTimeSeconds: 180 },
    ];
    const problem: EvacuationProblem = {
      nodeCount: 3,
      roads,
      zones: [{ id: 'z', entryNodes: [0], vehicles: 1 }],
      shelters: [{ id: 's', node: 2, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 10,
    };
    expect(Array.from(routeTravelSteps(problem).steps)).toEqual([2, 1, 5, 3]);
  });

  it('zero-step roads never form a cycle, even round roads that take no time', () => {
    const roads: EvacuationRoad[] = [
      { from: 0, to: 1, capacityVehPerHour: 600, travelTimeSeconds: 0 },
      { from: 1, to: 0, capacityVehPerHour: 600, travelTimeSeconds: 0 },
      { from: 1, to: 2, capacityVehPerHour: 600, travelTimeSeconds: 5 },
      { from: 2, to: 1, capacityVehPerHour: 600, travelTimeSeconds: 5 },
      { from: 2, to: 3, capacityVehPerHour: 600, travelTimeSeconds: 0 },
    ];
    const problem: EvacuationProblem = {
      nodeCount: 4,
      roads,
      zones: [{ id: 'z', entryNodes: [0], vehicles: 3 }],
      shelters: [{ id: 's', node: 3, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 4,
    };
    const { steps } = routeTravelSteps(problem);
    expect(steps[0]! + steps[1]!).toBeGreaterThanOrEqual(1);
    expect(steps[2]! + steps[3]!).toBeGreaterThanOrEqual(1);
    const result = solveEvacuation(problem, { verify: true });
    expect(result.verification?.ok).toBe(true);
    // Roads of no time at all at equal potential take one step unless they lead to a lower node
    // index (0 → 1 and 2 → 3 here): a known cost of that tie-break, two steps for 5 s.
    expect(result.curve.deliveredVehiclesByStep.slice(0, 3)).toEqual([0, 0, 3]);
  });
});

describe('no route is modelled faster than free flow', () => {
  it('on random grids of short roads, every trip between any two junctions takes at least its free-flow time less one step', () => {
    // The lower bound that keeps the plan honest (docs/model.md §1): Σ τ_e·Δ ≥ Σ t_e − Δ on every
    // route. Driving a cycle k times shows it needs Σ τ_e·Δ ≥ Σ t_e round every cycle, so each
    // two-way road of t < Δ/2 costs at least one step in one of its directions; a rule that makes
    // both directions of such roads free lets trips along a line of equal potential (a staircase
    // in a grid) cost nothing, and the maximum flow would use them. Reference: the test's own
    // Dijkstra over free-flow seconds and over the engine's steps × Δ, from every junction.
    let seed = 20261205;
    const random = (): number => {
      seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
      return seed / 2 ** 32;
    };
    for (let round = 0; round < 12; round++) {
      const nx = 5 + Math.floor(random() * 5);
      const ny = 4 + Math.floor(random() * 4);
      const dt = random() < 0.5 ? 60 : 30;
      const base = grid(nx, ny, 100, 50, 900);
      // Roads of 2–40 s, some one-way (the reverse dropped).
      const roads = base.roads
        .map((r) => ({ ...r, travelTimeSeconds: 2 + Math.floor(random() * 380) / 10 }))
        .filter(() => random() > 0.1);
      const nodeCount = base.nodeCount;
      const pick = (): number => Math.floor(random() * nodeCount);
      const problem: EvacuationProblem = {
        nodeCount,
        roads,
        zones: [
          { id: 'a', entryNodes: [pick(), pick()], vehicles: 10 },
          { id: 'b', entryNodes: [pick()], vehicles: 10 },
        ],
        shelters: [
          { id: 's', node: pick(), capacityVehicles: null },
          { id: 't', node: pick(), capacityVehicles: null },
        ],
        timeStepSeconds: dt,
        horizonSteps: 40,
      };
      const { steps } = routeTravelSteps(problem);
      const asSteps = roads.map((r, e) => ({ ...r, travelTimeSeconds: steps[e]! * dt }));
      for (let a = 0; a < nodeCount; a++) {
        const free = dijkstra(nodeCount, roads, [a]);
        const modelled = dijkstra(nodeCount, asSteps, [a]);
        for (let b = 0; b < nodeCount; b++) {
          if (!Number.isFinite(free[b]!)) continue;
          expect(modelled[b]!, `round ${round}: ${a} → ${b}, free flow ${free[b]} s`).toBeGreaterThanOrEqual(free[b]! - dt - 1e-6);
        }
      }
    }
  });
});

describe('given and fitted steps', () => {
  const riverGrid = (): EvacuationProblem => {
    // 30 × 20 junctions of 100 m roads at 50 km/h (7.2 s), a river between rows 9 and 10 crossed
    // at x = 3 and x = 26 only, three zones south of it releasing over an hour, exits north at
    // x = 5 and x = 24: the middle zone's vehicles use both far bridges.
    const nx = 30;
    const ny = 20;
    const { nodeCount, roads: all } = grid(nx, ny, 100, 50, 600);
    const roads = all.filter((r) => {
      const rows = [Math.floor(r.from / nx), Math.floor(r.to / nx)].sort((a, b) => a - b);
      return !(rows[0] === 9 && rows[1] === 10) || r.from % nx === 3 || r.from % nx === 26;
    });
    const horizonSteps = 240;
    const releaseFractionByStep = Array.from({ length: horizonSteps + 1 }, (_, t) => Math.min(1, ((t + 1) * 60) / 3600));
    return {
      nodeCount,
      roads,
      zones: [10, 15, 20].map((x, i) => ({ id: `z${i}`, entryNodes: [2 * nx + x, 2 * nx + x + 1, 3 * nx + x], vehicles: 700, releaseFractionByStep })),
      shelters: [5, 24].map((x, i) => ({ id: `s${i}`, node: (ny - 1) * nx + x, capacityVehicles: null })),
      timeStepSeconds: 60,
      horizonSteps,
    };
  };

  it('given steps replace the rounding: the same steps give the same result, on both layouts; a zero-step cycle is refused', () => {
    const problem = riverGrid();
    const { steps } = routeTravelSteps(problem);
    for (const algorithm of ['auto', 'dinic'] as const) {
      const plain = solveEvacuation(problem, { algorithm });
      const given = solveEvacuation(problem, { algorithm, roadTravelSteps: steps });
      expect(given.curve.deliveredVehiclesByStep).toEqual(plain.curve.deliveredVehiclesByStep);
      expect(given.plan.roads.travelSteps).toEqual(Array.from(steps));
    }
    const zeroBothWays = Int32Array.from(steps);
    zeroBothWays[0] = 0;
    zeroBothWays[1] = 0; // roads 0 and 1 are the two directions of one street
    expect(() => givenTravelSteps(problem, zeroBothWays)).toThrow(/close a cycle/);
    expect(() => givenTravelSteps(problem, steps.subarray(1))).toThrow(/entries/);
  }, 120_000);

  it('warns when most of the plan\'s routes are more than one step off, even with the fastest trip exact', () => {
    // A direct road of 60 s carrying 1 vehicle a step, and a detour of two 30 s roads carrying 60,
    // given 3 steps each: the fastest trip (the direct road, 1 step) is exact, but most of the 100
    // vehicles take the detour, modelled 360 s for 60 s at free flow.
    const problem: EvacuationProblem = {
      nodeCount: 3,
      roads: [
        { from: 0, to: 1, capacityVehPerHour: 60, travelTimeSeconds: 60 },
        { from: 0, to: 2, capacityVehPerHour: 3600, travelTimeSeconds: 30 },
        { from: 2, to: 1, capacityVehPerHour: 3600, travelTimeSeconds: 30 },
      ],
      zones: [{ id: 'z', entryNodes: [0], vehicles: 100 }],
      shelters: [{ id: 's', node: 1, capacityVehicles: null }],
      timeStepSeconds: 60,
      horizonSteps: 30,
    };
    const result = solveEvacuation(problem, { roadTravelSteps: Int32Array.from([1, 3, 3]) });
    expect(result.routeTiming.largestSeconds).toBe(0);
    expect(result.plannedRoutes.typicalSeconds).toBeCloseTo(300, 9);
    const warning = result.warnings.find((w) => w.code === 'route-time-error');
    expect(warning?.message).toMatch(/^the routes the plan's 100 vehicles drive are modelled typically 5\.0 min and up to 5\.0 min slower than at free flow/);
    expect(warning?.message).toMatch(/a time step of 10 s should bring the typical route within 60 s/);
    // Within one step on every count: no warning.
    const exact = solveEvacuation(problem, { roadTravelSteps: Int32Array.from([1, 1, 0]) });
    expect(exact.warnings.map((w) => w.code)).not.toContain('route-time-error');
  });

  it('steps fitted to a first solve\'s plan keep the lower bound and bring more of the plan\'s vehicles within one step', () => {
    // Measured when written: 78.0 % of the plan's vehicles within one step by the rounding against
    // potentials, 82.8 % with steps fitted to the first plan's road use (largest 862 s → 418 s).
    // On other grids the fit helped less or not at all (tests/bench/flow/README.md): it is offered
    // as an option, not used by default.
    const problem = riverGrid();
    const first = solveEvacuation(problem);
    const steps = fittedTravelSteps(problem, first.plan.roads.totalVehicles);
    expect(() => givenTravelSteps(problem, steps)).not.toThrow();
    const second = solveEvacuation(problem, { roadTravelSteps: steps, verify: true });
    expect(second.verification?.ok).toBe(true);
    expect(second.plannedRoutes.withinOneStepShare).toBeGreaterThan(first.plannedRoutes.withinOneStepShare + 0.03);
    expect(second.plannedRoutes.largestSeconds).toBeLessThan(first.plannedRoutes.largestSeconds);
    // The lower bound, against Dijkstra from a sample of junctions.
    const asSteps = problem.roads.map((r, e) => ({ ...r, travelTimeSeconds: steps[e]! * 60 }));
    for (let a = 0; a < problem.nodeCount; a += 37) {
      const free = dijkstra(problem.nodeCount, problem.roads, [a]);
      const modelled = dijkstra(problem.nodeCount, asSteps, [a]);
      for (let b = 0; b < problem.nodeCount; b++) if (Number.isFinite(free[b]!)) expect(modelled[b]!).toBeGreaterThanOrEqual(free[b]! - 60 - 1e-6);
    }
  }, 120_000);
});

describe('coarse against fine steps', () => {
  it('on a county-like grid the 50/90/95 % times at Δ = 300 s stay within one coarse step of those at Δ = 60 s', () => {
    // 24 × 24 junctions 200 m apart (14.4 s at 50 km/h, 600 veh/h per direction), a river along
    // the middle row crossed by four bridges, six zones on the south bank releasing over an hour,
    // three exits on the north edge. The same physical problem at two steps.
    const nx = 24;
    const ny = 24;
    const { nodeCount, roads: all } = grid(nx, ny, 200, 50, 600);
    const river = 12;
    const bridges = new Set([3, 9, 15, 21]);
    const roads = all.filter((r) => {
      const crosses = (Math.floor(r.from / nx) === river - 1 && Math.floor(r.to / nx) === river) || (Math.floor(r.from / nx) === river && Math.floor(r.to / nx) === river - 1);
      return !crosses || bridges.has(r.from % nx);
    });
    const zoneNodes = [2, 6, 10, 14, 18, 22].map((x) => 4 * nx + x);
    const solve = (dt: number) => {
      const horizonSteps = (4 * 3600) / dt;
      const releaseFractionByStep = Array.from({ length: horizonSteps + 1 }, (_, t) => Math.min(1, ((t + 1) * dt) / 3600));
      return solveEvacuation({
        nodeCount,
        roads,
        zones: zoneNodes.map((v, i) => ({ id: `z${i}`, entryNodes: [v, v + 1, v + nx], vehicles: 700, releaseFractionByStep })),
        shelters: [2, 12, 21].map((x, i) => ({ id: `s${i}`, node: (ny - 1) * nx + x, capacityVehicles: null })),
        timeStepSeconds: dt,
        horizonSteps,
      });
    };
    const fine = solve(60);
    const coarse = solve(300);
    const end = (step: number | null, dt: number): number => (step === null ? Infinity : (step + 1) * dt);
    for (const mark of ['p50', 'p90', 'p95'] as const) {
      const f = end(fine.curve.marks[mark], 60);
      const c = end(coarse.curve.marks[mark], 300);
      expect(Number.isFinite(f) && Number.isFinite(c), mark).toBe(true);
      expect(Math.abs(c - f), `${mark}: ${f} s at 60 s, ${c} s at 300 s`).toBeLessThanOrEqual(300);
    }
  }, 120_000);
});
