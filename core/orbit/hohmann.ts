/**
 * Hohmann transfer between circular coplanar orbits: two tangential burns on a transfer ellipse
 * whose periapsis and apoapsis are the two orbit radii (vis-viva; Curtis, Orbital Mechanics for
 * Engineering Students, section 6.3; Vallado, Fundamentals of Astrodynamics and Applications,
 * section 6.3.1).
 *
 * Signs: dv1 and dv2 are along the velocity at each burn — positive speeds up (outward
 * transfer), negative slows down (inward transfer). dvTotal is the sum of their magnitudes.
 * Equal radii give a zero transfer (both burns 0) with tof half that orbit's period.
 * Radii so large (or μ so large or small) that a result overflows — r2 = 1e300 m makes a³
 * infinite — raise SolverError('hohmann', 'non-finite') naming the value, never an Infinity.
 */
import { requirePositive, SolverError } from '../math/index.ts';

export interface HohmannTransfer {
  /** Burn at r1, along the velocity (m/s; negative = retrograde burn). */
  dv1: number;
  /** Burn at r2, along the velocity (m/s; negative = retrograde burn). */
  dv2: number;
  /** |dv1| + |dv2| (m/s). */
  dvTotal: number;
  /** Coast time on the transfer ellipse: half its period (s). */
  tof: number;
  /** Semi-major axis of the transfer ellipse, (r1 + r2) / 2 (m). */
  aTransfer: number;
}

export function hohmann(mu: number, r1: number, r2: number): HohmannTransfer {
  requirePositive('mu', mu);
  requirePositive('r1', r1);
  requirePositive('r2', r2);
  const a = (r1 + r2) / 2;
  // Speeds on the transfer ellipse at r1 and r2 by vis-viva: v² = μ(2/r − 1/a).
  const vt1 = Math.sqrt(mu * (2 / r1 - 1 / a));
  const vt2 = Math.sqrt(mu * (2 / r2 - 1 / a));
  const dv1 = vt1 - Math.sqrt(mu / r1);
  const dv2 = Math.sqrt(mu / r2) - vt2;
  const out: HohmannTransfer = {
    dv1,
    dv2,
    dvTotal: Math.abs(dv1) + Math.abs(dv2),
    tof: Math.PI * Math.sqrt((a * a * a) / mu),
    aTransfer: a,
  };
  for (const [k, v] of Object.entries(out)) {
    if (!Number.isFinite(v)) {
      throw new SolverError(
        'hohmann',
        'non-finite',
        `the ${k === 'tof' ? 'transfer time' : k === 'aTransfer' ? 'transfer orbit' : 'Δv'} is too large to represent (${k} = ${v}) for these values: r1 = ${r1} m, r2 = ${r2} m, μ = ${mu} m³/s²`,
        { mu, r1, r2 },
      );
    }
  }
  return out;
}
