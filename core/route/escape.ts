/**
 * A moon to another planet without stopping at its own planet: one escape burn from the moon's
 * orbit onto the planet's departure hyperbola (a 'to-parent' hop and a 'siblings' hop flown as
 * one).
 *
 * Method (patched conics, as core/conic/solveBurn.ts departs from a planet): the window is the
 * porkchop's best from the planet P to the target Y for a "parking orbit" at the moon's distance
 * (the departure burn then counted from the moon's orbital speed — the moon's own gravity apart).
 * At the window's departure time the velocity the ship needs where the moon is, v⁺, is the
 * hyperbolic departure about P from the moon's state with the window's Lambert v∞ (solveBurn's
 * departure-style 'transfer' with the moon's state in place of a parking orbit's); the excess
 * velocity relative to the moon is then w = v⁺ − v_M. From the ship's circular orbit of the moon,
 * of radius r, the escape burn is tangential at the periapsis of the moon-centred hyperbola with
 * excess w: Δv = √(|w|² + 2μ_M/r) − √(μ_M/r) (Curtis eq. 8.42 — from memory), the start orbit laid
 * through that point as siblings.ts lays a planet's parking orbit. It is flown as a 'fixed'
 * prograde burn; after the ship leaves the moon's and the planet's spheres of influence a
 * mid-course 'transfer' burn aims the arrival, paying for the patching errors of two spheres.
 */
import { SolverError } from '../math/index.ts';
import { bodyState } from '../system/index.ts';
import { solveBurn } from '../conic/index.ts';
import type { TransferWindow } from '../search/index.ts';
import { eventId, situationAfter, type Draft } from './draft.ts';
import { circularPeriod, cross, norm, parkingThrough, planeThrough, unit, type V3 } from './geometry.ts';
import type { ArrivalAim } from './arrive.ts';
import type { SiblingsLeg } from './siblings.ts';

/** Adds the escape and the interplanetary leg (up to the coast to the arrival periapsis at y) to an empty draft. */
export function escapeEvents(
  draft: Draft,
  moonK: number,
  y: number,
  window: TransferWindow,
  altitude: number,
  inclination: number | null,
  aim: ArrivalAim,
): SiblingsLeg & { leaveMoon: number } {
  const system = draft.system;
  const moon = system.bodies[moonK];
  const P = moon.parentIndex;
  const planet = system.bodies[P];
  const by = system.bodies[y];
  const depart = window.departure;
  const arrive = window.arrival;
  const m6 = new Float64Array(6);
  bodyState(system, moonK, depart, m6, P);
  const w: V3 = [0, 0, 0];
  try {
    solveBurn({ system, central: P, t: depart, state: m6 }, { kind: 'transfer', to: by.id, arrive }, w);
  } catch (e) {
    throw new SolverError('route', 'no-solution', `no departure from ${planet.name} at ${moon.name}'s distance: ${(e as Error).message}`);
  }
  const wi = norm(w);
  const u = unit(w);
  const h = planeThrough(u, inclination);
  const r = moon.radius + altitude;
  const nuInf = Math.acos(-1 / (1 + (r * wi * wi) / moon.mu));
  const hu = cross(h, u);
  const p: V3 = [
    Math.cos(nuInf) * u[0] - Math.sin(nuInf) * hu[0],
    Math.cos(nuInf) * u[1] - Math.sin(nuInf) * hu[1],
    Math.cos(nuInf) * u[2] - Math.sin(nuInf) * hu[2],
  ];
  draft.start = parkingThrough(system, moonK, altitude, h, p, depart, 1.25 * circularPeriod(moon.mu, r));
  const dv = Math.sqrt(wi * wi + (2 * moon.mu) / r) - Math.sqrt(moon.mu / r);
  const name = `Leave ${moon.name} for ${by.name}`;
  draft.events.push({
    type: 'burn',
    id: eventId(draft, name),
    name,
    t: depart,
    frame: 'vnb',
    dv: [dv, 0, 0],
    solve: { kind: 'fixed' },
    mode: 'impulsive',
    pointing: 'velocity',
  });
  draft.events.push({ type: 'coast', id: eventId(draft, `Leave ${moon.name}`), name: `Leave ${moon.name}`, until: { kind: 'soi-change' } });
  const leaveMoon = situationAfter(draft).t;
  draft.events.push({ type: 'coast', id: eventId(draft, `Leave ${planet.name}`), name: `Leave ${planet.name}`, until: { kind: 'soi-change' } });
  draft.events.push({
    type: 'coast',
    id: eventId(draft, 'Cruise'),
    name: 'Cruise',
    until: { kind: 'duration', dt: Math.min(3 * 86400, 0.1 * (arrive - depart)) },
  });
  const mid = 'Mid-course correction';
  draft.events.push({
    type: 'burn',
    id: eventId(draft, mid),
    name: mid,
    t: null,
    frame: 'vnb',
    dv: [0, 0, 0],
    solve: { kind: 'transfer', to: by.id, arrive, periapsisAltitude: aim.altitude },
    mode: 'impulsive',
    pointing: 'velocity',
  });
  draft.events.push({ type: 'coast', id: eventId(draft, `Approach ${by.name}`), name: `Approach ${by.name}`, until: { kind: 'periapsis', body: by.id } });
  const rArr = by.radius + aim.altitude;
  return { window, depart, arrive, leaveMoon, dvDepart: dv, vArrive: Math.sqrt(window.vInfArrive * window.vInfArrive + (2 * by.mu) / rArr) };
}
