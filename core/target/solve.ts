/**
 * The targeter's solver: goals × controls, solved by bounded damped least squares.
 *
 * A caller names the controls it lets vary (each with a scale and optional bounds) and the goals it
 * wants met (each with a wanted value and a tolerance), and supplies a flight: any function from the
 * controls' values to the goals' values (a patched-conic evaluation, an n-body flight, a plain
 * formula). The solver drives every goal within its tolerance.
 *
 * Method (Levenberg 1944 / Marquardt 1963; Nocedal & Wright, Numerical Optimization, 2nd ed., §10.3;
 * damping update by the gain ratio as in Madsen, Nielsen & Tingleff, Methods for Non-Linear Least
 * Squares Problems, 2nd ed. 2004, §3.2):
 * - Work in scaled unknowns z_j = x_j / scale_j and scaled residuals r_i = (g_i(x) − wanted_i) / tol_i,
 *   so a goal is met exactly when |r_i| ≤ 1 and every unknown counts in its own natural unit.
 * - Jacobian of r in z by forward or central finite differences (per-control steps, stepping away
 *   from a bound that is too close), or from the caller's Jacobian of g in x.
 * - Step p minimising |J·p + r|² + λ|p|² (core/math dampedLeastSquares), then projected onto the
 *   bounds (clamped). A control at a bound whose descent direction points outward is held there for
 *   that step (its column is dropped), so a bound the solution wants to cross does not stall the rest.
 * - A trial point is accepted when it lowers ½|r|²; λ then shrinks by max(1/3, 1 − (2ρ − 1)³) with
 *   ρ the gain ratio, else λ grows by ν and ν doubles. A flight that fails at a trial point rejects
 *   that step.
 *
 * Statuses: 'converged' (every goal within tolerance), 'max-iterations' (iteration or flight budget
 * spent), 'stalled' (no step lowers the misses: a local minimum, a goal no control moves, or a
 * control held at its bound), 'flight-failed' (the flight failed at the start or while differencing).
 * The message names the goals still outside tolerance in the caller's words and units.
 *
 * Only WaymarkError (InputError, SolverError, ValidationError) raised by a flight counts as a flight
 * failure; any other exception is a bug and propagates. A flight returning a non-finite goal value
 * counts as a failed flight. No NaN leaves the solver.
 */
import { InputError, SolverError, WaymarkError, dampedLeastSquares, requireFinite, requirePositive } from '../math/index.ts';

/** A quantity the solver may vary. */
export interface Control {
  /** Name in the user's words, e.g. "burn 2 Δv prograde". */
  name: string;
  /** Typical size of a useful change (SI units): the unit the solver measures steps in. */
  scale: number;
  /** Lower bound (SI units); default unbounded. */
  lower?: number;
  /** Upper bound (SI units); default unbounded. */
  upper?: number;
  /** Finite-difference step (SI units); default √ε·max(|x|, scale) forward, ∛ε·max(|x|, scale) central. */
  step?: number;
  /** Unit shown in messages, e.g. "m/s"; values are divided by `unitScale` for display. */
  units?: string;
  /** SI value of one display unit (1000 for km); default 1. */
  unitScale?: number;
}

/** A quantity the flight must bring within tolerance of a wanted value. */
export interface Goal {
  /** Name in the user's words, e.g. "periapsis altitude at Ochre". */
  name: string;
  /** Wanted value (SI units). */
  wanted: number;
  /** Largest acceptable |value − wanted| (SI units), > 0. */
  tolerance: number;
  /** Unit shown in messages, e.g. "km"; values are divided by `unitScale` for display. */
  units?: string;
  /** SI value of one display unit (1000 for km, π/180 for degrees); default 1. */
  unitScale?: number;
}

/**
 * Computes the goals' values at the controls' values x (length n) into out (length m). May throw a
 * WaymarkError when the flight cannot be flown (counted as a failed flight).
 */
export type Flight = (x: Float64Array, out: Float64Array) => void;

/** Writes ∂g_i/∂x_j (row-major m×n, SI units) at x into out. */
export type JacobianFn = (x: Float64Array, out: Float64Array) => void;

export interface SolveOptions {
  /** Starting values of the controls (SI units), within their bounds. */
  x0: ArrayLike<number>;
  /** Supplied Jacobian of the goals in the controls; default finite differences. */
  jacobian?: JacobianFn;
  /** Finite differences: 'forward' (n flights per Jacobian) or 'central' (2n); default 'forward'. */
  difference?: 'forward' | 'central';
  /** Iteration budget (Jacobians formed); default DEFAULT_MAX_ITERATIONS. */
  maxIterations?: number;
  /** Flight budget (every call of the flight counts); default DEFAULT_MAX_FLIGHTS. */
  maxFlights?: number;
  /** Initial damping relative to the largest diagonal entry of JᵀJ; default DEFAULT_DAMPING. */
  damping?: number;
  /**
   * 'broyden': after a differenced Jacobian, update it by Broyden's rank-one secant formula at each
   * accepted step (one flight per iteration instead of n + 1), differencing afresh when a step is
   * rejected, when a step does not halve the misses, or when the updated Jacobian sees no way down;
   * default 'difference' (every iteration).
   */
  jacobianUpdate?: 'difference' | 'broyden';
}

/** One row of the iteration history. */
export interface SolveIteration {
  /** |r| (scaled residuals, tolerance units) at the accepted point after this iteration. */
  residualNorm: number;
  /** λ used for the accepted (or last rejected) step. */
  damping: number;
  /** Flights flown so far. */
  flights: number;
}

export type SolveStatus = 'converged' | 'max-iterations' | 'stalled' | 'flight-failed';

/** What one goal came to at the returned controls. */
export interface GoalOutcome {
  name: string;
  value: number;
  wanted: number;
  tolerance: number;
  /** Within tolerance; false when the flight never gave values (value then reads 0). */
  met: boolean;
}

export interface SolveResult {
  status: SolveStatus;
  /** One or two sentences a designer understands: what was met, what was not and why. */
  message: string;
  /** Best controls found (SI units): the last accepted point. */
  x: Float64Array;
  /** Goals' values at x (SI units); zeros when `flown` is false. */
  values: Float64Array;
  /** The flight gave goal values at least once (false: it failed at the starting controls). */
  flown: boolean;
  goals: GoalOutcome[];
  /** Names of the controls at a bound at x. */
  atBound: string[];
  iterations: number;
  flights: number;
  history: SolveIteration[];
  /** The flight's error, when status is 'flight-failed'. */
  error?: WaymarkError;
}

/** Default iteration budget. */
export const DEFAULT_MAX_ITERATIONS = 50;
/** Default flight budget. */
export const DEFAULT_MAX_FLIGHTS = 2000;
/** Default initial damping τ: λ₀ = τ·max diag(JᵀJ) (Madsen, Nielsen & Tingleff suggest 1e-6 … 1). */
export const DEFAULT_DAMPING = 1e-3;
/** A step shorter than this (scaled units, relative to |z| + this) counts as no progress. */
export const STEP_TOL = 1e-14;
/** Projected gradient |Jᵀr|∞ below this (tolerance² per scale unit) counts as a stationary point. */
export const GRADIENT_TOL = 1e-12;
/** Damping beyond this × the initial one: no step along the gradient helps any more. */
export const DAMPING_LIMIT = 1e16;

const SQRT_EPS = Math.sqrt(Number.EPSILON);
const CBRT_EPS = Math.cbrt(Number.EPSILON);

/** A number for messages: six significant digits, exponent form only when very large or small. */
function fmt(v: number): string {
  const a = Math.abs(v);
  if (a !== 0 && (a >= 1e9 || a < 1e-4)) return v.toExponential(4);
  return String(Number(v.toPrecision(6)));
}

function show(v: number, d: { units?: string; unitScale?: number }): string {
  const s = fmt(v / (d.unitScale ?? 1));
  return d.units ? `${s} ${d.units}` : s;
}

function checkProblem(controls: readonly Control[], goals: readonly Goal[], x0: ArrayLike<number>): void {
  if (!Array.isArray(controls) || controls.length < 1) throw new InputError('controls', 'must list at least one control', controls);
  if (!Array.isArray(goals) || goals.length < 1) throw new InputError('goals', 'must list at least one goal', goals);
  if (!x0 || x0.length !== controls.length) throw new InputError('x0', `must have one value per control (${controls.length})`, x0?.length);
  controls.forEach((c, j) => {
    if (typeof c?.name !== 'string' || c.name === '') throw new InputError(`controls[${j}].name`, 'must be a non-empty string', c?.name);
    requirePositive(`controls[${j}].scale`, c.scale);
    if (c.lower !== undefined) requireFinite(`controls[${j}].lower`, c.lower);
    if (c.upper !== undefined) requireFinite(`controls[${j}].upper`, c.upper);
    if (c.lower !== undefined && c.upper !== undefined && !(c.lower < c.upper)) {
      throw new InputError(`controls[${j}].upper`, `must be > lower (${c.lower})`, c.upper);
    }
    if (c.step !== undefined) requirePositive(`controls[${j}].step`, c.step);
    if (c.unitScale !== undefined) requirePositive(`controls[${j}].unitScale`, c.unitScale);
    requireFinite(`x0[${j}]`, x0[j]);
    if ((c.lower !== undefined && x0[j] < c.lower) || (c.upper !== undefined && x0[j] > c.upper)) {
      throw new InputError(`x0[${j}]`, `must lie within the bounds of "${c.name}" [${c.lower ?? '-∞'}, ${c.upper ?? '∞'}]`, x0[j]);
    }
  });
  goals.forEach((g, i) => {
    if (typeof g?.name !== 'string' || g.name === '') throw new InputError(`goals[${i}].name`, 'must be a non-empty string', g?.name);
    requireFinite(`goals[${i}].wanted`, g.wanted);
    requirePositive(`goals[${i}].tolerance`, g.tolerance);
    if (g.unitScale !== undefined) requirePositive(`goals[${i}].unitScale`, g.unitScale);
  });
}

/**
 * Drives every goal within its tolerance by varying the controls within their bounds, starting at
 * options.x0. Throws InputError for a malformed problem; returns a status (never throws) for a
 * problem it cannot solve.
 */
export function solveTargets(controls: readonly Control[], goals: readonly Goal[], flight: Flight, options: SolveOptions): SolveResult {
  if (typeof flight !== 'function') throw new InputError('flight', 'must be a function', flight);
  checkProblem(controls, goals, options?.x0);
  const n = controls.length;
  const m = goals.length;
  const difference = options.difference ?? 'forward';
  if (difference !== 'forward' && difference !== 'central') throw new InputError('difference', "must be 'forward' or 'central'", difference);
  const maxIterations = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new InputError('maxIterations', 'must be an integer >= 1', maxIterations);
  const maxFlights = options.maxFlights ?? DEFAULT_MAX_FLIGHTS;
  if (!Number.isInteger(maxFlights) || maxFlights < 1) throw new InputError('maxFlights', 'must be an integer >= 1', maxFlights);
  const tau = options.damping ?? DEFAULT_DAMPING;
  requirePositive('damping', tau);
  const jacobianFn = options.jacobian;
  const broyden = options.jacobianUpdate === 'broyden';
  if (options.jacobianUpdate !== undefined && options.jacobianUpdate !== 'difference' && !broyden) {
    throw new InputError('jacobianUpdate', "must be 'difference' or 'broyden'", options.jacobianUpdate);
  }
  if (jacobianFn !== undefined && typeof jacobianFn !== 'function') throw new InputError('jacobian', 'must be a function', jacobianFn);

  // the solve's own scratch, allocated once (per step only the history row and dampedLeastSquares' small QR work arrays)
  const scale = new Float64Array(n);
  const lo = new Float64Array(n);
  const hi = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const c = controls[j];
    scale[j] = c.scale;
    lo[j] = c.lower ?? Number.NEGATIVE_INFINITY;
    hi[j] = c.upper ?? Number.POSITIVE_INFINITY;
  }
  const x = Float64Array.from(options.x0);
  const xt = new Float64Array(n); // trial / perturbed controls
  const g = new Float64Array(m); // goal values at x
  const gt = new Float64Array(m); // goal values at a trial point
  const gb = new Float64Array(m); // goal values at a backward point (central differences)
  const r = new Float64Array(m); // scaled residuals at x
  const rt = new Float64Array(m);
  const J = new Float64Array(m * n); // ∂r/∂z
  const Jb = new Float64Array(m * n); // the Jacobian kept between iterations ('broyden')
  let fresh = false; // Jb is a differenced Jacobian at x, not a secant update
  const negR = new Float64Array(m);
  const p = new Float64Array(n);
  const grad = new Float64Array(n); // Jᵀr
  const held = new Uint8Array(n);

  let flights = 0;
  let flown = false; // goal values exist (the flight succeeded at least at the start)
  let iterations = 0;
  const history: SolveIteration[] = [];
  let flightError: WaymarkError | undefined;

  /** Flies at xx into out; false (and flightError set) when the flight fails or gives a non-finite value. */
  const fly = (xx: Float64Array, out: Float64Array): boolean => {
    flights++;
    try {
      flight(xx, out);
    } catch (e) {
      if (e instanceof SolverError && e.reason === 'cancelled') throw e; // a cancel ends the solve, it is no failed flight
      if (e instanceof WaymarkError) {
        flightError = e;
        return false;
      }
      throw e;
    }
    for (let i = 0; i < m; i++) {
      if (!Number.isFinite(out[i])) {
        flightError = new InputError(`goal "${goals[i].name}"`, 'came out of the flight as a non-finite number', out[i]);
        return false;
      }
    }
    return true;
  };
  const residuals = (gv: Float64Array, out: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < m; i++) {
      out[i] = (gv[i] - goals[i].wanted) / goals[i].tolerance;
      s += out[i] * out[i];
    }
    return s;
  };
  const allMet = (rr: Float64Array): boolean => {
    for (let i = 0; i < m; i++) if (!(Math.abs(rr[i]) <= 1)) return false;
    return true;
  };

  /** Jacobian of r in z at x into J; false when a flight fails. */
  const jacobian = (): boolean => {
    if (jacobianFn) {
      try {
        jacobianFn(x, J);
      } catch (e) {
        if (e instanceof SolverError && e.reason === 'cancelled') throw e; // a cancel ends the solve, it is no failed flight
        if (e instanceof WaymarkError) {
          flightError = e;
          return false;
        }
        throw e;
      }
      for (let i = 0; i < m; i++) {
        for (let j = 0; j < n; j++) {
          const v = (J[i * n + j] * scale[j]) / goals[i].tolerance;
          if (!Number.isFinite(v)) {
            flightError = new InputError(`jacobian[${i * n + j}]`, 'must be a finite number', J[i * n + j]);
            return false;
          }
          J[i * n + j] = v;
        }
      }
      return true;
    }
    xt.set(x);
    for (let j = 0; j < n; j++) {
      const c = controls[j];
      const base = Math.max(Math.abs(x[j]), scale[j]);
      let h = c.step ?? (difference === 'central' ? CBRT_EPS : SQRT_EPS) * base;
      // a bound closer than the step: difference away from it (or across half the room there is)
      if (!(x[j] + h <= hi[j]) && !(x[j] - h >= lo[j])) h = Math.max(hi[j] - x[j], x[j] - lo[j]) / 2;
      const canUp = x[j] + h <= hi[j];
      const canDown = x[j] - h >= lo[j];
      if (difference === 'central' && canUp && canDown) {
        xt[j] = x[j] + h;
        if (!fly(xt, gt)) return false;
        xt[j] = x[j] - h;
        if (!fly(xt, gb)) return false;
        for (let i = 0; i < m; i++) J[i * n + j] = (((gt[i] - gb[i]) / (2 * h)) * scale[j]) / goals[i].tolerance;
      } else {
        const hs = canUp ? h : -h;
        xt[j] = x[j] + hs;
        if (!fly(xt, gt)) return false;
        for (let i = 0; i < m; i++) J[i * n + j] = (((gt[i] - g[i]) / hs) * scale[j]) / goals[i].tolerance;
      }
      xt[j] = x[j];
    }
    return true;
  };

  const finish = (status: SolveStatus, why: string): SolveResult => {
    const outcomes: GoalOutcome[] = goals.map((goal, i) => ({
      name: goal.name,
      value: g[i],
      wanted: goal.wanted,
      tolerance: goal.tolerance,
      met: flown && Math.abs(g[i] - goal.wanted) <= goal.tolerance,
    }));
    const atBound: string[] = [];
    for (let j = 0; j < n; j++) if (x[j] <= lo[j] || x[j] >= hi[j]) atBound.push(controls[j].name);
    const missed = outcomes
      .map((o, i) => ({ o, goal: goals[i] }))
      .filter(({ o }) => flown && !o.met)
      .map(({ o, goal }) => `"${o.name}" is ${show(o.value, goal)}, wanted ${show(o.wanted, goal)} within ±${show(o.tolerance, goal)}`);
    let message: string;
    if (status === 'converged') {
      message = `every goal met (${m} goal${m === 1 ? '' : 's'}) after ${iterations} iteration${iterations === 1 ? '' : 's'} and ${flights} flights.`;
    } else {
      const bounds = controls
        .map((c, j) =>
          x[j] <= lo[j] ? `"${c.name}" at its lower bound ${show(lo[j], c)}` : x[j] >= hi[j] ? `"${c.name}" at its upper bound ${show(hi[j], c)}` : '',
        )
        .filter((s) => s !== '');
      message = `${why}${missed.length > 0 ? ` Not met: ${missed.join('; ')}.` : ''}${bounds.length > 0 ? ` Held by bounds: ${bounds.join('; ')}.` : ''}`;
    }
    const result: SolveResult = {
      status,
      message,
      x: Float64Array.from(x),
      values: Float64Array.from(g),
      flown,
      goals: outcomes,
      atBound,
      iterations,
      flights,
      history,
    };
    if (status === 'flight-failed' && flightError) result.error = flightError;
    return result;
  };

  if (!fly(x, g)) {
    g.fill(0); // no values: reported as 0 and never as met
    return finish('flight-failed', `The flight fails at the starting controls: ${flightError?.message}.`);
  }
  flown = true;
  let cost = residuals(g, r);
  let lambda = -1;
  let nu = 2;
  let lambda0 = 0;
  let stale = false; // Jb has been updated by a secant step since it was differenced
  while (!allMet(r)) {
    if (iterations >= maxIterations) return finish('max-iterations', `No solution within ${maxIterations} iterations.`);
    if (flights >= maxFlights) return finish('max-iterations', `No solution within ${maxFlights} flights.`);
    iterations++;
    if (!broyden || !fresh) {
      if (!jacobian()) return finish('flight-failed', `The flight fails while measuring how the goals respond to the controls: ${flightError?.message}.`);
      if (broyden) Jb.set(J);
      fresh = true;
      stale = false;
    } else {
      J.set(Jb);
    }
    const secant = broyden && stale;
    // gradient of ½|r|² and the controls held at a bound that the descent direction pushes outward
    let gradMax = 0;
    let maxDiag = 0;
    let free = 0;
    for (let j = 0; j < n; j++) {
      let s = 0;
      let d = 0;
      for (let i = 0; i < m; i++) {
        s += J[i * n + j] * r[i];
        d += J[i * n + j] * J[i * n + j];
      }
      grad[j] = s;
      held[j] = (x[j] <= lo[j] && s > 0) || (x[j] >= hi[j] && s < 0) ? 1 : 0;
      if (!held[j]) {
        free++;
        gradMax = Math.max(gradMax, Math.abs(s));
        maxDiag = Math.max(maxDiag, d);
      }
    }
    if (secant && (free === 0 || !(gradMax > GRADIENT_TOL) || !(maxDiag > 0))) {
      fresh = false; // judge a stall only on a differenced Jacobian
      stale = false;
      continue;
    }
    if (free === 0) return finish('stalled', 'Every control is held at a bound the solution wants to cross.');
    if (!(gradMax > GRADIENT_TOL) || !(maxDiag > 0)) {
      return finish('stalled', 'No change of the free controls lowers the misses (a local minimum, or goals the controls do not move).');
    }
    if (lambda < 0) {
      lambda = tau * maxDiag;
      lambda0 = lambda;
    }
    for (let j = 0; j < n; j++) {
      if (held[j]) for (let i = 0; i < m; i++) J[i * n + j] = 0;
    }
    for (let i = 0; i < m; i++) negR[i] = -r[i];
    // inner loop: raise λ until a trial point lowers the cost
    let accepted = false;
    while (!accepted) {
      if (flights >= maxFlights) return finish('max-iterations', `No solution within ${maxFlights} flights.`);
      if (lambda > DAMPING_LIMIT * lambda0) return finish('stalled', 'No step lowers the misses any further (the damping grew without bound).');
      dampedLeastSquares(J, negR, m, n, lambda, p);
      let stepNorm = 0;
      let zNorm = 0;
      for (let j = 0; j < n; j++) {
        if (held[j]) p[j] = 0;
        const z = x[j] / scale[j];
        const zt = Math.min(hi[j] / scale[j], Math.max(lo[j] / scale[j], z + p[j]));
        p[j] = zt - z; // the projected step
        xt[j] = held[j] ? x[j] : Math.min(hi[j], Math.max(lo[j], zt * scale[j]));
        stepNorm += p[j] * p[j];
        zNorm += z * z;
      }
      if (Math.sqrt(stepNorm) <= STEP_TOL * (Math.sqrt(zNorm) + STEP_TOL)) {
        return finish('stalled', 'The steps became too small to change the controls (a local minimum or a control held at its bound).');
      }
      // predicted decrease of ½|r|² for the projected step: −gᵀp − ½|Jp|²
      let pred = 0;
      for (let i = 0; i < m; i++) {
        let jp = 0;
        for (let j = 0; j < n; j++) jp += J[i * n + j] * p[j];
        pred -= r[i] * jp + 0.5 * jp * jp;
      }
      const ok = fly(xt, gt);
      const costT = ok ? residuals(gt, rt) : Number.POSITIVE_INFINITY;
      const used = lambda;
      if (secant && !(ok && costT < cost)) {
        // a secant Jacobian that leads nowhere: difference afresh at x before raising the damping
        fresh = false;
        stale = false;
        break;
      }
      if (ok && costT < cost) {
        if (broyden) {
          // Broyden's update of the kept Jacobian (Madsen, Nielsen & Tingleff 2004, §3.4):
          // Jb ← Jb + (Δr − Jb·p) pᵀ / (pᵀp), p the step taken (scaled units)
          let pp = 0;
          for (let j = 0; j < n; j++) pp += p[j] * p[j];
          if (pp > 0) {
            for (let i = 0; i < m; i++) {
              let jp = 0;
              for (let j = 0; j < n; j++) jp += Jb[i * n + j] * p[j];
              const u = (rt[i] - r[i] - jp) / pp;
              for (let j = 0; j < n; j++) Jb[i * n + j] += u * p[j];
            }
          }
          stale = true;
          // a secant step that did not at least halve the misses: difference afresh next time
          if (costT > 0.25 * cost) fresh = false;
        }
        const rho = pred > 0 ? (0.5 * (cost - costT)) / pred : 1;
        lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
        nu = 2;
        x.set(xt);
        g.set(gt);
        r.set(rt);
        cost = costT;
        accepted = true;
        history.push({ residualNorm: Math.sqrt(cost), damping: used, flights });
      } else {
        lambda *= nu;
        nu *= 2;
      }
    }
  }
  return finish('converged', '');
}
