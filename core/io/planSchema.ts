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
 * - `checkDocumentAgainstSystem(doc, system)` once the system is known: every body id exists, the
 *   start and target orbits clear the body's surface (errors) and its minimum safe altitude
 *   (warnings).
 * Paths use the FILE's field names (`events[2].dv_mps[0]`, `start.periapsis_altitude_m`),
 * since that is what the user edits.
 */

import type { ValidationIssue } from '../math/index.ts';
import { MAX_PLAN_SPEED, MAX_START_DISTANCE } from '../plan/index.ts';
import { MIN_BURNOUT_FRACTION, MIN_STAGE_THRUST } from '../plan/index.ts';
import { MAX_PLAN_YEARS_FROM_EPOCH, type StarSystem } from '../system/index.ts';
import type { PlanDocument } from './planFileShape.ts';

export type {
  BurnEventDocument,
  CoastEventDocument,
  EventDocument,
  ParkingStartDocument,
  PlanDocument,
  PlanSystemDocument,
  ResolvedBurnDocument,
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

/** The schema's bound on masses (planFileShape.ts MASS_MAX; zod is not loaded at run time). */
const SCHEMA_MASS_MAX = 1e12;

type Loose = Record<string, unknown>;
const record = (x: unknown): Loose | null => (typeof x === 'object' && x !== null && !Array.isArray(x) ? (x as Loose) : null);
const num = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);
const str = (x: unknown): x is string => typeof x === 'string';
const vec = (x: unknown): x is [number, number, number] => Array.isArray(x) && x.length === 3 && x.every(num);
const list = (x: unknown): unknown[] => (Array.isArray(x) ? x : []);

/**
 * Semantic checks of a plan document (no system needed). Written for a schema-valid document,
 * it reads every value defensively, so it also runs on one the schema refused and checks the
 * parts that are well-formed (a file's problems are all reported at once; a value the schema
 * refused is skipped).
 */
export function checkPlanDocument(doc: PlanDocument): ValidationIssue[] {
  const issues: ValidationIssue[] = [];
  const d = (record(doc) ?? {}) as Loose;

  // Vehicle.
  const v = record(d.vehicle);
  const stages = list(v?.stages).map(record);
  if (v) {
    let mass = num(v.payload_kg) ? v.payload_kg : Number.NaN;
    stages.forEach((s, k) => {
      mass += s && num(s.dry_kg) && num(s.propellant_kg) ? s.dry_kg + s.propellant_kg : Number.NaN;
      if (s?.propellant_kg === 0) issues.push(warn(`vehicle.stages[${k}].propellant_kg`, 'is 0: the stage cannot burn'));
      if (s && num(s.thrust_N) && s.thrust_N > 0 && !(s.thrust_N >= MIN_STAGE_THRUST))
        issues.push(err(`vehicle.stages[${k}].thrust_N`, `must be at least ${MIN_STAGE_THRUST} N`));
    });
    const last = stages[stages.length - 1];
    // Mass rules only when every mass is one the schema accepts (a refused mass is reported once, by the schema).
    const accepted = (x: unknown): boolean => num(x) && x >= 0 && x <= SCHEMA_MASS_MAX;
    if (Number.isNaN(mass) || !accepted(v.payload_kg) || stages.some((s) => !s || !accepted(s.dry_kg) || !accepted(s.propellant_kg))) {
      // skipped: a mass is missing or refused by the schema
    } else if (!(mass > 0)) issues.push(err('vehicle', 'must have a total mass > 0 (payload, dry and propellant masses are all 0)'));
    else if (last && !((v.payload_kg as number) + (last.dry_kg as number) >= MIN_BURNOUT_FRACTION * mass)) {
      // the evaluator's rule (vehicle.ts checkVehicle): enough must be left when the propellant is gone
      issues.push(
        err(
          'vehicle.payload_kg',
          `plus the last stage's dry_kg (vehicle.stages[${stages.length - 1}].dry_kg) must be > 0 and at least ${MIN_BURNOUT_FRACTION} of the total mass (the burnout mass)`,
        ),
      );
    }
    const stageNames = new Map<string, number>();
    stages.forEach((s, k) => {
      if (!s || !str(s.name)) return;
      const first = stageNames.get(s.name);
      if (first !== undefined) issues.push(warn(`vehicle.stages[${k}].name`, `repeats the name of vehicle.stages[${first}]; budget rows name stages`));
      else stageNames.set(s.name, k);
    });
  }

  // Start.
  const start = record(d.start);
  if (start?.kind === 'state') {
    if (vec(start.r_m) && start.r_m.every((x) => x === 0)) issues.push(err('start.r_m', 'must not be the zero vector'));
    // Magnitudes the evaluator refuses (checkPlan.ts): past them the state's squares overflow.
    if (vec(start.r_m) && !(Math.hypot(...start.r_m) <= MAX_START_DISTANCE)) {
      issues.push(err('start.r_m', `must have a magnitude of at most ${MAX_START_DISTANCE} m`));
    }
    if (vec(start.v_mps) && !(Math.hypot(...start.v_mps) <= MAX_PLAN_SPEED)) {
      issues.push(err('start.v_mps', `must have a magnitude of at most ${MAX_PLAN_SPEED} m/s`));
    }
  }

  // Events: unique ids, explicit times in order, staging within the stage count.
  const ids = new Map<string, number>();
  let lastTime = start && num(start.epoch_s) ? start.epoch_s : Number.NEGATIVE_INFINITY;
  let lastTimePath = 'start.epoch_s';
  let drops = 0;
  list(d.events).forEach((x, k) => {
    const ev = record(x);
    if (!ev) return;
    const at = `events[${k}]`;
    if (str(ev.id)) {
      const first = ids.get(ev.id);
      if (first !== undefined) issues.push(err(`${at}.id`, `must be unique ("${ev.id}" is also the id of events[${first}])`));
      else ids.set(ev.id, k);
    }

    const inOrder = (t: unknown, path: string): void => {
      if (!num(t)) return;
      if (t < lastTime) issues.push(err(path, `must not be earlier than ${lastTimePath} (${lastTime} s)`));
      else {
        lastTime = t;
        lastTimePath = path;
      }
    };

    if (ev.type === 'burn') {
      inOrder(ev.t_s, `${at}.t_s`);
      if (vec(ev.dv_mps) && !(Math.hypot(...ev.dv_mps) <= MAX_PLAN_SPEED))
        issues.push(err(`${at}.dv_mps`, `must have a magnitude of at most ${MAX_PLAN_SPEED} m/s`));
      const solve = ev.solve === undefined ? { kind: 'fixed' } : (record(ev.solve) ?? {});
      if (solve.kind === 'transfer' && num(solve.arrive_s) && Number.isFinite(lastTime)) {
        if (!(solve.arrive_s > lastTime)) issues.push(err(`${at}.solve.arrive_s`, `must be later than ${lastTimePath} (${lastTime} s)`));
      }
      if (solve.kind === 'fixed' && vec(ev.dv_mps) && ev.dv_mps.every((x) => x === 0)) issues.push(warn(`${at}.dv_mps`, 'is zero: the burn changes nothing'));
    } else if (ev.type === 'coast') {
      const u = record(ev.until);
      if (u?.kind === 'time') inOrder(u.t_s, `${at}.until.t_s`);
    } else if (ev.type === 'stage') {
      drops++;
      if (v && Array.isArray(v.stages) && drops > stages.length) {
        issues.push(err(at, `drops a stage but none is left (the vehicle has ${stages.length} stage${stages.length === 1 ? '' : 's'})`));
      }
    }
  });
  if (num(d.end_s) && d.end_s < lastTime) {
    issues.push(err('end_s', `must not be earlier than ${lastTimePath} (${lastTime} s)`));
  }

  // Target.
  const tg = record(d.target);
  if (tg) {
    const hasE = tg.e !== undefined && tg.e !== null;
    const hasApo = tg.apoapsis_altitude_m !== undefined && tg.apoapsis_altitude_m !== null;
    if (hasE && hasApo) issues.push(err('target', 'must give "e" or "apoapsis_altitude_m", not both'));
    if (num(tg.apoapsis_altitude_m) && num(tg.periapsis_altitude_m) && tg.apoapsis_altitude_m < tg.periapsis_altitude_m) {
      issues.push(err('target.apoapsis_altitude_m', `must be >= target.periapsis_altitude_m (${tg.periapsis_altitude_m} m)`));
    }
  }
  return issues;
}

/**
 * Checks of a plan document against the system it flies in: every body id exists; the start
 * and target orbits clear the body's surface (error) and its minimum safe altitude (warning).
 * Reads the document defensively like `checkPlanDocument`, so it runs on a document the schema
 * refused too (values of the wrong kind are skipped). Paths in the plan file's field names.
 */
export function checkDocumentAgainstSystem(doc: unknown, system: StarSystem): ValidationIssue[] {
  const issues: ValidationIssue[] = [];
  const d = record(doc) ?? {};
  const known = system.bodies.map((b) => b.id).join(', ');
  const body = (path: string, id: string): number => {
    const k = Object.hasOwn(system.indexById, id) ? system.indexById[id] : -1;
    if (k < 0) issues.push(err(path, `names no body of system "${system.name}" (got "${id}"; the bodies are: ${known})`));
    return k;
  };

  // Every absolute time the plan names, within MAX_PLAN_YEARS_FROM_EPOCH calendar years of the epoch.
  const cal = system.calendar;
  const span = MAX_PLAN_YEARS_FROM_EPOCH * cal.yearLength;
  const era = cal.era ? ` ${cal.era}` : '';
  const nearEpoch = (path: string, t: unknown): void => {
    if (!num(t) || Math.abs(t) <= span) return;
    const year = cal.yearAtEpoch + Math.floor(t / cal.yearLength);
    issues.push(
      err(
        path,
        `falls in year ${year}${era}, more than ${MAX_PLAN_YEARS_FROM_EPOCH.toLocaleString('en-US')} years from the epoch of ${system.name} (year ${cal.yearAtEpoch}${era}); Waymark flies plans within years ${cal.yearAtEpoch - MAX_PLAN_YEARS_FROM_EPOCH} to ${cal.yearAtEpoch + MAX_PLAN_YEARS_FROM_EPOCH}`,
      ),
    );
  };

  const s = record(d.start);
  if (s) nearEpoch('start.epoch_s', s.epoch_s);
  const sb = s && str(s.body) ? body('start.body', s.body) : -1;
  if (s && sb >= 0) {
    const b = system.bodies[sb];
    if (s.kind === 'parking' && num(s.periapsis_altitude_m)) {
      const h = s.periapsis_altitude_m;
      const e = s.e === undefined ? 0 : s.e;
      const rp = b.radius + h;
      if (!(rp > 0)) issues.push(err('start.periapsis_altitude_m', `must be > -${b.radius} m (the mean radius of ${b.name})`));
      else {
        if (h < b.safeAlt) issues.push(warn('start.periapsis_altitude_m', `is below the minimum safe altitude of ${b.name} (${b.safeAlt} m)`));
        if (num(e) && e >= 0 && e < 1 && (rp * (1 + e)) / (1 - e) > b.derived.soiRadius) {
          issues.push(warn('start', `the parking orbit reaches beyond the sphere of influence of ${b.name} (${b.derived.soiRadius} m)`));
        }
      }
    } else if (s.kind === 'state' && vec(s.r_m)) {
      const r = Math.hypot(s.r_m[0], s.r_m[1], s.r_m[2]);
      if (r <= b.radius) issues.push(err('start.r_m', `is inside ${b.name} (|r| = ${r} m, mean radius ${b.radius} m)`));
      else if (r > b.derived.soiRadius) issues.push(warn('start.r_m', `is outside the sphere of influence of ${b.name} (${b.derived.soiRadius} m)`));
    }
  }

  list(d.events).forEach((x, k) => {
    const ev = record(x);
    if (!ev) return;
    const solve = record(ev.solve);
    nearEpoch(`events[${k}].t_s`, ev.t_s);
    if (solve) nearEpoch(`events[${k}].solve.arrive_s`, solve.arrive_s);
    if (ev.type === 'burn' && solve?.kind === 'transfer' && str(solve.to)) {
      const to = body(`events[${k}].solve.to`, solve.to);
      if (to === 0) issues.push(err(`events[${k}].solve.to`, 'must name a body, not the star'));
      const h = solve.periapsis_altitude_m;
      if (to > 0 && num(h)) {
        const b = system.bodies[to];
        if (!(b.radius + h > 0)) issues.push(err(`events[${k}].solve.periapsis_altitude_m`, `must be > -${b.radius} m (the mean radius of ${b.name})`));
        else if (h < b.safeAlt)
          issues.push(warn(`events[${k}].solve.periapsis_altitude_m`, `is below the minimum safe altitude of ${b.name} (${b.safeAlt} m)`));
      }
    }
    const u = record(ev.until);
    if (u?.kind === 'time') nearEpoch(`events[${k}].until.t_s`, u.t_s);
    if (ev.type === 'coast' && u && (u.kind === 'periapsis' || u.kind === 'apoapsis') && str(u.body)) {
      body(`events[${k}].until.body`, u.body);
    }
  });

  const tg = record(d.target);
  if (tg && str(tg.body)) {
    const tb = body('target.body', tg.body);
    if (tb >= 0 && num(tg.periapsis_altitude_m)) {
      const b = system.bodies[tb];
      if (!(b.radius + tg.periapsis_altitude_m > 0)) {
        issues.push(err('target.periapsis_altitude_m', `must be > -${b.radius} m (the mean radius of ${b.name})`));
      } else if (tg.periapsis_altitude_m < b.safeAlt) {
        issues.push(warn('target.periapsis_altitude_m', `is below the minimum safe altitude of ${b.name} (${b.safeAlt} m)`));
      }
    }
  }
  return issues;
}
