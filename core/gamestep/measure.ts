/**
 * Error measures of the game-step check: the specific orbital energy and the scale of its
 * relative error, and differences of states in the radial-transverse-normal (RTN) frame
 * of the reference state.
 */

/** Scale of the relative energy error: |ε_ref|, but at least 1e-6·μ/r (near-parabolic orbits). */
export function energyScale(er: number, r: Float64Array, B: Float64Array, mu: number): number {
  return Math.max(Math.abs(er), (1e-6 * mu) / Math.hypot(r[0] - B[0], r[1] - B[1], r[2] - B[2]));
}

// Specific orbital energy of state s (abs) about the body of abs state B and μ.
export function energyOf(s: Float64Array, B: Float64Array, mu: number): number {
  const rx = s[0] - B[0], ry = s[1] - B[1], rz = s[2] - B[2];
  const vx = s[3] - B[3], vy = s[4] - B[4], vz = s[5] - B[5];
  return 0.5 * (vx * vx + vy * vy + vz * vz) - mu / Math.hypot(rx, ry, rz);
}

// Unit radial, transverse, normal vectors of state r (abs) about body B (abs), into u (9).
function rtnBasis(r: ArrayLike<number>, B: ArrayLike<number>, u: number[]): void {
  const x = r[0] - B[0], y = r[1] - B[1], z = r[2] - B[2];
  const vx = r[3] - B[3], vy = r[4] - B[4], vz = r[5] - B[5];
  const rn = Math.hypot(x, y, z) || 1;
  let hx = y * vz - z * vy, hy = z * vx - x * vz, hz = x * vy - y * vx;
  const hn = Math.hypot(hx, hy, hz) || 1;
  hx /= hn;
  hy /= hn;
  hz /= hn;
  u[0] = x / rn;
  u[1] = y / rn;
  u[2] = z / rn;
  u[3] = hy * u[2] - hz * u[1];
  u[4] = hz * u[0] - hx * u[2];
  u[5] = hx * u[1] - hy * u[0];
  u[6] = hx;
  u[7] = hy;
  u[8] = hz;
}

const basis9 = [0, 0, 0, 0, 0, 0, 0, 0, 0];

/** RTN components of the difference g − r (position, velocity) in r's frame about B, into out (6). */
export function toRtn(r: ArrayLike<number>, B: ArrayLike<number>, g: ArrayLike<number>, out: number[]): void {
  rtnBasis(r, B, basis9);
  const u = basis9;
  for (let k = 0; k < 2; k++) {
    const dx = g[3 * k] - r[3 * k], dy = g[3 * k + 1] - r[3 * k + 1], dz = g[3 * k + 2] - r[3 * k + 2];
    for (let j = 0; j < 3; j++) out[3 * k + j] = u[3 * j] * dx + u[3 * j + 1] * dy + u[3 * j + 2] * dz;
  }
}

/** Adds RTN components d (6) in r's frame about B to state out (6). */
export function fromRtn(r: ArrayLike<number>, B: ArrayLike<number>, d: ArrayLike<number>, out: Float64Array): void {
  rtnBasis(r, B, basis9);
  const u = basis9;
  for (let k = 0; k < 2; k++) {
    for (let c = 0; c < 3; c++) out[3 * k + c] += u[c] * d[3 * k] + u[3 + c] * d[3 * k + 1] + u[6 + c] * d[3 * k + 2];
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
