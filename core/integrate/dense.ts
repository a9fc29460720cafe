/**
 * Dense output: the continuous extension of an integration, one polynomial per accepted step.
 *
 * Each step [t_k, t_k + h_k] is stored in the form of Hairer's DOPRI5 code (Hairer, Nørsett &
 * Wanner, Solving Ordinary Differential Equations I, 2nd ed., §II.6, the CONTD5 evaluation):
 *
 *   y(t_k + θh) = r1 + θ·(r2 + (1−θ)·(r3 + θ·(r4 + (1−θ)·r5))),   θ ∈ [0, 1]
 *
 * For Dormand–Prince 5(4) the five vectors give its 4th-order continuous extension; with r5 = 0
 * the same form is the cubic Hermite interpolant through (y, y') at both ends, which the
 * fixed-step spans of the propagation front door use. Evaluation finds the step by binary search
 * over the stored step start times and allocates nothing when `out` is given.
 *
 * DOP853 (dop853.ts) stores eight vectors per step (width 8), its 7th-order continuous extension
 * in the same nested form continued (Hairer et al. §II.10, the CONTD8 evaluation):
 *
 *   y = r1 + θ·(r2 + (1−θ)·(r3 + θ·(r4 + (1−θ)·(r5 + θ·(r6 + (1−θ)·(r7 + θ·r8)))))).
 *
 * Integration may run backward (t decreasing); the object covers [min, max] of tStart, tEnd.
 */
import { InputError, requireFinite } from '../math/index.ts';

export class DenseOutput {
  /** Number of components of y. */
  readonly n: number;
  /** Time where the covered span starts (the solve's t0). */
  tStart: number;
  /** Time where the covered span ends (the solve's final t; an event time if a terminal event stopped it). */
  tEnd: number;

  private starts: Float64Array; // step start times t_k
  private widths: Float64Array; // signed step sizes h_k
  /** Coefficient vectors per step: 5 (r1..r5) or 8 (r1..r8). */
  readonly width: 5 | 8;
  private coef: Float64Array; // width·n per step
  private count = 0;

  constructor(n: number, tStart: number, capacity = 64, width: 5 | 8 = 5) {
    if (!Number.isInteger(n) || n < 1) throw new InputError('n', 'must be an integer >= 1', n);
    requireFinite('tStart', tStart);
    if (width !== 5 && width !== 8) throw new InputError('width', 'must be 5 or 8', width);
    this.n = n;
    this.width = width;
    this.tStart = tStart;
    this.tEnd = tStart;
    const cap = Math.max(1, capacity | 0);
    this.starts = new Float64Array(cap);
    this.widths = new Float64Array(cap);
    this.coef = new Float64Array(cap * width * n);
  }

  /** Number of stored steps. */
  get steps(): number {
    return this.count;
  }

  /**
   * Appends one step [t0, t0 + h] with its `width` coefficient vectors laid out r1..r5 (or
   * r1..r8) in `coeffs` (length ≥ width·n) and moves tEnd to t0 + h. Steps must be contiguous and in the
   * direction of integration.
   */
  appendStep(t0: number, h: number, coeffs: ArrayLike<number>): void {
    const k = this.slot();
    this.starts[k] = t0;
    this.widths[k] = h;
    const m = this.width * this.n;
    const base = k * m;
    const c = this.coef;
    for (let i = 0; i < m; i++) c[base + i] = coeffs[i];
    this.tEnd = t0 + h;
  }

  /**
   * Appends the cubic Hermite step through (y0, f0 = y'(t0)) and (y1, f1 = y'(t0 + h)):
   * r1 = y0, r2 = y1 − y0, r3 = h·f0 − r2, r4 = r2 − h·f1 − r3, r5 = 0.
   */
  appendHermite(t0: number, h: number, y0: ArrayLike<number>, f0: ArrayLike<number>, y1: ArrayLike<number>, f1: ArrayLike<number>): void {
    const k = this.slot();
    this.starts[k] = t0;
    this.widths[k] = h;
    const base = k * this.width * this.n;
    hermiteCoefficients(this.n, h, y0, f0, y1, f1, this.coef, base);
    this.coef.fill(0, base + 5 * this.n, base + this.width * this.n);
    this.tEnd = t0 + h;
  }

  /** Interpolated state at time t (which must lie in the covered span). */
  at(t: number, out: Float64Array = new Float64Array(this.n)): Float64Array {
    requireFinite('t', t);
    if (this.count === 0) throw new InputError('t', 'cannot be evaluated: the dense output holds no steps', t);
    const lo = Math.min(this.tStart, this.tEnd);
    const hi = Math.max(this.tStart, this.tEnd);
    if (t < lo || t > hi) throw new InputError('t', `must lie within the dense output span [${lo}, ${hi}]`, t);
    if (out.length < this.n) throw new InputError('out', `must have at least ${this.n} components`, out.length);
    const k = this.find(t);
    return this.evalStep(k, (t - this.starts[k]) / this.widths[k], out);
  }

  /** Evaluates stored step k at θ ∈ [0, 1] (no range checks; for the integrators' own use). */
  evalStep(k: number, theta: number, out: Float64Array): Float64Array {
    const m = this.width * this.n;
    return this.width === 8 ? evalCoefficients8(this.n, this.coef, k * m, theta, out) : evalCoefficients(this.n, this.coef, k * m, theta, out);
  }

  /** Moves tEnd back to t (inside the last step), e.g. when a terminal event stops the solve. */
  truncate(t: number): void {
    this.tEnd = t;
  }

  // Index of the step containing t: the last k whose start is not past t in the direction of integration.
  private find(t: number): number {
    const dir = this.widths[0] >= 0 ? 1 : -1;
    const s = this.starts;
    let lo = 0;
    let hi = this.count - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if ((s[mid] - t) * dir <= 0) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  }

  private slot(): number {
    if (this.count === this.starts.length) {
      const cap = this.starts.length * 2;
      const s = new Float64Array(cap);
      s.set(this.starts);
      this.starts = s;
      const w = new Float64Array(cap);
      w.set(this.widths);
      this.widths = w;
      const c = new Float64Array(cap * this.width * this.n);
      c.set(this.coef);
      this.coef = c;
    }
    return this.count++;
  }
}

/**
 * Evaluates one step's coefficients r1..r5 (stored from `base`, n each) at θ:
 * y = r1 + θ·(r2 + (1−θ)·(r3 + θ·(r4 + (1−θ)·r5))).
 */
export function evalCoefficients(n: number, c: ArrayLike<number>, base: number, theta: number, out: Float64Array): Float64Array {
  const th1 = 1 - theta;
  for (let i = 0; i < n; i++) {
    const j = base + i;
    out[i] = c[j] + theta * (c[j + n] + th1 * (c[j + 2 * n] + theta * (c[j + 3 * n] + th1 * c[j + 4 * n])));
  }
  return out;
}

/**
 * Evaluates one step's coefficients r1..r8 (stored from `base`, n each) at θ, DOP853's form:
 * y = r1 + θ·(r2 + (1−θ)·(r3 + θ·(r4 + (1−θ)·(r5 + θ·(r6 + (1−θ)·(r7 + θ·r8)))))).
 */
export function evalCoefficients8(n: number, c: ArrayLike<number>, base: number, theta: number, out: Float64Array): Float64Array {
  const th1 = 1 - theta;
  for (let i = 0; i < n; i++) {
    const j = base + i;
    const p = c[j + 4 * n] + theta * (c[j + 5 * n] + th1 * (c[j + 6 * n] + theta * c[j + 7 * n]));
    out[i] = c[j] + theta * (c[j + n] + th1 * (c[j + 2 * n] + theta * (c[j + 3 * n] + th1 * p)));
  }
  return out;
}

/**
 * Writes the cubic Hermite step through (y0, f0) and (y1, f1) over signed width h as r1..r5
 * (from `base`): r1 = y0, r2 = y1 − y0, r3 = h·f0 − r2, r4 = r2 − h·f1 − r3, r5 = 0.
 */
export function hermiteCoefficients(
  n: number,
  h: number,
  y0: ArrayLike<number>,
  f0: ArrayLike<number>,
  y1: ArrayLike<number>,
  f1: ArrayLike<number>,
  out: Float64Array,
  base = 0,
): void {
  for (let i = 0; i < n; i++) {
    const dy = y1[i] - y0[i];
    const r3 = h * f0[i] - dy;
    out[base + i] = y0[i];
    out[base + n + i] = dy;
    out[base + 2 * n + i] = r3;
    out[base + 3 * n + i] = dy - h * f1[i] - r3;
    out[base + 4 * n + i] = 0;
  }
}
