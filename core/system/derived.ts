/**
 * Quantities derived from a body's elements and masses: orbital period, mean motion,
 * periapsis/apoapsis, sphere of influence, Hill radius, depth in the body tree.
 */

import { hillRadius, sphereOfInfluence } from '../orbit/index.ts';
import type { BodyDerived, OrbitalElements } from './model.ts';

/** Orbital period T = 2π √(a³/μ), s (Kepler's third law). */
export function orbitalPeriod(mu: number, a: number): number {
  return 2 * Math.PI * Math.sqrt((a * a * a) / mu);
}

/** Mean motion n = √(μ/a³), rad/s. */
export function meanMotionOf(mu: number, a: number): number {
  return Math.sqrt(mu / (a * a * a));
}

/**
 * Laplace sphere-of-influence radius r = a (m/M)^(2/5) (Bate, Mueller & White, Fundamentals of
 * Astrodynamics (1971), §7.4; Curtis, §8.5), with the mass ratio taken as μ_body/μ_parent.
 * Delegates to core/orbit/soi.ts (InputError unless a > 0 and 0 < μ_body < μ_parent).
 */
export function laplaceSoiRadius(a: number, muBody: number, muParent: number): number {
  return sphereOfInfluence(a, muBody, muParent);
}

/** Hill radius at periapsis r_H = a (1 − e) (m / 3M)^(1/3) (core/orbit/soi.ts). */
export function hillRadiusOf(a: number, e: number, muBody: number, muParent: number): number {
  return hillRadius(a, e, muBody, muParent);
}

/** Mean solar day of a rotating body on an orbit: 1 / |1/P_rot − 1/P_orb| (prograde P_rot > 0). */
export function meanSolarDay(rotationPeriod: number, orbitalPeriodS: number): number {
  return 1 / Math.abs(1 / rotationPeriod - 1 / orbitalPeriodS);
}

/** Derived quantities of the star (no orbit). */
export function starDerived(): BodyDerived {
  return {
    orbitMu: 0,
    period: Infinity,
    meanMotion: 0,
    periapsis: 0,
    apoapsis: 0,
    soiRadius: Infinity,
    hillRadius: Infinity,
    depth: 0,
  };
}

/** Derived quantities of a body of gravitational parameter `mu` orbiting a parent of `muParent`. */
export function bodyDerived(el: OrbitalElements, mu: number, muParent: number, depth: number): BodyDerived {
  const orbitMu = muParent + mu;
  return {
    orbitMu,
    period: orbitalPeriod(orbitMu, el.a),
    meanMotion: meanMotionOf(orbitMu, el.a),
    periapsis: el.a * (1 - el.e),
    apoapsis: el.a * (1 + el.e),
    soiRadius: laplaceSoiRadius(el.a, mu, muParent),
    hillRadius: hillRadiusOf(el.a, el.e, mu, muParent),
    depth,
  };
}
