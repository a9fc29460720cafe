/**
 * The 'siblings' hop: from an orbit of body X to body Y, both orbiting the same parent (planet to
 * planet about the star, moon to sister moon about a planet).
 *
 * Window: the porkchop of core/search (Lambert by Izzo's method, departure and capture burns
 * tangential at periapsis of the hyperbolas, Curtis §8.7–8.9) over the departure range × times of
 * flight 0.5–1.5 of the Hohmann time π√(((a_X + a_Y)/2)³/μ) (Curtis eq. 6.3 — from memory), on a
 * WINDOW_ROWS × WINDOW_COLS grid, its best local minimum refined (findWindows): the lowest total
 * Δv in the range. The departure orbit is the one the search assumes (circular at the ship's
 * altitude); the arrival capture the one the next hop wants.
 *
 * Events (as core/conic/fromWindow.ts planFromWindow lays them out): a 'transfer' departure burn
 * (the hyperbola from the ship's current point with the Lambert v∞), the coast out of X's sphere
 * of influence, a cruise of min(3 days, 10 % of the flight), a mid-course 'transfer' burn aiming
 * the arrival periapsis at the aim altitude, the coast to that periapsis, then the arrival burns.
 *
 * The first hop of a route starts the plan: the parking orbit is laid through the point where the
 * departure burn is tangential (the plane holds v̂∞ — the least inclined such plane, or the
 * designer's inclination when one is given — and the ship is at the hyperbola's periapsis
 * direction p̂ = cos ν∞·v̂∞ − sin ν∞·(ĥ × v̂∞), ν∞ = acos(−1/e), e = 1 + r_p v∞²/μ, at the
 * departure time, 1.25 revolutions after the start). A later hop leaves an orbit it did not
 * choose: the departure time is moved, within the last revolution before the window, to the
 * point where the departure burn (solved as the evaluation solves it) is least.
 */
import { SolverError } from '../math/index.ts';
import { propagateKepler, solveLambert, synodicPeriod } from '../orbit/index.ts';
import { bodyPosition, bodyState, formatDate, type StarSystem } from '../system/index.ts';
import { solveBurn } from '../conic/index.ts';
import { computePorkchopRows, createGrid, findWindows, type TransferWindow } from '../search/index.ts';
import type { PlanEvent } from '../plan/index.ts';
import { eventId, type Draft, type Situation } from './draft.ts';
import { circularPeriod, cross, norm, parkingThrough, planeThrough, unit, type V3 } from './geometry.ts';
import type { ArrivalAim } from './arrive.ts';

/** Porkchop grid of the window search: departure samples × time-of-flight samples. */
export const WINDOW_ROWS = 61;
export const WINDOW_COLS = 41;
/** Departure candidates scanned over the last revolution of a parking orbit the route did not choose. */
export const DEPARTURE_SCAN = 72;

export interface SiblingsLeg {
  window: TransferWindow;
  /** Departure burn time as planned (may precede the window's by less than a revolution). */
  depart: number;
  arrive: number;
  /** Patched-conic departure Δv and arrival periapsis speed (for the capture estimate), m/s. */
  dvDepart: number;
  vArrive: number;
}

/** The best window from body x (ship at `parkingAltitude`) to body y in [after, before] (see the module comment). */
export function bestWindow(system: StarSystem, x: number, y: number, after: number, before: number, parkingAltitude: number, aim: ArrivalAim): TransferWindow {
  const parent = system.bodies[x].parentIndex;
  const mu = system.bodies[parent].mu;
  const a1 = system.bodies[x].elements?.a ?? 0;
  const a2 = system.bodies[y].elements?.a ?? 0;
  const tH = Math.PI * Math.sqrt(((a1 + a2) / 2) ** 3 / mu);
  const { grid, setup } = createGrid(system, {
    from: x,
    to: y,
    depart: { start: after, end: before, n: WINDOW_ROWS },
    secondAxis: 'tof',
    second: { start: 0.5 * tH, end: 1.5 * tH, n: WINDOW_COLS },
    parkingAltitude,
    arrivalAltitude: aim.altitude,
    arrivalEccentricity: aim.e,
    metric: 'total',
  });
  grid.unsolved = computePorkchopRows(system, setup, 0, WINDOW_ROWS, grid.planes);
  // findWindows lists windows in departure order ("the next K windows"): the best is the cheapest of all
  let w: TransferWindow | undefined;
  for (const c of findWindows(system, grid, { count: Number.MAX_SAFE_INTEGER })) if (!w || c.dvTotal < w.dvTotal) w = c;
  if (!w) throw new SolverError('route', 'no-solution', `no transfer from ${system.bodies[x].name} to ${system.bodies[y].name} found in the date range`);
  return w;
}

/** A window cheaper by this fraction outside the range is worth telling the designer about. */
export const OUTSIDE_WINDOW_SAVING = 0.05;

/**
 * When the best departure of [after, before] lies on the range's edge (no window opens inside
 * it, the cheapest departure is wherever the range is cut), the best window over one and a half
 * synodic periods from `after`: if it departs outside the range and saves more than
 * OUTSIDE_WINDOW_SAVING, a sentence saying when it opens and what it costs; else null.
 */
export function windowOutsideRange(
  system: StarSystem,
  x: number,
  y: number,
  inRange: TransferWindow,
  after: number,
  before: number,
  parkingAltitude: number,
  aim: ArrivalAim,
): string | null {
  if (!inRange.atEdge) return null;
  const bx = system.bodies[x];
  const by = system.bodies[y];
  const recurrence = synodicPeriod(bx.derived.period, by.derived.period);
  if (!(recurrence > 0 && Number.isFinite(recurrence))) return null;
  let wide: TransferWindow;
  try {
    wide = bestWindow(system, x, y, after, after + 1.5 * recurrence, parkingAltitude, aim);
  } catch {
    return null;
  }
  const outside = wide.departure < after || wide.departure > before;
  if (!outside || !(wide.dvTotal < (1 - OUTSIDE_WINDOW_SAVING) * inRange.dvTotal)) return null;
  const cal = system.calendar;
  const kms = (v: number) => `${(v / 1000).toFixed(2)} km/s`;
  return (
    `no ${bx.name} → ${by.name} window opens between ${formatDate(cal, after)} and ${formatDate(cal, before)}: ` +
    `the cheapest departure there is at the range's edge (${kms(inRange.dvTotal)}); a window opens ${formatDate(cal, wide.departure)} (${kms(wide.dvTotal)}) — widen the departure range to include it`
  );
}

/** v∞ at departure of the window's Lambert arc (about the common parent), m/s. */
function departureVInf(system: StarSystem, x: number, y: number, depart: number, arrive: number): V3 {
  const parent = system.bodies[x].parentIndex;
  const s1 = new Float64Array(6);
  const r2 = new Float64Array(3);
  bodyState(system, x, depart, s1, parent);
  bodyPosition(system, y, arrive, r2, parent);
  const sol = solveLambert(system.bodies[parent].mu, [s1[0], s1[1], s1[2]], r2, arrive - depart)[0];
  return [sol.v1[0] - s1[3], sol.v1[1] - s1[4], sol.v1[2] - s1[5]];
}

/**
 * Adds the hop's events (up to the coast to the arrival periapsis) to the draft. With no start yet
 * (the route's first hop) the start is laid as the module comment says; otherwise the ship leaves
 * from `from` (in orbit about x).
 */
export function siblingsEvents(
  draft: Draft,
  x: number,
  y: number,
  window: TransferWindow,
  altitude: number,
  inclination: number | null,
  aim: ArrivalAim,
  from: Situation | null,
): SiblingsLeg {
  const system = draft.system;
  const bx = system.bodies[x];
  const by = system.bodies[y];
  const arrive = window.arrival;
  let depart = window.departure;
  if (!from) {
    const vinf = departureVInf(system, x, y, depart, arrive);
    const u = unit(vinf);
    const h = planeThrough(u, inclination);
    const rp = bx.radius + altitude;
    const vi = norm(vinf);
    const nuInf = Math.acos(-1 / (1 + (rp * vi * vi) / bx.mu));
    const hu = cross(h, u);
    const p: V3 = [
      Math.cos(nuInf) * u[0] - Math.sin(nuInf) * hu[0],
      Math.cos(nuInf) * u[1] - Math.sin(nuInf) * hu[1],
      Math.cos(nuInf) * u[2] - Math.sin(nuInf) * hu[2],
    ];
    draft.start = parkingThrough(system, x, altitude, h, p, depart, 1.25 * circularPeriod(bx.mu, rp));
  } else {
    // the cheapest point of the last revolution before the window
    const r = norm(from.state);
    const T = circularPeriod(bx.mu, r);
    const t0 = Math.max(from.t + 60, depart - T);
    const dv = [0, 0, 0];
    let best = Infinity;
    let bestT = depart;
    for (let k = 0; k <= DEPARTURE_SCAN; k++) {
      const t = t0 + ((depart - t0) * k) / DEPARTURE_SCAN;
      const s = propagateKepler(bx.mu, from.state, t - from.t);
      try {
        solveBurn({ system, central: x, t, state: s }, { kind: 'transfer', to: by.id, arrive }, dv);
      } catch {
        continue;
      }
      const m = norm(dv);
      if (m < best) {
        best = m;
        bestT = t;
      }
    }
    depart = bestT;
  }
  const burn = (name: string, t: number | null, periapsisAltitude?: number): PlanEvent => ({
    type: 'burn',
    id: eventId(draft, name),
    name,
    t,
    frame: 'vnb',
    dv: [0, 0, 0],
    solve: periapsisAltitude === undefined ? { kind: 'transfer', to: by.id, arrive } : { kind: 'transfer', to: by.id, arrive, periapsisAltitude },
    mode: 'impulsive',
    pointing: 'velocity',
  });
  const push = (e: PlanEvent): void => {
    draft.events.push(e);
  };
  push(burn(`Departure from ${bx.name}`, depart));
  push({ type: 'coast', id: eventId(draft, `Leave ${bx.name}`), name: `Leave ${bx.name}`, until: { kind: 'soi-change' } });
  push({ type: 'coast', id: eventId(draft, 'Cruise'), name: 'Cruise', until: { kind: 'duration', dt: Math.min(3 * 86400, 0.1 * (arrive - depart)) } });
  push(burn('Mid-course correction', null, aim.altitude));
  push({ type: 'coast', id: eventId(draft, `Approach ${by.name}`), name: `Approach ${by.name}`, until: { kind: 'periapsis', body: by.id } });
  const rArr = by.radius + aim.altitude;
  return {
    window,
    depart,
    arrive,
    dvDepart: window.dvDepart,
    vArrive: Math.sqrt(window.vInfArrive * window.vInfArrive + (2 * by.mu) / rArr),
  };
}
