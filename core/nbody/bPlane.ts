/**
 * B-plane coordinates of an osculating hyperbola: B·T and B·R on the hyperbola's own T, R axes
 * or on given ones (T = Ŝ × k̂ normalised, R = Ŝ × T, Ŝ the incoming asymptote; Vallado,
 * Fundamentals of Astrodynamics and Applications, 4th ed., §12.4 "B-plane targeting", from
 * memory). Used by the n-body arrival comparison (arrival.ts).
 */
import type { ConicInfo } from '../conic/index.ts';
import type { Vec3Tuple } from '../dynamics/index.ts';

/** B-plane coordinates of an osculating hyperbola (Vallado §12.4, from memory). */
export interface BPlane {
  /** B·T and B·R, m, on the axes given (or the hyperbola's own). */
  bt: number;
  br: number;
  /** |B|, m. */
  b: number;
}

/** Incoming asymptote Ŝ and the T, R axes of a hyperbola (e > 1), or null for a closed orbit. */
export function bPlaneAxes(info: ConicInfo): { S: Vec3Tuple; T: Vec3Tuple; R: Vec3Tuple } | null {
  if (!(info.e > 1)) return null;
  const e = info.e;
  const c = 1 / e;
  const s = Math.sqrt(e * e - 1) / e;
  const S: Vec3Tuple = [c * info.P[0] + s * info.Q[0], c * info.P[1] + s * info.Q[1], c * info.P[2] + s * info.Q[2]];
  // T = Ŝ × k̂ normalised (in the reference plane), R = Ŝ × T
  let tx = S[1],
    ty = -S[0];
  const tn = Math.hypot(tx, ty);
  if (!(tn > 1e-12)) return null;
  tx /= tn;
  ty /= tn;
  const T: Vec3Tuple = [tx, ty, 0];
  const R: Vec3Tuple = [S[1] * 0 - S[2] * ty, S[2] * tx - S[0] * 0, S[0] * ty - S[1] * tx];
  return { S, T, R };
}

/** B vector Ŝ × h / v∞ of a hyperbola, projected on the axes T, R; null for a closed orbit. */
export function bPlane(info: ConicInfo, axes: { T: Vec3Tuple; R: Vec3Tuple } | null): BPlane | null {
  const own = bPlaneAxes(info);
  if (!own) return null;
  const ax = axes ?? own;
  const S = own.S;
  const vinf = Math.sqrt(-info.mu * info.alpha);
  const Bx = (S[1] * info.hz - S[2] * info.hy) / vinf;
  const By = (S[2] * info.hx - S[0] * info.hz) / vinf;
  const Bz = (S[0] * info.hy - S[1] * info.hx) / vinf;
  return {
    bt: Bx * ax.T[0] + By * ax.T[1] + Bz * ax.T[2],
    br: Bx * ax.R[0] + By * ax.R[1] + Bz * ax.R[2],
    b: Math.hypot(Bx, By, Bz),
  };
}
