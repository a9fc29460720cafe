/**
 * The independent reference solver: odex (npm), a port of Hairer & Wanner's ODEX
 * (Gragg–Bulirsch–Stoer extrapolation; Hairer, Nørsett & Wanner, Solving ODEs I, 2nd ed., §II.9).
 *
 * Loaded through require with the small typed surface used here: the package ships its
 * TypeScript source as its entry, and importing it by name would make the project's strict
 * type check compile that source.
 */
import { createRequire } from 'node:module';

export interface OdexResult {
  y: number[];
  outcome: number;
  nStep: number;
  xEnd: number;
  nAccept: number;
  nReject: number;
  nEval: number;
}

export interface OdexSolver {
  n: number;
  maxSteps: number;
  /** Largest step (ODEX's HMAX; 0: the whole interval). */
  maxStepSize: number;
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  initialStepSize: number;
  solve(f: (x: number, y: number[]) => number[], x: number, y0: number[], xEnd: number): OdexResult;
}

const require = createRequire(import.meta.url);
const odex = require('odex') as { Solver: new (n: number) => OdexSolver; Outcome: Record<string, number> };

export const OdexSolverClass = odex.Solver;
/** odex's Outcome.Converged. */
export const ODEX_CONVERGED: number = odex.Outcome.Converged;

/** Two-body derivative in odex's calling convention (returns a new array). */
export function odexTwoBody(mu: number): (x: number, y: number[]) => number[] {
  return (_x, y) => {
    const r2 = y[0] * y[0] + y[1] * y[1] + y[2] * y[2];
    const k = -mu / (r2 * Math.sqrt(r2));
    return [y[3], y[4], y[5], k * y[0], k * y[1], k * y[2]];
  };
}

/** Runs odex on y' = f from x0 to x1 at rtol = atol-scaled tolerances. */
export function odexSolve(
  f: (x: number, y: number[]) => number[],
  x0: number,
  y0: ArrayLike<number>,
  x1: number,
  rtol: number,
  atol: number,
  maxSteps = 1_000_000,
): OdexResult {
  const s = new OdexSolverClass(y0.length);
  s.relativeTolerance = rtol;
  s.absoluteTolerance = atol;
  s.maxSteps = maxSteps;
  return s.solve(f, x0, Array.from(y0), x1);
}
