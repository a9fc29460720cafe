/**
 * The plan file's document types and the checks JSON Schema cannot express.
 *
 * `PlanDocument` is the plain-data shape of a version-1 plan file: unit-bearing field names
 * (`_m`, `_s`, `_mps`, `_kg`, `_N`), angles in DEGREES. The shape is declared once, in
 * planFileShape.ts (which also gives assets/schema/plan.schema.json); this module names its
 * types for the rest of the code without loading zod. planFile.ts converts a document to and
 * from the in-memory `Plan` (SI, radians).
 *
 * Two passes of semantic checks, both returning every issue found (errors and warnings):
 * - `checkPlanDocument(doc)` on a schema-valid document: unique event ids, a vehicle with mass
 *   (and a burnout mass), explicit times in order, target consistency, staging within the stage
 *   count, state and Δv magnitudes the evaluator accepts ...
 * - `checkPlanAgainstSystem(plan, system)` once the system is known: every body id exists, the
 *   start and target orbits clear the body's surface (errors) and its minimum safe altitude
 *   (warnings).
 * Paths use the FILE's field names (`events[2].dv_mps[0]`, `start.periapsis_altitude_m`),
 * since that is what the user edits.
 */

import type { ValidationIssue } from '../math/index.ts';
import { MAX_PLAN_SPEED, MAX_START_DISTANCE } from '../plan/index.ts';
import type { Plan } from '../plan/index.ts';
import { MIN_BURNOUT_FRACTION, MIN_STAGE_THRUST } from '../plan/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { PlanDocument } from './planFileShape.ts';

export type {
  BurnEventDocument,
  CoastEventDocument,
  EventDocument,
  ParkingStartDocument,
  PlanDocument,
  PlanSystemDocument,
  SolveDocument,
  StageDocument,
  StageEventDocument,
  StateStartDocument,
  TargetDocument,
  UntilDocument,
  VehicleDocument,
} from './planFileShape.ts';

// The format's tag and version, held to the declaration by the type checker.
export const PLAN_FORMAT = 'waymark-plan' satisfies PlanDocument['format'];
export const PLAN_VERSION = 1 satisfies PlanDocument['version'];

function err(path: string, rule: string): ValidationIssue {
  return { path, rule, severity: 'error' };
}

function warn(path: string, rule: string): ValidationIssue {
  return { path, rule, severity: 'warning' };
}

/** Semantic checks of a schema-valid plan document (no system needed). */
export function checkPlanDocument(doc: PlanDocument): ValidationIssue[] {
  const issues: ValidationIssue[] = [];

  // Vehicle.
  const v = doc.vehicle;
  let mass = v.payload_kg;
  v.stages.forEach((s, k) => {
    mass += s.dry_kg + s.propellant_kg;
    if (s.propellant_kg === 0) issues.push(warn(`vehicle.stages[${k}].propellant_kg`, 'is 0: the stage cannot burn'));
    if (!(s.thrust_N >= MIN_STAGE_THRUST)) issues.push(err(`vehicle.stages[${k}].thrust_N`, `must be at least ${MIN_STAGE_THRUST} N`));
  });
  if (!(mass > 0)) issues.push(err('vehicle', 'must have a total mass > 0 (payload, dry and propellant masses are all 0)'));
  else if (v.stages.length > 0 && !(v.payload_kg + v.stages[v.stages.length - 1].dry_kg >= MIN_BURNOUT_FRACTION * mass)) {
    // the evaluator's rule (vehicle.ts checkVehicle): enough must be left when the propellant is gone
    issues.push(
      err(
        'vehicle.payload_kg',
        `plus the last stage's dry_kg (vehicle.stages[${v.stages.length - 1}].dry_kg) must be > 0 and at least ${MIN_BURNOUT_FRACTION} of the total mass (the burnout mass)`,
      ),
    );
  }
  const stageNames = new Map<string, number>();
  v.stages.forEach((s, k) => {
    const first = stageNames.get(s.name);
    if (first !== undefined) issues.push(warn(`vehicle.stages[${k}].name`, `repeats the name of vehicle.stages[${first}]; budget rows name stages`));
    else stageNames.set(s.name, k);
  });

  // Start.
  const start = doc.start;
  if (start.kind === 'state' && start.r_m.every((x) => x === 0)) issues.push(err('start.r_m', 'must not be the zero vector'));
  // Magnitudes the evaluator refuses (checkPlan.ts): past them the state's squares overflow.
  if (start.kind === 'state' && !(Math.hypot(...start.r_m) <= MAX_START_DISTANCE)) {
    issues.push(err('start.r_m', `must have a magnitude of at most ${MAX_START_DISTANCE} m`));
  }
  if (start.kind === 'state' && !(Math.hypot(...start.v_mps) <= MAX_PLAN_SPEED)) {
    issues.push(err('start.v_mps', `must have a magnitude of at most ${MAX_PLAN_SPEED} m/s`));
  }

  // Events: unique ids, explicit times in order, staging within the stage count.
  const ids = new Map<string, number>();
  let lastTime = start.epoch_s;
  let lastTimePath = 'start.epoch_s';
  let drops = 0;
  doc.events.forEach((ev, k) => {
    const at = `events[${k}]`;
    const first = ids.get(ev.id);
    if (first !== undefined) issues.push(err(`${at}.id`, `must be unique ("${ev.id}" is also the id of events[${first}])`));
    else ids.set(ev.id, k);

    const inOrder = (t: number, path: string): void => {
      if (t < lastTime) issues.push(err(path, `must not be earlier than ${lastTimePath} (${lastTime} s)`));
      else {
        lastTime = t;
        lastTimePath = path;
      }
    };

    if (ev.type === 'burn') {
      if (ev.t_s !== null) inOrder(ev.t_s, `${at}.t_s`);
      if (!(Math.hypot(...ev.dv_mps) <= MAX_PLAN_SPEED)) issues.push(err(`${at}.dv_mps`, `must have a magnitude of at most ${MAX_PLAN_SPEED} m/s`));
      const solve = ev.solve ?? { kind: 'fixed' };
      if (solve.kind === 'transfer') {
        if (!(solve.arrive_s > lastTime)) issues.push(err(`${at}.solve.arrive_s`, `must be later than ${lastTimePath} (${lastTime} s)`));
      }
      if (solve.kind === 'fixed' && ev.dv_mps.every((x) => x === 0)) issues.push(warn(`${at}.dv_mps`, 'is zero: the burn changes nothing'));
    } else if (ev.type === 'coast') {
      if (ev.until.kind === 'time') inOrder(ev.until.t_s, `${at}.until.t_s`);
    } else {
      drops++;
      if (drops > v.stages.length) {
        issues.push(err(at, `drops a stage but none is left (the vehicle has ${v.stages.length} stage${v.stages.length === 1 ? '' : 's'})`));
      }
    }
  });
  if (doc.end_s !== undefined && doc.end_s !== null && doc.end_s < lastTime) {
    issues.push(err('end_s', `must not be earlier than ${lastTimePath} (${lastTime} s)`));
  }

  // Target.
  const tg = doc.target;
  if (tg) {
    const hasE = tg.e !== undefined && tg.e !== null;
    const hasApo = tg.apoapsis_altitude_m !== undefined && tg.apoapsis_altitude_m !== null;
    if (hasE && hasApo) issues.push(err('target', 'must give "e" or "apoapsis_altitude_m", not both'));
    if (hasApo && tg.apoapsis_altitude_m! < tg.periapsis_altitude_m) {
      issues.push(err('target.apoapsis_altitude_m', `must be >= target.periapsis_altitude_m (${tg.periapsis_altitude_m} m)`));
    }
  }
  return issues;
}

/**
 * Checks of a plan against the system it flies in: every body id exists; the start and target
 * orbits clear the body's surface (error) and its minimum safe altitude (warning). Paths in
 * the plan file's field names.
 */
export function checkPlanAgainstSystem(plan: Plan, system: StarSystem): ValidationIssue[] {
  const issues: ValidationIssue[] = [];
  const known = system.bodies.map((b) => b.id).join(', ');
  const body = (path: string, id: string): number => {
    const k = Object.hasOwn(system.indexById, id) ? system.indexById[id] : -1;
    if (k < 0) issues.push(err(path, `names no body of system "${system.name}" (got "${id}"; the bodies are: ${known})`));
    return k;
  };

  const s = plan.start;
  const sb = body('start.body', s.body);
  if (sb >= 0) {
    const b = system.bodies[sb];
    if (s.kind === 'parking') {
      const rp = b.radius + s.periapsisAltitude;
      if (!(rp > 0)) issues.push(err('start.periapsis_altitude_m', `must be > -${b.radius} m (the mean radius of ${b.name})`));
      else {
        if (s.periapsisAltitude < b.safeAlt) {
          issues.push(warn('start.periapsis_altitude_m', `is below the minimum safe altitude of ${b.name} (${b.safeAlt} m)`));
        }
        const ra = (rp * (1 + s.e)) / (1 - s.e);
        if (ra > b.derived.soiRadius) {
          issues.push(warn('start', `the parking orbit reaches beyond the sphere of influence of ${b.name} (${b.derived.soiRadius} m)`));
        }
      }
    } else {
      const r = Math.hypot(s.r[0], s.r[1], s.r[2]);
      if (r <= b.radius) issues.push(err('start.r_m', `is inside ${b.name} (|r| = ${r} m, mean radius ${b.radius} m)`));
      else if (r > b.derived.soiRadius) issues.push(warn('start.r_m', `is outside the sphere of influence of ${b.name} (${b.derived.soiRadius} m)`));
    }
  }

  plan.events.forEach((ev, k) => {
    if (ev.type === 'burn' && ev.solve.kind === 'transfer') {
      const to = body(`events[${k}].solve.to`, ev.solve.to);
      if (to === 0) issues.push(err(`events[${k}].solve.to`, 'must name a body, not the star'));
      const h = ev.solve.periapsisAltitude;
      if (to > 0 && h !== undefined) {
        const b = system.bodies[to];
        if (!(b.radius + h > 0)) issues.push(err(`events[${k}].solve.periapsis_altitude_m`, `must be > -${b.radius} m (the mean radius of ${b.name})`));
        else if (h < b.safeAlt)
          issues.push(warn(`events[${k}].solve.periapsis_altitude_m`, `is below the minimum safe altitude of ${b.name} (${b.safeAlt} m)`));
      }
    }
    if (ev.type === 'coast' && (ev.until.kind === 'periapsis' || ev.until.kind === 'apoapsis') && ev.until.body !== undefined) {
      body(`events[${k}].until.body`, ev.until.body);
    }
  });

  const tg = plan.target;
  if (tg) {
    const tb = body('target.body', tg.body);
    if (tb >= 0) {
      const b = system.bodies[tb];
      if (!(b.radius + tg.periapsisAltitude > 0)) {
        issues.push(err('target.periapsis_altitude_m', `must be > -${b.radius} m (the mean radius of ${b.name})`));
      } else if (tg.periapsisAltitude < b.safeAlt) {
        issues.push(warn('target.periapsis_altitude_m', `is below the minimum safe altitude of ${b.name} (${b.safeAlt} m)`));
      }
    }
  }
  return issues;
}
