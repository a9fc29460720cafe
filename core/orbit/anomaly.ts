/**
 * Conversions between mean, eccentric / hyperbolic / parabolic and true anomaly. All angles in
 * radians.
 *
 * Revolutions are preserved: the elliptic conversions are continuous and monotonic in their
 * argument, so meanToTrue(M + 2πk, e) = meanToTrue(M, e) + 2πk and trueToMean undoes
 * meanToTrue exactly in the number of revolutions. Open orbits (e ≥ 1) have one "revolution":
 * their true anomaly is taken in (−π, π] and must lie inside the asymptotes,
 * |ν| < ν∞ = acos(−1/e).
 *
 * Definitions of the mean anomaly M, with n from `meanMotion` and t_p the periapsis time,
 * M = n·(t − t_p) in every case:
 * - ellipse (0 ≤ e < 1): M = E − e·sin E, n = √(μ/a³);
 * - hyperbola (e > 1):   M = e·sinh H − H, n = √(μ/(−a)³);
 * - parabola (e = 1, exactly): M = (D + D³/3)/2 with D = tan(ν/2), n = √(μ/p³). This is
 *   Barker's equation t − t_p = ½·√(p³/μ)·(D + D³/3) (Vallado, Fundamentals of Astrodynamics
 *   and Applications, 4th ed., §2.2.5, eq. 2-25 with n_p = 2√(μ/p³)); our M is half of
 *   Vallado's n_p·(t − t_p) because n here is √(μ/p³).
 *
 * Methods:
 * - Kepler's equation, elliptic: Halley iteration kept inside the bracket E ∈ [M, M + e]
 *   (bisection fallback), from E₀ = M below e = 0.3 and from Mikkola's cubic starter above
 *   (S. Mikkola, "A cubic approximation for Kepler's equation", Celestial Mechanics 40,
 *   329–334, 1987); it stops once Halley's cubic error law says the last step is exact to
 *   rounding. From e = 0.3 the residual and its derivative are evaluated as
 *   (1−e)·E + e·(E − sin E) and (1−e) + e·(1 − cos E) with series / half-angle forms near E = 0,
 *   which keeps full relative accuracy as e → 1 and M → 0 (the cancellation discussed by
 *   Gooding & Odell, "The hyperbolic Kepler equation (and the elliptic equation revisited)",
 *   Celestial Mechanics 44, 267–282, 1988). The conic ephemeris (core/system) calls this solver
 *   every evaluation, so its cost matters.
 * - Hyperbolic: Mikkola's hyperbolic starter (same paper), Halley in the bracket
 *   H ∈ [asinh(M/e), min(asinh(M/(e−1)), ∛(6M/e))], the same cancellation-free residual.
 * - Parabolic: Barker's cubic solved in closed form, D = 2·sinh(asinh(3M)/3).
 * - E ↔ ν: ν = E + 2·atan2(β sin E, 1 − β cos E), β = e/(1 + √(1−e²)) (Broucke & Cefola,
 *   "A note on the relations between true and eccentric anomalies in the two-body problem",
 *   Celestial Mechanics 7, 388–389, 1973), continuous across revolutions.
 */
import { InputError, SolverError, requireFinite, requirePositive } from '../math/index.ts';

const TWO_PI = 2 * Math.PI;
const EPS = Number.EPSILON;
/** Iteration budget for the Kepler-equation solvers (they normally need 1–3 steps). */
export const ANOMALY_MAX_ITER = 100;
/** A Halley step below this fraction of the iterate ends the iteration (cubic convergence). */
const STEP_TOL = 1e-11;
/** Absolute floor of the stopping tests, so subnormal anomalies terminate too. */
const TINY = 4 * Number.MIN_VALUE;

function requireEccentricity(e: number): void {
  if (typeof e !== 'number' || !Number.isFinite(e) || e < 0) throw new InputError('e', 'must be a finite number >= 0', e);
}

function requireElliptic(e: number): void {
  if (typeof e !== 'number' || !Number.isFinite(e) || !(e >= 0 && e < 1)) throw new InputError('e', 'must be in [0, 1) for an ellipse', e);
}

function requireHyperbolic(e: number): void {
  if (typeof e !== 'number' || !Number.isFinite(e) || !(e > 1)) throw new InputError('e', 'must be > 1 for a hyperbola', e);
}

/** x − sin x without cancellation (series below 0.5). */
function xMinusSin(x: number): number {
  const ax = Math.abs(x);
  if (ax >= 0.5) return x - Math.sin(x);
  const x2 = x * x;
  // x³/3! − x⁵/5! + ... − x¹⁵/15!: truncation < 2e-18 relative for |x| < 0.5
  return x * x2 * (1 / 6 - x2 * (1 / 120 - x2 * (1 / 5040 - x2 * (1 / 362880 - x2 * (1 / 39916800 - x2 * (1 / 6227020800 - x2 / 1307674368000))))));
}

/** sinh x − x without cancellation (series below 0.5). */
function sinhMinusX(x: number): number {
  const ax = Math.abs(x);
  if (ax >= 0.5) return Math.sinh(x) - x;
  const x2 = x * x;
  return x * x2 * (1 / 6 + x2 * (1 / 120 + x2 * (1 / 5040 + x2 * (1 / 362880 + x2 * (1 / 39916800 + x2 * (1 / 6227020800 + x2 / 1307674368000))))));
}

/** E − e·sin E, accurate as e → 1 and E → 0. */
function keplerElliptic(E: number, e: number): number {
  return (1 - e) * E + e * xMinusSin(E);
}

/** e·sinh H − H, accurate as e → 1 and H → 0. */
function keplerHyperbolic(H: number, e: number): number {
  return (e - 1) * H + e * sinhMinusX(H);
}

/** Eccentric anomaly E from mean anomaly M (0 ≤ e < 1). Same revolution as M. */
export function meanToEccentric(M: number, e: number): number {
  requireFinite('M', M);
  requireElliptic(e);
  if (e === 0) return M;
  const k = Math.round(M / TWO_PI);
  const Mr = k === 0 ? M : M - k * TWO_PI;
  return solveEllipticKepler(Mr, e) + k * TWO_PI;
}

/**
 * E with E − e·sin E = M, for M in [−π, π] (the caller reduces M) and 0 ≤ e < 1: the solver
 * behind meanToEccentric, for hot loops such as the conic ephemeris. No input checks, no
 * allocation. With `sinCos`, also writes [sin E, cos E] there: the last iteration's values
 * carried across its final step by the angle-sum formulas — the two evaluations a caller would
 * otherwise repeat.
 */
export function solveEllipticKepler(M: number, e: number, sinCos?: Float64Array): number {
  // small enough to be inlined into the caller, so M and e reach SC unboxed
  SC[0] = Math.abs(M);
  SC[1] = e;
  solveEllipticReduced();
  if (sinCos) {
    sinCos[0] = M < 0 ? -SC[3] : SC[3];
    sinCos[1] = SC[4];
  }
  return M < 0 ? -SC[2] : SC[2];
}

// In and out of solveEllipticReduced: 0 m, 1 e (in); 2 E, 3 sin E, 4 cos E (out). Numbers
// travel through a typed array, not as arguments and a return value, which a call that is not
// inlined would box on every evaluation (the ephemeris makes one per body state).
const SC = new Float64Array(5);

function withSinCos(E: number): void {
  SC[2] = E;
  SC[3] = Math.sin(E);
  SC[4] = Math.cos(E);
}

/** Below this eccentricity the iteration starts from E₀ = M and uses the plain residual forms. */
const LOW_E = 0.3;

/** Solves E − e sin E = m for m = SC[0] ∈ [0, π], e = SC[1]; leaves E, sin E, cos E in SC[2..4]. */
function solveEllipticReduced(): void {
  const m = SC[0];
  const e = SC[1];
  if (m === 0) {
    SC[2] = 0;
    SC[3] = 0;
    SC[4] = 1;
    return;
  }
  // tiny M: E = M/(1 − e) exactly to rounding once the cubic term e·E³/6 is below ε·(1 − e)·E
  const lin = m / (1 - e);
  if (e * lin * lin < 6 * EPS * (1 - e)) {
    withSinCos(lin);
    return;
  }
  let lo = m;
  let hi = Math.min(Math.PI, m + e);
  let E: number;
  if (e < LOW_E) {
    // |E − M| ≤ e: one Halley step leaves about C·e³, within reach of the a-priori stop below
    E = m;
  } else {
    // Mikkola (1987) cubic starter
    const denom = 4 * e + 0.5;
    const alpha = (1 - e) / denom;
    const beta = (0.5 * m) / denom;
    const z = Math.cbrt(beta + Math.sqrt(alpha * alpha * alpha + beta * beta));
    // s = z − α/z written as 2β/(z² + α + α²/z²) to avoid cancellation when β ≪ α^{3/2}
    let s = (2 * beta) / (z * z + alpha + (alpha * alpha) / (z * z));
    const s5 = s * s * s * s * s;
    s -= (0.078 * s5) / (1 + e);
    E = m + e * (3 * s - 4 * s * s * s);
    if (!(E > lo && E < hi)) E = 0.5 * (lo + hi);
  }
  // Halley's error law: next error ≈ C·(error)³ with C = f''²/(4f'²) − f'''/(6f'), and here
  // f' ≥ 1 − e, |f''| ≤ e, |f'''| ≤ e, so |C| ≤ q²/4 + q/6 with q = e/(1 − e) (Halley's error
  // constant, Traub, Iterative Methods for the Solution of Equations, 1964, from memory). A step s
  // with 2·that bound·|s|³ under ε/4
  // of E (and |s| < 1e-3, where the bound is the law) leaves E + s exact to rounding, with no
  // further evaluation to confirm it.
  const q = e / (1 - e);
  const cubeBound = 2 * (0.25 * q * q + q / 6);
  for (let it = 0; it < ANOMALY_MAX_ITER; it++) {
    const sinE = Math.sin(E);
    const cosE = Math.cos(E);
    // f = E − e sin E − m and f' = 1 − e cos E; near e → 1 and E → 0 in the cancellation-free
    // forms (1 − e)E + e(E − sin E) and (1 − e) + e·sin²E/(1 + cos E). Below LOW_E the plain
    // forms lose nothing: e sin E ≤ 0.3·E and f' ≥ 0.7.
    let f: number;
    let fp: number;
    if (e < LOW_E) {
      f = E - e * sinE - m;
      fp = 1 - e * cosE;
    } else {
      // keplerElliptic(E, e), reusing sin E where xMinusSin would evaluate it again (E > 0 here)
      f = (E >= 0.5 ? (1 - e) * E + e * (E - sinE) : keplerElliptic(E, e)) - m;
      fp = cosE > 0 ? 1 - e + (e * sinE * sinE) / (1 + cosE) : 1 - e * cosE;
    }
    if (f === 0) {
      SC[2] = E;
      SC[3] = sinE;
      SC[4] = cosE;
      return;
    }
    if (f < 0) lo = E;
    else hi = E;
    // Halley, s = −f/(f' − f·f''/(2f')) = −f·f'/(f'² − f·f''/2) with f'' = e sin E; Newton where
    // that denominator is not positive
    const den = fp * fp - 0.5 * f * e * sinE;
    const step = den > 0 ? (-f * fp) / den : -f / fp;
    // converged: tested before the bracket, since a last step below the rounding of E leaves
    // En === E === lo (or hi), which the bracket test would keep bisecting away from
    const a = Math.abs(step);
    if (a <= STEP_TOL * E + TINY || (a < 1e-3 && cubeBound * a * a * a <= 0.25 * EPS * E)) {
      // sin and cos carried across the step: sin(E + s) = sin E·cos s + cos E·sin s, with
      // cos s and sin s from their series to s⁴ and s⁵ (the next terms are below 2e-21 for |s| < 1e-3)
      const s2 = step * step;
      const cs = 1 - s2 * (0.5 - s2 / 24);
      const sn = step * (1 - s2 * (1 / 6 - s2 / 120));
      SC[2] = E + step;
      SC[3] = sinE * cs + cosE * sn;
      SC[4] = cosE * cs - sinE * sn;
      return;
    }
    let En = E + step;
    if (!(En > lo && En < hi)) {
      En = 0.5 * (lo + hi);
      if (hi - lo <= 4 * EPS * hi + TINY) {
        withSinCos(En);
        return;
      }
      E = En;
      continue;
    }
    E = En;
  }
  throw new SolverError('kepler-elliptic', 'no-convergence', `no eccentric anomaly after ${ANOMALY_MAX_ITER} iterations`, { M: m, e });
}

/** Mean anomaly from eccentric anomaly (0 ≤ e < 1): M = E − e·sin E. */
export function eccentricToMean(E: number, e: number): number {
  requireFinite('E', E);
  requireElliptic(e);
  const k = Math.round(E / TWO_PI);
  if (k === 0) return keplerElliptic(E, e);
  return keplerElliptic(E - k * TWO_PI, e) + k * TWO_PI;
}

function betaOf(e: number): number {
  return e / (1 + Math.sqrt((1 - e) * (1 + e)));
}

/** True anomaly from eccentric anomaly (0 ≤ e < 1), same revolution (Broucke & Cefola 1973). */
export function eccentricToTrue(E: number, e: number): number {
  requireFinite('E', E);
  requireElliptic(e);
  const b = betaOf(e);
  return E + 2 * Math.atan2(b * Math.sin(E), 1 - b * Math.cos(E));
}

/** Eccentric anomaly from true anomaly (0 ≤ e < 1), same revolution (Broucke & Cefola 1973). */
export function trueToEccentric(nu: number, e: number): number {
  requireFinite('nu', nu);
  requireElliptic(e);
  const b = betaOf(e);
  return nu - 2 * Math.atan2(b * Math.sin(nu), 1 + b * Math.cos(nu));
}

/** Hyperbolic anomaly H from mean anomaly M = e·sinh H − H (e > 1). */
export function meanToHyperbolic(M: number, e: number): number {
  requireFinite('M', M);
  requireHyperbolic(e);
  return solveHyperbolicKepler(M, e, e - 1);
}

/**
 * H with e·sinh H − H = M, given e and e − 1 separately (callers that know e − 1 more
 * accurately than by subtraction, e.g. from −p·α/(1 + e), keep full accuracy for e → 1).
 * No input checks: M finite, e > 1 and eMinus1 = e − 1 > 0 are the caller's duty.
 */
export function solveHyperbolicKepler(M: number, e: number, eMinus1: number): number {
  const m = Math.abs(M);
  if (m === 0) return 0;
  // tiny M: H = M/(e − 1) to rounding once the cubic term e·H³/6 is below ε·(e − 1)·H
  const lin = m / eMinus1;
  if (e * lin * lin < 6 * EPS * eMinus1) return M < 0 ? -lin : lin;
  // bracket: e·sinh H − H ≤ e·sinh H, and ≥ (e − 1)·sinh H, and ≥ e·H³/6
  let lo = Math.asinh(m / e);
  let hi = Math.min(Math.asinh(m / eMinus1), Math.cbrt((6 * m) / e));
  // Mikkola (1987) hyperbolic starter
  const denom = 4 * e + 0.5;
  const alpha = eMinus1 / denom;
  const beta = (0.5 * m) / denom;
  const z = Math.cbrt(beta + Math.sqrt(alpha * alpha * alpha + beta * beta));
  let s = (2 * beta) / (z * z + alpha + (alpha * alpha) / (z * z));
  const s2 = s * s;
  s += (0.071 * s2 * s2 * s) / ((1 + 0.45 * s2) * (1 + 4 * s2) * e);
  let H = 3 * Math.asinh(s);
  // outside the bracket: start from its nearer end (the midpoint of a bracket as wide as
  // [asinh(m/e), ∛(6m/e)] is far up the exponential, where Newton creeps one unit per step)
  if (!(H > lo)) H = lo;
  else if (!(H < hi)) H = hi;
  for (let it = 0; it < ANOMALY_MAX_ITER; it++) {
    const f = eMinus1 * H + e * sinhMinusX(H) - m;
    if (f === 0) return M < 0 ? -H : H;
    if (f < 0) lo = H;
    else hi = H;
    const sh = Math.sinh(H);
    const ch = Math.cosh(H);
    // f' = e cosh H − 1 = (e − 1) + e (cosh H − 1), cosh H − 1 = sinh²H/(cosh H + 1) near 0
    // (for large H the square would overflow where cosh H itself does not)
    const fp = eMinus1 + e * (ch < 2 ? (sh * sh) / (ch + 1) : ch - 1);
    const fpp = e * sh;
    const hd = fp - 0.5 * f * (fpp / fp); // f·f'' alone can overflow
    const step = hd > 0 ? -f / hd : -f / fp;
    // converged: tested before the bracket (see solveEllipticReduced)
    if (Math.abs(step) <= STEP_TOL * H + TINY) return M < 0 ? -(H + step) : H + step;
    let Hn = H + step;
    if (!(Hn > lo && Hn < hi)) {
      Hn = 0.5 * (lo + hi);
      if (hi - lo <= 4 * EPS * hi + TINY) return M < 0 ? -Hn : Hn;
      H = Hn;
      continue;
    }
    H = Hn;
  }
  throw new SolverError('kepler-hyperbolic', 'no-convergence', `no hyperbolic anomaly after ${ANOMALY_MAX_ITER} iterations`, { M, e });
}

/** e·sinh H − H given e and e − 1 separately (cancellation-free as e → 1, H → 0). No input checks. */
export function hyperbolicMeanAccurate(H: number, e: number, eMinus1: number): number {
  return eMinus1 * H + e * sinhMinusX(H);
}

/** Mean anomaly from hyperbolic anomaly (e > 1): M = e·sinh H − H. */
export function hyperbolicToMean(H: number, e: number): number {
  requireFinite('H', H);
  requireHyperbolic(e);
  const M = keplerHyperbolic(H, e);
  if (!Number.isFinite(M)) throw new InputError('H', 'is too large (e·sinh H overflows)', H);
  return M;
}

/** True anomaly from hyperbolic anomaly (e > 1), in (−ν∞, ν∞). */
export function hyperbolicToTrue(H: number, e: number): number {
  requireFinite('H', H);
  requireHyperbolic(e);
  return 2 * Math.atan(Math.sqrt((e + 1) / (e - 1)) * Math.tanh(0.5 * H));
}

/** ν wrapped into (−π, π]. */
function wrapPi(nu: number): number {
  if (nu > -Math.PI && nu <= Math.PI) return nu;
  const w = nu - TWO_PI * Math.round(nu / TWO_PI);
  return w <= -Math.PI ? w + TWO_PI : w;
}

/** Hyperbolic anomaly from true anomaly (e > 1); ν is taken modulo 2π into (−π, π] and must satisfy |ν| < acos(−1/e). */
export function trueToHyperbolic(nu: number, e: number): number {
  requireFinite('nu', nu);
  requireHyperbolic(e);
  const w = wrapPi(nu);
  const x = Math.sqrt((e - 1) / (e + 1)) * Math.tan(0.5 * w);
  if (!(1 + e * Math.cos(w) > 0) || !(Math.abs(x) < 1)) {
    throw new InputError('nu', `must lie inside the asymptotes, |nu| < acos(-1/e) = ${Math.acos(-1 / e)}`, nu);
  }
  return 2 * Math.atanh(x);
}

/** True anomaly from mean anomaly for any conic (see the module comment for M's definition). */
export function meanToTrue(M: number, e: number): number {
  requireFinite('M', M);
  requireEccentricity(e);
  if (e < 1) return eccentricToTrue(meanToEccentric(M, e), e);
  if (e > 1) return hyperbolicToTrue(meanToHyperbolic(M, e), e);
  // parabola: D³ + 3D − 6M = 0  →  D = 2 sinh(asinh(3M)/3)
  const D = 2 * Math.sinh(Math.asinh(3 * M) / 3);
  return 2 * Math.atan(D);
}

/** Mean anomaly from true anomaly for any conic (inverse of meanToTrue). */
export function trueToMean(nu: number, e: number): number {
  requireFinite('nu', nu);
  requireEccentricity(e);
  if (e < 1) return eccentricToMean(trueToEccentric(nu, e), e);
  if (e > 1) return hyperbolicToMean(trueToHyperbolic(nu, e), e);
  const w = wrapPi(nu);
  if (!(Math.abs(w) < Math.PI)) throw new InputError('nu', 'must satisfy |nu| < π for a parabola', nu);
  const D = Math.tan(0.5 * w);
  return 0.5 * (D + (D * D * D) / 3);
}

/**
 * Mean motion n (rad/s). For e ≠ 1 pass the semi-major axis a (either sign):
 * n = √(μ/|a|³). For the parabola pass a = ±Infinity and the semi-latus rectum p:
 * n = √(μ/p³), consistent with the parabolic M of meanToTrue.
 */
export function meanMotion(mu: number, a: number, p?: number): number {
  requirePositive('mu', mu);
  if (typeof a !== 'number' || Number.isNaN(a) || a === 0) throw new InputError('a', 'must be a non-zero number (±Infinity for a parabola)', a);
  if (!Number.isFinite(a)) {
    if (p === undefined) throw new InputError('p', 'is required for a parabola (a = ±Infinity)', p);
    requirePositive('p', p);
    return Math.sqrt(mu / p) / p;
  }
  const aa = Math.abs(a);
  return Math.sqrt(mu / aa) / aa;
}
