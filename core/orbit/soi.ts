/**
 * Extent of a body's gravitational dominance about its primary.
 *
 * - Laplace sphere of influence r = a (m/M)^(2/5) (Curtis, Orbital Mechanics for Engineering
 *   Students, section 8.5; Bate, Mueller & White, Fundamentals of Astrodynamics, section 7.4).
 * - Hill sphere radius r = a(1 − e) (m/(3M))^(1/3), evaluated at periapsis (Hamilton & Burns,
 *   Icarus 92 (1991); Murray & Dermott, Solar System Dynamics, section 3.2 for the circular case).
 *
 * m and M may be masses or gravitational parameters (only their ratio enters), both in the same
 * units; the formulas assume m ≪ M, and m < M is required.
 */
import { InputError, requireNonNegative, requirePositive } from '../math/index.ts';

function checkMasses(m: number, M: number): void {
  requirePositive('m', m);
  requirePositive('M', M);
  if (!(m < M)) throw new InputError('m', 'must be < M (the body must be lighter than its primary)', m);
}

/** Laplace sphere-of-influence radius a (m/M)^(2/5), in the units of a. */
export function sphereOfInfluence(a: number, m: number, M: number): number {
  requirePositive('a', a);
  checkMasses(m, M);
  return a * (m / M) ** 0.4;
}

/** Hill sphere radius a(1 − e)(m/(3M))^(1/3), in the units of a. e must lie in [0, 1). */
export function hillRadius(a: number, e: number, m: number, M: number): number {
  requirePositive('a', a);
  requireNonNegative('e', e);
  if (!(e < 1)) throw new InputError('e', 'must be < 1 (closed orbit)', e);
  checkMasses(m, M);
  return a * (1 - e) * Math.cbrt(m / (3 * M));
}
