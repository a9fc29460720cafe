/**
 * Goals read from a flight in any model (modelFlight.ts): the quantities a designer targets.
 *
 * - Final orbit about a body (at the end of the plan): periapsis altitude, apoapsis altitude,
 *   eccentricity, inclination — the osculating conic of the ship's state relative to that body.
 * - Arrival at a body, from the ship's state relative to it at a probe time near the arrival (the
 *   osculating conic about the body there; a hyperbola on approach): B·T and B·R on fixed B-plane
 *   axes (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., §12.4, from memory —
 *   nearly linear in the burns even when the first flight misses by millions of kilometres, so the
 *   targeter aims arrivals there), the periapsis time, periapsis altitude (the closest approach of
 *   the approach conic), inclination and eccentricity.
 * - SOI entry time at a body.
 * - The ship's position relative to a body at a time (a coarse aim: nearly linear in the burns
 *   while the ship is far from the body).
 *
 * A goal the flight cannot give (an open final orbit has no apoapsis; no probe at that time; the
 * flight never enters that SOI; the ship hits a body first) raises SolverError('target',
 * 'no-solution') in words a designer understands: the solver counts it as a failed flight.
 */
import { InputError, SolverError } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import { conicInfo, createConicInfo } from '../conic/index.ts';
import { bPlane, bPlaneAxes, type BPlane } from '../nbody/index.ts';
import type { Goal } from './solve.ts';
import type { ModelFlight } from './modelFlight.ts';

export type MeasureKind =
  | 'final-periapsis-altitude'
  | 'final-apoapsis-altitude'
  | 'final-eccentricity'
  | 'final-inclination'
  | 'arrival-bt'
  | 'arrival-br'
  | 'arrival-periapsis-time'
  | 'arrival-periapsis-altitude'
  | 'arrival-inclination'
  | 'arrival-eccentricity'
  | 'soi-entry-time'
  /** A component (axis 0, 1, 2) of the ship's position relative to the body at the probe time. */
  | 'position'
  /**
   * The B-plane miss from an aim point given as a periapsis altitude and an inclination, along T
   * or R of the approach's own B-plane: the aim is recomputed from the flight's own v∞ and
   * asymptote, so reaching zero reaches that altitude and inclination exactly.
   */
  | 'arrival-aim-t'
  | 'arrival-aim-r';

/** Unit vectors T and R of a B-plane (inertial axes). */
export interface BPlaneAxes {
  T: [number, number, number];
  R: [number, number, number];
}

/** A goal on a flight: what is measured, about which body, when. */
export interface FlightGoal extends Goal {
  kind: MeasureKind;
  /** Body index the goal is about. */
  body: number;
  /** Arrival goals: the probe time (s) whose state is read. */
  at?: number;
  /** B·T, B·R goals: the B-plane axes they are measured on. */
  axes?: BPlaneAxes;
  /** 'position' goals: the axis (0 x, 1 y, 2 z). */
  axis?: 0 | 1 | 2;
  /** 'arrival-aim-*' goals: the aim (periapsis altitude m, inclination rad) and the B-plane angle side to keep (sign of sin θ). */
  aim?: { altitude: number; i: number; side: 1 | -1 };
}

const s6 = new Float64Array(6);
const info = createConicInfo();

function bodyName(system: StarSystem, k: number): string {
  return system.bodies[k]?.name ?? `body ${k + 1}`;
}

/** The goal's value (SI) in the flight; SolverError('target', 'no-solution') when the flight does not give it. */
export function measure(system: StarSystem, flight: ModelFlight, goal: FlightGoal): number {
  const body = system.bodies[goal.body];
  if (!body) throw new InputError('goal.body', 'must be a body of the system', goal.body);
  const name = bodyName(system, goal.body);
  const fail = (why: string): never => {
    throw new SolverError('target', 'no-solution', why, { goal: goal.name });
  };
  if (goal.kind === 'soi-entry-time') {
    for (const e of flight.entries) if (e.body === goal.body) return e.t;
    return fail(`the flight never enters the sphere of influence of ${name}`);
  }
  if (goal.kind.startsWith('final-')) {
    if (flight.impact) fail(`the ship hits ${bodyName(system, flight.impact.body)} before the end of the plan`);
    flight.endState(goal.body, s6);
    const c = conicInfo(body.mu, s6, info);
    switch (goal.kind) {
      case 'final-periapsis-altitude':
        return c.rp - body.radius;
      case 'final-eccentricity':
        return c.e;
      case 'final-inclination':
        return c.i;
      default:
        if (!Number.isFinite(c.ra)) fail(`the final orbit about ${name} is open (e = ${c.e.toPrecision(4)}): it has no apoapsis`);
        return c.ra - body.radius;
    }
  }
  if (goal.at === undefined || !flight.stateAt(goal.body, goal.at, s6)) return fail(`the flight gives no state near the arrival at ${name}`);
  if (flight.impact && flight.impact.t < goal.at) fail(`the ship hits ${bodyName(system, flight.impact.body)} before the arrival at ${name}`);
  if (goal.kind === 'position') return s6[goal.axis ?? 0];
  const c = conicInfo(body.mu, s6, info);
  switch (goal.kind) {
    case 'arrival-bt':
    case 'arrival-br': {
      const b: BPlane | null = bPlane(c, goal.axes ?? null);
      if (!b) return fail(`the approach to ${name} is not a hyperbola (e = ${c.e.toPrecision(4)}): no B-plane`);
      return goal.kind === 'arrival-bt' ? b.bt : b.br;
    }
    case 'arrival-periapsis-time': {
      if (!(c.n > 0)) return fail(`the approach to ${name} has no periapsis`);
      return goal.at - c.M / c.n;
    }
    case 'arrival-aim-t':
    case 'arrival-aim-r': {
      const own = bPlaneAxes(c);
      const b = own ? bPlane(c, own) : null;
      if (!own || !b || !goal.aim) return fail(`the approach to ${name} is not a hyperbola (e = ${c.e.toPrecision(4)}): no B-plane`);
      // aim point on the approach's own axes (see targetPlan.ts withArrivalGoals)
      const rp = body.radius + goal.aim.altitude;
      const v2 = -c.mu * c.alpha;
      const B = Math.sqrt(rp * rp + (2 * body.mu * rp) / v2);
      const cos = Math.max(-1, Math.min(1, -Math.cos(goal.aim.i) / own.R[2]));
      const th = Math.atan2(goal.aim.side * Math.sqrt(1 - cos * cos), cos);
      return goal.kind === 'arrival-aim-t' ? b.bt - B * Math.cos(th) : b.br - B * Math.sin(th);
    }
    case 'arrival-periapsis-altitude':
      return c.rp - body.radius;
    case 'arrival-inclination':
      return c.i;
    case 'arrival-eccentricity':
      return c.e;
    default:
      throw new InputError('goal.kind', 'must be a known goal kind', (goal as FlightGoal).kind);
  }
}
