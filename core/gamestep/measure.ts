/**
 * Error measures of the game-step check: the specific orbital energy and the scale of its
 * relative error, and differences of states in the radial-transverse-normal (RTN) frame
 * of the reference state.
 */
import { InputError, rtnMatrix } from '../math/index.ts';

/** Scale of the relative energy error: |ε_ref|, but at least 1e-6·μ/r (near-parabolic orbits). */
export function energyScale(er: number, r: Float64Array, B: Float64Array, mu: number): number {
  return Math.max(Math.abs(er), (1e-6 * mu) / Math.hypot(r[0] - B[0], r[1] - B[1], r[2] - B[2]));
}

// Specific orbital energy of state s (abs) about the body of abs state B and μ.
export function energyOf(s: Float64Array, B: Float64Array, mu: number): number {
  const rx = s[0] - B[0],
    ry = s[1] - B[1],
    rz = s[2] - B[2];
  const vx = s[3] - B[3],
    vy = s[4] - B[4],
    vz = s[5] - B[5];
  return 0.5 * (vx * vx + vy * vy + vz * vz) - mu / Math.hypot(rx, ry, rz);
}

// RTN → inertial matrix (core/math/frames.ts, rows x, y, z; columns R, T, N) of state r (abs)
// about body B (abs), into m. A rectilinear state (r ∥ v: no orbital plane) keeps only its
// radial axis: T and N are zero, so the difference shows as its radial part alone.
const rel = new Float64Array(6);
function rtnBasis(r: ArrayLike<number>, B: ArrayLike<number>, m: Float64Array): void {
  for (let i = 0; i < 6; i++) rel[i] = r[i] - B[i];
  try {
    rtnMatrix(rel.subarray(0, 3), rel.subarray(3, 6), m);
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    const rn = Math.hypot(rel[0], rel[1], rel[2]) || 1;
    m.fill(0);
    m[0] = rel[0] / rn;
    m[3] = rel[1] / rn;
    m[6] = rel[2] / rn;
  }
}

const basis9 = new Float64Array(9);

/** RTN components of the difference g − r (position, velocity) in r's frame about B, into out (6). */
export function toRtn(r: ArrayLike<number>, B: ArrayLike<number>, g: ArrayLike<number>, out: number[]): void {
  rtnBasis(r, B, basis9);
  const u = basis9;
  for (let k = 0; k < 2; k++) {
    const dx = g[3 * k] - r[3 * k],
      dy = g[3 * k + 1] - r[3 * k + 1],
      dz = g[3 * k + 2] - r[3 * k + 2];
    for (let j = 0; j < 3; j++) out[3 * k + j] = u[j] * dx + u[3 + j] * dy + u[6 + j] * dz;
  }
}

/** Adds RTN components d (6) in r's frame about B to state out (6). */
export function fromRtn(r: ArrayLike<number>, B: ArrayLike<number>, d: ArrayLike<number>, out: Float64Array): void {
  rtnBasis(r, B, basis9);
  const u = basis9;
  for (let k = 0; k < 2; k++) {
    for (let c = 0; c < 3; c++) out[3 * k + c] += u[3 * c] * d[3 * k] + u[3 * c + 1] * d[3 * k + 1] + u[3 * c + 2] * d[3 * k + 2];
  }
}

export function norm3(v: ArrayLike<number>, o: number): number {
  return Math.hypot(v[o], v[o + 1], v[o + 2]);
}

// |position part| of the vectors at `times`, linearly interpolated at t (0 at t0).
export function interpolateNorm(times: number[], v: number[][], t: number, t0: number): number {
  let tPrev = t0;
  let ePrev = 0;
  for (let i = 0; i < times.length; i++) {
    const e = norm3(v[i], 0);
    if (times[i] >= t) return ePrev + ((e - ePrev) * (t - tPrev)) / Math.max(times[i] - tPrev, 1e-300);
    tPrev = times[i];
    ePrev = e;
  }
  return ePrev;
}
