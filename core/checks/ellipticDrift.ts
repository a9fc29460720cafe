/**
 * Kepler drift of one bound body for the Wisdom–Holman map's inner loop: Lagrange coefficients
 * in the change of eccentric anomaly x (Murray & Dermott, Solar System Dynamics, eqs. 2.71;
 * Danby, Fundamentals of Celestial Mechanics, 2nd ed., §6.9):
 *   ΔM = n·dt = x − e·cosE0·sin x + e·sinE0·(1 − cos x),
 * solved by Halley's method (cubic convergence; Danby & Burkardt, "The solution of Kepler's
 * equation. I", Celest. Mech. 31 (1983) 95), cheaply:
 * - the first guess is the body's x from its previous drift of the same dt (x changes by about
 *   e·(n·dt)² from one step to the next, so two iterations settle it), or ΔM;
 * - sin x and cos x come from their Taylor polynomials about 0 when |x| ≤ 1 (degrees 21 and 22:
 *   truncation ≤ 1/23! ≈ 4e-23, below a double's rounding; the usual drift of a Wisdom–Holman
 *   step is 2π/20 … 2π/10), Math.sin/Math.cos otherwise;
 * - the iteration stops once its next correction is below rounding: the error after a step of
 *   size |dx| is about K·|dx|³ with K ≤ e²/(4F′²) + e/(6F′) (|F″|, |F‴| ≤ e), and the last
 *   correction's own sin/cos come from the fourth-order rotation through −dx (|dx| ≤ 1e-3:
 *   exact to dx⁵/120 ≤ 8e-18).
 * sin and cos are evaluated afresh at every x, never from a kept reference angle: a reference's
 * fixed rounding would enter every step with the same sign and make the energy drift linearly
 * (seen: 1e-16 per step).
 * Each body keeps DRIFT_SLOTS numbers in `memo` (previous x and its dt), made by `driftMemo`.
 * Returns false (nothing written) when the fast path does not apply: unbound, |ΔM| > π, or
 * the iteration not settled in DRIFT_ITERATIONS_MAX iterations; the caller then uses the
 * universal-variable solver.
 */

/** Numbers kept per body in memo. */
export const DRIFT_SLOTS = 2;
/** Halley iterations before giving up to the universal-variable solver. */
const DRIFT_ITERATIONS_MAX = 12;
/** Stop: the estimated error left after the last correction (rad; a double near 0.3 rad has a spacing of 5.6e-17). */
const DRIFT_TOL = 1e-17;
/** Largest last correction whose sin/cos the fourth-order rotation gives to rounding (rad). */
const DRIFT_LAST_STEP = 1e-3;
/** Largest |x| for the Taylor polynomials (rad). */
const DRIFT_TAYLOR_SPAN = 1;

// 1/((2k)(2k+1)) and 1/((2k−1)(2k)), k = 1, 2, …: the nested (Horner) Taylor forms of sin and cos
const S1 = 1 / 6,
  S2 = 1 / 20,
  S3 = 1 / 42,
  S4 = 1 / 72,
  S5 = 1 / 110,
  S6 = 1 / 156,
  S7 = 1 / 210,
  S8 = 1 / 272,
  S9 = 1 / 342,
  S10 = 1 / 420;
const C1 = 1 / 2,
  C2 = 1 / 12,
  C3 = 1 / 30,
  C4 = 1 / 56,
  C5 = 1 / 90,
  C6 = 1 / 132,
  C7 = 1 / 182,
  C8 = 1 / 240,
  C9 = 1 / 306,
  C10 = 1 / 380,
  C11 = 1 / 462;

/** Memo for n bodies: no previous drift. */
export function driftMemo(n: number): Float64Array {
  const memo = new Float64Array(DRIFT_SLOTS * n);
  for (let k = 0; k < n; k++) memo[DRIFT_SLOTS * k + 1] = Number.NaN;
  return memo;
}

/**
 * Drifts the body whose relative position and velocity are x[b … b+2], v[b … b+2] for dt on
 * the Kepler orbit of gravitational parameter mu, in place; its memo slots start at s.
 */
export function ellipticDrift(mu: number, dt: number, x: Float64Array, v: Float64Array, b: number, memo: Float64Array, s: number): boolean {
  const x0 = x[b],
    y0 = x[b + 1],
    z0 = x[b + 2];
  const vx0 = v[b],
    vy0 = v[b + 1],
    vz0 = v[b + 2];
  const r0 = Math.sqrt(x0 * x0 + y0 * y0 + z0 * z0);
  const v2 = vx0 * vx0 + vy0 * vy0 + vz0 * vz0;
  const sigma = x0 * vx0 + y0 * vy0 + z0 * vz0;
  const ia = 2 / r0 - v2 / mu;
  if (!(ia > 0)) return false;
  const n = Math.sqrt(mu * ia * ia * ia);
  const dM = n * dt;
  if (!(Math.abs(dM) <= Math.PI)) return false;
  const ec = 1 - r0 * ia; // e·cos E0
  const es = (sigma * ia * ia) / n; // e·sin E0 (σ/(n a²))
  const e = Math.sqrt(ec * ec + es * es);
  let q = memo[s + 1] === dt ? memo[s] : dM;
  let sq = 0,
    cq = 1;
  let ok = false;
  for (let it = 0; it < DRIFT_ITERATIONS_MAX; it++) {
    if (Math.abs(q) <= DRIFT_TAYLOR_SPAN) {
      const q2 = q * q;
      sq =
        q *
        (1 -
          q2 *
            S1 *
            (1 - q2 * S2 * (1 - q2 * S3 * (1 - q2 * S4 * (1 - q2 * S5 * (1 - q2 * S6 * (1 - q2 * S7 * (1 - q2 * S8 * (1 - q2 * S9 * (1 - q2 * S10))))))))));
      cq =
        1 -
        q2 *
          C1 *
          (1 -
            q2 *
              C2 *
              (1 - q2 * C3 * (1 - q2 * C4 * (1 - q2 * C5 * (1 - q2 * C6 * (1 - q2 * C7 * (1 - q2 * C8 * (1 - q2 * C9 * (1 - q2 * C10 * (1 - q2 * C11))))))))));
    } else if (Number.isFinite(q)) {
      sq = Math.sin(q);
      cq = Math.cos(q);
    } else {
      return false;
    }
    const F = q - ec * sq + es * (1 - cq) - dM;
    const dF = 1 - ec * cq + es * sq;
    const ddF = ec * sq + es * cq;
    const dq = F / (dF - (0.5 * F * ddF) / dF);
    q -= dq;
    // Halley's error after a step dq is about K·|dq|³, K = F″²/(4F′²) − F‴/(6F′) ≤ e²/(4F′²) + e/(6F′)
    const ed = e / dF;
    const dq2 = dq * dq;
    if (Math.abs(dq) <= DRIFT_LAST_STEP && (0.25 * ed * ed + ed / 6) * dq2 * Math.abs(dq) <= DRIFT_TOL) {
      // sin and cos of the corrected q: a rotation through −dq, Taylor to dq⁴
      const c1 = 1 - 0.5 * dq2 * (1 - dq2 * C2);
      const s1 = dq * (1 - dq2 * S1);
      const sn = sq * c1 - cq * s1;
      cq = cq * c1 + sq * s1;
      sq = sn;
      ok = true;
      break;
    }
  }
  if (!ok) return false;
  memo[s] = q;
  memo[s + 1] = dt;
  const a = 1 / ia;
  const r = a * (1 - ec * cq + es * sq);
  const f = 1 + (a * (cq - 1)) / r0;
  // g = t − (x − sin x)/n at the time t = (x − ec·sin x + es·(1 − cos x))/n that x belongs to
  // (dt to within the stop tolerance): the drift stays exactly on the orbit whatever is left of
  // the iteration's error, which would otherwise bias the energy by the same sign every step
  const g = (sq * (1 - ec) + es * (1 - cq)) / n;
  const fd = (-a * a * n * sq) / (r * r0);
  const gd = 1 + (a * (cq - 1)) / r;
  x[b] = f * x0 + g * vx0;
  x[b + 1] = f * y0 + g * vy0;
  x[b + 2] = f * z0 + g * vz0;
  v[b] = fd * x0 + gd * vx0;
  v[b + 1] = fd * y0 + gd * vy0;
  v[b + 2] = fd * z0 + gd * vz0;
  return true;
}
