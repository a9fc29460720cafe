/**
 * Universal-variable Kepler propagation of a two-body state, valid for every conic
 * (ellipse, parabola, hyperbola), forward and backward in time.
 *
 * Method: the universal Kepler equation in χ (Curtis, Orbital Mechanics for Engineering
 * Students, §3.7, Algorithm 3.3; Vallado, Fundamentals of Astrodynamics and Applications,
 * 4th ed., §2.3, Algorithm 8, KEPLER)
 *
 *   F(χ) = σ0·χ²·C(ψ) + (1 − α·r0)·χ³·S(ψ) + r0·χ − √μ·Δt = 0,   ψ = α·χ²,
 *   α = 2/r0 − v0²/μ,  σ0 = r0·v0/√μ,
 *
 * then the Lagrange coefficients f, g, ḟ, ġ. Details:
 * - Ellipses: Δt is first reduced modulo the period to |Δt| ≤ T/2 (the exact floating-point
 *   remainder), so many revolutions cost nothing extra. The period itself carries a rounding
 *   of a few ε (from α of the state), which k revolutions multiply into k·T·ε of time: past
 *   KEPLER_MAX_REVOLUTIONS (2⁴⁴, where that reaches 1/256 of an orbit) the position along the
 *   orbit is no longer known and SolverError('kepler', 'precision-lost') is raised instead of
 *   a state (Δt = 1e300 s once gave |r| ≈ 1e285 km on a bound orbit, Δt ≥ 1e20 s the initial
 *   state unchanged).
 * - Initial guess: Vallado Algorithm 8 for ellipses (χ0 = √μ·Δt·α) and hyperbolas (the
 *   logarithmic guess); near the parabola (|α·r0| < NEAR_PARABOLIC) Barker's equation solved
 *   in closed form from the current state.
 * - Iteration: Laguerre's method with n = 5 (Conway, "An improved algorithm due to Laguerre
 *   for the solution of Kepler's equation", Celestial Mechanics 39, 199–211, 1986), kept
 *   inside a bracket: F is increasing (F′ = r > 0), χ = 0 is one end, and
 *   |χ| ≤ √μ·|Δt|/q (q = periapsis radius, since r ≥ q) — tightened for ellipses to
 *   (π + 2)/√α — is the other. A step that leaves the bracket is replaced by bisection, and
 *   from the 8th step on every 4th step bisects, so a slow crawl cannot exhaust the budget.
 * - Stop: when |F| falls to the rounding level of its own terms (KEPLER_RESIDUAL_FACTOR·ε
 *   times their magnitudes), i.e. χ cannot be improved in double precision — unless that
 *   rounding exceeds KEPLER_UNRESOLVED·√μ·|Δt|: there the terms cancel so badly that F ≈ 0
 *   says nothing (a nearly rectilinear hyperbola far out, from a starter far past the root, gave
 *   a point on the way out instead of on the way in), and the bracket shrinks toward χ = 0.
 * - Hyperbolas with a large change of hyperbolic anomaly (ΔH ≳ HYPERBOLIC_ANOMALY_SWITCH):
 *   the terms of F grow like e·sinh H0·cosh ΔH while their sum is only
 *   e·sinh H1 − e·sinh H0 − ΔH. Flying from far out back toward periapsis they cancel by many
 *   orders of magnitude and χ from F loses digits (10⁻⁷ relative seen for r0 ≈ 6·10⁴|a|), and
 *   from a poor guess Laguerre crawls one e-fold per step through the exponential. There χ is
 *   taken from the hyperbolic anomaly instead: H0 from e·sinh H0 = σ0·√−α, M1 = M0 + n·Δt,
 *   H1 from Kepler's equation (anomaly.ts, with e − 1 = −p·α/(1 + e) free of cancellation),
 *   and χ = (H1 − H0)/√−α (Vallado §2.3, χ = √−a·ΔH), which is well conditioned.
 *
 * Limits: a rectilinear state (r ∥ v to rounding, |r × v| ≤ RECTILINEAR_TOLERANCE·|r||v|, or
 * v = 0) is propagated as the degenerate conic the formulas describe (radial free fall matches
 * the analytic solution) up to the centre; a flight that would reach r = 0 within Δt (the time
 * to the centre from the rectilinear conic's anomaly: M = E − sin E, sinh H − H, or the
 * parabolic τ = √2·r^{3/2}/(3√μ)) raises SolverError('kepler', 'collision') with that time,
 * instead of the formulas' elastic bounce through the centre. Accuracy near such a collision
 * degrades as the problem's own conditioning does. Near-parabolic long arcs
 * are ill-conditioned in the input state itself (α = 2/r0 − v0²/μ cancels): e = 1 − 5e-7 over
 * half a period shows ~1e-9 relative error against a 60-digit reference, as any
 * double-precision method would. Hyperbolic flights so long
 * that cosh(√−ψ) overflows (hyperbolic anomaly ≳ 700) raise SolverError.
 */
import { InputError, SolverError } from '../math/index.ts';
import { hyperbolicMeanAccurate, solveHyperbolicKepler } from './anomaly.ts';
import { RECTILINEAR_TOLERANCE } from './elements.ts';
import { stumpffCS } from './stumpff.ts';

/** Laguerre–Conway iteration budget (typically 2–5 steps are used). */
export const KEPLER_MAX_ITER = 60;
/** Converged when |F| ≤ KEPLER_RESIDUAL_FACTOR·ε·(sum of |terms of F|). */
export const KEPLER_RESIDUAL_FACTOR = 32;
/**
 * A χ where the rounding of F exceeds this fraction of √μ·|Δt| is not accepted as a root (the
 * terms of F cancel there by more than eleven orders of magnitude): the bracket shrinks instead.
 */
export const KEPLER_UNRESOLVED = 1e-3;
/** |α·r0| below this uses the parabolic (Barker) starter. */
export const NEAR_PARABOLIC = 1e-6;
/**
 * Hyperbolas whose expected change of hyperbolic anomaly, ΔH ≈ √−α·√μ·|Δt|/r0 (exact to first
 * order: dM/dH = e·cosh H0 − 1 = −α·r0), exceeds this take χ from the hyperbolic Kepler
 * equation (χ = ΔH/√−α) instead of iterating on F (see the module comment).
 */
export const HYPERBOLIC_ANOMALY_SWITCH = 0.5;
/**
 * Most revolutions of an ellipse a propagation may span: the period's rounding (≈ ε·T) grows
 * with k revolutions to k·ε of an orbit, 2⁻⁸ at k = 2⁴⁴ (about 1.8e13). Past it the phase is
 * not resolved in double precision: SolverError('kepler', 'precision-lost').
 */
export const KEPLER_MAX_REVOLUTIONS = 2 ** 44;

const EPS = Number.EPSILON;
const TWO_PI = 2 * Math.PI;
const LAGUERRE_N = 5;

// module-scope scratch (allocation-free hot path)
const cs = new Float64Array(2);
const coef = new Float64Array(5);

function checkInputs(mu: number, state: ArrayLike<number>, dt: number): void {
  if (typeof mu !== 'number' || !Number.isFinite(mu)) throw new InputError('mu', 'must be a finite number', mu);
  if (!(mu > 0)) throw new InputError('mu', 'must be > 0', mu);
  if (typeof dt !== 'number' || !Number.isFinite(dt)) throw new InputError('dt', 'must be a finite number', dt);
  if (!state || state.length < 6) throw new InputError('state', 'must have 6 components [x, y, z, vx, vy, vz]', state);
  for (let k = 0; k < 6; k++) {
    const x = state[k];
    if (typeof x !== 'number' || !Number.isFinite(x)) throw new InputError(`state[${k}]`, 'must be a finite number', x);
  }
  if (state[0] === 0 && state[1] === 0 && state[2] === 0) {
    throw new InputError('state[0..2]', 'position must not be the zero vector', [state[0], state[1], state[2]]);
  }
}

/**
 * Solves the universal Kepler equation and writes [f, g, ḟ, ġ, χ] into `c`.
 * Inputs are already validated. `g` belongs to the reduced Δt (see the module comment).
 */
function solve(mu: number, state: ArrayLike<number>, dt: number, c: Float64Array | number[]): void {
  const x = state[0],
    y = state[1],
    z = state[2];
  const vx = state[3],
    vy = state[4],
    vz = state[5];
  const r0 = Math.sqrt(x * x + y * y + z * z);
  const v0sq = vx * vx + vy * vy + vz * vz;
  const rv = x * vx + y * vy + z * vz;
  const sqmu = Math.sqrt(mu);
  const sigma0 = rv / sqmu;
  const alpha = 2 / r0 - v0sq / mu;
  const ar0 = alpha * r0;
  const oneMinusAr0 = 1 - ar0;

  // angular momentum (the rectilinear check and the bracket below)
  const hx = y * vz - z * vy;
  const hy = z * vx - x * vz;
  const hz = x * vy - y * vx;
  const hsq = hx * hx + hy * hy + hz * hz;
  if (hsq <= RECTILINEAR_TOLERANCE * RECTILINEAR_TOLERANCE * r0 * r0 * v0sq) {
    const tc = timeToCentre(sqmu, r0, rv, alpha, dt);
    if (Math.abs(dt) >= tc) {
      throw new SolverError(
        'kepler',
        'collision',
        `the radial fall reaches the centre (r = 0) ${tc.toPrecision(6)} s ${dt > 0 ? 'after' : 'before'} the start, within the ${dt} s asked`,
        {
          mu,
          state: Array.from({ length: 6 }, (_, k) => state[k]),
          dt,
          tCollision: dt > 0 ? tc : -tc,
        },
      );
    }
  }

  // reduce Δt modulo the period of an ellipse (exact remainder, then into [−T/2, T/2])
  let t = dt;
  if (alpha > 0) {
    const period = TWO_PI / (sqmu * alpha * Math.sqrt(alpha));
    if (Math.abs(t) > 0.5 * period) {
      const revolutions = Math.abs(t) / period;
      if (!(revolutions <= KEPLER_MAX_REVOLUTIONS)) {
        throw new SolverError(
          'kepler',
          'precision-lost',
          `${dt} s is ${revolutions.toExponential(2)} revolutions of a ${period.toPrecision(6)} s orbit: past ${KEPLER_MAX_REVOLUTIONS.toExponential(2)} revolutions the rounding of the period hides where on the orbit the body is`,
          { mu, state: Array.from({ length: 6 }, (_, k) => state[k]), dt, period },
        );
      }
      t %= period;
      if (t > 0.5 * period) t -= period;
      else if (t < -0.5 * period) t += period;
    }
  }
  if (t === 0) {
    c[0] = 1;
    c[1] = 0;
    c[2] = 0;
    c[3] = 1;
    c[4] = 0;
    return;
  }
  const sdt = sqmu * t;
  const absSdt = Math.abs(sdt);

  // bracket for χ: sign(χ) = sign(Δt), |χ| ≤ √μ|Δt|/q (doubled for margin)
  const p = hsq / mu;
  const ecc = Math.sqrt(Math.max(0, 1 - p * alpha));
  const q = p / (1 + ecc);
  let bound = q > 0 ? (2 * absSdt) / q : Infinity;
  if (alpha > 0) bound = Math.min(bound, (1.01 * (Math.PI + 2)) / Math.sqrt(alpha));
  let lo = t > 0 ? 0 : -bound;
  let hi = t > 0 ? bound : 0;

  let chi: number;
  let c2 = 0.5;
  let c3 = 1 / 6;
  if (alpha < 0 && Math.sqrt(-alpha) * absSdt > HYPERBOLIC_ANOMALY_SWITCH * r0) {
    const sna = Math.sqrt(-alpha);
    const em1 = (-p * alpha) / (1 + ecc); // e − 1 without cancellation
    const eSinhH0 = sigma0 * sna;
    const H0 = Math.asinh(eSinhH0 / ecc);
    const M0 = hyperbolicMeanAccurate(H0, ecc, em1);
    const M1 = M0 + sqmu * -alpha * sna * t;
    const H1 = solveHyperbolicKepler(M1, ecc, em1);
    chi = (H1 - H0) / sna;
    stumpffCS(alpha * chi * chi, cs);
    c2 = cs[0];
    c3 = cs[1];
    if (!Number.isFinite(chi) || !Number.isFinite(c2) || !Number.isFinite(c3)) {
      throw new SolverError('kepler', 'non-finite', 'hyperbolic anomaly overflow (flight too long)', { mu, dt, chi });
    }
    lagrange(sqmu, r0, alpha, t, chi, c2, c3, x, y, z, vx, vy, vz, c);
    return;
  }

  // initial guess
  if (ar0 > NEAR_PARABOLIC) {
    chi = sdt * alpha; // Vallado Algorithm 8, ellipse
  } else if (ar0 < -NEAR_PARABOLIC) {
    // Vallado Algorithm 8, hyperbola
    const a = 1 / alpha;
    const sgn = t > 0 ? 1 : -1;
    const arg = (-2 * mu * alpha * t) / (rv + sgn * Math.sqrt(-mu * a) * oneMinusAr0);
    chi = sgn * Math.sqrt(-a) * Math.log(arg);
  } else if (p > 0) {
    // near-parabolic: Barker's equation from the current state, χ = √p·(D1 − D0)
    const sp = Math.sqrt(p);
    const D0 = sigma0 / sp;
    const M1 = 0.5 * (D0 + (D0 * D0 * D0) / 3) + (sqmu / (p * sp)) * t;
    const D1 = 2 * Math.sinh(Math.asinh(3 * M1) / 3);
    chi = sp * (D1 - D0);
  } else {
    chi = sdt / r0;
  }
  if (!(chi > lo && chi < hi)) {
    // outside the bracket or not finite: fall back to the short-arc guess, then to bisection
    chi = sdt / r0;
    if (!(chi > lo && chi < hi)) chi = Number.isFinite(bound) ? 0.5 * (lo + hi) : sdt / r0;
  }

  let converged = false;
  for (let it = 0; it < KEPLER_MAX_ITER; it++) {
    const chi2 = chi * chi;
    const psi = alpha * chi2;
    stumpffCS(psi, cs);
    c2 = cs[0];
    c3 = cs[1];
    const t1 = sigma0 * chi2 * c2;
    const t2 = oneMinusAr0 * chi2 * chi * c3;
    const t3 = r0 * chi;
    const F = t1 + t2 + t3 - sdt;
    if (!Number.isFinite(F)) {
      // overflow of the hyperbolic functions: χ is far too large in magnitude
      if (chi > 0) hi = chi;
      else lo = chi;
      chi = 0.5 * (lo + hi);
      continue;
    }
    const rounding = KEPLER_RESIDUAL_FACTOR * EPS * (Math.abs(t1) + Math.abs(t2) + Math.abs(t3) + absSdt);
    if (rounding > KEPLER_UNRESOLVED * absSdt) {
      // the terms of F cancel so far that F cannot resolve the time here (a nearly rectilinear
      // hyperbola far out, from a guess far past the root, where they grow like cosh): do not
      // take F ≈ 0 for a root; |χ| is too large, so shrink the bracket toward 0
      if (chi > 0) hi = chi;
      else lo = chi;
      chi = 0.5 * (lo + hi);
      continue;
    }
    if (Math.abs(F) <= rounding) {
      converged = true;
      break;
    }
    if (F < 0) lo = chi;
    else hi = chi;
    const Fp = chi2 * c2 + sigma0 * chi * (1 - psi * c3) + r0 * (1 - psi * c2);
    const Fpp = sigma0 * (1 - psi * c2) + oneMinusAr0 * chi * (1 - psi * c3);
    const disc = (LAGUERRE_N - 1) * (LAGUERRE_N - 1) * Fp * Fp - LAGUERRE_N * (LAGUERRE_N - 1) * F * Fpp;
    const den = Fp + (Fp >= 0 ? 1 : -1) * Math.sqrt(Math.abs(disc));
    let next = chi - (LAGUERRE_N * F) / den;
    // safeguard: from the 8th step on, every 4th step bisects, so the bracket keeps shrinking
    const force = it >= 8 && (it & 3) === 0 && Number.isFinite(lo) && Number.isFinite(hi);
    if (force || !(next > lo && next < hi)) {
      // bisection; with an open-ended bracket (rectilinear open orbit) double outward instead
      if (lo === -Infinity) next = 2 * Math.min(chi, hi);
      else if (hi === Infinity) next = 2 * Math.max(chi, lo);
      else next = 0.5 * (lo + hi);
    }
    if (next === chi) {
      // bracket collapsed to adjacent doubles
      converged = true;
      break;
    }
    chi = next;
  }
  if (!converged) {
    throw new SolverError('kepler', 'no-convergence', `universal Kepler equation not solved in ${KEPLER_MAX_ITER} iterations`, {
      mu,
      state: Array.from({ length: 6 }, (_, k) => state[k]),
      dt,
      chi,
    });
  }
  lagrange(sqmu, r0, alpha, t, chi, c2, c3, x, y, z, vx, vy, vz, c);
}

/**
 * Time to the centre of a rectilinear (e = 1, radial) orbit in the direction of dt, s; Infinity
 * when it moves away for ever. From the anomaly of the degenerate conic (Bate, Mueller & White,
 * ch. 4; Vallado §2.2, e = 1 in Kepler's equation): ellipse r = a(1 − cos E), M = E − sin E,
 * the centre at M = 0 and 2π; hyperbola r = |a|(cosh H − 1), M = sinh H − H, the centre at
 * H = 0; parabola (|α·r0| < NEAR_PARABOLIC) τ = √2·r0^{3/2}/(3√μ) from or to the centre.
 */
function timeToCentre(sqmu: number, r0: number, rv: number, alpha: number, dt: number): number {
  const inward = dt > 0 ? rv <= 0 : rv >= 0; // moving toward the centre in dt's direction (at rest: both)
  const ar0 = alpha * r0;
  if (ar0 > NEAR_PARABOLIC) {
    const n = sqmu * alpha * Math.sqrt(alpha);
    const E = Math.acos(Math.min(1, Math.max(-1, 1 - ar0))); // in [0, π]: the outgoing half
    const M = E - Math.sin(E);
    // outgoing (rv > 0) at M; incoming at 2π − M. Forward: the centre at 2π; backward: at 0.
    const Mnow = rv > 0 || (rv === 0 && dt < 0) ? M : TWO_PI - M;
    return dt > 0 ? (TWO_PI - Mnow) / n : Mnow / n;
  }
  if (!inward) return Infinity;
  if (ar0 < -NEAR_PARABOLIC) {
    const n = sqmu * -alpha * Math.sqrt(-alpha);
    const H = Math.acosh(1 - ar0);
    return (Math.sinh(H) - H) / n;
  }
  return (Math.SQRT2 * r0 * Math.sqrt(r0)) / (3 * sqmu);
}

/** Lagrange coefficients from the solved χ (Vallado Algorithm 8 / Curtis eqs. 3.69). */
function lagrange(
  sqmu: number,
  r0: number,
  alpha: number,
  t: number,
  chi: number,
  c2: number,
  c3: number,
  x: number,
  y: number,
  z: number,
  vx: number,
  vy: number,
  vz: number,
  c: Float64Array | number[],
): void {
  const chi2 = chi * chi;
  const f = 1 - (chi2 * c2) / r0;
  const g = t - (chi2 * chi * c3) / sqmu;
  // |r| from the new position
  const rx = f * x + g * vx;
  const ry = f * y + g * vy;
  const rz = f * z + g * vz;
  const rn = Math.sqrt(rx * rx + ry * ry + rz * rz);
  const fdot = (sqmu / (rn * r0)) * chi * (alpha * chi2 * c3 - 1);
  const gdot = 1 - (chi2 * c2) / rn;
  c[0] = f;
  c[1] = g;
  c[2] = fdot;
  c[3] = gdot;
  c[4] = chi;
}

/**
 * Lagrange coefficients of a two-body coast: writes [f, g, ḟ, ġ, χ] into out (allocates a
 * Float64Array(5) when omitted), so that r = f·r0 + g·v0 and v = ḟ·r0 + ġ·v0. For ellipses g
 * and χ belong to Δt reduced modulo the period. Same errors as propagateKepler.
 */
export function keplerCoefficients(mu: number, state: ArrayLike<number>, dt: number, out?: Float64Array | number[]): Float64Array | number[] {
  checkInputs(mu, state, dt);
  const o = out ?? new Float64Array(5);
  solve(mu, state, dt, coef);
  checkOutput(coef, 5, mu, state, dt);
  for (let k = 0; k < 5; k++) o[k] = coef[k];
  return o;
}

function checkOutput(a: ArrayLike<number>, n: number, mu: number, state: ArrayLike<number>, dt: number): void {
  for (let k = 0; k < n; k++) {
    if (!Number.isFinite(a[k])) {
      throw new SolverError('kepler', 'non-finite', 'propagated state is not finite (collision of a rectilinear orbit or overflow)', {
        mu,
        state: Array.from({ length: 6 }, (_, j) => state[j]),
        dt,
      });
    }
  }
}

/**
 * Propagates a two-body state [r, v] by dt seconds (dt may be negative). Writes into out
 * (may alias state), allocation-free when out is given. Throws InputError on bad input,
 * SolverError('kepler', 'no-convergence', ...) if iteration fails.
 */
export function propagateKepler(mu: number, state: ArrayLike<number>, dt: number, out?: Float64Array | number[]): Float64Array | number[] {
  checkInputs(mu, state, dt);
  const o = out ?? new Float64Array(6);
  if (o.length < 6) throw new InputError('out', 'must have 6 components', o.length);
  const x = state[0],
    y = state[1],
    z = state[2];
  const vx = state[3],
    vy = state[4],
    vz = state[5];
  solve(mu, state, dt, coef);
  const f = coef[0],
    g = coef[1],
    fd = coef[2],
    gd = coef[3];
  const nx = f * x + g * vx;
  const ny = f * y + g * vy;
  const nz = f * z + g * vz;
  const nvx = fd * x + gd * vx;
  const nvy = fd * y + gd * vy;
  const nvz = fd * z + gd * vz;
  if (!Number.isFinite(nx) || !Number.isFinite(ny) || !Number.isFinite(nz) || !Number.isFinite(nvx) || !Number.isFinite(nvy) || !Number.isFinite(nvz)) {
    checkOutput([nx, ny, nz, nvx, nvy, nvz], 6, mu, state, dt);
  }
  o[0] = nx;
  o[1] = ny;
  o[2] = nz;
  o[3] = nvx;
  o[4] = nvy;
  o[5] = nvz;
  return o;
}
