/**
 * One-dimensional root finding and minimisation.
 *
 * - `brent`: bracketed root finder combining bisection, secant and inverse quadratic
 *   interpolation (Brent, Algorithms for Minimization without Derivatives, 1973, ch. 4,
 *   procedure zero; laid out as in Press et al., Numerical Recipes, 3rd ed., §9.3).
 * - `newtonSafe`: Newton's method kept inside a bracket, falling back to bisection whenever
 *   a Newton step would leave the bracket or shrink it too slowly (Press et al., Numerical
 *   Recipes, 3rd ed., §9.4, rtsafe).
 * - `minimize`: Brent's one-dimensional minimiser, golden-section search accelerated by
 *   parabolic interpolation (Brent 1973, ch. 5, procedure localmin; Numerical Recipes §10.3).
 *
 * Failures raise SolverError with solver 'brent', 'newton-safe' or 'brent-min' and reason
 * 'no-bracket', 'no-convergence' or 'non-finite'; bad arguments raise InputError.
 * These take callbacks and are meant for set-up work (window refinement, events), not for
 * allocation-free inner loops.
 */
import { InputError, SolverError, requireFinite } from './errors.ts';

const EPS = Number.EPSILON;

export interface RootOptions {
  /**
   * Absolute tolerance on x. Default: 4·ε·max(|a|, |b|), i.e. about machine precision at
   * the scale of the bracket. A relative term 2·ε·|x| is always added.
   */
  tol?: number;
  /** Iteration budget (function evaluations after the bracket ends). Default 200. */
  maxIter?: number;
}

export const ROOT_MAX_ITER = 200;

function options(a: number, b: number, opts: RootOptions | undefined): { tol: number; maxIter: number } {
  const tol = opts?.tol ?? 4 * EPS * Math.max(Math.abs(a), Math.abs(b));
  const maxIter = opts?.maxIter ?? ROOT_MAX_ITER;
  if (!(tol >= 0) || !Number.isFinite(tol)) throw new InputError('tol', 'must be a finite number >= 0', tol);
  if (!Number.isInteger(maxIter) || maxIter < 1) throw new InputError('maxIter', 'must be an integer >= 1', maxIter);
  return { tol, maxIter };
}

function evalFinite(solver: string, f: (x: number) => number, x: number): number {
  const y = f(x);
  if (typeof y !== 'number' || !Number.isFinite(y)) {
    throw new SolverError(solver, 'non-finite', `function returned ${y} at x = ${x}`, { x, y });
  }
  return y;
}

/**
 * A root of f in [a, b] (f(a) and f(b) of opposite sign, or one of them zero).
 * Brent 1973, ch. 4. Throws SolverError('brent', 'no-bracket') when the signs agree.
 */
export function brent(f: (x: number) => number, a: number, b: number, opts?: RootOptions): number {
  requireFinite('a', a);
  requireFinite('b', b);
  const { tol, maxIter } = options(a, b, opts);
  let fa = evalFinite('brent', f, a);
  let fb = evalFinite('brent', f, b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa > 0 === fb > 0) {
    throw new SolverError('brent', 'no-bracket', `f(a) = ${fa} and f(b) = ${fb} have the same sign`, { a, b, fa, fb });
  }
  let c = b;
  let fc = fb;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < maxIter; iter++) {
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol1 = 2 * EPS * Math.abs(b) + 0.5 * tol;
    const xm = 0.5 * (c - b);
    if (Math.abs(xm) <= tol1 || fb === 0) return b;
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      // inverse quadratic interpolation (secant when only two points are distinct)
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * xm * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = xm;
        e = d;
      }
    } else {
      d = xm;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : xm > 0 ? tol1 : -tol1;
    fb = evalFinite('brent', f, b);
  }
  throw new SolverError('brent', 'no-convergence', `no root to tolerance ${tol} after ${maxIter} iterations`, { a, b, c, fb });
}

/**
 * A root of f in [lo, hi] by Newton's method with derivative df, safeguarded by the bracket
 * (Numerical Recipes, 3rd ed., §9.4). `x0` is the first guess (default: the midpoint).
 */
export function newtonSafe(f: (x: number) => number, df: (x: number) => number, lo: number, hi: number, opts?: RootOptions & { x0?: number }): number {
  requireFinite('lo', lo);
  requireFinite('hi', hi);
  const { tol, maxIter } = options(lo, hi, opts);
  const fl = evalFinite('newton-safe', f, lo);
  const fh = evalFinite('newton-safe', f, hi);
  if (fl === 0) return lo;
  if (fh === 0) return hi;
  if (fl > 0 === fh > 0) {
    throw new SolverError('newton-safe', 'no-bracket', `f(lo) = ${fl} and f(hi) = ${fh} have the same sign`, { lo, hi, fl, fh });
  }
  // orient so that f(xl) < 0 < f(xh)
  let xl = fl < 0 ? lo : hi;
  let xh = fl < 0 ? hi : lo;
  let x = opts?.x0 ?? 0.5 * (lo + hi);
  requireFinite('x0', x);
  if (x < Math.min(lo, hi) || x > Math.max(lo, hi)) throw new InputError('x0', 'must lie inside [lo, hi]', x);
  let dxOld = Math.abs(hi - lo);
  let dx = dxOld;
  let fx = evalFinite('newton-safe', f, x);
  let dfx = evalFinite('newton-safe', df, x);
  for (let iter = 0; iter < maxIter; iter++) {
    if (fx === 0) return x;
    const leaves = ((x - xh) * dfx - fx) * ((x - xl) * dfx - fx) > 0;
    const slow = Math.abs(2 * fx) > Math.abs(dxOld * dfx);
    if (leaves || slow || dfx === 0) {
      dxOld = dx;
      dx = 0.5 * (xh - xl);
      x = xl + dx;
    } else {
      dxOld = dx;
      dx = fx / dfx;
      x -= dx;
    }
    if (Math.abs(dx) <= tol + 2 * EPS * Math.abs(x)) return x;
    fx = evalFinite('newton-safe', f, x);
    dfx = evalFinite('newton-safe', df, x);
    if (fx < 0) xl = x;
    else xh = x;
  }
  throw new SolverError('newton-safe', 'no-convergence', `no root to tolerance ${tol} after ${maxIter} iterations`, { lo, hi, x, fx });
}

export interface MinimumResult {
  /** Abscissa of the minimum found. */
  x: number;
  /** f(x). */
  fx: number;
  /** Function evaluations used. */
  evaluations: number;
}

export interface MinimizeOptions {
  /** Absolute tolerance on x (added to √ε·|x|). Default 1e-10·(b − a). */
  tol?: number;
  /** Evaluation budget. Default 200. */
  maxIter?: number;
}

const GOLDEN_C = 0.5 * (3 - Math.sqrt(5));
const SQRT_EPS = Math.sqrt(EPS);

/**
 * A local minimum of f on [a, b] by Brent's method (golden section + parabolic steps;
 * Brent 1973, ch. 5). Returns the smallest value found; for a unimodal f it is the minimum.
 * The achievable accuracy in x is about √ε relative (the minimum is flat to first order).
 */
export function minimize(f: (x: number) => number, a: number, b: number, opts?: MinimizeOptions): MinimumResult {
  requireFinite('a', a);
  requireFinite('b', b);
  if (a > b) {
    const t = a;
    a = b;
    b = t;
  }
  if (!(b > a)) throw new InputError('b', 'must differ from a', b);
  const t = opts?.tol ?? 1e-10 * (b - a);
  const maxIter = opts?.maxIter ?? ROOT_MAX_ITER;
  if (!(t > 0) || !Number.isFinite(t)) throw new InputError('tol', 'must be a finite number > 0', t);
  if (!Number.isInteger(maxIter) || maxIter < 1) throw new InputError('maxIter', 'must be an integer >= 1', maxIter);

  let x = a + GOLDEN_C * (b - a);
  let w = x;
  let v = x;
  let fx = evalFinite('brent-min', f, x);
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  let evaluations = 1;
  for (let iter = 0; iter < maxIter; iter++) {
    const m = 0.5 * (a + b);
    const tol1 = SQRT_EPS * Math.abs(x) + t / 3;
    const tol2 = 2 * tol1;
    if (Math.abs(x - m) <= tol2 - 0.5 * (b - a)) return { x, fx, evaluations };
    let p = 0;
    let q = 0;
    let r = 0;
    if (Math.abs(e) > tol1) {
      // fit a parabola through x, w, v
      r = (x - w) * (fx - fv);
      q = (x - v) * (fx - fw);
      p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      r = e;
      e = d;
    }
    if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
      d = p / q;
      const u = x + d;
      if (u - a < tol2 || b - u < tol2) d = x < m ? tol1 : -tol1;
    } else {
      e = (x < m ? b : a) - x;
      d = GOLDEN_C * e;
    }
    const u = x + (Math.abs(d) >= tol1 ? d : d > 0 ? tol1 : -tol1);
    const fu = evalFinite('brent-min', f, u);
    evaluations++;
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  throw new SolverError('brent-min', 'no-convergence', `no minimum to tolerance ${t} after ${maxIter} iterations`, { a, b, x, fx });
}
