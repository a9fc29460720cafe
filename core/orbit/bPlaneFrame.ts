/**
 * The B-plane axes of an incoming asymptote Ŝ: T = Ŝ × ẑ normalised (x̂ when Ŝ is along ±ẑ), R = Ŝ × T
 * (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., §12.4 — from memory; the
 * convention of core/nbody/bPlane.ts; used by the flyby geometry here and the flyby aim and report
 * in core/conic). Writes [Tx, Ty, Tz, Rx, Ry, Rz] into `out`.
 */
export function bPlaneFrame(Sx: number, Sy: number, Sz: number, out: Float64Array): Float64Array {
  let Tx = Sy,
    Ty = -Sx,
    Tz = 0;
  const tn = Math.hypot(Tx, Ty);
  if (tn > 1e-12) {
    Tx /= tn;
    Ty /= tn;
  } else {
    Tx = 1;
    Ty = 0;
    Tz = 0;
  }
  out[0] = Tx;
  out[1] = Ty;
  out[2] = Tz;
  out[3] = Sy * Tz - Sz * Ty;
  out[4] = Sz * Tx - Sx * Tz;
  out[5] = Sx * Ty - Sy * Tx;
  return out;
}
