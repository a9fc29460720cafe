/**
 * The longest integration step the ship force model allows: a fraction of the shortest orbital
 * period among the bodies that pull on the ship.
 *
 * Why: far from a planet with moons, the moons' pull on the ship is a tiny term that turns with
 * the moon's period (8.4 days for Skerry) while the ship's own motion changes over months. An
 * adaptive Runge–Kutta step much longer than that period samples the turning term at a few
 * stages only, and its embedded error estimate — which assumes the solution is smooth on the
 * scale of the step (Hairer, Nørsett & Wanner, Solving ODEs I, 2nd ed., §II.4, on the maximal
 * step size HMAX) — misses it: DOP853 at rtol 1e-10 stepped 36–52 days through the demo's
 * cruise to Moravel with true local errors 2–50 times its tolerance (measured against a run at
 * rtol 2.5e-14 with steps of a quarter day). Bounding the step by the shortest period lets the
 * stages see the turning term.
 */
import type { ShipForces } from '../dynamics/index.ts';

/** Steps per orbital period of the fastest pulling body, at least. */
export const STEPS_PER_FASTEST_PERIOD = 2;

/**
 * Largest step (s) for a flight in `forces`: the shortest orbital period among the pulling bodies
 * other than the star, divided by STEPS_PER_FASTEST_PERIOD; Infinity when only the star (or, in the
 * two-body mode, only the origin) pulls.
 */
export function fieldStepLimit(forces: ShipForces): number {
  const system = forces.system;
  if (!system || forces.gravity !== 'n-body') return Infinity;
  let shortest = Infinity;
  for (let k = 1; k < forces.count; k++) {
    if (!(forces.mu[k] > 0)) continue;
    const p = system.bodies[k].derived.period;
    if (p > 0 && p < shortest) shortest = p;
  }
  return shortest / STEPS_PER_FASTEST_PERIOD;
}
