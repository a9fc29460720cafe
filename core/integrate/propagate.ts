/**
 * The propagation front door: flies x'' = a(t, x, v) from t0 to tEnd, chooses the integrator
 * and records which method flew which span and why. Never a silent switch: every choice and
 * every fallback is a FlownSpan with its reason.
 *
 * Policy (method 'auto'):
 * - by default Dormand–Prince RK45 (rk45.ts), reason 'default';
 * - at tight tolerances (rtol ≤ DOP853_RTOL) the 8th-order DOP853 (dop853.ts), reason
 *   'tight tolerance: rtol … ≤ 1e-10' — a quarter of RK45's evaluations at rtol 1e-12 on a
 *   smooth orbit. Its error estimate is close to its true local error where RK45's is tens of
 *   times pessimistic, so at the same rtol it takes much longer steps: a caller whose
 *   acceleration varies faster than its motion shows (a moon circling a planet far from the
 *   ship) must bound the step with maxStep, or the embedded estimates alias the fast terms;
 * - when a period estimate is given and the span exceeds longCoastRevs revolutions, a
 *   symplectic method (LONG_COAST_METHOD, Yoshida 4) flies it at fixedStep or
 *   period / DEFAULT_STEPS_PER_REV, reason 'long coast: N revolutions > M' — symplectic
 *   methods keep the energy error bounded over long coasts (Hairer, Lubich & Wanner, Geometric
 *   Numerical Integration, 2nd ed., §I.1 and ch. X);
 * - if RK45 (or DOP853) stops with 'step-budget' or 'step-underflow', FALLBACK_METHOD flies the rest from
 *   where RK45 stopped, at fixedStep, else period / DEFAULT_STEPS_PER_REV, else the last step
 *   size RK45 proposed; reason 'RK45 failed: <status> at t=…; fell back to yoshida4 with h=…'.
 *   No fallback when it would need more than FALLBACK_MAX_STEPS steps: the result then keeps
 *   RK45's status and the message says why.
 * An explicit method is always honoured (reason 'requested by caller'), with no fallback; so is
 * fallback: false (the result keeps the adaptive method's status, for references that must fail
 * rather than change method).
 *
 * State layout for events and dense output: y = [x, v] (2n components, n = x0.length). On
 * fixed-step spans events and dense output use the cubic Hermite interpolant through (x, v, a)
 * at the step ends, which costs one extra acceleration evaluation per step (counted in fevals).
 */
import { InputError, requireFinite } from '../math/index.ts';
import { DenseOutput, hermiteCoefficients } from './dense.ts';
import { EventLocator, checkEvents, type EventHit, type EventSpec } from './eventLocator.ts';
import { FIXED_METHODS, integrateFixed, requireStatePair, type FixedMethod } from './fixed.ts';
import type { AccelFunction, OdeFunction, SolveStats } from './ode.ts';
import { dop853 } from './dop853.ts';
import { DEFAULT_RTOL, rk45 } from './rk45.ts';

export type MethodChoice = 'auto' | 'rk45' | 'dop853' | FixedMethod;

export interface PropagateRequest {
  accel: AccelFunction;
  t0: number;
  x0: ArrayLike<number>;
  v0: ArrayLike<number>;
  tEnd: number;
  method?: MethodChoice;
  rtol?: number;
  atol?: number;
  /** Step of the fixed-step methods (s, > 0). */
  fixedStep?: number;
  /** Step budget of RK45. */
  maxSteps?: number;
  /** Largest step of RK45 and DOP853 (s, > 0; default the whole span); the fixed-step methods ignore it. */
  maxStep?: number;
  /** Under 'auto', fly the rest with FALLBACK_METHOD when RK45 or DOP853 fails (default true). */
  fallback?: boolean;
  /** Events on y = [x, v]. */
  events?: EventSpec[];
  dense?: boolean;
  /** orbital period estimate for the revolution-count policy; when the span exceeds longCoastRevs periods and method is auto, a symplectic method flies it */
  period?: number;
  longCoastRevs?: number;
  signal?: { aborted: boolean };
}

export interface FlownSpan {
  t0: number;
  t1: number;
  method: 'rk45' | 'dop853' | FixedMethod;
  reason: string;
  stats: SolveStats;
}

export interface PropagateResult {
  t: number;
  x: Float64Array;
  v: Float64Array;
  spans: FlownSpan[];
  events: EventHit[];
  /** 'done' | 'event' | 'cancelled' | 'step-budget' | 'step-underflow' (the last two only when no fallback flew). */
  status: string;
  message: string;
  /** Dense output of y = [x, v] over all spans. */
  dense?: DenseOutput;
}

/**
 * Tolerance at and below which 'auto' flies with DOP853 instead of RK45: the n-body default
 * (1e-10) and the game-step reference (1e-12) fly with DOP853.
 */
export const DOP853_RTOL = 1e-10;
/** Revolutions above which 'auto' flies a coast with a symplectic method. */
export const DEFAULT_LONG_COAST_REVS = 500;
/** Fixed steps per revolution when the step comes from the period estimate. */
export const DEFAULT_STEPS_PER_REV = 1000;
/** Symplectic method for long coasts. */
export const LONG_COAST_METHOD: FixedMethod = 'yoshida4';
/** Method that flies the rest of the span when RK45 fails under 'auto'. */
export const FALLBACK_METHOD: FixedMethod = 'yoshida4';
/** Largest number of fixed steps a fallback may take. */
export const FALLBACK_MAX_STEPS = 10_000_000;

const METHODS: readonly MethodChoice[] = ['auto', 'rk45', ...FIXED_METHODS, 'dop853'];

function fmt(x: number): string {
  return String(Number(x.toPrecision(6)));
}

export function propagate(req: PropagateRequest): PropagateResult {
  if (!req || typeof req !== 'object') throw new InputError('request', 'must be an object', req);
  if (typeof req.accel !== 'function') throw new InputError('accel', 'must be a function', req.accel);
  const t0 = requireFinite('t0', req.t0);
  const tEnd = requireFinite('tEnd', req.tEnd);
  const n = requireStatePair(req.x0, req.v0);
  const method = req.method ?? 'auto';
  if (!METHODS.includes(method)) throw new InputError('method', `must be one of ${METHODS.join(', ')}`, method);
  const positive = (field: string, v: number | undefined): void => {
    if (v === undefined) return;
    requireFinite(field, v);
    if (!(v > 0)) throw new InputError(field, 'must be > 0', v);
  };
  positive('rtol', req.rtol);
  positive('atol', req.atol);
  positive('fixedStep', req.fixedStep);
  positive('period', req.period);
  positive('longCoastRevs', req.longCoastRevs);
  positive('maxStep', req.maxStep);
  if (req.fallback !== undefined && typeof req.fallback !== 'boolean') throw new InputError('fallback', 'must be true or false', req.fallback);
  if (req.maxSteps !== undefined && (!Number.isInteger(req.maxSteps) || req.maxSteps < 1)) {
    throw new InputError('maxSteps', 'must be an integer >= 1', req.maxSteps);
  }
  const events = checkEvents(req.events);
  const longCoastRevs = req.longCoastRevs ?? DEFAULT_LONG_COAST_REVS;
  const accel = req.accel;

  const spans: FlownSpan[] = [];
  const n2 = 2 * n;
  const y = new Float64Array(n2);
  for (let i = 0; i < n; i++) {
    y[i] = req.x0[i];
    y[n + i] = req.v0[i];
  }
  const result = (t: number, yy: Float64Array, status: string, message: string, hits: EventHit[], dense?: DenseOutput): PropagateResult => ({
    t,
    x: yy.slice(0, n),
    v: yy.slice(n, n2),
    spans,
    events: hits,
    status,
    message,
    dense,
  });

  // Choose the first method.
  let first: 'rk45' | 'dop853' | FixedMethod;
  let reason: string;
  let h = req.fixedStep;
  if (method === 'auto') {
    const revs = req.period !== undefined ? Math.abs(tEnd - t0) / req.period : 0;
    if (req.period !== undefined && revs > longCoastRevs) {
      first = LONG_COAST_METHOD;
      h ??= req.period / DEFAULT_STEPS_PER_REV;
      reason = `long coast: ${fmt(revs)} revolutions > ${fmt(longCoastRevs)}`;
    } else if ((req.rtol ?? DEFAULT_RTOL) <= DOP853_RTOL) {
      first = 'dop853';
      reason = `tight tolerance: rtol ${fmt(req.rtol ?? DEFAULT_RTOL)} ≤ ${fmt(DOP853_RTOL)}`;
    } else {
      first = 'rk45';
      reason = 'default';
    }
  } else {
    first = method;
    reason = 'requested by caller';
    if (method !== 'rk45' && method !== 'dop853' && h === undefined) {
      if (req.period === undefined) throw new InputError('fixedStep', `must be given for method ${method} when period is not`);
      h = req.period / DEFAULT_STEPS_PER_REV;
    }
  }

  if (first !== 'rk45' && first !== 'dop853') {
    const locator = new EventLocator(events, n2, 'propagate');
    const dense = req.dense ? new DenseOutput(n2, t0) : undefined;
    const span = flyFixed(first, accel, t0, y, tEnd, h as number, n, locator, dense, req.signal);
    spans.push({ t0, t1: span.t, method: first, reason, stats: span.stats });
    return result(span.t, y, span.status, span.message, locator.hits, dense);
  }

  // RK45 or DOP853 on the first-order form.
  const xs = new Float64Array(n);
  const vs = new Float64Array(n);
  const as = new Float64Array(n);
  const ode: OdeFunction = (t, yy, dydt) => {
    for (let i = 0; i < n; i++) {
      xs[i] = yy[i];
      vs[i] = yy[n + i];
    }
    accel(t, xs, vs, as);
    for (let i = 0; i < n; i++) {
      dydt[i] = vs[i];
      dydt[n + i] = as[i];
    }
  };
  const adaptive = first === 'dop853' ? dop853 : rk45;
  const label = first === 'dop853' ? 'DOP853' : 'RK45';
  const r = adaptive(ode, t0, y, tEnd, {
    rtol: req.rtol,
    atol: req.atol,
    maxSteps: req.maxSteps,
    maxStep: req.maxStep,
    events,
    dense: req.dense,
    signal: req.signal,
  });
  spans.push({ t0, t1: r.t, method: first, reason, stats: r.stats });
  const failed = r.status === 'step-budget' || r.status === 'step-underflow';
  if (!failed || method !== 'auto' || req.fallback === false) return result(r.t, r.y, r.status, r.message, r.events, r.dense);

  // Fallback from where RK45 (DOP853) stopped.
  const hFallback = req.fixedStep ?? (req.period !== undefined ? req.period / DEFAULT_STEPS_PER_REV : Math.abs(r.hNext));
  const remaining = Math.abs(tEnd - r.t);
  const need = hFallback > 0 ? remaining / hFallback : Infinity;
  if (!(need <= FALLBACK_MAX_STEPS)) {
    return result(
      r.t,
      r.y,
      r.status,
      `${r.message}; no fallback: ${FALLBACK_METHOD} with h=${fmt(hFallback)} would need ${fmt(need)} steps > ${FALLBACK_MAX_STEPS}`,
      r.events,
      r.dense,
    );
  }
  const locator = new EventLocator(events, n2, 'propagate');
  for (const hit of r.events) locator.hits.push(hit);
  const yy = Float64Array.from(r.y);
  const dense = req.dense ? (r.dense ?? new DenseOutput(n2, t0)) : undefined;
  const span = flyFixed(FALLBACK_METHOD, accel, r.t, yy, tEnd, hFallback, n, locator, dense, req.signal);
  spans.push({
    t0: r.t,
    t1: span.t,
    method: FALLBACK_METHOD,
    reason: `${label} failed: ${r.status} at t=${r.t}; fell back to ${FALLBACK_METHOD} with h=${fmt(hFallback)}`,
    stats: span.stats,
  });
  return result(span.t, yy, span.status, `${r.message}; ${span.message}`, locator.hits, dense);
}

interface FixedSpan {
  t: number;
  status: string;
  message: string;
  stats: SolveStats;
}

// Flies a fixed-step span from (t0, y = [x, v]) to tEnd, updating y in place; events and dense
// output on the cubic Hermite interpolant of each step.
function flyFixed(
  method: FixedMethod,
  accel: AccelFunction,
  t0: number,
  y: Float64Array,
  tEnd: number,
  h: number,
  n: number,
  locator: EventLocator,
  dense: DenseOutput | undefined,
  signal: { aborted: boolean } | undefined,
): FixedSpan {
  const n2 = 2 * n;
  const x0 = y.slice(0, n);
  const v0 = y.slice(n, n2);
  const track = locator.active || dense !== undefined;
  let extra = 0;
  let stopAt = NaN;
  let onStep: ((t: number, x: Float64Array, v: Float64Array) => boolean) | undefined;
  if (track) {
    const yA = Float64Array.from(y);
    const fA = new Float64Array(n2);
    const yB = new Float64Array(n2);
    const fB = new Float64Array(n2);
    const a = new Float64Array(n);
    const rc = new Float64Array(5 * n2);
    const derivative = (t: number, x: Float64Array, v: Float64Array, out: Float64Array): void => {
      accel(t, x, v, a);
      extra++;
      for (let i = 0; i < n; i++) {
        out[i] = v[i];
        out[n + i] = a[i];
      }
    };
    derivative(t0, x0, v0, fA);
    if (locator.active) locator.begin(t0, yA);
    let tA = t0;
    onStep = (t, x, v) => {
      for (let i = 0; i < n; i++) {
        yB[i] = x[i];
        yB[n + i] = v[i];
      }
      derivative(t, x, v, fB);
      const hs = t - tA;
      hermiteCoefficients(n2, hs, yA, fA, yB, fB, rc);
      if (dense) dense.appendStep(tA, hs, rc);
      if (locator.active && locator.detect(t, yB)) {
        stopAt = locator.locate(tA, hs, t, yB, rc);
        if (!Number.isNaN(stopAt)) {
          if (dense) dense.truncate(stopAt);
          return false;
        }
      }
      if (locator.active) locator.advance();
      tA = t;
      yA.set(yB);
      fA.set(fB);
      return true;
    };
  }
  const r =
    tEnd === t0
      ? { t: t0, x: x0, v: v0, steps: 0, fevals: 0, status: 'done' as const }
      : integrateFixed(method, accel, t0, x0, v0, { h, tEnd, onStep, signal });
  const stats: SolveStats = { accepted: r.steps, rejected: 0, fevals: r.fevals + extra };
  if (r.status === 'stopped' && !Number.isNaN(stopAt)) {
    const hit = locator.hits[locator.hits.length - 1];
    y.set(hit.y);
    return { t: stopAt, status: 'event', message: `${method}: terminal event ${locator.label(hit.index)} at t=${stopAt}`, stats };
  }
  y.set(r.x, 0);
  y.set(r.v, n);
  if (r.status === 'cancelled') return { t: r.t, status: 'cancelled', message: `${method}: cancelled at t=${r.t} after ${r.steps} steps`, stats };
  return {
    t: r.t,
    status: 'done',
    message: `${method}: reached tEnd=${tEnd} in ${r.steps} steps of h=${fmt(h)}`,
    stats,
  };
}
