/**
 * What a route does on arrival at a body, and what it costs in patched conics.
 *
 * Final orbit (periapsis r_p, apoapsis r_a, optional inclination): the approach is aimed at a
 * periapsis r_arr above the target orbit (r_arr = r_a when an apoapsis above r_p is asked,
 * otherwise r_p + max(100 km, 20 % of the altitude)), and the orbit is made in two burns at two
 * apsides: at r_arr an 'apsis' burn puts the opposite apsis at r_p, half an orbit later at r_p
 * an 'apsis' burn puts the opposite apsis at r_a. A single capture burn would tie the final
 * orbit to the arrival periapsis; two burns at two points set both apsides whatever the
 * approach left, so the targeter's final leg can meet both (as the moon demo plan does). An
 * inclination is then reached with a 'plane' burn at the next node (rotating the velocity about
 * the radius keeps the orbit's shape; costly — 2v·sin(Δi/2) — and documented as a limit).
 *
 * Intermediate orbits (a later hop leaves from them): a single 'capture' burn at the arrival
 * periapsis to eccentricity e.
 *
 * Estimates: vis-viva (Curtis, Orbital Mechanics for Engineering Students, eq. 2.71 — from
 * memory) at each apsis: the speed before and after each burn.
 */
import type { Body } from '../system/index.ts';
import type { PlanEvent } from '../plan/index.ts';
import { eventId, type Draft } from './draft.ts';

/** The final orbit at the arrival body, SI. */
export interface FinalOrbit {
  periapsisAltitude: number;
  apoapsisAltitude: number;
  inclination: number | null;
}

/** How an arrival is aimed: the approach periapsis altitude and the orbit captured into there. */
export interface ArrivalAim {
  altitude: number;
  /** Eccentricity of the first orbit captured into (for the window search's capture cost). */
  e: number;
}

/** Speed at radius r on an orbit of apsides r1, r2 (vis-viva). */
export function visViva(mu: number, r: number, r1: number, r2: number): number {
  return Math.sqrt(mu * (2 / r - 2 / (r1 + r2)));
}

/** The arrival periapsis altitude for a final orbit (see the module comment). */
export function finalAim(body: Body, orbit: FinalOrbit): ArrivalAim {
  const hp = orbit.periapsisAltitude;
  const margin = Math.max(100e3, 0.2 * hp);
  const altitude = orbit.apoapsisAltitude >= hp + margin ? orbit.apoapsisAltitude : hp + margin;
  const rArr = body.radius + altitude;
  const rp = body.radius + hp;
  return { altitude, e: (rArr - rp) / (rArr + rp) };
}

/**
 * Patched-conic Δv of the final arrival from a periapsis speed vArr at the aim altitude: the two
 * apsis burns (and no plane change, which depends on the approach).
 */
export function finalArrivalDv(body: Body, orbit: FinalOrbit, vArr: number): number {
  const mu = body.mu;
  const rArr = body.radius + finalAim(body, orbit).altitude;
  const rp = body.radius + orbit.periapsisAltitude;
  const ra = body.radius + orbit.apoapsisAltitude;
  const dv1 = Math.abs(vArr - visViva(mu, rArr, rArr, rp));
  const dv2 = Math.abs(visViva(mu, rp, rArr, rp) - visViva(mu, rp, rp, ra));
  return dv1 + dv2;
}

/** Patched-conic Δv of an intermediate capture: periapsis speed vArr to the orbit of eccentricity e there. */
export function captureDv(body: Body, aim: ArrivalAim, vArr: number): number {
  const r = body.radius + aim.altitude;
  return Math.abs(vArr - Math.sqrt((body.mu * (1 + aim.e)) / r));
}

/** The burns of a final arrival, after the coast to the arrival periapsis (see the module comment). */
export function finalArrivalEvents(draft: Draft, body: Body, orbit: FinalOrbit): PlanEvent[] {
  const out: PlanEvent[] = [];
  const add = (e: PlanEvent): void => {
    out.push(e);
    draft.events.push(e);
  };
  const burn = (name: string, solve: Extract<PlanEvent, { type: 'burn' }>['solve']): void =>
    add({ type: 'burn', id: eventId(draft, name), name, t: null, frame: 'vnb', dv: [0, 0, 0], solve, mode: 'impulsive', pointing: 'velocity' });
  const coast = (name: string, until: Extract<PlanEvent, { type: 'coast' }>['until']): void => add({ type: 'coast', id: eventId(draft, name), name, until });
  burn(`${body.name} capture`, { kind: 'apsis', altitude: orbit.periapsisAltitude });
  coast(`Coast to periapsis at ${body.name}`, { kind: 'periapsis', body: body.id });
  const circular = orbit.apoapsisAltitude === orbit.periapsisAltitude;
  burn(circular ? 'Circularise' : 'Set apoapsis', { kind: 'apsis', altitude: orbit.apoapsisAltitude });
  if (orbit.inclination !== null) {
    coast(`Coast to a node at ${body.name}`, { kind: 'node', which: 'any' });
    burn('Plane change', { kind: 'plane', i: orbit.inclination });
  }
  const a = body.radius + (orbit.periapsisAltitude + orbit.apoapsisAltitude) / 2;
  coast('Final orbit', { kind: 'duration', dt: 2 * Math.PI * Math.sqrt((a * a * a) / body.mu) });
  return out;
}

/** The capture burn of an intermediate orbit, after the coast to the arrival periapsis. */
export function captureEvents(draft: Draft, body: Body, aim: ArrivalAim): PlanEvent[] {
  const name = `${body.name} capture`;
  const e: PlanEvent = {
    type: 'burn',
    id: eventId(draft, name),
    name,
    t: null,
    frame: 'vnb',
    dv: [0, 0, 0],
    solve: { kind: 'capture', e: aim.e },
    mode: 'impulsive',
    pointing: 'velocity',
  };
  draft.events.push(e);
  return [e];
}
