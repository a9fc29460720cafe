/**
 * The 'to-moon' hop: from an orbit of a body P to its moon M, inside P's sphere of influence.
 *
 * Search: the ship's own conic is scanned — MOON_COAST_STEPS coast times over one revolution
 * of its orbit × MOON_TOF_STEPS times of flight from 5 % to 160 % of the Hohmann time
 * π√(((a_ship + a_M)/2)³/μ_P) — and each pair solved by Lambert (Izzo 2015, core/orbit) from the
 * ship's position to the moon's centre at arrival. The cost of a pair is the transfer burn
 * |v₁ − v_ship| plus the capture at M from the arrival v∞ (v_p = √(v∞² + 2μ_M/r_p), Curtis
 * eq. 8.42 — from memory, less the captured orbit's periapsis speed), as the porkchop's
 * FROM_PARENT geometry counts them (core/search/transfer.ts) but from the ship's actual state
 * rather than an ideal 180° departure point. The cheapest pair is taken: for a circular moon
 * orbit and a ship in a circular orbit this is the Hohmann-like transfer, phased so the ship
 * arrives where the moon is (the departure is the coast time into the ship's orbit).
 *
 * Events: a coast of the chosen duration, a direct 'transfer' burn to M aimed at the arrival
 * periapsis altitude (core/conic solveBurn: Lambert from the ship's position, aimed off the
 * moon's centre by the impact parameter), halfway a mid-course 'transfer' burn to the same aim
 * (zero in patched conics; in n-body it gives the targeter a burn near the moon — without it a
 * route from Tessel to Quill is not met in n-body, with it it is), the coast to periapsis at M,
 * then the arrival burns.
 */
import { SolverError } from '../math/index.ts';
import { propagateKepler, solveLambert, type LambertSolution } from '../orbit/index.ts';
import { bodyState } from '../system/index.ts';
import type { PlanEvent } from '../plan/index.ts';
import { conicInfo } from '../conic/index.ts';
import { eventId, type Draft, type Situation } from './draft.ts';
import type { ArrivalAim } from './arrive.ts';

export const MOON_COAST_STEPS = 48;
export const MOON_TOF_STEPS = 32;
/**
 * An aim offset B at the moon tilts the arc's plane by about atan(B / (r₂ sin θ)) (θ the transfer
 * angle, r₂ the moon's distance): pairs with B ≥ PLANE_SWING · r₂ sin θ (a tilt over ≈ 6°, near
 * a 180° transfer where the plane is undefined) are skipped — there the solved burn can take
 * another plane than the search saw (a 10 km/s burn for a 3.5 km/s transfer).
 */
export const PLANE_SWING = 0.1;

export interface MoonLeg {
  depart: number;
  arrive: number;
  dvDepart: number;
  /** Arrival periapsis speed at the aim altitude, m/s. */
  vArrive: number;
  cost: number;
}

/** The cheapest transfer from the ship's conic at `from` to moon m (see the module comment). */
export function searchMoonTransfer(draft: Draft, from: Situation, m: number, aim: ArrivalAim, signal?: { aborted: boolean }): MoonLeg {
  const system = draft.system;
  const P = from.central;
  const mu = system.bodies[P].mu;
  const moon = system.bodies[m];
  const info = conicInfo(mu, from.state);
  if (!(info.alpha > 0)) throw new SolverError('route', 'no-solution', `the ship is not in a closed orbit of ${system.bodies[P].name}`);
  const aShip = 1 / info.alpha;
  const aMoon = moon.elements?.a ?? 0;
  const tH = Math.PI * Math.sqrt(((aShip + aMoon) / 2) ** 3 / mu);
  const rArr = moon.radius + aim.altitude;
  const vCap = Math.sqrt((moon.mu * (1 + aim.e)) / rArr);
  const m6 = new Float64Array(6);
  let best: MoonLeg | null = null;
  for (let i = 0; i < MOON_COAST_STEPS; i++) {
    if (signal?.aborted) throw new SolverError('route', 'cancelled', 'cancelled while searching the transfer to the moon');
    const dt = (info.period * i) / MOON_COAST_STEPS;
    const s = propagateKepler(mu, from.state, dt);
    for (let j = 0; j < MOON_TOF_STEPS; j++) {
      const tof = tH * (0.05 + (1.55 * j) / (MOON_TOF_STEPS - 1));
      const ta = from.t + dt + tof;
      bodyState(system, m, ta, m6, P);
      let sol: LambertSolution | undefined;
      try {
        sol = solveLambert(mu, [s[0], s[1], s[2]], [m6[0], m6[1], m6[2]], tof)[0];
      } catch {
        continue;
      }
      if (!sol) continue;
      // the burn aims off the moon's centre by B on the side v̂∞ × ẑ (core/conic solveBurn): the
      // pair is costed on that arc, and refused when the offset can swing the arc's plane
      const vix = sol.v2[0] - m6[3];
      const viy = sol.v2[1] - m6[4];
      const viz = sol.v2[2] - m6[5];
      const vi = Math.hypot(vix, viy, viz);
      if (!(vi > 0)) continue;
      const B = rArr * Math.sqrt(1 + (2 * moon.mu) / (rArr * vi * vi));
      const r2 = Math.hypot(m6[0], m6[1], m6[2]);
      const cx = s[1] * m6[2] - s[2] * m6[1];
      const cy = s[2] * m6[0] - s[0] * m6[2];
      const cz = s[0] * m6[1] - s[1] * m6[0];
      const sinAngle = Math.hypot(cx, cy, cz) / (Math.hypot(s[0], s[1], s[2]) * r2);
      if (!(B < PLANE_SWING * r2 * sinAngle)) continue;
      let bx = viy;
      let by = -vix;
      let bz = 0;
      if (Math.hypot(bx, by) < 1e-9 * vi) {
        bx = 0;
        by = viz;
        bz = -viy;
      }
      const bn = Math.hypot(bx, by, bz);
      try {
        sol = solveLambert(mu, [s[0], s[1], s[2]], [m6[0] + (B * bx) / bn, m6[1] + (B * by) / bn, m6[2] + (B * bz) / bn], tof)[0];
      } catch {
        continue;
      }
      if (!sol) continue;
      const dv1 = Math.hypot(sol.v1[0] - s[3], sol.v1[1] - s[4], sol.v1[2] - s[5]);
      const vinf = Math.hypot(sol.v2[0] - m6[3], sol.v2[1] - m6[4], sol.v2[2] - m6[5]);
      const vp = Math.sqrt(vinf * vinf + (2 * moon.mu) / rArr);
      const cost = dv1 + Math.abs(vp - vCap);
      if (Number.isFinite(cost) && (!best || cost < best.cost)) best = { depart: from.t + dt, arrive: ta, dvDepart: dv1, vArrive: vp, cost };
    }
  }
  if (!best) throw new SolverError('route', 'no-solution', `no transfer to ${moon.name} found from the ship's orbit`);
  return best;
}

/** Adds the hop's events (up to the coast to the arrival periapsis at the moon) to the draft. */
export function toMoonEvents(draft: Draft, from: Situation, m: number, leg: MoonLeg, aim: ArrivalAim): void {
  const moon = draft.system.bodies[m];
  const push = (e: PlanEvent): void => {
    draft.events.push(e);
  };
  if (leg.depart > from.t + 1)
    push({ type: 'coast', id: eventId(draft, 'Coast to the transfer point'), name: 'Coast to the transfer point', until: { kind: 'time', t: leg.depart } });
  const name = `Transfer to ${moon.name}`;
  push({
    type: 'burn',
    id: eventId(draft, name),
    name,
    t: null,
    frame: 'vnb',
    dv: [0, 0, 0],
    solve: { kind: 'transfer', to: moon.id, arrive: leg.arrive, periapsisAltitude: aim.altitude },
    mode: 'impulsive',
    pointing: 'velocity',
  });
  // halfway, a mid-course burn re-aims the arrival (0 in patched conics; in other models the
  // targeter's handle near the moon)
  push({
    type: 'coast',
    id: eventId(draft, 'Coast to mid-course'),
    name: 'Coast to mid-course',
    until: { kind: 'duration', dt: 0.5 * (leg.arrive - leg.depart) },
  });
  const mid = `Mid-course correction to ${moon.name}`;
  push({
    type: 'burn',
    id: eventId(draft, mid),
    name: mid,
    t: null,
    frame: 'vnb',
    dv: [0, 0, 0],
    solve: { kind: 'transfer', to: moon.id, arrive: leg.arrive, periapsisAltitude: aim.altitude },
    mode: 'impulsive',
    pointing: 'velocity',
  });
  push({ type: 'coast', id: eventId(draft, `Approach ${moon.name}`), name: `Approach ${moon.name}`, until: { kind: 'periapsis', body: moon.id } });
}
