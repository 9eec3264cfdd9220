// The LinearSolver of shared/plan-optimization backed by glpk.js (the GNU Linear Programming
// Kit compiled to WebAssembly). glpk.js aborts its module on a program without columns
// ("glp_add_cols: ncs = 0", then RuntimeError: Aborted), so an empty program is answered here without it.
import GLPK from 'glpk.js/node';
import type { LinearProgram, LinearSolver, LpSolution } from '../../shared/plan-optimization';

type Glpk = Awaited<ReturnType<typeof GLPK>>;

let instance: Promise<Glpk> | undefined;

/** One glpk.js instance per process (loading the WebAssembly module takes a moment). */
export async function loadGlpkSolver(): Promise<LinearSolver> {
  instance ??= GLPK();
  return glpkSolver(await instance);
}

export function glpkSolver(glpk: Glpk): LinearSolver {
  return {
    solve(program: LinearProgram, options: { timeLimitSeconds: number }): LpSolution {
      if (program.variables.length === 0) return { status: 'optimal', objective: 0, values: {} };
      const boundType = (lower: number | null, upper: number | null): number =>
        lower === null && upper === null ? glpk.GLP_FR : upper === null ? glpk.GLP_LO : lower === null ? glpk.GLP_UP : lower === upper ? glpk.GLP_FX : glpk.GLP_DB;
      const objective = program.objective.length > 0 ? program.objective : [{ name: program.variables[0]!.name, coef: 0 }];
      const result = glpk.solve(
        {
          name: 'program',
          objective: { direction: glpk.GLP_MAX, name: 'objective', vars: objective },
          subjectTo: program.rows
            .filter((row) => row.terms.length > 0)
            .map((row) => ({ name: row.name, vars: row.terms, bnds: { type: boundType(row.lower, row.upper), lb: row.lower ?? 0, ub: row.upper ?? 0 } })),
          bounds: program.variables.map((v) => ({ name: v.name, type: boundType(v.lower, v.upper), lb: v.lower, ub: v.upper ?? 0 })),
          generals: program.variables.filter((v) => v.integer).map((v) => v.name),
        },
        { msglev: glpk.GLP_MSG_OFF, tmlim: options.timeLimitSeconds, presol: true },
      ) as unknown as { result: { status: number; z: number; vars: Record<string, number> } };
      const s = result.result.status;
      const status: LpSolution['status'] =
        s === glpk.GLP_OPT ? 'optimal' : s === glpk.GLP_FEAS ? 'time-limit' : s === glpk.GLP_NOFEAS || s === glpk.GLP_INFEAS ? 'infeasible' : s === glpk.GLP_UNBND ? 'unbounded' : 'failed';
      return { status, objective: result.result.z, values: result.result.vars };
    },
  };
}
