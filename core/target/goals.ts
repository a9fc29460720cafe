/**
 * Goals read from a patched-conic flight of a plan (core/conic evaluate's PlanResult): the final
 * orbit's periapsis altitude, apoapsis altitude, eccentricity and inclination at the plan's target
 * body, and the time the flight enters a body's sphere of influence.
 *
 * A goal the flight cannot give (the ship does not end about the target body, the final orbit is
 * open so it has no apoapsis, the flight never enters that body's SOI) raises SolverError
 * ('target', 'no-solution') in words a designer understands; the solver counts that as a failed
 * flight. Values are SI (m, rad, s); each goal carries its display unit (km, °, days).
 */
import { InputError, SolverError } from '../math/index.ts';
import type { Plan, PlanResult } from '../plan/index.ts';
import type { StarSystem } from '../system/index.ts';
import { findBodyIndex } from '../system/index.ts';
import type { Goal } from './solve.ts';

export type PlanGoalKind = 'periapsis-altitude' | 'apoapsis-altitude' | 'eccentricity' | 'inclination' | 'soi-entry-time';

/** A goal on a conic flight of a plan. `body` names the body for 'soi-entry-time'. */
export interface PlanGoal extends Goal {
  kind: PlanGoalKind;
  body?: string;
}

const DEG = Math.PI / 180;
const DAY = 86400;

/** The goal's value (SI) in a conic PlanResult; SolverError when the flight does not give it. */
export function planGoalValue(system: StarSystem, result: PlanResult, goal: PlanGoal): number {
  if (goal.kind === 'soi-entry-time') {
    const b = goal.body === undefined ? -1 : findBodyIndex(system, goal.body);
    if (b < 0) throw new InputError('goal.body', 'must name a body of the system', goal.body);
    // after an SOI entry the entered body is the central one
    for (const ev of result.events) if (ev.kind === 'soi-entry' && ev.central === b) return ev.t;
    throw new SolverError('target', 'no-solution', `the flight never enters the sphere of influence of ${system.bodies[b].name}`, { goal: goal.name });
  }
  const target = result.target;
  if (!target) throw new InputError('plan.target', 'must be set for a goal on the final orbit', goal.name);
  const achieved = target.achieved;
  const name = system.bodies[target.body]?.name ?? 'the target body';
  if (!achieved) throw new SolverError('target', 'no-solution', `the flight does not end in orbit about ${name}`, { goal: goal.name });
  switch (goal.kind) {
    case 'periapsis-altitude':
      return achieved.periapsisAltitude;
    case 'eccentricity':
      return achieved.e;
    case 'inclination':
      return achieved.i;
    case 'apoapsis-altitude':
      if (achieved.apoapsisAltitude === null) {
        throw new SolverError('target', 'no-solution', `the final orbit about ${name} is open (e = ${achieved.e.toPrecision(4)}): it has no apoapsis`, {
          goal: goal.name,
        });
      }
      return achieved.apoapsisAltitude;
    default:
      throw new InputError('goal.kind', 'must be a known plan goal', (goal as PlanGoal).kind);
  }
}

/** The goals a plan's target asks for (periapsis altitude always; apoapsis, e, i when set), with its tolerances. */
export function goalsFromTarget(plan: Plan): PlanGoal[] {
  const t = plan.target;
  if (!t) throw new InputError('plan.target', 'must be set to derive goals from it', null);
  const goals: PlanGoal[] = [
    {
      kind: 'periapsis-altitude',
      name: `periapsis altitude at ${t.body}`,
      wanted: t.periapsisAltitude,
      tolerance: t.tolerance.periapsisAltitude,
      units: 'km',
      unitScale: 1000,
    },
  ];
  if (t.apoapsisAltitude !== null) {
    // the target's periapsis tolerance serves the apoapsis too (the target has one altitude tolerance)
    goals.push({
      kind: 'apoapsis-altitude',
      name: `apoapsis altitude at ${t.body}`,
      wanted: t.apoapsisAltitude,
      tolerance: t.tolerance.periapsisAltitude,
      units: 'km',
      unitScale: 1000,
    });
  }
  if (t.e !== null) goals.push({ kind: 'eccentricity', name: `eccentricity at ${t.body}`, wanted: t.e, tolerance: t.tolerance.e });
  if (t.i !== null) goals.push({ kind: 'inclination', name: `inclination at ${t.body}`, wanted: t.i, tolerance: t.tolerance.i, units: '°', unitScale: DEG });
  return goals;
}

/** A goal on the time the flight enters a body's SOI (shown in days). */
export function soiEntryGoal(body: string, wanted: number, tolerance: number): PlanGoal {
  return { kind: 'soi-entry-time', body, name: `arrival at ${body}`, wanted, tolerance, units: 'days', unitScale: DAY };
}
