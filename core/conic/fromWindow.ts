/**
 * A plan from a porkchop pick (departure and arrival times between two sibling bodies): the
 * "click the porkchop" of the Windows screen.
 *
 * Construction (patched conics; Curtis, Orbital Mechanics for Engineering Students, §8.7–8.9):
 * 1. Lambert (Izzo 2015) between the bodies' positions about their common parent gives the
 *    departure excess velocity v∞ = v1 − v_from.
 * 2. The departure hyperbola from a circular parking orbit of radius r_p has e = 1 + r_p·v∞²/μ
 *    and its outgoing asymptote at true anomaly ν∞ = acos(−1/e). The parking orbit plane is the
 *    one containing v̂∞ with the smallest inclination to the reference plane (normal
 *    ĥ ∝ ẑ − (ẑ·v̂∞)v̂∞), and the periapsis direction is p̂ = cos ν∞·v̂∞ − sin ν∞·(ĥ × v̂∞), so the
 *    departure burn at p̂ is tangential. The ship starts `parkingLead` seconds earlier, phased so
 *    that it is at p̂ at the departure time.
 * 3. Events: the 'transfer' departure burn at `depart`; coast to the SOI exit; coast
 *    `midCourseDelay`; a mid-course 'transfer' burn aimed at the capture periapsis altitude;
 *    coast to periapsis at the target; a 'capture' burn to eccentricity `captureE`.
 * The target is that capture orbit (periapsis altitude ± 10 km, e ± 0.01).
 * Limits: single-revolution, prograde transfers only; circular parking orbit.
 */
import { InputError, requireFinite, requireNonNegative, requirePositive } from '../math/index.ts';
import { propagateKepler } from '../orbit/index.ts';
import { solveLambert } from '../orbit/index.ts';
import { stateToElements } from '../orbit/index.ts';
import { bodyPosition, bodyState } from '../system/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';
import type { Plan, ReservePolicy, Vehicle } from '../plan/index.ts';
import { checkVehicle } from '../plan/index.ts';

export interface WindowPick {
  /** Departure body id and target body id (siblings: same parent). */
  from: string;
  to: string;
  /** Departure and arrival times, s from the epoch. */
  depart: number;
  arrive: number;
  /** Circular parking orbit altitude at `from`, m. */
  parkingAltitude: number;
  /** Capture periapsis altitude at `to`, m. */
  captureAltitude: number;
  vehicle: Vehicle;
  /** Eccentricity of the capture orbit (default 0: circular). */
  captureE?: number;
  /** Coast after the SOI exit before the mid-course burn, s (default 3 days). */
  midCourseDelay?: number;
  /** Time in the parking orbit before the departure burn, s (default 1.25 parking periods). */
  parkingLead?: number;
  /** Reserve policy (default 5 % + 50 m/s). */
  reserve?: ReservePolicy;
  /** Plan name (default "<From> to <To>"). */
  name?: string;
}

/** Default coast from the SOI exit to the mid-course burn, s. */
export const DEFAULT_MID_COURSE_DELAY = 3 * 86400;

/** Builds the plan described in the module comment. Throws InputError on bad input. */
export function planFromWindow(system: StarSystem, pick: WindowPick): Plan {
  if (!pick || typeof pick !== 'object') throw new InputError('pick', 'must be an object', pick);
  const from = findBodyIndex(system, pick.from);
  const to = findBodyIndex(system, pick.to);
  if (from <= 0) throw new InputError('from', 'must name a body other than the star', pick.from);
  if (to <= 0) throw new InputError('to', 'must name a body other than the star', pick.to);
  if (from === to) throw new InputError('to', 'must differ from the departure body', pick.to);
  const parent = system.bodies[from].parentIndex;
  if (system.bodies[to].parentIndex !== parent) {
    throw new InputError('to', `must orbit the same body as ${system.bodies[from].name} (a sibling)`, pick.to);
  }
  requireFinite('depart', pick.depart);
  requireFinite('arrive', pick.arrive);
  if (!(pick.arrive > pick.depart)) throw new InputError('arrive', 'must be after depart', pick.arrive);
  requirePositive('parkingAltitude', pick.parkingAltitude + system.bodies[from].radius);
  requireFinite('parkingAltitude', pick.parkingAltitude);
  requireFinite('captureAltitude', pick.captureAltitude);
  checkVehicle(pick.vehicle, 'vehicle');
  const captureE = pick.captureE ?? 0;
  if (!(captureE >= 0 && captureE < 1)) throw new InputError('captureE', 'must be in [0, 1)', captureE);
  const midDelay = pick.midCourseDelay ?? DEFAULT_MID_COURSE_DELAY;
  requireNonNegative('midCourseDelay', midDelay);

  const fb = system.bodies[from];
  const tb = system.bodies[to];
  const mu = fb.mu;
  const s1 = new Float64Array(6);
  const r2 = new Float64Array(3);
  bodyState(system, from, pick.depart, s1, parent);
  bodyPosition(system, to, pick.arrive, r2, parent);
  const sol = solveLambert(system.bodies[parent].mu, [s1[0], s1[1], s1[2]], r2, pick.arrive - pick.depart)[0];
  const vx = sol.v1[0] - s1[3],
    vy = sol.v1[1] - s1[4],
    vz = sol.v1[2] - s1[5];
  const vinf = Math.hypot(vx, vy, vz);
  const ux = vx / vinf,
    uy = vy / vinf,
    uz = vz / vinf;
  // plane normal closest to +z containing v̂∞
  let hx = -uz * ux,
    hy = -uz * uy,
    hz = 1 - uz * uz;
  let hn = Math.hypot(hx, hy, hz);
  if (hn < 1e-9) {
    hx = 1 - ux * ux;
    hy = -ux * uy;
    hz = -ux * uz;
    hn = Math.hypot(hx, hy, hz);
  }
  hx /= hn;
  hy /= hn;
  hz /= hn;
  const rp = fb.radius + pick.parkingAltitude;
  const e = 1 + (rp * vinf * vinf) / mu;
  const nuInf = Math.acos(-1 / e);
  // ĥ × v̂∞
  const cx = hy * uz - hz * uy,
    cy = hz * ux - hx * uz,
    cz = hx * uy - hy * ux;
  const px = Math.cos(nuInf) * ux - Math.sin(nuInf) * cx;
  const py = Math.cos(nuInf) * uy - Math.sin(nuInf) * cy;
  const pz = Math.cos(nuInf) * uz - Math.sin(nuInf) * cz;
  // circular velocity along ĥ × p̂
  const vc = Math.sqrt(mu / rp);
  const qx = hy * pz - hz * py,
    qy = hz * px - hx * pz,
    qz = hx * py - hy * px;
  const atDepart = [rp * px, rp * py, rp * pz, vc * qx, vc * qy, vc * qz];
  const period = 2 * Math.PI * Math.sqrt((rp * rp * rp) / mu);
  const lead = pick.parkingLead ?? 1.25 * period;
  requireNonNegative('parkingLead', lead);
  const atStart = propagateKepler(mu, atDepart, -lead);
  const el = stateToElements(mu, [atStart[0], atStart[1], atStart[2]], [atStart[3], atStart[4], atStart[5]]);
  // circular: the elements give ν as the argument of latitude (or the true longitude when equatorial)
  const nu = el.argp + el.nu;
  return {
    name: pick.name ?? `${fb.name} to ${tb.name}`,
    description: `Transfer from a ${(pick.parkingAltitude / 1000).toFixed(0)} km parking orbit at ${fb.name} to a ${(pick.captureAltitude / 1000).toFixed(0)} km orbit at ${tb.name}.`,
    vehicle: pick.vehicle,
    start: {
      kind: 'parking',
      body: fb.id,
      epoch: pick.depart - lead,
      periapsisAltitude: pick.parkingAltitude,
      e: 0,
      i: el.i,
      raan: el.raan,
      argp: 0,
      nu: nu - 2 * Math.PI * Math.floor(nu / (2 * Math.PI)),
    },
    events: [
      {
        type: 'burn',
        id: 'departure',
        name: 'Departure',
        t: pick.depart,
        frame: 'vnb',
        dv: [0, 0, 0],
        solve: { kind: 'transfer', to: tb.id, arrive: pick.arrive },
        mode: 'impulsive',
        pointing: 'velocity',
      },
      { type: 'coast', id: 'leave-soi', name: `Leave ${fb.name}`, until: { kind: 'soi-change' } },
      { type: 'coast', id: 'cruise', name: 'Cruise', until: { kind: 'duration', dt: midDelay } },
      {
        type: 'burn',
        id: 'mid-course',
        name: 'Mid-course correction',
        t: null,
        frame: 'vnb',
        dv: [0, 0, 0],
        solve: { kind: 'transfer', to: tb.id, arrive: pick.arrive, periapsisAltitude: pick.captureAltitude },
        mode: 'impulsive',
        pointing: 'velocity',
      },
      { type: 'coast', id: 'approach', name: `Approach ${tb.name}`, until: { kind: 'periapsis', body: tb.id } },
      {
        type: 'burn',
        id: 'capture',
        name: `${tb.name} capture`,
        t: null,
        frame: 'vnb',
        dv: [0, 0, 0],
        solve: { kind: 'capture', e: captureE },
        mode: 'impulsive',
        pointing: 'velocity',
      },
    ],
    target: {
      body: tb.id,
      periapsisAltitude: pick.captureAltitude,
      e: captureE,
      apoapsisAltitude: null,
      i: null,
      tolerance: { periapsisAltitude: 10e3, e: 0.01, i: 0.01 },
    },
    reserve: pick.reserve ?? { percent: 5, absolute: 50 },
    end: null,
  };
}
