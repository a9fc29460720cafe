/**
 * A plan split into legs for targeting, leg by leg in order: each leg's goals are met with the
 * burns before them (and after the previous leg's goals), so a later leg never undoes an earlier
 * one.
 *
 * The legs come from the reference flight (the plan's patched-conic evaluation with impulsive
 * burns: the designer's intent, where its Lambert arcs aim). A leg ends at an arrival: the ship enters a
 * body's sphere of influence and then burns there (a capture or a departure onward). The goals of
 * an arrival leg are that arrival as the reference flies it: its B-plane point (B·T, B·R on the
 * reference hyperbola's axes, which fixes the approach's periapsis altitude and inclination) read
 * from the approach conic halfway from the SOI entry to the periapsis, and — when the arrival time
 * is held — its periapsis time. Not holding it is cheaper (the demo's n-body arrival comes 12.5 h
 * early; holding the date costs tens of m/s more); a timed schedule is then shifted by the
 * difference (targetPlan), so burns timed after the arrival still fire where planned. The last
 * leg's goals are the plan's target orbit at the end of the plan; an eccentricity goal on a closed orbit is aimed as the
 * apoapsis altitude it gives (smooth where the eccentricity is not, e.g. at a circular target).
 *
 * A flyby leg (the plan marks the body with a 'flyby' event, plan.ts FlybyEvent) ends at a pass
 * through that body's sphere with no burn inside it (an unpowered flyby): its goals are those of
 * an arrival leg — the B-plane point and the periapsis time of the pass — met by the burns before
 * it, so the leg after it starts from the pass the designer planned. (A powered flyby burns at
 * the periapsis and is an arrival leg already.)
 *
 * Tolerances: the caller's (TargetTolerances); a B-plane tolerance is the altitude tolerance
 * carried through |B| = √(r_p² + 2μ r_p / v∞²) (so dB/dr_p = (r_p + μ/v∞²)/|B|).
 */
import { InputError } from '../math/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';
import type { Plan, PlanResult } from '../plan/index.ts';
import { conicInfo } from '../conic/index.ts';
import { conicStateRelativeTo } from './modelFlight.ts';
import { bPlane, bPlaneAxes } from '../nbody/index.ts';
import type { FlightGoal } from './measure.ts';

const DEG = Math.PI / 180;
const DAY = 86400;

/** How close the targeter brings each kind of goal (SI). */
export interface TargetTolerances {
  /** Altitudes (periapsis, apoapsis, arrival periapsis through the B-plane), m. */
  altitude: number;
  /** Inclination, rad. */
  i: number;
  /** Eccentricity (when not aimed as an apoapsis). */
  e: number;
  /** Arrival periapsis time, s. */
  time: number;
}

/** Defaults: far inside the plan's own "reached" tolerances, so every model agrees on "reached". */
export const DEFAULT_TARGET_TOLERANCES: TargetTolerances = { altitude: 100, i: 0.001 * DEG, e: 1e-5, time: 60 };

export interface Leg {
  /** "arrival at Ochre", "final orbit about Ochre". */
  name: string;
  kind: 'arrival' | 'final';
  /** Body arrived at (or orbited at the end). */
  body: number;
  /** Ids of the burns whose Δv the leg varies, in plan order. */
  burns: string[];
  goals: FlightGoal[];
  /**
   * Arrival legs: a coarse aim met first — the ship's position relative to the body at the
   * reference SOI entry time, within the body's radius per axis — so that the B-plane and time goals
   * start where they are nearly linear (far misses bend them); empty for the final leg.
   */
  coarse: FlightGoal[];
  /**
   * Arrival legs aimed by the designer (TargetOptions.goals): the periapsis altitude and
   * inclination aimed at, the side of the B-plane and the tolerance on the B-plane miss.
   */
  aim?: { altitude: number; i: number; side: 1 | -1; tolerance: number };
  /** Arrival legs: the periapsis time there as a goal (among `goals` only when the arrival time is held). */
  timeGoal: FlightGoal | null;
  /** Probe times the goals read (arrival legs: the reference periapsis time). */
  probes: number[];
  /**
   * The reference arrival (arrival legs): the probe time of its B-plane, its periapsis altitude,
   * inclination and v∞ (m/s); the late probe time (1 % of the approach before the periapsis and
   * before the burn there starts), the side of the B-plane it passes (sign of sin θ) and the
   * B-plane tolerance.
   */
  reference: { t: number; altitude: number; i: number; vinf: number; late: number; side: 1 | -1; bTol: number } | null;
}

const s6 = new Float64Array(6);
/** The legs of `plan` from its reference flight (see the module comment). */
export function planLegs(system: StarSystem, plan: Plan, reference: PlanResult, tol: TargetTolerances = DEFAULT_TARGET_TOLERANCES, arrivalTime = true): Leg[] {
  const rows = new Map(reference.budget.rows.map((r) => [r.planEventId, r]));
  const burnCentral = new Map<string, number>();
  for (const e of reference.events) if ((e.kind === 'burn' || e.kind === 'burn-start') && e.planEventId !== null) burnCentral.set(e.planEventId, e.central);
  const burns = plan.events.filter((e) => e.type === 'burn' && rows.has(e.id)).map((e) => e.id);
  if (burns.length === 0) throw new InputError('plan.events', 'must hold at least one burn the flight reaches: there is nothing to target with', plan.name);
  const entries = reference.events.filter((e) => e.kind === 'soi-entry');
  const flybyBodies = new Set<number>();
  for (const e of plan.events) if (e.type === 'flyby') flybyBodies.add(findBodyIndex(system, e.body));
  const legs: Leg[] = [];
  let current: string[] = [];
  let since = reference.t0;
  let here = burnCentral.get(burns[0]) ?? -1;
  for (const id of burns) {
    const row = rows.get(id);
    const c = burnCentral.get(id) ?? -1;
    const tb = row ? row.tStart : Number.POSITIVE_INFINITY;
    let entry = c !== here && c > 0 ? entries.find((e) => e.central === c && e.t > since && e.t <= tb) : undefined;
    let k = c;
    let tEnd = tb;
    let flyby = false;
    if (!entry && flybyBodies.size > 0) {
      // an unpowered pass of a marked flyby body, entered and left before this burn
      const pass = entries.find((e) => flybyBodies.has(e.central) && e.central !== c && e.t > since && e.t <= tb);
      const exit = pass ? reference.events.find((e) => e.kind === 'soi-exit' && e.central === pass.central && e.t > pass.t) : undefined;
      if (pass && exit && exit.t <= tb) {
        entry = pass;
        k = pass.central;
        tEnd = exit.t;
        flyby = true;
      }
    }
    if (entry && current.length > 0) {
      const leg = arrivalLeg(system, reference, k, entry.t, tEnd, current, tol, arrivalTime, flyby);
      if (leg) legs.push(leg);
      else if (legs.length > 0) legs[legs.length - 1].burns.push(...current);
      current = [];
      since = entry.t;
    }
    if (c > 0 || here < 0) here = c;
    current.push(id);
  }
  const final = finalLeg(system, plan, current, tol);
  if (final) legs.push(final);
  else if (current.length > 0 && legs.length > 0) legs[legs.length - 1].burns.push(...current);
  return legs;
}

function arrivalLeg(
  system: StarSystem,
  ref: PlanResult,
  k: number,
  tEntry: number,
  tBurn: number,
  burns: string[],
  tol: TargetTolerances,
  arrivalTime: boolean,
  flyby = false,
): Leg | null {
  const body = system.bodies[k];
  const peri = ref.events.find((e) => e.kind === 'periapsis' && e.central === k && e.t >= tEntry && e.t <= tBurn + 1e-6);
  // probed halfway from the SOI entry to the periapsis (or the burn): on the approach conic, well
  // before any burn there — a finite capture burn starts minutes before the periapsis it is centred on
  const tPeri = peri ? peri.t : tBurn;
  const t = tEntry + 0.5 * (tPeri - tEntry);
  // the late probe: where an n-body approach is read once more (the star's pull bends an approach
  // through a large sphere of influence after the halfway point)
  const late = Math.min(tPeri, tBurn) - 0.01 * (tPeri - tEntry);
  const info = conicInfo(body.mu, conicStateRelativeTo(system, ref, k, t, s6));
  const axes = bPlaneAxes(info);
  const b = axes ? bPlane(info, axes) : null;
  if (!axes || !b) return null; // a closed approach has no B-plane: its goals go to the next leg
  const vinf2 = -info.mu * info.alpha;
  const dBdrp = (info.rp + info.mu / vinf2) / Math.max(b.b, 1);
  const bTol = tol.altitude * dBdrp;
  const name = flyby ? `flyby of ${body.name}` : `arrival at ${body.name}`;
  const T: [number, number, number] = [axes.T[0], axes.T[1], axes.T[2]];
  const R: [number, number, number] = [axes.R[0], axes.R[1], axes.R[2]];
  const timeGoal: FlightGoal = {
    kind: 'arrival-periapsis-time',
    body: k,
    at: t,
    name: `periapsis time at ${body.name}`,
    wanted: info.n > 0 ? t - info.M / info.n : t,
    tolerance: tol.time,
    units: 'days',
    unitScale: DAY,
  };
  const goals: FlightGoal[] = [
    { kind: 'arrival-bt', body: k, at: t, axes: { T, R }, name: `B·T at ${body.name}`, wanted: b.bt, tolerance: bTol, units: 'km', unitScale: 1000 },
    { kind: 'arrival-br', body: k, at: t, axes: { T, R }, name: `B·R at ${body.name}`, wanted: b.br, tolerance: bTol, units: 'km', unitScale: 1000 },
  ];
  if (arrivalTime) goals.push(timeGoal);
  const pos = conicStateRelativeTo(system, ref, k, tEntry, s6);
  const coarse: FlightGoal[] = (['x', 'y', 'z'] as const).map((a, axis) => ({
    kind: 'position',
    body: k,
    at: tEntry,
    axis: axis as 0 | 1 | 2,
    name: `${a} from ${body.name} at the SOI entry`,
    wanted: pos[axis],
    tolerance: body.radius,
    units: 'km',
    unitScale: 1000,
  }));
  return {
    name,
    kind: 'arrival',
    body: k,
    burns: [...burns],
    goals,
    coarse,
    timeGoal,
    probes: [tEntry, t, late],
    reference: { t, altitude: info.rp - body.radius, i: info.i, vinf: Math.sqrt(vinf2), late, side: b.br >= 0 ? 1 : -1, bTol },
  };
}

/** The final leg's goals: the plan's target orbit (none without a target). */
function finalLeg(system: StarSystem, plan: Plan, burns: string[], tol: TargetTolerances): Leg | null {
  const t = plan.target;
  if (!t || burns.length === 0) return null;
  const k = findBodyIndex(system, t.body);
  if (k < 0) throw new InputError('plan.target.body', 'must name a body of the system', t.body);
  const body = system.bodies[k];
  const goals: FlightGoal[] = finalGoals(plan, k, body.name, body.radius, tol);
  return { name: `final orbit about ${body.name}`, kind: 'final', body: k, burns: [...burns], goals, coarse: [], timeGoal: null, probes: [], reference: null };
}

/** The target orbit as goals on the final osculating orbit about body k. */
export function finalGoals(plan: Plan, k: number, bodyName: string, radius: number, tol: TargetTolerances): FlightGoal[] {
  const t = plan.target;
  if (!t) return [];
  const altTol = Math.min(tol.altitude, t.tolerance.periapsisAltitude);
  const goals: FlightGoal[] = [
    {
      kind: 'final-periapsis-altitude',
      body: k,
      name: `periapsis altitude about ${bodyName}`,
      wanted: t.periapsisAltitude,
      tolerance: altTol,
      units: 'km',
      unitScale: 1000,
    },
  ];
  if (t.apoapsisAltitude !== null) {
    goals.push({
      kind: 'final-apoapsis-altitude',
      body: k,
      name: `apoapsis altitude about ${bodyName}`,
      wanted: t.apoapsisAltitude,
      tolerance: altTol,
      units: 'km',
      unitScale: 1000,
    });
  } else if (t.e !== null && t.e < 1) {
    // r_a = r_p (1 + e)/(1 − e); dr_a/de = 2 r_p/(1 − e)²
    const rp = radius + t.periapsisAltitude;
    const eTol = Math.min(tol.e, t.tolerance.e);
    goals.push({
      kind: 'final-apoapsis-altitude',
      body: k,
      name: `apoapsis altitude about ${bodyName} (e = ${t.e})`,
      wanted: (rp * (1 + t.e)) / (1 - t.e) - radius,
      tolerance: (eTol * 2 * rp) / (1 - t.e) ** 2,
      units: 'km',
      unitScale: 1000,
    });
  } else if (t.e !== null) {
    goals.push({ kind: 'final-eccentricity', body: k, name: `eccentricity about ${bodyName}`, wanted: t.e, tolerance: Math.min(tol.e, t.tolerance.e) });
  }
  if (t.i !== null) {
    goals.push({
      kind: 'final-inclination',
      body: k,
      name: `inclination about ${bodyName}`,
      wanted: t.i,
      tolerance: Math.min(tol.i, t.tolerance.i),
      units: '°',
      unitScale: DEG,
    });
  }
  return goals;
}
