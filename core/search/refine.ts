/**
 * Local minimisation in a few dimensions without derivatives, inside a box: the downhill
 * simplex method (Nelder & Mead, "A simplex method for function minimization", The Computer
 * Journal 7 (1965) 308–313), with the standard coefficients and the accept/contract rules as
 * stated by Lagarias, Reeds, Wright & Wright, "Convergence properties of the Nelder–Mead
 * simplex method in low dimensions", SIAM J. Optim. 9 (1998) 112–147. Trial points are
 * projected onto the box (clamped), so the search never leaves it.
 *
 * Non-finite function values count as +Infinity (worse than anything), so the simplex backs
 * away from regions where the function has no value (unsolvable transfers).
 * Stops when the spread of f over the simplex is ≤ fTol and the simplex fits in xTol per
 * coordinate (in units of the initial step), or when the evaluation budget is spent.
 */
import { InputError, SolverError, requireFinite } from '../math/index.ts';

export interface SimplexOptions {
  /** Spread of f over the simplex to stop at (same unit as f). Default 1e-3. */
  fTol?: number;
  /** Size of the simplex to stop at, per coordinate, as a fraction of the initial step. Default 1e-4. */
  xTol?: number;
  /** Evaluation budget. Default 600. */
  maxEvaluations?: number;
  /** Lower bounds per coordinate (default −Infinity). */
  lower?: ArrayLike<number>;
  /** Upper bounds per coordinate (default +Infinity). */
  upper?: ArrayLike<number>;
}

export interface SimplexResult {
  /** Best point found. */
  x: number[];
  /** f at x. */
  fx: number;
  evaluations: number;
  /** True when the f-spread test passed (the x test may have run out of budget). */
  converged: boolean;
}

const REFLECT = 1;
const EXPAND = 2;
const CONTRACT = 0.5;
const SHRINK = 0.5;

export const SIMPLEX_DEFAULT_FTOL = 1e-3;
export const SIMPLEX_DEFAULT_XTOL = 1e-4;
export const SIMPLEX_DEFAULT_MAX_EVALUATIONS = 600;

/**
 * A local minimum of f near x0. `step` gives the initial simplex edge per coordinate
 * (x0 + step_k e_k); a zero step keeps that coordinate fixed. Throws SolverError('simplex',
 * 'no-solution') when f has no finite value at any point tried.
 */
export function nelderMead(f: (x: number[]) => number, x0: ArrayLike<number>, step: ArrayLike<number>, options: SimplexOptions = {}): SimplexResult {
  const dim = x0.length;
  if (dim < 1 || step.length !== dim) throw new InputError('step', `must have ${dim} components like x0`, step);
  const lo = options.lower ?? new Array<number>(dim).fill(-Infinity);
  const hi = options.upper ?? new Array<number>(dim).fill(Infinity);
  for (let k = 0; k < dim; k++) {
    requireFinite(`x0[${k}]`, x0[k]);
    requireFinite(`step[${k}]`, step[k]);
    if (!(lo[k] <= hi[k])) throw new InputError(`lower[${k}]`, 'must be <= upper', lo[k]);
  }
  const fTol = options.fTol ?? SIMPLEX_DEFAULT_FTOL;
  const xTol = options.xTol ?? SIMPLEX_DEFAULT_XTOL;
  const maxEval = options.maxEvaluations ?? SIMPLEX_DEFAULT_MAX_EVALUATIONS;
  if (!(fTol > 0)) throw new InputError('fTol', 'must be > 0', fTol);
  if (!(xTol > 0)) throw new InputError('xTol', 'must be > 0', xTol);
  if (!Number.isInteger(maxEval) || maxEval < dim + 1) throw new InputError('maxEvaluations', `must be an integer >= ${dim + 1}`, maxEval);

  // Only coordinates with a non-zero step move.
  const free: number[] = [];
  for (let k = 0; k < dim; k++) if (step[k] !== 0) free.push(k);
  const clamp = (x: number[]): number[] => {
    for (let k = 0; k < dim; k++) x[k] = x[k] < lo[k] ? lo[k] : x[k] > hi[k] ? hi[k] : x[k];
    return x;
  };
  let evaluations = 0;
  const value = (x: number[]): number => {
    evaluations++;
    const y = f(x);
    return typeof y === 'number' && y < Infinity ? y : Infinity; // NaN < Infinity is false
  };

  const start = clamp(Array.from(x0));
  const n = free.length;
  const pts: number[][] = [start];
  const fs: number[] = [value(start)];
  for (const k of free) {
    const p = start.slice();
    p[k] += step[k];
    clamp(p);
    if (p[k] === start[k]) p[k] -= step[k]; // stepped onto a bound: go the other way
    clamp(p);
    pts.push(p);
    fs.push(value(p));
  }
  const order = (): void => {
    const idx = pts.map((_, i) => i).sort((a, b) => fs[a] - fs[b] || a - b);
    const p2 = idx.map((i) => pts[i]);
    const f2 = idx.map((i) => fs[i]);
    for (let i = 0; i <= n; i++) {
      pts[i] = p2[i];
      fs[i] = f2[i];
    }
  };
  const small = (): boolean => {
    for (const k of free) {
      const tol = xTol * Math.abs(step[k]);
      for (let i = 1; i <= n; i++) if (Math.abs(pts[i][k] - pts[0][k]) > tol) return false;
    }
    return true;
  };

  let converged = false;
  order();
  while (n > 0) {
    const spread = fs[n] - fs[0];
    const fOk = fs[0] < Infinity && spread <= fTol;
    if (fOk && small()) {
      converged = true;
      break;
    }
    if (evaluations >= maxEval) {
      converged = fOk;
      break;
    }
    // centroid of the best n points
    const c = new Array<number>(dim).fill(0);
    for (let i = 0; i < n; i++) for (let k = 0; k < dim; k++) c[k] += pts[i][k] / n;
    const worst = pts[n];
    const along = (t: number): number[] => clamp(c.map((ck, k) => ck + t * (ck - worst[k])));
    const xr = along(REFLECT);
    const fr = value(xr);
    if (fr < fs[0]) {
      const xe = along(EXPAND);
      const fe = value(xe);
      if (fe < fr) {
        pts[n] = xe;
        fs[n] = fe;
      } else {
        pts[n] = xr;
        fs[n] = fr;
      }
    } else if (fr < fs[n - 1]) {
      pts[n] = xr;
      fs[n] = fr;
    } else {
      const outside = fr < fs[n];
      const xc = along(outside ? REFLECT * CONTRACT : -CONTRACT);
      const fc = value(xc);
      if (outside ? fc <= fr : fc < fs[n]) {
        pts[n] = xc;
        fs[n] = fc;
      } else {
        for (let i = 1; i <= n; i++) {
          pts[i] = clamp(pts[i].map((v, k) => pts[0][k] + SHRINK * (v - pts[0][k])));
          fs[i] = value(pts[i]);
        }
      }
    }
    order();
  }
  if (n === 0) converged = fs[0] < Infinity;
  if (!(fs[0] < Infinity)) {
    throw new SolverError('simplex', 'no-solution', `no finite function value in ${evaluations} evaluations`, { x0: Array.from(x0) });
  }
  return { x: pts[0], fx: fs[0], evaluations, converged };
}
