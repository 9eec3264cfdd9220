// A linear or mixed-integer program in a solver-neutral shape. shared/ stays free of Node and
// WebAssembly: the caller passes a LinearSolver (the server and the tests wrap glpk.js, the GNU
// Linear Programming Kit compiled to WebAssembly).

export interface LpVariable {
  name: string;
  lower: number;
  /** null = no upper bound. */
  upper: number | null;
  integer?: boolean;
}

export interface LpRow {
  name: string;
  terms: { name: string; coef: number }[];
  /** null = no bound on that side; equal lower and upper make an equality. */
  lower: number | null;
  upper: number | null;
}

export interface LinearProgram {
  variables: LpVariable[];
  rows: LpRow[];
  /** Maximised. */
  objective: { name: string; coef: number }[];
}

export interface LpSolution {
  status: 'optimal' | 'feasible' | 'infeasible' | 'unbounded' | 'time-limit' | 'failed';
  objective: number;
  values: Record<string, number>;
}

export interface LinearSolver {
  /** Solves and returns the status; never throws for an empty program (the caller guards). */
  solve(program: LinearProgram, options: { timeLimitSeconds: number }): LpSolution;
}
