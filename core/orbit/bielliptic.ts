/**
 * Bi-elliptic transfer between circular coplanar orbits: a first ellipse from r1 out to rb, a
 * burn at rb onto a second ellipse from rb to r2, and a circularising burn at r2 (vis-viva;
 * Curtis, Orbital Mechanics for Engineering Students, section 6.4; Vallado, Fundamentals of
 * Astrodynamics and Applications, section 6.3.2).
 *
 * Signs: each dv is along the velocity at its burn (positive speeds up). With rb above both
 * radii, dv1 and dv2 are positive and dv3 negative. dvTotal is the sum of magnitudes.
 * rb = Infinity gives the limiting case (two parabolic legs, dv2 = 0, infinite tof).
 */
import { InputError, requirePositive } from '../math/index.ts';

export interface BiellipticTransfer {
  /** Burn at r1 onto the first ellipse (m/s). */
  dv1: number;
  /** Burn at rb onto the second ellipse (m/s). */
  dv2: number;
  /** Burn at r2 into the circular orbit (m/s; negative = retrograde). */
  dv3: number;
  /** |dv1| + |dv2| + |dv3| (m/s). */
  dvTotal: number;
  /** Coast time: half periods of both ellipses (s). */
  tof: number;
}

export function bielliptic(mu: number, r1: number, r2: number, rb: number): BiellipticTransfer {
  requirePositive('mu', mu);
  requirePositive('r1', r1);
  requirePositive('r2', r2);
  if (rb !== Infinity) requirePositive('rb', rb);
  if (!(rb >= r1 && rb >= r2)) throw new InputError('rb', 'must be >= r1 and >= r2', rb);
  const a1 = (r1 + rb) / 2;
  const a2 = (r2 + rb) / 2;
  // Vis-viva on each ellipse; 1/a → 0 and μ/rb → 0 as rb → ∞.
  const v1c = Math.sqrt(mu / r1);
  const v2c = Math.sqrt(mu / r2);
  const va = Math.sqrt(mu * (2 / r1 - 1 / a1)); // first ellipse at r1
  const vb1 = Math.sqrt(Math.max(0, mu * (2 / rb - 1 / a1))); // first ellipse at rb
  const vb2 = Math.sqrt(Math.max(0, mu * (2 / rb - 1 / a2))); // second ellipse at rb
  const vc = Math.sqrt(mu * (2 / r2 - 1 / a2)); // second ellipse at r2
  const dv1 = va - v1c;
  const dv2 = vb2 - vb1;
  const dv3 = v2c - vc;
  const tof = rb === Infinity ? Infinity : Math.PI * (Math.sqrt((a1 * a1 * a1) / mu) + Math.sqrt((a2 * a2 * a2) / mu));
  return { dv1, dv2, dv3, dvTotal: Math.abs(dv1) + Math.abs(dv2) + Math.abs(dv3), tof };
}
