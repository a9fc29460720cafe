/**
 * The 'to-parent' hop: from an orbit of a moon M to the planet P it orbits. No solved burn kind
 * leaves a moon for its parent, so the escape is computed here by patched conics and flown as a
 * 'fixed' prograde burn (vnb frame):
 * - the planetocentric transfer is the Hohmann-like ellipse from the moon's distance a_M down to
 *   the aim periapsis r_t: its speed at a_M is v_a = √(2μ_P r_t/(a_M(a_M + r_t))) (vis-viva), so
 *   the ship must leave the moon with v∞ = v_M − v_a, against the moon's velocity;
 * - the escape burn at the ship's circular orbit radius r gives v_p = √(v∞² + 2μ_M/r)
 *   (Curtis eq. 8.42 — from memory), Δv = v_p − v_c;
 * - the burn point is where the hyperbola's outgoing asymptote (at ν∞ = acos(−1/e),
 *   e = 1 + r v∞²/μ_M, from the burn point in the sense of motion) points along −v̂_M projected
 *   into the orbit plane (the geometry of core/conic/fromWindow.ts, mirrored);
 * - the burn's size is then corrected by secant steps on the patched-conic flight itself until
 *   the periapsis at P is the aim's (the hyperbola leaves the moon's sphere of influence at a
 *   finite radius, so the two-body v∞ is not exactly the one flown).
 * Events: the burn, the coast out of M's sphere of influence, the coast to periapsis at P, then
 * the arrival burns.
 */
import { SolverError } from '../math/index.ts';
import { propagateKepler } from '../orbit/index.ts';
import { bodyState } from '../system/index.ts';
import type { PlanEvent } from '../plan/index.ts';
import { conicInfo } from '../conic/index.ts';
import { eventId, situationAfter, type Draft, type Situation } from './draft.ts';
import { cross, dot, norm, unit, type V3 } from './geometry.ts';
import type { ArrivalAim } from './arrive.ts';

/** Secant steps on the escape burn's size at most. */
export const ESCAPE_STEPS = 12;

export interface ParentLeg {
  depart: number;
  arrive: number;
  dvDepart: number;
  /** Periapsis speed at the planet, m/s. */
  vArrive: number;
}

/** Adds the hop's events (up to the coast to periapsis at the planet) to the draft; see the module comment. */
export function toParentEvents(draft: Draft, from: Situation, aim: ArrivalAim, tolerance: number): ParentLeg {
  const system = draft.system;
  const m = from.central;
  const moon = system.bodies[m];
  const P = moon.parentIndex;
  const planet = system.bodies[P];
  const rt = planet.radius + aim.altitude;
  const m6 = new Float64Array(6);
  const r = norm(from.state);
  const h = unit(cross(from.state, [from.state[3], from.state[4], from.state[5]]));
  const n = norm([from.state[3], from.state[4], from.state[5]]) / r;
  // v∞ and the burn point, iterated for the moon's motion during the wait
  let tb = from.t + 60;
  let dv = 0;
  for (let it = 0; it < 3; it++) {
    bodyState(system, m, tb, m6, P);
    const aM = norm(m6);
    const vM = Math.hypot(m6[3], m6[4], m6[5]);
    const va = Math.sqrt((2 * planet.mu * rt) / (aM * (aM + rt)));
    const vinf = Math.abs(vM - va);
    const vp = Math.sqrt(vinf * vinf + (2 * moon.mu) / r);
    dv = vp - Math.sqrt(moon.mu / r);
    const w: V3 = [-m6[3], -m6[4], -m6[5]];
    const k = dot(w, h);
    const u = unit([w[0] - k * h[0], w[1] - k * h[1], w[2] - k * h[2]]);
    const nuInf = Math.acos(-1 / (1 + (r * vinf * vinf) / moon.mu));
    const hu = cross(h, u);
    const p: V3 = [
      Math.cos(nuInf) * u[0] - Math.sin(nuInf) * hu[0],
      Math.cos(nuInf) * u[1] - Math.sin(nuInf) * hu[1],
      Math.cos(nuInf) * u[2] - Math.sin(nuInf) * hu[2],
    ];
    const s0 = propagateKepler(moon.mu, from.state, 60);
    const rh = unit([s0[0], s0[1], s0[2]]);
    let ang = Math.atan2(dot(h, cross(rh, p)), dot(rh, p));
    if (ang < 0) ang += 2 * Math.PI;
    tb = from.t + 60 + ang / n;
  }
  const name = `Leave ${moon.name} for ${planet.name}`;
  const id = eventId(draft, name);
  const events = (size: number): PlanEvent[] => [
    { type: 'burn', id, name, t: tb, frame: 'vnb', dv: [size, 0, 0], solve: { kind: 'fixed' }, mode: 'impulsive', pointing: 'velocity' },
    { type: 'coast', id: `${id}-soi`, name: `Leave ${moon.name}`, until: { kind: 'soi-change' } },
    { type: 'coast', id: `${id}-approach`, name: `Approach ${planet.name}`, until: { kind: 'periapsis', body: planet.id } },
  ];
  const miss = (size: number): number => {
    const s = situationAfter(draft, events(size), true);
    if (s.central !== P) return Number.NaN;
    return conicInfo(planet.mu, s.state).rp - rt;
  };
  // secant on the burn size; a step that leaves no periapsis at P is halved back
  let x0 = dv;
  let f0 = miss(x0);
  if (!Number.isFinite(f0)) throw new SolverError('route', 'no-solution', `the escape from ${moon.name} does not reach ${planet.name}`);
  let x1 = dv * 1.01;
  let f1 = miss(x1);
  for (let k = 0; k < ESCAPE_STEPS && Math.abs(f0) > tolerance; k++) {
    if (!Number.isFinite(f1) || f1 === f0) {
      x1 = (x0 + x1) / 2;
      f1 = miss(x1);
      continue;
    }
    const x2 = x1 - (f1 * (x1 - x0)) / (f1 - f0);
    x0 = x1;
    f0 = f1;
    x1 = Math.max(0.5 * x0, Math.min(2 * x0, x2));
    f1 = miss(x1);
    if (Number.isFinite(f1) && Math.abs(f1) < Math.abs(f0)) {
      [x0, f0, x1, f1] = [x1, f1, x0, f0];
    }
  }
  if (!(Math.abs(f0) <= tolerance))
    throw new SolverError(
      'route',
      'no-solution',
      `the escape from ${moon.name} cannot be aimed at a ${(aim.altitude / 1000).toFixed(0)} km periapsis at ${planet.name}`,
    );
  for (const e of events(x0)) draft.events.push(e);
  const end = situationAfter(draft);
  const vArrive = norm([end.state[3], end.state[4], end.state[5]]);
  return { depart: tb, arrive: end.t, dvDepart: x0, vArrive };
}
