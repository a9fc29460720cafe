/**
 * Fixed-step integration of second-order systems x'' = a(t, x, v): one front for the
 * symplectic methods (semi-implicit Euler, velocity Verlet, Yoshida 4) and the comparison
 * methods (explicit Euler, classic RK4). x and v have any length that is a multiple of 3
 * (3 per particle), so the mutual n-body ephemeris can fly 3N components.
 *
 * Steps: with `steps`, exactly that many steps of h forward in time. With `tEnd`, steps of h
 * toward tEnd (backward when tEnd < t0) and a last step shortened (or stretched by rounding) to
 * land on tEnd exactly. Every other step uses exactly h; the reported times t_k = t0 ± k·h are
 * computed, not accumulated. Give one of the two.
 * After each step the state is checked: a non-finite component throws SolverError 'non-finite'.
 */
import { InputError, SolverError, requireFinite } from '../math/index.ts';
import { explicitEulerStepper } from './explicitEuler.ts';
import type { AccelFunction, FixedStepper } from './ode.ts';
import { rk4Stepper } from './rk4.ts';
import { symplecticEulerStepper } from './symplecticEuler.ts';
import { verletStepper } from './verlet.ts';
import { yoshida4Stepper } from './yoshida4.ts';

export type FixedMethod = 'symplectic-euler' | 'verlet' | 'yoshida4' | 'explicit-euler' | 'rk4';

export const FIXED_METHODS: readonly FixedMethod[] = ['symplectic-euler', 'verlet', 'yoshida4', 'explicit-euler', 'rk4'];

export interface FixedOptions {
  /** Step magnitude (> 0). */
  h: number;
  /** Number of steps (integer ≥ 0), forward in time. */
  steps?: number;
  /** End time; the last step lands on it exactly. */
  tEnd?: number;
  /** Called after every step; return false to stop. Do not keep or modify x, v. */
  onStep?: (t: number, x: Float64Array, v: Float64Array) => boolean | undefined;
  /** Cooperative cancellation, checked before every step. */
  signal?: { aborted: boolean };
}

export interface FixedResult {
  t: number;
  x: Float64Array;
  v: Float64Array;
  steps: number;
  fevals: number;
  status: 'done' | 'stopped' | 'cancelled';
}

/** Relative slack when counting steps of h in a span, so rounding does not add a sliver of a step. */
const STEP_COUNT_SLACK = 1e-9;

/** The stepper of a method, bound to an acceleration and a state length n. */
export function fixedStepper(method: FixedMethod, accel: AccelFunction, n: number): FixedStepper {
  switch (method) {
    case 'symplectic-euler':
      return symplecticEulerStepper(accel, n);
    case 'verlet':
      return verletStepper(accel, n);
    case 'yoshida4':
      return yoshida4Stepper(accel, n);
    case 'explicit-euler':
      return explicitEulerStepper(accel, n);
    case 'rk4':
      return rk4Stepper(accel, n);
    default:
      throw new InputError('method', `must be one of ${FIXED_METHODS.join(', ')}`, method);
  }
}

/** Checks x0, v0 (same length, a positive multiple of 3, finite) and returns that length. */
export function requireStatePair(x0: ArrayLike<number>, v0: ArrayLike<number>): number {
  if (!x0 || typeof x0.length !== 'number' || x0.length < 3 || x0.length % 3 !== 0) {
    throw new InputError('x0', 'must have a positive multiple of 3 components (3 per particle)', x0?.length);
  }
  if (!v0 || v0.length !== x0.length) throw new InputError('v0', `must have ${x0.length} components, like x0`, v0?.length);
  for (let i = 0; i < x0.length; i++) {
    if (typeof x0[i] !== 'number' || !Number.isFinite(x0[i])) throw new InputError(`x0[${i}]`, 'must be a finite number', x0[i]);
    if (typeof v0[i] !== 'number' || !Number.isFinite(v0[i])) throw new InputError(`v0[${i}]`, 'must be a finite number', v0[i]);
  }
  return x0.length;
}

/** Number of steps of magnitude h covering span (> 0). */
export function stepCount(span: number, h: number): number {
  return Math.max(1, Math.ceil(Math.abs(span) / h - STEP_COUNT_SLACK));
}

export function integrateFixed(
  method: FixedMethod,
  accel: AccelFunction,
  t0: number,
  x0: ArrayLike<number>,
  v0: ArrayLike<number>,
  options: FixedOptions,
): FixedResult {
  if (!FIXED_METHODS.includes(method)) throw new InputError('method', `must be one of ${FIXED_METHODS.join(', ')}`, method);
  if (typeof accel !== 'function') throw new InputError('accel', 'must be a function', accel);
  requireFinite('t0', t0);
  const n = requireStatePair(x0, v0);
  if (!options) throw new InputError('options', 'must give h and one of steps or tEnd');
  const h = options.h;
  requireFinite('h', h);
  if (!(h > 0)) throw new InputError('h', 'must be > 0 (the direction comes from tEnd)', h);
  let nSteps: number;
  let dir = 1;
  const hasEnd = options.tEnd !== undefined;
  if (hasEnd && options.steps !== undefined) throw new InputError('steps', 'must not be given together with tEnd', options.steps);
  if (hasEnd) {
    const tEnd = options.tEnd as number;
    requireFinite('tEnd', tEnd);
    dir = tEnd < t0 ? -1 : 1;
    nSteps = tEnd === t0 ? 0 : stepCount(tEnd - t0, h);
  } else if (options.steps !== undefined) {
    nSteps = options.steps;
    if (!Number.isInteger(nSteps) || nSteps < 0) throw new InputError('steps', 'must be an integer >= 0', nSteps);
  } else {
    throw new InputError('steps', 'or tEnd must be given');
  }

  const x = Float64Array.from(x0 as ArrayLike<number>);
  const v = Float64Array.from(v0 as ArrayLike<number>);
  const stepper = fixedStepper(method, accel, n);
  const onStep = options.onStep;
  const signal = options.signal;
  const hs = dir * h;
  let t = t0;
  let fevals = 0;
  let done = 0;
  let status: FixedResult['status'] = 'done';
  for (let k = 0; k < nSteps; k++) {
    if (signal?.aborted) {
      status = 'cancelled';
      break;
    }
    const lastOnEnd = hasEnd && k === nSteps - 1;
    const tNext = lastOnEnd ? (options.tEnd as number) : t0 + (k + 1) * hs;
    // Every step but a landing last one uses h itself (bit-for-bit the game-loop step).
    fevals += stepper.step(t, lastOnEnd ? tNext - t : hs, x, v);
    t = tNext;
    done++;
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(x[i]) || !Number.isFinite(v[i])) {
        throw new SolverError('integrateFixed', 'non-finite', `${method}: state component ${i} became non-finite at t=${t} (step ${done})`, {
          method,
          t,
          h,
        });
      }
    }
    if (onStep && onStep(t, x, v) === false) {
      status = 'stopped';
      break;
    }
  }
  return { t, x, v, steps: done, fevals, status };
}
