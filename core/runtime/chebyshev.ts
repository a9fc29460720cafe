/**
 * A Chebyshev series of a 3-vector function of time on one interval [a, b]: the fit from values
 * at the Chebyshev nodes, and the evaluation of the value (position) and of the derivative series
 * (velocity), allocation-free.
 *
 * Fit (Press, Teukolsky, Vetterling & Flannery, Numerical Recipes, 3rd ed., §5.8, from memory):
 * with s = 2(t − a)/(b − a) − 1 in [−1, 1] and the N + 1 nodes s_k = cos(π(k + ½)/(N + 1)),
 * k = 0..N (the zeros of T_{N+1}),
 *   c_j = (2/(N + 1)) Σ_k f(t(s_k)) cos(π j (k + ½)/(N + 1)),   j = 0..N,
 * with c_0 stored halved, so f(t) ≈ Σ_{j=0..N} c_j T_j(s): the polynomial of degree N that
 * interpolates f at the nodes. Its error is close to the first dropped term c_{N+1} T_{N+1}(s),
 * largest at the extremes of T_{N+1}, s = cos(π m/(N + 1)), m = 0..N+1 (see `CHECK_POINTS`).
 *
 * Value by Clenshaw's recurrence (NR §5.8): b_{N+1} = b_{N+2} = 0,
 *   b_j = 2s b_{j+1} − b_{j+2} + c_j (j = N..1),  f = s b_1 − b_2 + c_0.
 * Derivative: dT_j/ds = j U_{j−1}(s), so df/ds = Σ_{m=0..N−1} (m + 1) c_{m+1} U_m(s), summed by
 * Clenshaw over U (U_0 = 1, U_1 = 2s, U_{m+1} = 2s U_m − U_{m−1}):
 *   d_m = (m + 1) c_{m+1} + 2s d_{m+1} − d_{m+2},  df/ds = d_0;  df/dt = df/ds · 2/(b − a).
 * Position with velocity from the derivative of the same series, in fixed-length pieces per body,
 * is how the planetary ephemerides are distributed (Newhall, "Numerical representation of
 * planetary ephemerides", Celestial Mechanics 45, 1989, from memory).
 *
 * Coefficient layout of one piece: [x_0..x_N, y_0..y_N, z_0..z_N] from `offset` in a Float64Array.
 * The standalone reader (reader.ts) repeats the two evaluations operation for operation, so it
 * gives the very same doubles.
 */
import { InputError } from '../math/index.ts';

/** Highest degree accepted (far above what an ephemeris needs: beyond it the nodes add roundoff, not accuracy). */
export const MAX_DEGREE = 40;

/** A 3-vector function of time: writes [x, y, z, …] (position first, m) at time t (s) into out6. */
export type VectorSource = (t: number, out6: Float64Array) => void;

/** Checks a degree: an integer in [1, MAX_DEGREE]. */
export function requireDegree(field: string, degree: number): number {
  if (!(Number.isInteger(degree) && degree >= 1 && degree <= MAX_DEGREE)) throw new InputError(field, `must be an integer in [1, ${MAX_DEGREE}]`, degree);
  return degree;
}

// Function values at the nodes, x, y, z interleaved, and the source's output (module scratch).
const values = new Float64Array(3 * (MAX_DEGREE + 1));
const state = new Float64Array(6);

/**
 * Fits the position [x, y, z] of `f` on [a, b] with a Chebyshev series of degree `degree`:
 * writes the 3(degree + 1) coefficients into `out` from `offset`. f is called at the degree + 1
 * nodes only (inside (a, b)). Throws InputError when f gives a non-finite position.
 */
export function fitChebyshev3(f: VectorSource, a: number, b: number, degree: number, out: Float64Array, offset = 0): Float64Array {
  const n = degree + 1;
  const half = 0.5 * (b - a);
  const mid = a + half;
  for (let k = 0; k < n; k++) {
    const t = mid + half * Math.cos((Math.PI * (k + 0.5)) / n);
    f(t, state);
    for (let c = 0; c < 3; c++) {
      const v = state[c];
      if (!Number.isFinite(v)) throw new InputError('source', `must give a finite position (component ${c} at t = ${t})`, v);
      values[3 * k + c] = v;
    }
  }
  const scale = 2 / n;
  for (let j = 0; j < n; j++) {
    let sx = 0;
    let sy = 0;
    let sz = 0;
    for (let k = 0; k < n; k++) {
      // cos(π j (2k + 1)/(2n)) with the integer j(2k + 1) reduced mod 4n first, so the argument
      // stays in [0, 2π) and the cosine keeps full accuracy whatever the degree
      const w = Math.cos((Math.PI * ((j * (2 * k + 1)) % (4 * n))) / (2 * n));
      sx += values[3 * k] * w;
      sy += values[3 * k + 1] * w;
      sz += values[3 * k + 2] * w;
    }
    const g = j === 0 ? 0.5 * scale : scale;
    out[offset + j] = g * sx;
    out[offset + n + j] = g * sy;
    out[offset + 2 * n + j] = g * sz;
  }
  return out;
}

/** Value of the series of one piece at t (Clenshaw): position [x, y, z] into out3. */
export function chebyshevPosition(
  coef: ArrayLike<number>,
  offset: number,
  degree: number,
  a: number,
  b: number,
  t: number,
  out3: Float64Array | number[],
): Float64Array | number[] {
  const n = degree + 1;
  const ox = offset;
  const oy = offset + n;
  const oz = offset + 2 * n;
  const s = (2 * (t - a)) / (b - a) - 1;
  const s2 = 2 * s;
  // the three axes' recurrences side by side: independent chains the processor overlaps
  let x1 = 0;
  let x2 = 0;
  let y1 = 0;
  let y2 = 0;
  let z1 = 0;
  let z2 = 0;
  for (let j = degree; j >= 1; j--) {
    const x0 = s2 * x1 - x2 + coef[ox + j];
    const y0 = s2 * y1 - y2 + coef[oy + j];
    const z0 = s2 * z1 - z2 + coef[oz + j];
    x2 = x1;
    x1 = x0;
    y2 = y1;
    y1 = y0;
    z2 = z1;
    z1 = z0;
  }
  out3[0] = s * x1 - x2 + coef[ox];
  out3[1] = s * y1 - y2 + coef[oy];
  out3[2] = s * z1 - z2 + coef[oz];
  return out3;
}

/** Derivative of the series of one piece at t (Clenshaw over U): velocity [vx, vy, vz] (per second) into out3. */
export function chebyshevVelocity(
  coef: ArrayLike<number>,
  offset: number,
  degree: number,
  a: number,
  b: number,
  t: number,
  out3: Float64Array | number[],
): Float64Array | number[] {
  const n = degree + 1;
  const ox = offset;
  const oy = offset + n;
  const oz = offset + 2 * n;
  const s = (2 * (t - a)) / (b - a) - 1;
  const s2 = 2 * s;
  const dsdt = 2 / (b - a);
  let x1 = 0;
  let x2 = 0;
  let y1 = 0;
  let y2 = 0;
  let z1 = 0;
  let z2 = 0;
  for (let m = degree - 1; m >= 0; m--) {
    const w = m + 1;
    const x0 = w * coef[ox + w] + s2 * x1 - x2;
    const y0 = w * coef[oy + w] + s2 * y1 - y2;
    const z0 = w * coef[oz + w] + s2 * z1 - z2;
    x2 = x1;
    x1 = x0;
    y2 = y1;
    y1 = y0;
    z2 = z1;
    z1 = z0;
  }
  out3[0] = x1 * dsdt;
  out3[1] = y1 * dsdt;
  out3[2] = z1 * dsdt;
  return out3;
}

/**
 * Points s in [−1, 1] where a piece's error is measured: the extremes of T_{N+1},
 * cos(π m/(N + 1)) for m = 0..N+1 (both ends included; they lie between the fit's nodes, where the
 * interpolation error peaks), and the midpoints (in angle) between them: 2N + 3 points.
 */
export function checkPoints(degree: number): Float64Array {
  const n = degree + 1;
  const out = new Float64Array(2 * n + 1);
  for (let m = 0; m <= 2 * n; m++) out[m] = Math.cos((Math.PI * m) / (2 * n));
  return out;
}
