/**
 * The vehicle a route is built and targeted with: the designer's ship with each stage's specific
 * impulse scaled up (masses, thrusts and staging kept) so that it carries at least AMPLE_DV — no
 * burn of a route is cut short for want of propellant while the route is laid and targeted (a
 * burn past the tanks is flown short, core/conic evaluate, and the coast after it never reaches
 * where it was aimed). The real ship's margin is reported afterwards (planRoute.ts).
 * Method: the rocket equation Δv = g₀·Isp·ln(m₀/m_f) (Tsiolkovsky) is linear in Isp.
 */
import { deltaVLeft, type Vehicle } from '../plan/index.ts';

/** Δv the building vehicle carries at least, m/s: several times the costliest demo route (≈ 19 km/s). */
export const AMPLE_DV = 200e3;

/** The ship with enough Δv for any route (see the module comment); a ship without propellant gets its last stage filled to ten times its burnout mass. */
export function ampleVehicle(vehicle: Vehicle): Vehicle {
  let v = vehicle;
  if (!(deltaVLeft(v) > 0)) {
    const n = v.stages.length - 1;
    const burnout = v.payloadMass + v.stages[n].dryMass;
    v = {
      ...v,
      stages: v.stages.map((s, k) => (k === n ? { ...s, propellantMass: 9 * burnout } : s)),
    };
  }
  const f = Math.max(1, AMPLE_DV / deltaVLeft(v));
  return { ...v, stages: v.stages.map((s) => ({ ...s, isp: s.isp * f })) };
}
