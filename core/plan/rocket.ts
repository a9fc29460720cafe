/**
 * The rocket equation and burn timing for one stage at constant thrust and specific impulse.
 * Tsiolkovsky: Δv = g0 · Isp · ln(m0 / mf), with standard gravity g0 = 9.80665 m/s²
 * (the conventional value, CGPM 1901), mass flow ṁ = F / (g0 · Isp).
 */
import { InputError, requirePositive, requireNonNegative } from '../math/index.ts';

/** Standard gravity, m/s² (conventional value used with specific impulse in seconds). */
export const G0 = 9.80665;

/** Effective exhaust velocity c = g0 · Isp, m/s. */
export function exhaustVelocity(isp: number): number {
  return G0 * requirePositive('isp', isp);
}

/** Δv from initial and final mass, m/s. */
export function rocketDeltaV(isp: number, m0: number, mf: number): number {
  requirePositive('m0', m0);
  requirePositive('mf', mf);
  if (mf > m0) throw new InputError('mf', 'must be <= m0', mf);
  return exhaustVelocity(isp) * Math.log(m0 / mf);
}

/** Propellant mass used for a Δv starting at mass m0, kg. */
export function propellantForDeltaV(isp: number, m0: number, dv: number): number {
  requirePositive('m0', m0);
  requireNonNegative('dv', dv);
  return m0 * -Math.expm1(-dv / exhaustVelocity(isp));
}

/** Duration of a burn of the given Δv at constant thrust F starting at mass m0, s. */
export function burnDuration(thrust: number, isp: number, m0: number, dv: number): number {
  requirePositive('thrust', thrust);
  const mdot = thrust / exhaustVelocity(isp);
  return propellantForDeltaV(isp, m0, dv) / mdot;
}

/** Thrust-to-weight ratio at surface gravity g (m/s²) for mass m. */
export function thrustToWeight(thrust: number, mass: number, g: number): number {
  return requirePositive('thrust', thrust) / (requirePositive('mass', mass) * requirePositive('g', g));
}
