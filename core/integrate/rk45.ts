/**
 * Dormand–Prince 5(4) explicit Runge–Kutta with adaptive steps, dense output and event location.
 *
 * Method: Dormand & Prince, "A family of embedded Runge–Kutta formulae", J. Comput. Appl. Math.
 * 6 (1980); step control, automatic initial step and the 4th-order continuous extension follow
 * Hairer, Nørsett & Wanner, Solving Ordinary Differential Equations I, 2nd ed., §II.4 (error
 * norm, initial step), §II.5 (the DOPRI5 tableau), §II.6 (dense output) and the PI controller
 * of Gustafsson (Hairer et al. IV.2 / the DOPRI5 code).
 *
 * - FSAL: the 7th stage of an accepted step is the 1st of the next (6 new evaluations per step).
 * - Error: e = h·Σ(b_i − b̂_i)k_i, RMS of e_i / (atol_i + rtol·max(|y_i|, |y_new_i|)); accept when ≤ 1.
 * - Events: sign change of g between accepted steps, refined by Brent's method on the step's
 *   interpolant. Two sign changes of the same g inside one step cancel and are not seen; cap the
 *   step with maxStep when events may come in close pairs.
 * - Non-finite derivative values reject the trial step and shrink it; if that drives the step
 *   below its minimum the solve stops with status 'step-underflow'. A non-finite derivative at the
 *   initial point, or a non-finite event function value, throws SolverError 'non-finite'.
 * - The step loop allocates nothing: stage buffers are Float64Arrays created once per solve.
 * - Speed: for n = 6 (one craft, y = [r, v]) the step loop runs an unrolled kernel that keeps
 *   the state and stages in local variables (far fewer typed-array accesses); it does the same
 *   arithmetic in the same order as the generic loop, so the two agree bit for bit (tested).
 */
import { InputError, SolverError, requireFinite } from '../math/index.ts';
import { DenseOutput } from './dense.ts';
import { EventLocator, checkEvents, type EventHit, type EventSpec } from './eventLocator.ts';
import type { OdeFunction, SolveStats } from './ode.ts';

export type { EventHit, EventSpec } from './eventLocator.ts';
export { EVENT_TIME_TOL } from './eventLocator.ts';

export interface RK45Options {
  /** Relative tolerance; default DEFAULT_RTOL. */
  rtol?: number;
  /** Absolute tolerance, scalar or one per component; default DEFAULT_ATOL. */
  atol?: number | ArrayLike<number>;
  /** Initial step magnitude; automatic (Hairer et al. II.4) when omitted. */
  h0?: number;
  /** Largest step magnitude; default the whole span. */
  maxStep?: number;
  /** Smallest step magnitude before the solve gives up with 'step-underflow'; default 0 (only the rounding floor). */
  minStep?: number;
  /** Budget of attempted steps (accepted + rejected); default DEFAULT_MAX_STEPS. */
  maxSteps?: number;
  events?: EventSpec[];
  /** Keep the dense output of every accepted step. */
  dense?: boolean;
  /** Cooperative cancellation, checked before every step. */
  signal?: { aborted: boolean };
}

export type RK45Status = 'done' | 'event' | 'step-underflow' | 'step-budget' | 'cancelled';

export interface RK45Result {
  t: number;
  y: Float64Array;
  status: RK45Status;
  message: string;
  stats: SolveStats;
  events: EventHit[];
  dense?: DenseOutput;
  /** Step size (signed) the controller proposed for the next step; what a caller resuming or falling back can use. */
  hNext: number;
}

/** Default relative tolerance. */
export const DEFAULT_RTOL = 1e-9;
/** Default absolute tolerance (SI units of each component). */
export const DEFAULT_ATOL = 1e-9;
/** Default step budget (Hairer's DOPRI5 NMAX). */
export const DEFAULT_MAX_STEPS = 100_000;
/** Step-size safety factor (DOPRI5 default). */
export const SAFETY = 0.9;
/** Smallest step-change factor h_new/h (DOPRI5 FAC1). */
export const FAC_MIN = 0.2;
/** Largest step-change factor h_new/h (DOPRI5 FAC2). */
export const FAC_MAX = 10;
/** PI controller β (DOPRI5 BETA default 0.04; Hairer et al. suggest up to 0.08). */
export const BETA = 0.04;
/** PI controller exponent on the current error: α = 1/5 − 0.75·β. */
export const ALPHA = 0.2 - 0.75 * BETA;
/** Step shrink factor after a trial step produced non-finite values. */
export const NONFINITE_SHRINK = 0.25;
/** Tightest relative tolerance accepted (100 ulps): tighter cannot be met in double precision. */
export const MIN_RTOL = 100 * 2.220446049250313e-16;

const EPS = 2.220446049250313e-16;
/** ln(1e-4): the floor of the previous error in the PI controller (DOPRI5). */
const LN_ERR_FLOOR = Math.log(1e-4);
/** Step floor in ulps of the current time: steps smaller than this no longer advance t reliably. */
const UNDERFLOW_ULPS = 16;

// The Dormand–Prince tableau (Hairer et al., Table II.5.2) is declared as literal constants
// inside the step loops: module-level constants cost a context load per use in the loop,
// literals are folded into the compiled code.

interface Settings {
  n: number;
  tEnd: number;
  dir: number;
  rtol: number;
  atol: Float64Array;
  maxStep: number;
  minStep: number;
  maxSteps: number;
  locator: EventLocator;
  dense: DenseOutput | undefined;
  signal: { aborted: boolean } | undefined;
  stats: SolveStats;
}

/** Integrates y' = f(t, y) from t0 to tEnd (either direction). See the module comment. */
export function rk45(f: OdeFunction, t0: number, y0: ArrayLike<number>, tEnd: number, options: RK45Options = {}): RK45Result {
  return solve(f, t0, y0, tEnd, options, true);
}

/**
 * The same solver always on the generic n-component loop (never the unrolled n = 6 kernel).
 * Exported for the equivalence test of the two loops; use rk45.
 */
export function rk45Generic(f: OdeFunction, t0: number, y0: ArrayLike<number>, tEnd: number, options: RK45Options = {}): RK45Result {
  return solve(f, t0, y0, tEnd, options, false);
}

function solve(f: OdeFunction, t0: number, y0: ArrayLike<number>, tEnd: number, options: RK45Options, unrolled: boolean): RK45Result {
  requireFinite('t0', t0);
  requireFinite('tEnd', tEnd);
  if (!y0 || typeof y0.length !== 'number' || y0.length < 1) throw new InputError('y0', 'must have at least 1 component', y0);
  const n = y0.length;
  for (let i = 0; i < n; i++) {
    if (typeof y0[i] !== 'number' || !Number.isFinite(y0[i])) throw new InputError(`y0[${i}]`, 'must be a finite number', y0[i]);
  }
  const rtol = options.rtol ?? DEFAULT_RTOL;
  requireFinite('rtol', rtol);
  if (!(rtol > 0)) throw new InputError('rtol', 'must be > 0', rtol);
  if (rtol < MIN_RTOL) throw new InputError('rtol', `must be >= ${MIN_RTOL} (100 ulps); tighter cannot be met in double precision`, rtol);
  const atol = new Float64Array(n);
  const atolIn = options.atol ?? DEFAULT_ATOL;
  if (typeof atolIn === 'number') {
    requireFinite('atol', atolIn);
    if (!(atolIn > 0)) throw new InputError('atol', 'must be > 0', atolIn);
    atol.fill(atolIn);
  } else {
    if (!atolIn || atolIn.length !== n) throw new InputError('atol', `must be a number or have ${n} components (one per component of y0)`, atolIn);
    for (let i = 0; i < n; i++) {
      requireFinite(`atol[${i}]`, atolIn[i]);
      if (!(atolIn[i] > 0)) throw new InputError(`atol[${i}]`, 'must be > 0', atolIn[i]);
      atol[i] = atolIn[i];
    }
  }
  const span = Math.abs(tEnd - t0);
  let maxStep = span;
  if (options.maxStep !== undefined) {
    requireFinite('maxStep', options.maxStep);
    if (!(options.maxStep > 0)) throw new InputError('maxStep', 'must be > 0', options.maxStep);
    maxStep = Math.min(options.maxStep, span);
  }
  let minStep = 0;
  if (options.minStep !== undefined) {
    requireFinite('minStep', options.minStep);
    if (!(options.minStep >= 0)) throw new InputError('minStep', 'must be >= 0', options.minStep);
    minStep = options.minStep;
  }
  if (options.h0 !== undefined) {
    requireFinite('h0', options.h0);
    if (!(options.h0 > 0)) throw new InputError('h0', 'must be > 0', options.h0);
  }
  const maxSteps = options.maxSteps ?? DEFAULT_MAX_STEPS;
  if (!Number.isInteger(maxSteps) || maxSteps < 1) throw new InputError('maxSteps', 'must be an integer >= 1', maxSteps);
  const events = checkEvents(options.events);

  const stats: SolveStats = { accepted: 0, rejected: 0, fevals: 0 };
  const y = Float64Array.from(y0 as ArrayLike<number>);
  const locator = new EventLocator(events, n, 'rk45');
  const dense = options.dense ? new DenseOutput(n, t0) : undefined;
  if (span === 0) {
    return { t: t0, y, status: 'done', message: 'tEnd equals t0: nothing to integrate', stats, events: locator.hits, dense, hNext: 0 };
  }
  const dir = tEnd > t0 ? 1 : -1;

  const k1 = new Float64Array(n);
  f(t0, y, k1);
  stats.fevals++;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(k1[i])) {
      throw new SolverError('rk45', 'non-finite', `derivative component ${i} is ${k1[i]} at the initial point t=${t0}`, { t0, y0: Array.from(y) });
    }
  }
  if (locator.active) locator.begin(t0, y);
  const h = options.h0 !== undefined ? Math.min(options.h0, maxStep) : initialStep(f, t0, y, k1, dir, rtol, atol, maxStep, stats);
  const settings: Settings = { n, tEnd, dir, rtol, atol, maxStep, minStep, maxSteps, locator, dense, signal: options.signal, stats };
  return unrolled && n === 6 ? march6(f, t0, y, k1, h, settings) : marchN(f, t0, y, k1, h, settings);
}

// Starting step size (Hairer et al. II.4, the algorithm of the DOPRI5 code), RMS norms.
function initialStep(
  f: OdeFunction,
  t: number,
  y: Float64Array,
  k1: Float64Array,
  dir: number,
  rtol: number,
  atol: Float64Array,
  maxStep: number,
  stats: SolveStats,
): number {
  const n = y.length;
  let d0 = 0;
  let d1 = 0;
  for (let i = 0; i < n; i++) {
    const sk = atol[i] + rtol * Math.abs(y[i]);
    d0 += (y[i] / sk) ** 2;
    d1 += (k1[i] / sk) ** 2;
  }
  d0 = Math.sqrt(d0 / n);
  d1 = Math.sqrt(d1 / n);
  const hh = Math.min(d0 < 1e-5 || d1 < 1e-5 ? 1e-6 : 0.01 * (d0 / d1), maxStep);
  const ys = new Float64Array(n);
  const k2 = new Float64Array(n);
  for (let i = 0; i < n; i++) ys[i] = y[i] + dir * hh * k1[i];
  f(t + dir * hh, ys, k2);
  stats.fevals++;
  let d2 = 0;
  for (let i = 0; i < n; i++) {
    const sk = atol[i] + rtol * Math.abs(y[i]);
    d2 += ((k2[i] - k1[i]) / sk) ** 2;
  }
  d2 = Math.sqrt(d2 / n) / hh;
  if (!Number.isFinite(d2)) return hh * 1e-3;
  const dm = Math.max(d1, d2);
  const h1 = dm <= 1e-15 ? Math.max(1e-6, hh * 1e-3) : (0.01 / dm) ** 0.2;
  return Math.min(100 * hh, h1, maxStep);
}

// PI step-size controller (Gustafsson; DOPRI5 form) on lnErr = ln‖err‖:
// h_new = h / clamp(err^α · err_old^−β / safety, 1/facMax, 1/facMin), as exp/log (cheaper than pow).
function acceptedShrink(lnErr: number, lnErrOld: number): number {
  const fac = Math.exp(ALPHA * lnErr - BETA * lnErrOld) / SAFETY;
  return Math.max(1 / FAC_MAX, Math.min(1 / FAC_MIN, fac));
}

// After a rejection: h_new = h / min(1/facMin, err^α / safety).
function rejectedShrink(lnErr: number): number {
  return Math.min(1 / FAC_MIN, Math.exp(ALPHA * lnErr) / SAFETY);
}

// Why the step loop stops before a step, or '' to go on.
function limitReached(s: Settings, t: number, h: number, steps: number): RK45Status | '' {
  if (s.signal?.aborted) return 'cancelled';
  if (steps >= s.maxSteps) return 'step-budget';
  if (!(h > stepFloor(s, t))) return 'step-underflow';
  return '';
}

function stepFloor(s: Settings, t: number): number {
  return Math.max(s.minStep, UNDERFLOW_ULPS * EPS * Math.max(Math.abs(t), Math.abs(s.tEnd)));
}

function limitMessage(status: RK45Status, s: Settings, t: number, h: number, nonFinite: boolean): string {
  if (status === 'cancelled') return `cancelled at t=${t} after ${s.stats.accepted} accepted steps`;
  if (status === 'step-budget') return `step budget of ${s.maxSteps} steps exhausted at t=${t} (tEnd=${s.tEnd})`;
  return (
    `step size ${h} fell below its minimum ${stepFloor(s, t)} at t=${t}` +
    (nonFinite ? ' (the derivative kept returning non-finite values)' : ' (tolerance cannot be met)')
  );
}

function doneMessage(s: Settings): string {
  return `reached tEnd=${s.tEnd} in ${s.stats.accepted} accepted steps (${s.stats.rejected} rejected)`;
}

// The generic step loop, any n.
function marchN(f: OdeFunction, t0: number, y0: Float64Array, k10: Float64Array, h0: number, s: Settings): RK45Result {
  const { n, tEnd, dir, rtol, maxStep, locator, dense, stats } = s;
  const hasEvents = locator.active;
  // One workspace for every stage vector: the loop reads and writes a single typed array and f
  // gets subarray views of it. Slots: 0, 1 = y and y_new (swapped by offset), 2 = stage argument,
  // 3..9 = k1..k7 (k1 and k7 swapped by offset: FSAL), 10 = atol.
  const w = new Float64Array(11 * n);
  const view = (slot: number): Float64Array => w.subarray(slot * n, slot * n + n);
  let oY = 0,
    oN = n,
    oK1 = 3 * n,
    oK7 = 9 * n;
  const oS = 2 * n,
    o2 = 4 * n,
    o3 = 5 * n,
    o4 = 6 * n,
    o5 = 7 * n,
    o6 = 8 * n,
    oA = 10 * n;
  let y = view(0);
  let ynew = view(1);
  const ys = view(2);
  let k1 = view(3);
  const k2 = view(4);
  const k3 = view(5);
  const k4 = view(6);
  const k5 = view(7);
  const k6 = view(8);
  let k7 = view(9);
  y.set(y0);
  k1.set(k10);
  w.set(s.atol, oA);
  const rc = new Float64Array(5 * n);

  // Dormand–Prince 5(4) tableau (Hairer et al., Table II.5.2).
  const C2 = 1 / 5,
    C3 = 3 / 10,
    C4 = 4 / 5,
    C5 = 8 / 9;
  const A21 = 1 / 5;
  const A31 = 3 / 40,
    A32 = 9 / 40;
  const A41 = 44 / 45,
    A42 = -56 / 15,
    A43 = 32 / 9;
  const A51 = 19372 / 6561,
    A52 = -25360 / 2187,
    A53 = 64448 / 6561,
    A54 = -212 / 729;
  const A61 = 9017 / 3168,
    A62 = -355 / 33,
    A63 = 46732 / 5247,
    A64 = 49 / 176,
    A65 = -5103 / 18656;
  const A71 = 35 / 384,
    A73 = 500 / 1113,
    A74 = 125 / 192,
    A75 = -2187 / 6784,
    A76 = 11 / 84;
  // Error coefficients b − b̂ (5th- minus 4th-order weights).
  const E1 = 71 / 57600,
    E3 = -71 / 16695,
    E4 = 71 / 1920,
    E5 = -17253 / 339200,
    E6 = 22 / 525,
    E7 = -1 / 40;

  let t = t0;
  let h = h0;
  let lnErrOld = LN_ERR_FLOOR; // ln of the previous accepted error, floored at 1e-4 (DOPRI5 FACOLD)
  let lastRejected = false;
  let lastNonFinite = false;
  let steps = 0;
  let status: RK45Status = 'done';
  let message = '';

  for (;;) {
    const stop = limitReached(s, t, h, steps);
    if (stop !== '') {
      status = stop;
      message = limitMessage(stop, s, t, h, lastNonFinite);
      break;
    }
    let last = false;
    if ((t + 1.01 * dir * h - tEnd) * dir >= 0) {
      h = Math.abs(tEnd - t);
      last = true;
    }
    const hs = dir * h;
    steps++;

    // Stages 2..7.
    for (let i = 0; i < n; i++) w[oS + i] = w[oY + i] + hs * A21 * w[oK1 + i];
    f(t + C2 * hs, ys, k2);
    for (let i = 0; i < n; i++) w[oS + i] = w[oY + i] + hs * (A31 * w[oK1 + i] + A32 * w[o2 + i]);
    f(t + C3 * hs, ys, k3);
    for (let i = 0; i < n; i++) w[oS + i] = w[oY + i] + hs * (A41 * w[oK1 + i] + A42 * w[o2 + i] + A43 * w[o3 + i]);
    f(t + C4 * hs, ys, k4);
    for (let i = 0; i < n; i++) {
      w[oS + i] = w[oY + i] + hs * (A51 * w[oK1 + i] + A52 * w[o2 + i] + A53 * w[o3 + i] + A54 * w[o4 + i]);
    }
    f(t + C5 * hs, ys, k5);
    for (let i = 0; i < n; i++) {
      w[oS + i] = w[oY + i] + hs * (A61 * w[oK1 + i] + A62 * w[o2 + i] + A63 * w[o3 + i] + A64 * w[o4 + i] + A65 * w[o5 + i]);
    }
    const tn = last ? tEnd : t + hs;
    f(tn, ys, k6);
    for (let i = 0; i < n; i++) {
      w[oN + i] = w[oY + i] + hs * (A71 * w[oK1 + i] + A73 * w[o3 + i] + A74 * w[o4 + i] + A75 * w[o5 + i] + A76 * w[o6 + i]);
    }
    f(tn, ynew, k7);
    stats.fevals += 6;

    // Embedded error estimate: squared RMS of e_i / (atol_i + rtol·max(|y_i|, |y_new_i|)).
    let err = 0;
    for (let i = 0; i < n; i++) {
      const ei = hs * (E1 * w[oK1 + i] + E3 * w[o3 + i] + E4 * w[o4 + i] + E5 * w[o5 + i] + E6 * w[o6 + i] + E7 * w[oK7 + i]);
      const sk = w[oA + i] + rtol * Math.max(Math.abs(w[oY + i]), Math.abs(w[oN + i]));
      const r = ei / sk;
      err += r * r;
    }
    err /= n;

    if (!(err < Infinity)) {
      // NaN or Infinity somewhere in the stages: reject and shrink.
      stats.rejected++;
      lastRejected = true;
      lastNonFinite = true;
      h *= NONFINITE_SHRINK;
      continue;
    }
    lastNonFinite = false;
    const lnErr = 0.5 * Math.log(err);
    if (err > 1) {
      h /= rejectedShrink(lnErr);
      stats.rejected++;
      lastRejected = true;
      continue;
    }

    let hNew = h / acceptedShrink(lnErr, lnErrOld);
    lnErrOld = lnErr > LN_ERR_FLOOR ? lnErr : LN_ERR_FLOOR;
    stats.accepted++;

    let rcReady = false;
    if (dense) {
      buildCoeffs(n, hs, y, ynew, k1, k3, k4, k5, k6, k7, rc);
      dense.appendStep(t, hs, rc);
      rcReady = true;
    }
    // Events: sign changes between the accepted points, refined on the interpolant.
    if (hasEvents && locator.detect(tn, ynew)) {
      if (!rcReady) buildCoeffs(n, hs, y, ynew, k1, k3, k4, k5, k6, k7, rc);
      const stopAt = locator.locate(t, hs, tn, ynew, rc);
      if (!Number.isNaN(stopAt)) {
        const hit = locator.hits[locator.hits.length - 1];
        y.set(hit.y);
        t = stopAt;
        if (dense) dense.truncate(stopAt);
        status = 'event';
        message = `terminal event ${locator.label(hit.index)} at t=${t}`;
        h = hNew;
        break;
      }
    }

    // Advance: swap y/y_new and k1/k7 (FSAL: k7 at the new point is k1 of the next step).
    t = tn;
    let tmp = y;
    y = ynew;
    ynew = tmp;
    tmp = k1;
    k1 = k7;
    k7 = tmp;
    let to = oY;
    oY = oN;
    oN = to;
    to = oK1;
    oK1 = oK7;
    oK7 = to;
    if (hasEvents) locator.advance();

    if (hNew > maxStep) hNew = maxStep;
    if (lastRejected) hNew = Math.min(hNew, h);
    lastRejected = false;
    h = hNew;
    if (last) {
      message = doneMessage(s);
      break;
    }
  }

  return { t, y: Float64Array.from(y), status, message, stats, events: locator.hits, dense, hNext: dir * h };
}

// The step loop unrolled for n = 6: state y, stages k1..k7 and y_new live in local variables
// (y0..y5; a, b, c, d, e, g, q = k1..k7; n0..n5 = y_new); f sees two 6-vectors, its argument
// and its output. Same arithmetic, same order as marchN.
function march6(f: OdeFunction, t0: number, yIn: Float64Array, k1In: Float64Array, h0: number, s: Settings): RK45Result {
  const { tEnd, dir, rtol, maxStep, locator, dense, stats } = s;
  const hasEvents = locator.active;
  const arg = new Float64Array(6); // f's argument
  const out = new Float64Array(6); // f's output
  // Vectors for the dense output and the event locator, filled only when they need them.
  const wv = new Float64Array(54);
  const vy = wv.subarray(0, 6),
    vn = wv.subarray(6, 12),
    v1 = wv.subarray(12, 18),
    v3 = wv.subarray(18, 24);
  const v4 = wv.subarray(24, 30),
    v5 = wv.subarray(30, 36),
    v6 = wv.subarray(36, 42),
    v7 = wv.subarray(42, 48);
  const rc = new Float64Array(30);
  const at0 = s.atol[0],
    at1 = s.atol[1],
    at2 = s.atol[2],
    at3 = s.atol[3],
    at4 = s.atol[4],
    at5 = s.atol[5];

  // Dormand–Prince 5(4) tableau (Hairer et al., Table II.5.2).
  const C2 = 1 / 5,
    C3 = 3 / 10,
    C4 = 4 / 5,
    C5 = 8 / 9;
  const A21 = 1 / 5;
  const A31 = 3 / 40,
    A32 = 9 / 40;
  const A41 = 44 / 45,
    A42 = -56 / 15,
    A43 = 32 / 9;
  const A51 = 19372 / 6561,
    A52 = -25360 / 2187,
    A53 = 64448 / 6561,
    A54 = -212 / 729;
  const A61 = 9017 / 3168,
    A62 = -355 / 33,
    A63 = 46732 / 5247,
    A64 = 49 / 176,
    A65 = -5103 / 18656;
  const A71 = 35 / 384,
    A73 = 500 / 1113,
    A74 = 125 / 192,
    A75 = -2187 / 6784,
    A76 = 11 / 84;
  // Error coefficients b − b̂ (5th- minus 4th-order weights).
  const E1 = 71 / 57600,
    E3 = -71 / 16695,
    E4 = 71 / 1920,
    E5 = -17253 / 339200,
    E6 = 22 / 525,
    E7 = -1 / 40;

  let y0 = yIn[0],
    y1 = yIn[1],
    y2 = yIn[2],
    y3 = yIn[3],
    y4 = yIn[4],
    y5 = yIn[5];
  let a0 = k1In[0],
    a1 = k1In[1],
    a2 = k1In[2],
    a3 = k1In[3],
    a4 = k1In[4],
    a5 = k1In[5];

  let t = t0;
  let h = h0;
  let lnErrOld = LN_ERR_FLOOR;
  let lastRejected = false;
  let lastNonFinite = false;
  let steps = 0;
  let status: RK45Status = 'done';
  let message = '';

  for (;;) {
    const stop = limitReached(s, t, h, steps);
    if (stop !== '') {
      status = stop;
      message = limitMessage(stop, s, t, h, lastNonFinite);
      break;
    }
    let last = false;
    if ((t + 1.01 * dir * h - tEnd) * dir >= 0) {
      h = Math.abs(tEnd - t);
      last = true;
    }
    const hs = dir * h;
    steps++;

    // Stage 2.
    arg[0] = y0 + hs * A21 * a0;
    arg[1] = y1 + hs * A21 * a1;
    arg[2] = y2 + hs * A21 * a2;
    arg[3] = y3 + hs * A21 * a3;
    arg[4] = y4 + hs * A21 * a4;
    arg[5] = y5 + hs * A21 * a5;
    f(t + C2 * hs, arg, out);
    const b0 = out[0],
      b1 = out[1],
      b2 = out[2],
      b3 = out[3],
      b4 = out[4],
      b5 = out[5];
    // Stage 3.
    arg[0] = y0 + hs * (A31 * a0 + A32 * b0);
    arg[1] = y1 + hs * (A31 * a1 + A32 * b1);
    arg[2] = y2 + hs * (A31 * a2 + A32 * b2);
    arg[3] = y3 + hs * (A31 * a3 + A32 * b3);
    arg[4] = y4 + hs * (A31 * a4 + A32 * b4);
    arg[5] = y5 + hs * (A31 * a5 + A32 * b5);
    f(t + C3 * hs, arg, out);
    const c0 = out[0],
      c1 = out[1],
      c2 = out[2],
      c3 = out[3],
      c4 = out[4],
      c5 = out[5];
    // Stage 4.
    arg[0] = y0 + hs * (A41 * a0 + A42 * b0 + A43 * c0);
    arg[1] = y1 + hs * (A41 * a1 + A42 * b1 + A43 * c1);
    arg[2] = y2 + hs * (A41 * a2 + A42 * b2 + A43 * c2);
    arg[3] = y3 + hs * (A41 * a3 + A42 * b3 + A43 * c3);
    arg[4] = y4 + hs * (A41 * a4 + A42 * b4 + A43 * c4);
    arg[5] = y5 + hs * (A41 * a5 + A42 * b5 + A43 * c5);
    f(t + C4 * hs, arg, out);
    const d0 = out[0],
      d1 = out[1],
      d2 = out[2],
      d3 = out[3],
      d4 = out[4],
      d5 = out[5];
    // Stage 5.
    arg[0] = y0 + hs * (A51 * a0 + A52 * b0 + A53 * c0 + A54 * d0);
    arg[1] = y1 + hs * (A51 * a1 + A52 * b1 + A53 * c1 + A54 * d1);
    arg[2] = y2 + hs * (A51 * a2 + A52 * b2 + A53 * c2 + A54 * d2);
    arg[3] = y3 + hs * (A51 * a3 + A52 * b3 + A53 * c3 + A54 * d3);
    arg[4] = y4 + hs * (A51 * a4 + A52 * b4 + A53 * c4 + A54 * d4);
    arg[5] = y5 + hs * (A51 * a5 + A52 * b5 + A53 * c5 + A54 * d5);
    f(t + C5 * hs, arg, out);
    const e0 = out[0],
      e1 = out[1],
      e2 = out[2],
      e3 = out[3],
      e4 = out[4],
      e5 = out[5];
    // Stage 6.
    arg[0] = y0 + hs * (A61 * a0 + A62 * b0 + A63 * c0 + A64 * d0 + A65 * e0);
    arg[1] = y1 + hs * (A61 * a1 + A62 * b1 + A63 * c1 + A64 * d1 + A65 * e1);
    arg[2] = y2 + hs * (A61 * a2 + A62 * b2 + A63 * c2 + A64 * d2 + A65 * e2);
    arg[3] = y3 + hs * (A61 * a3 + A62 * b3 + A63 * c3 + A64 * d3 + A65 * e3);
    arg[4] = y4 + hs * (A61 * a4 + A62 * b4 + A63 * c4 + A64 * d4 + A65 * e4);
    arg[5] = y5 + hs * (A61 * a5 + A62 * b5 + A63 * c5 + A64 * d5 + A65 * e5);
    const tn = last ? tEnd : t + hs;
    f(tn, arg, out);
    const g0 = out[0],
      g1 = out[1],
      g2 = out[2],
      g3 = out[3],
      g4 = out[4],
      g5 = out[5];
    // Stage 7: the new point (5th order) and its derivative (FSAL).
    const n0 = y0 + hs * (A71 * a0 + A73 * c0 + A74 * d0 + A75 * e0 + A76 * g0);
    const n1 = y1 + hs * (A71 * a1 + A73 * c1 + A74 * d1 + A75 * e1 + A76 * g1);
    const n2 = y2 + hs * (A71 * a2 + A73 * c2 + A74 * d2 + A75 * e2 + A76 * g2);
    const n3 = y3 + hs * (A71 * a3 + A73 * c3 + A74 * d3 + A75 * e3 + A76 * g3);
    const n4 = y4 + hs * (A71 * a4 + A73 * c4 + A74 * d4 + A75 * e4 + A76 * g4);
    const n5 = y5 + hs * (A71 * a5 + A73 * c5 + A74 * d5 + A75 * e5 + A76 * g5);
    arg[0] = n0;
    arg[1] = n1;
    arg[2] = n2;
    arg[3] = n3;
    arg[4] = n4;
    arg[5] = n5;
    f(tn, arg, out);
    const q0 = out[0],
      q1 = out[1],
      q2 = out[2],
      q3 = out[3],
      q4 = out[4],
      q5 = out[5];
    stats.fevals += 6;

    // Embedded error estimate (as in marchN).
    let err = 0;
    let r = (hs * (E1 * a0 + E3 * c0 + E4 * d0 + E5 * e0 + E6 * g0 + E7 * q0)) / (at0 + rtol * Math.max(Math.abs(y0), Math.abs(n0)));
    err += r * r;
    r = (hs * (E1 * a1 + E3 * c1 + E4 * d1 + E5 * e1 + E6 * g1 + E7 * q1)) / (at1 + rtol * Math.max(Math.abs(y1), Math.abs(n1)));
    err += r * r;
    r = (hs * (E1 * a2 + E3 * c2 + E4 * d2 + E5 * e2 + E6 * g2 + E7 * q2)) / (at2 + rtol * Math.max(Math.abs(y2), Math.abs(n2)));
    err += r * r;
    r = (hs * (E1 * a3 + E3 * c3 + E4 * d3 + E5 * e3 + E6 * g3 + E7 * q3)) / (at3 + rtol * Math.max(Math.abs(y3), Math.abs(n3)));
    err += r * r;
    r = (hs * (E1 * a4 + E3 * c4 + E4 * d4 + E5 * e4 + E6 * g4 + E7 * q4)) / (at4 + rtol * Math.max(Math.abs(y4), Math.abs(n4)));
    err += r * r;
    r = (hs * (E1 * a5 + E3 * c5 + E4 * d5 + E5 * e5 + E6 * g5 + E7 * q5)) / (at5 + rtol * Math.max(Math.abs(y5), Math.abs(n5)));
    err += r * r;
    err /= 6;

    if (!(err < Infinity)) {
      stats.rejected++;
      lastRejected = true;
      lastNonFinite = true;
      h *= NONFINITE_SHRINK;
      continue;
    }
    lastNonFinite = false;
    const lnErr = 0.5 * Math.log(err);
    if (err > 1) {
      h /= rejectedShrink(lnErr);
      stats.rejected++;
      lastRejected = true;
      continue;
    }

    let hNew = h / acceptedShrink(lnErr, lnErrOld);
    lnErrOld = lnErr > LN_ERR_FLOOR ? lnErr : LN_ERR_FLOOR;
    stats.accepted++;

    if (dense || hasEvents) {
      vn[0] = n0;
      vn[1] = n1;
      vn[2] = n2;
      vn[3] = n3;
      vn[4] = n4;
      vn[5] = n5;
      let rcReady = false;
      if (dense) {
        fill6(
          vy,
          v1,
          v3,
          v4,
          v5,
          v6,
          v7,
          y0,
          y1,
          y2,
          y3,
          y4,
          y5,
          a0,
          a1,
          a2,
          a3,
          a4,
          a5,
          c0,
          c1,
          c2,
          c3,
          c4,
          c5,
          d0,
          d1,
          d2,
          d3,
          d4,
          d5,
          e0,
          e1,
          e2,
          e3,
          e4,
          e5,
          g0,
          g1,
          g2,
          g3,
          g4,
          g5,
          q0,
          q1,
          q2,
          q3,
          q4,
          q5,
        );
        buildCoeffs(6, hs, vy, vn, v1, v3, v4, v5, v6, v7, rc);
        dense.appendStep(t, hs, rc);
        rcReady = true;
      }
      if (hasEvents && locator.detect(tn, vn)) {
        if (!rcReady) {
          fill6(
            vy,
            v1,
            v3,
            v4,
            v5,
            v6,
            v7,
            y0,
            y1,
            y2,
            y3,
            y4,
            y5,
            a0,
            a1,
            a2,
            a3,
            a4,
            a5,
            c0,
            c1,
            c2,
            c3,
            c4,
            c5,
            d0,
            d1,
            d2,
            d3,
            d4,
            d5,
            e0,
            e1,
            e2,
            e3,
            e4,
            e5,
            g0,
            g1,
            g2,
            g3,
            g4,
            g5,
            q0,
            q1,
            q2,
            q3,
            q4,
            q5,
          );
          buildCoeffs(6, hs, vy, vn, v1, v3, v4, v5, v6, v7, rc);
        }
        const stopAt = locator.locate(t, hs, tn, vn, rc);
        if (!Number.isNaN(stopAt)) {
          const hy = locator.hits[locator.hits.length - 1].y;
          y0 = hy[0];
          y1 = hy[1];
          y2 = hy[2];
          y3 = hy[3];
          y4 = hy[4];
          y5 = hy[5];
          t = stopAt;
          if (dense) dense.truncate(stopAt);
          status = 'event';
          message = `terminal event ${locator.label(locator.hits[locator.hits.length - 1].index)} at t=${t}`;
          h = hNew;
          break;
        }
      }
    }

    // Advance (FSAL: k7 at the new point is k1 of the next step).
    t = tn;
    y0 = n0;
    y1 = n1;
    y2 = n2;
    y3 = n3;
    y4 = n4;
    y5 = n5;
    a0 = q0;
    a1 = q1;
    a2 = q2;
    a3 = q3;
    a4 = q4;
    a5 = q5;
    if (hasEvents) locator.advance();

    if (hNew > maxStep) hNew = maxStep;
    if (lastRejected) hNew = Math.min(hNew, h);
    lastRejected = false;
    h = hNew;
    if (last) {
      message = doneMessage(s);
      break;
    }
  }

  return { t, y: Float64Array.of(y0, y1, y2, y3, y4, y5), status, message, stats, events: locator.hits, dense, hNext: dir * h };
}

// Writes the unrolled kernel's y and k1, k3..k7 into vectors for buildCoeffs.
function fill6(
  vy: Float64Array,
  v1: Float64Array,
  v3: Float64Array,
  v4: Float64Array,
  v5: Float64Array,
  v6: Float64Array,
  v7: Float64Array,
  y0: number,
  y1: number,
  y2: number,
  y3: number,
  y4: number,
  y5: number,
  a0: number,
  a1: number,
  a2: number,
  a3: number,
  a4: number,
  a5: number,
  c0: number,
  c1: number,
  c2: number,
  c3: number,
  c4: number,
  c5: number,
  d0: number,
  d1: number,
  d2: number,
  d3: number,
  d4: number,
  d5: number,
  e0: number,
  e1: number,
  e2: number,
  e3: number,
  e4: number,
  e5: number,
  g0: number,
  g1: number,
  g2: number,
  g3: number,
  g4: number,
  g5: number,
  q0: number,
  q1: number,
  q2: number,
  q3: number,
  q4: number,
  q5: number,
): void {
  vy[0] = y0;
  vy[1] = y1;
  vy[2] = y2;
  vy[3] = y3;
  vy[4] = y4;
  vy[5] = y5;
  v1[0] = a0;
  v1[1] = a1;
  v1[2] = a2;
  v1[3] = a3;
  v1[4] = a4;
  v1[5] = a5;
  v3[0] = c0;
  v3[1] = c1;
  v3[2] = c2;
  v3[3] = c3;
  v3[4] = c4;
  v3[5] = c5;
  v4[0] = d0;
  v4[1] = d1;
  v4[2] = d2;
  v4[3] = d3;
  v4[4] = d4;
  v4[5] = d5;
  v5[0] = e0;
  v5[1] = e1;
  v5[2] = e2;
  v5[3] = e3;
  v5[4] = e4;
  v5[5] = e5;
  v6[0] = g0;
  v6[1] = g1;
  v6[2] = g2;
  v6[3] = g3;
  v6[4] = g4;
  v6[5] = g5;
  v7[0] = q0;
  v7[1] = q1;
  v7[2] = q2;
  v7[3] = q3;
  v7[4] = q4;
  v7[5] = q5;
}

// Dense output coefficients r1..r5 of the step from (y, k1) to (ynew, k7) (Hairer et al. II.6, DOPRI5).
function buildCoeffs(
  n: number,
  hs: number,
  y: Float64Array,
  ynew: Float64Array,
  k1: Float64Array,
  k3: Float64Array,
  k4: Float64Array,
  k5: Float64Array,
  k6: Float64Array,
  k7: Float64Array,
  rc: Float64Array,
): void {
  // Dense output coefficients (DOPRI5 code, Hairer et al. II.6).
  const D1 = -12715105075 / 11282082432,
    D3 = 87487479700 / 32700410799,
    D4 = -10690763975 / 1880347072;
  const D5 = 701980252875 / 199316789632,
    D6 = -1453857185 / 822651844,
    D7 = 69997945 / 29380423;
  for (let i = 0; i < n; i++) {
    const dy = ynew[i] - y[i];
    const bspl = hs * k1[i] - dy;
    rc[i] = y[i];
    rc[n + i] = dy;
    rc[2 * n + i] = bspl;
    rc[3 * n + i] = dy - hs * k7[i] - bspl;
    rc[4 * n + i] = hs * (D1 * k1[i] + D3 * k3[i] + D4 * k4[i] + D5 * k5[i] + D6 * k6[i] + D7 * k7[i]);
  }
}
