/**
 * Lambert's problem: the conic arc that joins two position vectors in a given time of flight
 * about a central body of gravitational parameter μ.
 *
 * Method: D. Izzo, "Revisiting Lambert's problem", Celestial Mechanics and Dynamical Astronomy
 * 121 (2015) 1–15 — the non-dimensional x variable and the λ geometry parameter, time of flight
 * T(x) by Lancaster–Blanchard (far from x = 1), by Lagrange's form (0.01 < |x − 1| < 0.2) and by
 * Battin's hypergeometric series (|x − 1| < 0.01), Householder (third-order) iterations on x from
 * Izzo's initial guesses, Halley iterations for the minimum time of each revolution count, and
 * both branches (left: x < x_min, right: x > x_min of T(x) for that count) per revolution count.
 *
 * Conventions
 * - Units are whatever the caller uses consistently (SI inside the core: m, s, m³/s²).
 * - Sense of motion: prograde means the transfer's angular momentum has a non-negative component
 *   along a reference normal — the +z axis by default, or `normalHint` when given. `retrograde`
 *   reverses that. A transfer plane that contains the reference normal (polar plane) counts as
 *   prograde (Izzo's convention, h·ẑ < 0 → long way).
 * - Collinear points (|r̂1 × r̂2| < COLLINEAR_SIN: transfer angle within ~1e-10 rad of 0 or π):
 *   the plane is taken as the one containing r1 and perpendicular to the reference normal's
 *   component perpendicular to r1; motion is prograde about that normal (or retrograde if asked).
 *   If r1 is along the reference normal, no plane can be chosen: `solveLambert` throws InputError
 *   asking for `normalHint`, the fast paths return −1. In that band r2 may sit off the chosen
 *   plane by at most |r2|·1e-10 (the arc then misses r2 by at most that much).
 * - A transfer angle of exactly 0 (r2 = k·r1, k ≠ 1) has only rectilinear (radial) solutions; the
 *   method returns them (zero transverse velocity).
 *
 * Numerics beyond the paper: 1 − λ² (= c/s), 1 − λ, ρ and σ are formed without cancellation
 * near 0°, 180° and nearly coincident points; the Lancaster–Blanchard angle ψ is taken with atan2
 * / asinh instead of acos / log; Householder steps are kept inside a bracket (bisection fallback);
 * a multi-revolution branch that converges onto the other branch is solved again on its own
 * monotone side of x_min.
 *
 * Limits
 * - Where the time of flight lies within rounding of a revolution count's minimum time, that
 *   count's two branches coincide; the count is dropped when the computed minimum exceeds it.
 * - Single-revolution flights far longer than the minimum-energy time (x → −1) lose accuracy
 *   with the representation of x: about 1e-12 relative miss at 300×, 1e-10 at 3,000×, 1e-8 at
 *   30,000× (measured against the Kepler propagator).
 * - Multi-revolution solutions are not ordered by cost; callers pick (see lambertBest).
 */
import { InputError, SolverError, requireFiniteVector, requirePositive } from '../math/index.ts';

export interface LambertSolution {
  /** Complete revolutions before arrival. */
  revs: number;
  /** 'single' for revs = 0; for revs ≥ 1, 'left' (x < x_min) or 'right' (x > x_min) of Izzo's T(x). */
  branch: 'single' | 'left' | 'right';
  /** Velocity at r1 on the transfer arc. */
  v1: Float64Array;
  /** Velocity at r2 on the transfer arc. */
  v2: Float64Array;
  /** Householder iterations used. */
  iterations: number;
  /** Izzo's x variable of the solution (x < 1 ellipse, x = 1 parabola, x > 1 hyperbola). */
  x: number;
}

export interface LambertOptions {
  /** Maximum complete revolutions to consider; default 0 (single revolution only). */
  revs?: number;
  /** Reverse the sense of motion about the reference normal; default false. */
  retrograde?: boolean;
  /**
   * Reference normal (default +z). Decides the sense of motion (prograde about it) and, where
   * r1 × r2 ≈ 0 (transfer angle near 0 or 180°), the transfer plane: the plane containing r1 and
   * perpendicular to this normal's component perpendicular to r1.
   */
  normalHint?: ArrayLike<number>;
  /** Convergence tolerance on the x step (relative where |x| > 1); default 1e-11. Below ~1e-15 it may be unreachable (SolverError). */
  tol?: number;
  /** Householder iteration budget per solution; default 30. */
  maxIter?: number;
}

/** Default convergence tolerance on x. */
export const LAMBERT_DEFAULT_TOL = 1e-11;
/** Default Householder iteration budget per solution. */
export const LAMBERT_DEFAULT_MAX_ITER = 30;
/** |r̂1 × r̂2| below which the two points count as collinear and the plane comes from the normal. */
export const COLLINEAR_SIN = 1e-10;
/** Points closer than this fraction of r1 + r2 count as coincident. */
const COINCIDENT_REL = 1e-14;
/**
 * Largest |r1|, |r2| accepted, m: the geometry needs s³ (s the semi-perimeter, up to 2·|r|),
 * which overflows past about 1e102 m; 1e100 m is far beyond any system (the files' bound on a
 * semi-major axis is 1e17 m).
 */
export const LAMBERT_MAX_RADIUS = 1e100;
/** |x − 1| below which Battin's series gives T(x) (Izzo 2015). */
const BATTIN_BAND = 0.01;
/** |x − 1| below which (and above BATTIN_BAND) Lagrange's form gives T(x). */
const LAGRANGE_BAND = 0.2;
/** |x − 1| below which derivatives of T are taken at 1 ± this (their formulas divide by 1 − x²). */
const DERIV_BAND = 1e-4;
/** Halley iterations for the minimum time of a revolution count. */
const TMIN_MAX_ITER = 16;
const TMIN_TOL = 1e-13;

// ---------------------------------------------------------------------------------------------
// Module scratch (the hot paths allocate nothing).

/** Derivatives dT/dx, d²T/dx², d³T/dx³ from the last call of dTdx. */
const D = new Float64Array(3);
/**
 * Geometry of the current problem:
 * 0 λ, 1 T (non-dimensional), 2–4 r̂1, 5–7 t̂1, 8–10 r̂2, 11–13 t̂2, 14 |r1|, 15 |r2|,
 * 16 γ = √(μs/2), 17 ρ, 18 σ, 19 1 − λ² (= c/s), 20 1 − λ.
 */
const G = new Float64Array(21);
/**
 * Input of prepare (numbers travel through here, not as arguments, so that no call boxes them):
 * 0 μ, 1–3 r1, 4–6 r2, 7 tof, 8–10 reference normal.
 */
const IN = new Float64Array(11);
/** x of the solution handed to velocities (and written by solveSingle). */
const XS = new Float64Array(1);
/** Iterations of the last solveX call. */
let lastIter = 0;
/** x at the minimum time of the last tMin call. */
let lastXMin = 0;

// ---------------------------------------------------------------------------------------------
// Time of flight T(x) and its derivatives (Izzo 2015).

/** Gauss hypergeometric ₂F₁(3, 1; 5/2; z) by its series (Battin's form near x = 1). */
function hyp2f1b(z: number): number {
  let sj = 1;
  let cj = 1;
  for (let j = 0; j < 200; j++) {
    cj = (((cj * (3 + j) * (1 + j)) / (2.5 + j)) * z) / (j + 1);
    sj += cj;
    if (Math.abs(cj) < 1e-16) break;
  }
  return sj;
}

/** Lagrange's form of T(x), used for 0.01 < |x − 1| < 0.2. */
function tofLagrange(x: number, N: number, lam: number): number {
  const a = 1 / (1 - x * x);
  if (a > 0) {
    const alfa = 2 * Math.acos(x);
    let beta = 2 * Math.asin(Math.min(1, Math.sqrt((lam * lam) / a)));
    if (lam < 0) beta = -beta;
    return (a * Math.sqrt(a) * (alfa - Math.sin(alfa) - (beta - Math.sin(beta)) + 2 * Math.PI * N)) / 2;
  }
  const alfa = 2 * Math.acosh(x);
  let beta = 2 * Math.asinh(Math.sqrt((-lam * lam) / a));
  if (lam < 0) beta = -beta;
  return (-a * Math.sqrt(-a) * (beta - Math.sinh(beta) - (alfa - Math.sinh(alfa)))) / 2;
}

/** Non-dimensional time of flight T(x) for N complete revolutions (Izzo 2015). */
function tofX(x: number, N: number, lam: number): number {
  const dist = Math.abs(x - 1);
  if (dist < LAGRANGE_BAND && dist > BATTIN_BAND) return tofLagrange(x, N, lam);
  const E = x * x - 1;
  const rho = Math.abs(E);
  // z = √(1 + λ²E) = √((1 − λ²) + λ²x²), free of cancellation as λ → ±1.
  const z = Math.sqrt(G[19] + lam * lam * x * x);
  if (dist <= BATTIN_BAND) {
    const eta = z - lam * x;
    const s1 = 0.5 * (G[20] - x * eta);
    const q = (4 / 3) * hyp2f1b(s1);
    let t = (eta * eta * eta * q + 4 * lam * eta) / 2;
    if (N > 0) t += (N * Math.PI) / (rho * Math.sqrt(rho));
    return t;
  }
  const y = Math.sqrt(rho);
  // z − λx without cancellation: (z² − λ²x²)/(z + λx) = (1 − λ²)/(z + λx) where λx > 0.
  const lx = lam * x;
  const zml = lx > 0 ? G[19] / (z + lx) : z - lx;
  let d: number;
  if (E < 0) {
    // ψ from cos ψ = xz − λE and sin ψ = (z − λx)√(1 − x²): atan2 keeps it accurate near 0 and π.
    d = N * Math.PI + Math.atan2(zml * y, x * z - lam * E);
  } else {
    // ψ = asinh(√E (z − λx)) (Lancaster–Blanchard's log form, accurate for small ψ).
    d = Math.asinh(y * zml);
  }
  return (x - lam * z - d / y) / E;
}

/** First three derivatives of T at x given T(x) (Izzo 2015); writes D. */
function dTdx(x: number, T: number, lam: number): void {
  const l2 = lam * lam;
  const l3 = l2 * lam;
  const oml2 = G[19];
  const umx2 = 1 - x * x;
  const y = Math.sqrt(oml2 + l2 * x * x);
  const y2 = y * y;
  const y3 = y2 * y;
  const d1 = (3 * T * x - 2 + (2 * l3 * x) / y) / umx2;
  const d2 = (3 * T + 5 * x * d1 + (2 * oml2 * l3) / y3) / umx2;
  const d3 = (7 * x * d2 + 8 * d1 - (6 * oml2 * l2 * l3 * x) / (y3 * y2)) / umx2;
  D[0] = d1;
  D[1] = d2;
  D[2] = d3;
}

/** Derivatives at x, moved off x = 1 where their formulas lose all precision. */
function derivatives(x: number, t: number, N: number, lam: number): void {
  if (Math.abs(x - 1) < DERIV_BAND) {
    const xs = x < 1 ? 1 - DERIV_BAND : 1 + DERIV_BAND;
    dTdx(xs, tofX(xs, N, lam), lam);
  } else {
    dTdx(x, t, lam);
  }
}

/**
 * Householder iterations for T(x) = Tt from x0, kept inside the open bracket (lo, hi).
 * `sense` is −1 where T decreases with x on the bracket, +1 where it increases, 0 where the
 * bracket is not known to be monotone (then steps are only kept inside it).
 * Returns x, or NaN without convergence; sets lastIter.
 */
function solveX(Tt: number, x0: number, N: number, lam: number, tol: number, maxIter: number, lo: number, hi: number, sense: number): number {
  let x = x0;
  for (let it = 1; it <= maxIter; it++) {
    const t = tofX(x, N, lam);
    const delta = t - Tt;
    if (sense !== 0) {
      if (delta * sense < 0) lo = x;
      else hi = x;
    }
    derivatives(x, t, N, lam);
    const d1 = D[0];
    const d2 = D[1];
    const d3 = D[2];
    const d1s = d1 * d1;
    let xn = x - (delta * (d1s - (delta * d2) / 2)) / (d1 * (d1s - delta * d2) + (d3 * delta * delta) / 6);
    const scale = Math.abs(x) > 1 ? Math.abs(x) : 1;
    if (Math.abs(xn - x) <= tol * scale || delta === 0) {
      lastIter = it;
      return Math.abs(xn - x) <= tol * scale ? xn : x;
    }
    if (!(xn > lo && xn < hi)) {
      // Out of the bracket (or not a number): fall back to bisection.
      if (hi === Infinity) xn = x > lo ? x + 1 + Math.abs(x) : lo + 1 + Math.abs(lo);
      else if (sense === 0) xn = xn >= hi ? (x + hi) / 2 : (x + lo) / 2;
      else xn = (lo + hi) / 2;
    }
    x = xn;
  }
  lastIter = maxIter;
  return NaN;
}

/**
 * Minimum non-dimensional time for N ≥ 1 revolutions by Halley iterations on dT/dx = 0 from
 * x = 0 (Izzo 2015). Sets lastXMin. Returns NaN without convergence.
 */
function tMin(N: number, lam: number): number {
  let x = 0;
  let t = tofX(0, N, lam);
  for (let it = 0; it < TMIN_MAX_ITER; it++) {
    dTdx(x, t, lam);
    const d1 = D[0];
    const d2 = D[1];
    const d3 = D[2];
    if (d1 === 0) {
      lastXMin = x;
      return t;
    }
    let xn = x - (d1 * d2) / (d2 * d2 - (d1 * d3) / 2);
    if (!(xn > -1 && xn < 1)) xn = xn >= 1 ? (x + 1) / 2 : (x - 1) / 2;
    const err = Math.abs(xn - x);
    x = xn;
    t = tofX(x, N, lam);
    if (err < TMIN_TOL) {
      lastXMin = x;
      return t;
    }
  }
  lastXMin = x;
  return NaN;
}

// ---------------------------------------------------------------------------------------------
// Geometry (Izzo 2015, with cancellation-free forms of λ, ρ and σ near 0°, 180° and coincident points).

/**
 * Fills G for the problem in IN (μ, r1, r2, tof, reference normal). Returns 0 on success, 1 if the points are collinear and the
 * reference normal is along r1 (no plane can be chosen), 2 if the points coincide.
 */
function prepare(retrograde: boolean): number {
  const mu = IN[0];
  const r1x = IN[1];
  const r1y = IN[2];
  const r1z = IN[3];
  const r2x = IN[4];
  const r2y = IN[5];
  const r2z = IN[6];
  const tof = IN[7];
  const nx = IN[8];
  const ny = IN[9];
  const nz = IN[10];
  const r1n = Math.sqrt(r1x * r1x + r1y * r1y + r1z * r1z);
  const r2n = Math.sqrt(r2x * r2x + r2y * r2y + r2z * r2z);
  const cx = r2x - r1x;
  const cy = r2y - r1y;
  const cz = r2z - r1z;
  const c = Math.sqrt(cx * cx + cy * cy + cz * cz);
  if (!(c > COINCIDENT_REL * (r1n + r2n))) return 2;
  const s = (r1n + r2n + c) / 2;
  const u1x = r1x / r1n,
    u1y = r1y / r1n,
    u1z = r1z / r1n;
  const u2x = r2x / r2n,
    u2y = r2y / r2n,
    u2z = r2z / r2n;
  let hx = u1y * u2z - u1z * u2y;
  let hy = u1z * u2x - u1x * u2z;
  let hz = u1x * u2y - u1y * u2x;
  const hn = Math.sqrt(hx * hx + hy * hy + hz * hz);
  // |r̂1 + r̂2| = 2 cos(θ/2), |r̂2 − r̂1| = 2 sin(θ/2) for θ in [0, π]: no cancellation near 0, π.
  const px = u1x + u2x,
    py = u1y + u2y,
    pz = u1z + u2z;
  const qx = u2x - u1x,
    qy = u2y - u1y,
    qz = u2z - u1z;
  let lam = (Math.sqrt(r1n * r2n) * Math.sqrt(px * px + py * py + pz * pz)) / (2 * s);
  if (hn >= COLLINEAR_SIN) {
    hx /= hn;
    hy /= hn;
    hz /= hn;
    // Long way (θ > π) when the geometric normal points against the reference normal.
    let flip = hx * nx + hy * ny + hz * nz < 0;
    if (retrograde) flip = !flip;
    if (flip) {
      lam = -lam;
      hx = -hx;
      hy = -hy;
      hz = -hz;
    }
  } else {
    // Collinear: the plane ⟂ the reference normal's part ⟂ r1; prograde about it.
    const d = nx * u1x + ny * u1y + nz * u1z;
    hx = nx - d * u1x;
    hy = ny - d * u1y;
    hz = nz - d * u1z;
    const n = Math.sqrt(hx * hx + hy * hy + hz * hz);
    const nn = Math.sqrt(nx * nx + ny * ny + nz * nz);
    if (!(n > 1e-8 * nn)) return 1;
    const k = retrograde ? -1 / n : 1 / n;
    const gx = hx,
      gy = hy,
      gz = hz;
    hx *= k;
    hy *= k;
    hz *= k;
    // Just past π about the chosen normal (a cross product at rounding level): the long way.
    const dg = gx * (u1y * u2z - u1z * u2y) + gy * (u1z * u2x - u1x * u2z) + gz * (u1x * u2y - u1y * u2x);
    if (retrograde ? dg > 0 : dg < 0) lam = -lam;
  }
  G[0] = lam;
  G[1] = Math.sqrt((2 * mu) / (s * s * s)) * tof;
  G[2] = u1x;
  G[3] = u1y;
  G[4] = u1z;
  // t̂ = ĥ × r̂ (unit: ĥ ⟂ r̂)
  G[5] = hy * u1z - hz * u1y;
  G[6] = hz * u1x - hx * u1z;
  G[7] = hx * u1y - hy * u1x;
  G[8] = u2x;
  G[9] = u2y;
  G[10] = u2z;
  let t2x = hy * u2z - hz * u2y;
  let t2y = hz * u2x - hx * u2z;
  let t2z = hx * u2y - hy * u2x;
  const t2n = Math.sqrt(t2x * t2x + t2y * t2y + t2z * t2z);
  t2x /= t2n;
  t2y /= t2n;
  t2z /= t2n;
  G[11] = t2x;
  G[12] = t2y;
  G[13] = t2z;
  G[14] = r1n;
  G[15] = r2n;
  G[16] = Math.sqrt((mu * s) / 2);
  // ρ = (|r1| − |r2|)/c with |r1| − |r2| = −(r2 − r1)·(r1 + r2)/(|r1| + |r2|): accurate for nearby points.
  const rho = -(cx * (r1x + r2x) + cy * (r1y + r2y) + cz * (r1z + r2z)) / ((r1n + r2n) * c);
  G[17] = rho;
  // σ = √(1 − ρ²) = 2√(r1 r2) sin(θ/2)/c: the first form where |ρ| is small, the second near ρ = ±1.
  G[18] = Math.abs(rho) < 0.5 ? Math.sqrt(1 - rho * rho) : (Math.sqrt(r1n * r2n) * Math.sqrt(qx * qx + qy * qy + qz * qz)) / c;
  const oml2 = c / s;
  G[19] = oml2;
  G[20] = lam > 0 ? oml2 / (1 + lam) : 1 - lam;
  return 0;
}

/** Terminal velocities for the solution x = XS[0] (Izzo 2015); writes 3 components at o1, o2. */
function velocities(out1: Float64Array, o1: number, out2: Float64Array, o2: number): void {
  const lam = G[0];
  const r1n = G[14];
  const r2n = G[15];
  const gamma = G[16];
  const rho = G[17];
  const sigma = G[18];
  const x = XS[0];
  const y = Math.sqrt(G[19] + lam * lam * x * x);
  const a = lam * y - x;
  const b = lam * y + x;
  const vr1 = (gamma * (a - rho * b)) / r1n;
  const vr2 = (-gamma * (a + rho * b)) / r2n;
  const vt = gamma * sigma * (y + lam * x);
  const vt1 = vt / r1n;
  const vt2 = vt / r2n;
  out1[o1] = vr1 * G[2] + vt1 * G[5];
  out1[o1 + 1] = vr1 * G[3] + vt1 * G[6];
  out1[o1 + 2] = vr1 * G[4] + vt1 * G[7];
  out2[o2] = vr2 * G[8] + vt2 * G[11];
  out2[o2 + 1] = vr2 * G[9] + vt2 * G[12];
  out2[o2 + 2] = vr2 * G[10] + vt2 * G[13];
}

/** T(x = 0, N = 0) = acos λ + λ√(1 − λ²), with acos λ = atan2(√(1 − λ²), λ) accurate near λ = ±1. */
function tofZero(lam: number): number {
  const q = Math.sqrt(G[19]);
  return Math.atan2(q, lam) + lam * q;
}

/**
 * Single-revolution x for the prepared geometry into XS[0] (NaN without convergence); returns
 * whether it converged. This is solveX from Izzo's initial guess (rational, power-law and
 * hyperbolic forms, after Izzo 2015) with sense −1 on (−1, ∞), with T(x)'s
 * Lancaster–Blanchard form and dTdx written out in the loop — the same operations in the same
 * order, so the same bits — because the hot loops (porkchop grids) run through here and a call
 * per evaluation would box its numbers.
 */
function solveSingle(tol: number, maxIter: number): boolean {
  const lam = G[0];
  const T = G[1];
  const oml2 = G[19];
  const oml = G[20];
  // initial guess; T00 = tofZero(λ), 1 − λ³ and 1 − λ⁵ through 1 − λ (accurate as λ → 1)
  const q0 = Math.sqrt(oml2);
  const T00 = Math.atan2(q0, lam) + lam * q0;
  const T1 = (2 / 3) * oml * (1 + lam + lam * lam);
  let x: number;
  if (T >= T00) x = -(T - T00) / (T - T00 + 4);
  else if (T <= T1) x = (T1 * (T1 - T)) / ((2 / 5) * oml * (1 + lam * (1 + lam * (1 + lam * (1 + lam)))) * T) + 1;
  else x = (T / T00) ** (Math.LN2 / Math.log(T1 / T00)) - 1;
  const l2 = lam * lam;
  const l3 = l2 * lam;
  let lo = -1;
  let hi = Infinity;
  for (let it = 1; it <= maxIter; it++) {
    const dist = Math.abs(x - 1);
    // √(1 − λ² + λ²x²): z of tofX and y of dTdx
    const z = Math.sqrt(oml2 + lam * lam * x * x);
    let t: number;
    if (dist >= LAGRANGE_BAND) {
      const E = x * x - 1;
      const y = Math.sqrt(Math.abs(E));
      const lx = lam * x;
      const zml = lx > 0 ? oml2 / (z + lx) : z - lx;
      const d = E < 0 ? Math.atan2(zml * y, x * z - lam * E) : Math.asinh(y * zml);
      t = (x - lam * z - d / y) / E;
    } else {
      t = tofX(x, 0, lam);
    }
    const delta = t - T;
    if (delta > 0) lo = x;
    else hi = x;
    let d1: number;
    let d2: number;
    let d3: number;
    if (dist < DERIV_BAND) {
      derivatives(x, t, 0, lam);
      d1 = D[0];
      d2 = D[1];
      d3 = D[2];
    } else {
      const umx2 = 1 - x * x;
      const z2 = z * z;
      const z3 = z2 * z;
      d1 = (3 * t * x - 2 + (2 * l3 * x) / z) / umx2;
      d2 = (3 * t + 5 * x * d1 + (2 * oml2 * l3) / z3) / umx2;
      d3 = (7 * x * d2 + 8 * d1 - (6 * oml2 * l2 * l3 * x) / (z3 * z2)) / umx2;
    }
    const d1s = d1 * d1;
    let xn = x - (delta * (d1s - (delta * d2) / 2)) / (d1 * (d1s - delta * d2) + (d3 * delta * delta) / 6);
    const scale = Math.abs(x) > 1 ? Math.abs(x) : 1;
    if (Math.abs(xn - x) <= tol * scale || delta === 0) {
      lastIter = it;
      XS[0] = Math.abs(xn - x) <= tol * scale ? xn : x;
      return true;
    }
    if (!(xn > lo && xn < hi)) {
      // Out of the bracket (or not a number): fall back to bisection.
      xn = hi === Infinity ? (x > lo ? x + 1 + Math.abs(x) : lo + 1 + Math.abs(lo)) : (lo + hi) / 2;
    }
    x = xn;
  }
  lastIter = maxIter;
  XS[0] = NaN;
  return false;
}

/** Largest feasible revolution count for the prepared geometry, at most `want`. */
function feasibleRevs(want: number): number {
  if (want <= 0) return 0;
  const lam = G[0];
  const T = G[1];
  let nmax = Math.floor(T / Math.PI);
  if (nmax > want) return want;
  if (nmax > 0) {
    const T0 = tofZero(lam) + nmax * Math.PI;
    if (T < T0) {
      const tm = tMin(nmax, lam);
      if (!(tm <= T)) nmax -= 1;
    }
  }
  return nmax;
}

/**
 * x of one multi-revolution branch (side −1 left, +1 right) for the prepared geometry; NaN
 * without convergence. Tries Izzo's guess first; if that lands on the wrong branch or fails,
 * solves again on the branch's own monotone bracket around x_min.
 */
function solveBranch(N: number, side: number, tol: number, maxIter: number): number {
  const lam = G[0];
  const T = G[1];
  let x0: number;
  if (side < 0) {
    const tmp = (((N + 1) * Math.PI) / (8 * T)) ** (2 / 3);
    x0 = (tmp - 1) / (tmp + 1);
  } else {
    const tmp = ((8 * T) / (N * Math.PI)) ** (2 / 3);
    x0 = (tmp - 1) / (tmp + 1);
  }
  let x = solveX(T, x0, N, lam, tol, maxIter, -1, 1, 0);
  const iters = lastIter;
  if (!Number.isNaN(x)) {
    // Right branch: T increases with x; left: decreases.
    dTdx(x, tofX(x, N, lam), lam);
    if (D[0] * side > 0) {
      lastIter = iters;
      return x;
    }
  }
  const tm = tMin(N, lam);
  const xm = lastXMin;
  if (!(tm <= T)) return NaN;
  const start = side < 0 ? (x0 < xm ? x0 : (xm - 1) / 2) : x0 > xm ? x0 : (xm + 1) / 2;
  x = side < 0 ? solveX(T, start, N, lam, tol, maxIter, -1, xm, -1) : solveX(T, start, N, lam, tol, maxIter, xm, 1, 1);
  lastIter += iters;
  return x;
}

// ---------------------------------------------------------------------------------------------
// Public API.

const Z_NORMAL = [0, 0, 1];

/** Fills IN for prepare from array inputs. */
function setInput(mu: number, r1: ArrayLike<number>, r2: ArrayLike<number>, tof: number, normal: ArrayLike<number>): void {
  IN[0] = mu;
  IN[1] = r1[0];
  IN[2] = r1[1];
  IN[3] = r1[2];
  IN[4] = r2[0];
  IN[5] = r2[1];
  IN[6] = r2[2];
  IN[7] = tof;
  IN[8] = normal[0];
  IN[9] = normal[1];
  IN[10] = normal[2];
}

/**
 * All solutions of Lambert's problem up to `options.revs` complete revolutions: the single
 * revolution first, then for each feasible revolution count its left and right branches.
 * Throws InputError for tof ≤ 0, coincident points, a zero radius or one past LAMBERT_MAX_RADIUS, non-finite input, μ ≤ 0, or
 * collinear points with no usable normal; throws SolverError('lambert', 'no-convergence' |
 * 'no-solution') when a solution does not converge or comes out non-finite. Never returns [].
 */
export function solveLambert(mu: number, r1: ArrayLike<number>, r2: ArrayLike<number>, tof: number, options: LambertOptions = {}): LambertSolution[] {
  requirePositive('mu', mu);
  requireFiniteVector('r1', r1);
  requireFiniteVector('r2', r2);
  requirePositive('tof', tof);
  const r1n = Math.hypot(r1[0], r1[1], r1[2]);
  const r2n = Math.hypot(r2[0], r2[1], r2[2]);
  if (!(r1n > 0)) throw new InputError('r1', 'must have a non-zero radius', r1);
  if (!(r2n > 0)) throw new InputError('r2', 'must have a non-zero radius', r2);
  if (!(r1n <= LAMBERT_MAX_RADIUS)) throw new InputError('r1', `is too large (|r1| = ${r1n.toExponential(3)} m; at most ${LAMBERT_MAX_RADIUS} m)`, r1);
  if (!(r2n <= LAMBERT_MAX_RADIUS)) throw new InputError('r2', `is too large (|r2| = ${r2n.toExponential(3)} m; at most ${LAMBERT_MAX_RADIUS} m)`, r2);
  const wantRevs = options.revs ?? 0;
  if (!Number.isInteger(wantRevs) || wantRevs < 0) throw new InputError('options.revs', 'must be a non-negative integer', wantRevs);
  const retrograde = options.retrograde ?? false;
  if (typeof retrograde !== 'boolean') throw new InputError('options.retrograde', 'must be a boolean', retrograde);
  const tol = options.tol ?? LAMBERT_DEFAULT_TOL;
  requirePositive('options.tol', tol);
  const maxIter = options.maxIter ?? LAMBERT_DEFAULT_MAX_ITER;
  if (!Number.isInteger(maxIter) || maxIter < 1) throw new InputError('options.maxIter', 'must be a positive integer', maxIter);
  let normal: ArrayLike<number> = Z_NORMAL;
  if (options.normalHint !== undefined) {
    requireFiniteVector('options.normalHint', options.normalHint);
    const h = options.normalHint;
    if (h[0] === 0 && h[1] === 0 && h[2] === 0) throw new InputError('options.normalHint', 'must not be the zero vector', h);
    normal = h;
  }

  setInput(mu, r1, r2, tof, normal);
  const status = prepare(retrograde);
  if (status === 2) throw new InputError('r2', 'must differ from r1 (coincident points)', r2);
  if (status === 1) {
    throw new InputError(
      'options.normalHint',
      options.normalHint === undefined
        ? 'required when r1 and r2 are collinear and r1 lies along the z axis'
        : 'must not be parallel to r1 when r1 and r2 are collinear',
      options.normalHint,
    );
  }

  const inputs = { mu, r1: Array.from(r1), r2: Array.from(r2), tof };
  const out: LambertSolution[] = [];
  const push = (x: number, revs: number, branch: LambertSolution['branch']): void => {
    if (Number.isNaN(x)) {
      throw new SolverError('lambert', 'no-convergence', `${branch} solution for ${revs} revolution(s) did not converge in ${maxIter} iterations`, {
        ...inputs,
        revs,
        branch,
      });
    }
    const v1 = new Float64Array(3);
    const v2 = new Float64Array(3);
    XS[0] = x;
    velocities(v1, 0, v2, 0);
    for (let i = 0; i < 3; i++) {
      if (!Number.isFinite(v1[i]) || !Number.isFinite(v2[i])) {
        throw new SolverError('lambert', 'no-solution', `${branch} solution for ${revs} revolution(s) is not finite`, { ...inputs, revs, branch, x });
      }
    }
    out.push({ revs, branch, v1, v2, iterations: lastIter, x });
  };

  solveSingle(tol, maxIter);
  push(XS[0], 0, 'single');
  const nmax = feasibleRevs(wantRevs);
  for (let n = 1; n <= nmax; n++) {
    push(solveBranch(n, -1, tol, maxIter), n, 'left');
    push(solveBranch(n, 1, tol, maxIter), n, 'right');
  }
  return out;
}

/**
 * Allocation-free single-revolution Lambert for hot loops (porkchop grids): writes v1 into out1
 * and v2 into out2 (3 components each) and returns the iterations used, or −1 if the input is
 * degenerate or the solve fails (no throw, no allocation). Reference normal +z.
 */
export function lambertSingleRev(
  mu: number,
  r1x: number,
  r1y: number,
  r1z: number,
  r2x: number,
  r2y: number,
  r2z: number,
  tof: number,
  retrograde: boolean,
  out1: Float64Array,
  out2: Float64Array,
): number {
  // Small enough to be inlined into the caller's loop, so its numbers reach IN unboxed.
  IN[0] = mu;
  IN[1] = r1x;
  IN[2] = r1y;
  IN[3] = r1z;
  IN[4] = r2x;
  IN[5] = r2y;
  IN[6] = r2z;
  IN[7] = tof;
  return singleRevFromInput(retrograde, out1, out2);
}

/** lambertSingleRev on the problem in IN[0..7] (reference normal +z). */
function singleRevFromInput(retrograde: boolean, out1: Float64Array, out2: Float64Array): number {
  const mu = IN[0];
  const tof = IN[7];
  if (!(mu > 0) || !(tof > 0) || !(tof < Infinity) || !(mu < Infinity)) return -1;
  const r1s = IN[1] * IN[1] + IN[2] * IN[2] + IN[3] * IN[3];
  const r2s = IN[4] * IN[4] + IN[5] * IN[5] + IN[6] * IN[6];
  if (!(r1s > 0 && r1s < Infinity && r2s > 0 && r2s < Infinity)) return -1;
  IN[8] = 0;
  IN[9] = 0;
  IN[10] = 1;
  if (prepare(retrograde) !== 0) return -1;
  if (!solveSingle(LAMBERT_DEFAULT_TOL, LAMBERT_DEFAULT_MAX_ITER)) return -1;
  velocities(out1, 0, out2, 0);
  if (!(Math.abs(out1[0] + out1[1] + out1[2] + out2[0] + out2[1] + out2[2]) < Infinity)) return -1;
  return lastIter;
}

/**
 * Allocation-free multi-revolution Lambert: every solution up to `maxRevs` revolutions, in the
 * order single, then (left, right) per revolution count. Solution k's velocities go to
 * outV1/outV2[3k .. 3k+2] (each sized ≥ 3·(2·maxRevs + 1)), its revolution count to outRevs[k]
 * and, if given, its branch to outBranch[k] (0 single, 1 left, 2 right). Returns the count of
 * solutions written, or −1 on degenerate input or a failed single-revolution solve; a
 * multi-revolution branch that fails is left out. Reference normal +z.
 */
export function lambertAll(
  mu: number,
  r1: ArrayLike<number>,
  r2: ArrayLike<number>,
  tof: number,
  maxRevs: number,
  retrograde: boolean,
  outV1: Float64Array,
  outV2: Float64Array,
  outRevs: Int32Array,
  outBranch?: Uint8Array,
): number {
  if (!(mu > 0) || !(tof > 0) || !(tof < Infinity) || !(mu < Infinity) || !(maxRevs >= 0)) return -1;
  const r1s = r1[0] * r1[0] + r1[1] * r1[1] + r1[2] * r1[2];
  const r2s = r2[0] * r2[0] + r2[1] * r2[1] + r2[2] * r2[2];
  if (!(r1s > 0 && r1s < Infinity && r2s > 0 && r2s < Infinity)) return -1;
  setInput(mu, r1, r2, tof, Z_NORMAL);
  if (prepare(retrograde) !== 0) return -1;
  if (!solveSingle(LAMBERT_DEFAULT_TOL, LAMBERT_DEFAULT_MAX_ITER)) return -1;
  velocities(outV1, 0, outV2, 0);
  outRevs[0] = 0;
  if (outBranch) outBranch[0] = 0;
  let k = 1;
  const nmax = feasibleRevs(Math.floor(maxRevs));
  for (let n = 1; n <= nmax; n++) {
    for (let side = -1; side <= 1; side += 2) {
      const xb = solveBranch(n, side, LAMBERT_DEFAULT_TOL, LAMBERT_DEFAULT_MAX_ITER);
      if (Number.isNaN(xb)) continue;
      XS[0] = xb;
      velocities(outV1, 3 * k, outV2, 3 * k);
      outRevs[k] = n;
      if (outBranch) outBranch[k] = side < 0 ? 1 : 2;
      k++;
    }
  }
  return k;
}

/** Cost of one solution from its terminal velocities (e.g. departure plus arrival Δv). */
export type LambertCost = (v1x: number, v1y: number, v1z: number, v2x: number, v2y: number, v2z: number) => number;

const bestV1 = new Float64Array(3);
const bestV2 = new Float64Array(3);

/**
 * Allocation-free search for the cheapest solution up to `maxRevs` revolutions under `cost`.
 * Writes its velocities into out1/out2 and returns its code: 0 single revolution, 2N − 1 the
 * left branch of N revolutions, 2N the right branch (decode with lambertCodeRevs /
 * lambertCodeBranch); −1 if nothing solved or every cost was non-finite.
 */
export function lambertBest(
  mu: number,
  r1: ArrayLike<number>,
  r2: ArrayLike<number>,
  tof: number,
  maxRevs: number,
  retrograde: boolean,
  cost: LambertCost,
  out1: Float64Array,
  out2: Float64Array,
): number {
  if (!(mu > 0) || !(tof > 0) || !(tof < Infinity) || !(mu < Infinity) || !(maxRevs >= 0)) return -1;
  const r1s = r1[0] * r1[0] + r1[1] * r1[1] + r1[2] * r1[2];
  const r2s = r2[0] * r2[0] + r2[1] * r2[1] + r2[2] * r2[2];
  if (!(r1s > 0 && r1s < Infinity && r2s > 0 && r2s < Infinity)) return -1;
  setInput(mu, r1, r2, tof, Z_NORMAL);
  if (prepare(retrograde) !== 0) return -1;
  let bestCode = -1;
  let bestCost = Infinity;
  if (solveSingle(LAMBERT_DEFAULT_TOL, LAMBERT_DEFAULT_MAX_ITER)) {
    velocities(bestV1, 0, bestV2, 0);
    const c = cost(bestV1[0], bestV1[1], bestV1[2], bestV2[0], bestV2[1], bestV2[2]);
    if (c < bestCost) {
      bestCost = c;
      bestCode = 0;
      out1[0] = bestV1[0];
      out1[1] = bestV1[1];
      out1[2] = bestV1[2];
      out2[0] = bestV2[0];
      out2[1] = bestV2[1];
      out2[2] = bestV2[2];
    }
  }
  const nmax = feasibleRevs(Math.floor(maxRevs));
  for (let n = 1; n <= nmax; n++) {
    for (let side = -1; side <= 1; side += 2) {
      const xb = solveBranch(n, side, LAMBERT_DEFAULT_TOL, LAMBERT_DEFAULT_MAX_ITER);
      if (Number.isNaN(xb)) continue;
      XS[0] = xb;
      velocities(bestV1, 0, bestV2, 0);
      const c = cost(bestV1[0], bestV1[1], bestV1[2], bestV2[0], bestV2[1], bestV2[2]);
      if (c < bestCost) {
        bestCost = c;
        bestCode = side < 0 ? 2 * n - 1 : 2 * n;
        out1[0] = bestV1[0];
        out1[1] = bestV1[1];
        out1[2] = bestV1[2];
        out2[0] = bestV2[0];
        out2[1] = bestV2[1];
        out2[2] = bestV2[2];
      }
    }
  }
  return bestCode;
}

/** Revolution count of a lambertBest code. */
export function lambertCodeRevs(code: number): number {
  return (code + 1) >> 1;
}

/** Branch of a lambertBest code. */
export function lambertCodeBranch(code: number): LambertSolution['branch'] {
  return code === 0 ? 'single' : code % 2 === 1 ? 'left' : 'right';
}
