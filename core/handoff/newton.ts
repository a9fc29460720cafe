/**
 * Least-change Newton iteration for a smooth, nearly linear flight: goals g(x) = wanted with more
 * controls than goals. Each iteration takes the minimum-norm Gauss–Newton step in units of the
 * goals' tolerances (Nocedal & Wright, Numerical Optimization, 2nd ed., §10.3; the minimum-norm
 * solution of an underdetermined linear system through a vanishing Tikhonov term) from a
 * forward-difference Jacobian, halving it until the misses shrink.
 *
 * Why not the targeter's Levenberg–Marquardt (core/target solve.ts): its damping is relative to the
 * largest diagonal of JᵀJ, so a goal hundreds of times less sensitive than another in tolerance
 * units (an arrival time against a B-plane point) is damped hard and crawls in. The retargeting's
 * reference flights are smooth and its corrections small, where the undamped step converges in a
 * few iterations.
 */
import { SolverError, dampedLeastSquares } from '../math/index.ts';

export interface NewtonGoal {
  wanted: number;
  tolerance: number;
}

export interface NewtonResult {
  x: Float64Array;
  /** Scaled misses (value − wanted)/tolerance at x. */
  misses: Float64Array;
  iterations: number;
  flights: number;
  /** Largest |miss| ≤ `aim`. */
  converged: boolean;
}

/** Relative Tikhonov term that picks the minimum-norm step without changing a well-posed one. */
const TINY = 1e-12;
/** Step halvings per iteration at most. */
const HALVINGS = 6;

/**
 * Drives every scaled miss within `aim` (in tolerances) from x0, varying x by steps measured in
 * `scale` (m/s for Δv components). `flight` writes the goals' values at x into out.
 */
export function newtonSolve(
  flight: (x: Float64Array, out: Float64Array) => void,
  goals: readonly NewtonGoal[],
  x0: ArrayLike<number>,
  options: { scale: number; aim: number; maxIterations: number; step: number },
): NewtonResult {
  const m = goals.length;
  const n = x0.length;
  const x = Float64Array.from(x0);
  const g = new Float64Array(m);
  const r = new Float64Array(m);
  const gt = new Float64Array(m);
  const J = new Float64Array(m * n);
  const xt = new Float64Array(n);
  let flights = 0;
  const misses = (gv: Float64Array, out: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < m; i++) {
      out[i] = (gv[i] - goals[i].wanted) / goals[i].tolerance;
      s += out[i] * out[i];
    }
    return Math.sqrt(s);
  };
  const fly = (xs: Float64Array, out: Float64Array): void => {
    flights++;
    flight(xs, out);
    for (let i = 0; i < m; i++)
      if (!Number.isFinite(out[i])) throw new SolverError('retarget', 'non-finite', 'a reference flight gave a non-finite goal value');
  };
  fly(x, g);
  let norm = misses(g, r);
  let it = 0;
  const worst = () => Math.max(...Array.from(r, Math.abs));
  while (worst() > options.aim && it < options.maxIterations) {
    it++;
    // Jacobian in tolerance units per `scale` of each control
    for (let j = 0; j < n; j++) {
      xt.set(x);
      xt[j] += options.step;
      fly(xt, gt);
      for (let i = 0; i < m; i++) J[i * n + j] = ((gt[i] - g[i]) / goals[i].tolerance) * (options.scale / options.step);
    }
    let maxDiag = 0;
    for (let j = 0; j < n; j++) {
      let d = 0;
      for (let i = 0; i < m; i++) d += J[i * n + j] ** 2;
      maxDiag = Math.max(maxDiag, d);
    }
    if (!(maxDiag > 0)) break; // no control moves any goal
    const neg = Array.from(r, (v) => -v);
    const p = dampedLeastSquares(J, neg, m, n, TINY * maxDiag);
    let f = 1;
    let accepted = false;
    for (let h = 0; h <= HALVINGS; h++, f /= 2) {
      for (let j = 0; j < n; j++) xt[j] = x[j] + f * p[j] * options.scale;
      const rt = new Float64Array(m);
      fly(xt, gt);
      const nt = misses(gt, rt);
      if (nt < norm) {
        x.set(xt);
        g.set(gt);
        r.set(rt);
        norm = nt;
        accepted = true;
        break;
      }
    }
    if (!accepted) break;
  }
  return { x, misses: r, iterations: it, flights, converged: worst() <= options.aim };
}
