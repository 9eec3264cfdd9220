// glpk.js (the GNU Linear Programming Kit compiled to WebAssembly, from the npm registry) as the
// outside reference: the linear programs below are written straight from the textbook
// formulations, independently of the engine's own network construction.
import GLPK from 'glpk.js/node';

export type Glpk = Awaited<ReturnType<typeof GLPK>>;

let instance: Promise<Glpk> | undefined;
export function loadGlpk(): Promise<Glpk> {
  instance ??= GLPK();
  return instance;
}

export interface LpArc {
  from: number;
  to: number;
  capacity: number;
  /** Objective weight per unit of flow on the arc (cost is subtracted). */
  cost?: number;
}

/**
 * max Σ_a weight·x_a − Σ_a cost_a·x_a subject to 0 ≤ x_a ≤ capacity_a and conservation at every
 * node other than the terminals, where weight = +sourceWeight on arcs leaving the source and
 * −sourceWeight on arcs entering it (so the objective counts net outflow of the source).
 * Returns the optimum and the arc values; an instance without arcs has optimum 0 (glpk aborts on
 * an empty problem).
 */
export function solveFlowLp(
  glpk: Glpk,
  nodeCount: number,
  arcs: readonly LpArc[],
  source: number,
  sink: number,
  sourceWeight = 1,
  integerVariables = false,
): { value: number; x: number[] } {
  if (arcs.length === 0) return { value: 0, x: [] };
  const name = (i: number): string => `x${i}`;
  const objective = arcs.map((arc, i) => {
    const net = (arc.from === source ? 1 : 0) - (arc.to === source ? 1 : 0);
    return { name: name(i), coef: sourceWeight * net - (arc.cost ?? 0) };
  });
  const rows = [];
  for (let v = 0; v < nodeCount; v++) {
    if (v === source || v === sink) continue;
    const vars = [];
    for (let i = 0; i < arcs.length; i++) {
      const arc = arcs[i]!;
      const coef = (arc.to === v ? 1 : 0) - (arc.from === v ? 1 : 0);
      if (coef !== 0) vars.push({ name: name(i), coef });
    }
    if (vars.length > 0) rows.push({ name: `node${v}`, vars, bnds: { type: glpk.GLP_FX, lb: 0, ub: 0 } });
  }
  const result = glpk.solve(
    {
      name: 'flow',
      objective: { direction: glpk.GLP_MAX, name: 'objective', vars: objective },
      subjectTo: rows,
      bounds: arcs.map((arc, i) => ({
        name: name(i),
        type: arc.capacity > 0 ? glpk.GLP_DB : glpk.GLP_FX,
        lb: 0,
        ub: arc.capacity,
      })),
      ...(integerVariables ? { generals: arcs.map((_, i) => name(i)) } : {}),
    },
    { msglev: glpk.GLP_MSG_OFF },
  );
  if (result.result.status !== glpk.GLP_OPT) throw new Error(`glpk status ${result.result.status}`);
  return { value: result.result.z, x: arcs.map((_, i) => result.result.vars[name(i)] ?? 0) };
}

/** A linear program given as named variables with bounds, equality rows and an objective to maximise. */
export interface GeneralLp {
  variables: { name: string; upper: number }[];
  /** Σ coef·var = 0 rows. */
  balances: { name: string; terms: { name: string; coef: number }[] }[];
  objective: { name: string; coef: number }[];
}

export function solveGeneralLp(glpk: Glpk, lp: GeneralLp): number {
  if (lp.variables.length === 0) return 0;
  const result = glpk.solve(
    {
      name: 'general',
      objective: { direction: glpk.GLP_MAX, name: 'objective', vars: lp.objective.length > 0 ? lp.objective : [{ name: lp.variables[0]!.name, coef: 0 }] },
      subjectTo: lp.balances
        .filter((row) => row.terms.length > 0)
        .map((row) => ({ name: row.name, vars: row.terms, bnds: { type: glpk.GLP_FX, lb: 0, ub: 0 } })),
      bounds: lp.variables.map((v) => ({ name: v.name, type: v.upper > 0 ? glpk.GLP_DB : glpk.GLP_FX, lb: 0, ub: v.upper })),
    },
    { msglev: glpk.GLP_MSG_OFF },
  );
  if (result.result.status !== glpk.GLP_OPT) throw new Error(`glpk status ${result.result.status}`);
  return result.result.z;
}
