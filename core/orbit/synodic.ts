/**
 * Synodic period and Hohmann phasing for two bodies on circular coplanar orbits about the same
 * primary (Curtis, Orbital Mechanics for Engineering Students, section 8.3; Vallado,
 * Fundamentals of Astrodynamics and Applications, section 6.6).
 *
 * Phase angle convention: the angle by which the target body leads the departure body, measured
 * in their common sense of motion, wrapped into (−π, π].
 */
import { InputError, requireFinite, requirePositive } from '../math/index.ts';

/** Synodic period 1 / |1/T1 − 1/T2| of two orbital periods (s). Throws for equal periods. */
export function synodicPeriod(T1: number, T2: number): number {
  requirePositive('T1', T1);
  requirePositive('T2', T2);
  const d = Math.abs(1 / T1 - 1 / T2);
  if (!(d > 0)) throw new InputError('T2', 'must differ from T1 (equal periods never change phase)', T2);
  return 1 / d;
}

/** Wraps an angle into (−π, π]. */
function wrapPi(a: number): number {
  let w = a % (2 * Math.PI);
  if (w <= -Math.PI) w += 2 * Math.PI;
  else if (w > Math.PI) w -= 2 * Math.PI;
  return w;
}

/**
 * Phase angle (rad, in (−π, π]) by which the target on circular orbit r2 must lead the
 * departure body on r1 at departure so that a Hohmann transfer meets it: φ = π − n2·t_H with
 * n2 = √(μ/r2³), t_H = π√(a³/μ), a = (r1 + r2)/2. Negative for inward transfers that need the
 * target to trail.
 */
export function hohmannPhaseAngle(mu: number, r1: number, r2: number): number {
  requirePositive('mu', mu);
  requirePositive('r1', r1);
  requirePositive('r2', r2);
  const a = (r1 + r2) / 2;
  const tH = Math.PI * Math.sqrt((a * a * a) / mu);
  const n2 = Math.sqrt(mu / (r2 * r2 * r2));
  return wrapPi(Math.PI - n2 * tH);
}

/**
 * Earliest time t ≥ tNow at which the phase angle (target ahead of departure body) equals the
 * Hohmann phase angle, given the phase angle `phaseNow` (rad) at tNow. The phase changes at
 * n2 − n1. Throws InputError for equal radii (the phase never changes).
 */
export function nextHohmannDeparture(mu: number, r1: number, r2: number, phaseNow: number, tNow = 0): number {
  requirePositive('mu', mu);
  requirePositive('r1', r1);
  requirePositive('r2', r2);
  requireFinite('phaseNow', phaseNow);
  requireFinite('tNow', tNow);
  if (r1 === r2) throw new InputError('r2', 'must differ from r1 (the phase never changes)', r2);
  const n1 = Math.sqrt(mu / (r1 * r1 * r1));
  const n2 = Math.sqrt(mu / (r2 * r2 * r2));
  const rate = n2 - n1;
  const target = hohmannPhaseAngle(mu, r1, r2);
  // Smallest Δt ≥ 0 with phaseNow + rate·Δt ≡ target (mod 2π).
  const twoPi = 2 * Math.PI;
  let gap = (target - phaseNow) / rate;
  const step = twoPi / Math.abs(rate);
  gap = ((gap % step) + step) % step;
  return tNow + gap;
}
