/**
 * Burn components in the plan's frames ↔ inertial axes, at the ship's state (r, v) relative to
 * its central body. Frame definitions are those of core/math/frames.ts (Vallado, Fundamentals
 * of Astrodynamics and Applications, 4th ed., §3.3):
 * - 'vnb': [along velocity, along orbit normal, binormal V×N];
 * - 'rtn': [radial, transverse, normal];
 * - 'inertial': the system's axes, components used as written.
 * Both local frames need r and v non-zero and not parallel; otherwise InputError (from frames.ts).
 * Allocation-free when `out` is given; `out` may alias the input vector.
 */
import { inertialToRtn, inertialToVnb, rtnToInertial, vnbToInertial } from '../math/index.ts';
import { InputError } from '../math/index.ts';
import type { Vec3, Vec3Like } from '../math/index.ts';
import type { BurnFrame } from './plan.ts';

/** Inertial vector of burn components given in `frame` at state (r, v). */
export function burnToInertial(frame: BurnFrame, r: Vec3Like, v: Vec3Like, local: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  switch (frame) {
    case 'vnb':
      return vnbToInertial(r, v, local, out);
    case 'rtn':
      return rtnToInertial(r, v, local, out);
    case 'inertial':
      out[0] = local[0];
      out[1] = local[1];
      out[2] = local[2];
      return out;
    default:
      throw new InputError('frame', "must be 'vnb', 'rtn' or 'inertial'", frame);
  }
}

/** Components in `frame` of an inertial vector at state (r, v). */
export function inertialToBurn(frame: BurnFrame, r: Vec3Like, v: Vec3Like, vec: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  switch (frame) {
    case 'vnb':
      return inertialToVnb(r, v, vec, out);
    case 'rtn':
      return inertialToRtn(r, v, vec, out);
    case 'inertial':
      out[0] = vec[0];
      out[1] = vec[1];
      out[2] = vec[2];
      return out;
    default:
      throw new InputError('frame', "must be 'vnb', 'rtn' or 'inertial'", frame);
  }
}
