/**
 * Input checks of an in-memory plan against a star system, before evaluation. The first problem
 * found throws InputError whose field is the path inside the plan, e.g. `events[2].dv[0]` or
 * `vehicle.stages[1].isp`, and whose rule says what is wrong. (The plan file reader reports every
 * problem of a file at once; this is the evaluator's own guard against bad data.)
 */
import { InputError, requireFinite } from '../math/index.ts';
import { findBodyIndex, MAX_EVENTS, MAX_STAGES, requireWithinLimit, type StarSystem } from '../system/index.ts';
import type { Plan, PlanEvent } from './plan.ts';
import { checkVehicle } from './vehicle.ts';

function obj(field: string, x: unknown): void {
  if (!x || typeof x !== 'object') throw new InputError(field, 'must be an object', x);
}

function nonNeg(field: string, x: number): void {
  requireFinite(field, x);
  if (!(x >= 0)) throw new InputError(field, 'must be >= 0', x);
}

function bodyId(system: StarSystem, field: string, id: unknown): number {
  if (typeof id !== 'string') throw new InputError(field, 'must be a body id (string)', id);
  const k = findBodyIndex(system, id);
  if (k < 0) throw new InputError(field, `must name a body of ${system.name} (known: ${system.bodies.map((b) => b.id).join(', ')})`, id);
  return k;
}

/**
 * Largest position magnitude of a state start, m: the system file's bound on semi-major axes
 * (1e17 m, about ten light-years). Beyond it squares of the state overflow the arithmetic.
 */
export const MAX_START_DISTANCE = 1e17;
/**
 * Largest speed (start velocity, burn Δv magnitude) in a plan, m/s: a sanity bound like the
 * plan file's others (1e12, 1e13), far past the speed of light (the model is Newtonian); it
 * keeps the arithmetic finite (a Δv of 1e308 m/s overflowed the budget to −Infinity).
 */
export const MAX_PLAN_SPEED = 1e13;

function vec3(field: string, v: unknown, max = Infinity, unit = ''): void {
  if (!Array.isArray(v) || v.length !== 3) throw new InputError(field, 'must be an array of 3 numbers', v);
  for (let i = 0; i < 3; i++) requireFinite(`${field}[${i}]`, v[i] as number);
  if (!(Math.hypot(v[0], v[1], v[2]) <= max)) throw new InputError(field, `must have a magnitude of at most ${max} ${unit}`.trim(), v);
}

function eccentricity(field: string, e: number): void {
  requireFinite(field, e);
  if (!(e >= 0 && e < 1)) throw new InputError(field, 'must be in [0, 1)', e);
}

function altitude(system: StarSystem, body: number, field: string, alt: number): void {
  requireFinite(field, alt);
  if (!(alt > -system.bodies[body].radius))
    throw new InputError(field, `must be > −${system.bodies[body].radius} m (above the centre of ${system.bodies[body].name})`, alt);
}

/** Throws InputError with the field path of the first problem in the plan. */
export function checkPlan(system: StarSystem, plan: Plan): void {
  obj('plan', plan);
  if (plan.vehicle && Array.isArray(plan.vehicle.stages)) requireWithinLimit('vehicle.stages', plan.vehicle.stages.length, MAX_STAGES, 'stages');
  checkVehicle(plan.vehicle, 'vehicle');
  const s = plan.start;
  obj('start', s);
  const startBody = bodyId(system, 'start.body', s.body);
  requireFinite('start.epoch', s.epoch);
  if (s.kind === 'parking') {
    altitude(system, startBody, 'start.periapsisAltitude', s.periapsisAltitude);
    eccentricity('start.e', s.e);
    requireFinite('start.i', s.i);
    requireFinite('start.raan', s.raan);
    requireFinite('start.argp', s.argp);
    requireFinite('start.nu', s.nu);
  } else if (s.kind === 'state') {
    vec3('start.r', s.r, MAX_START_DISTANCE, 'm');
    vec3('start.v', s.v, MAX_PLAN_SPEED, 'm/s');
    if (s.r[0] === 0 && s.r[1] === 0 && s.r[2] === 0) throw new InputError('start.r', 'must not be the zero vector', s.r);
  } else {
    throw new InputError('start.kind', "must be 'parking' or 'state'", (s as { kind: unknown }).kind);
  }
  if (!Array.isArray(plan.events)) throw new InputError('events', 'must be an array', plan.events);
  requireWithinLimit('events', plan.events.length, MAX_EVENTS, 'events');
  const ids = new Set<string>();
  plan.events.forEach((ev: PlanEvent, k) => {
    const p = `events[${k}]`;
    obj(p, ev);
    if (typeof ev.id !== 'string' || ev.id === '') throw new InputError(`${p}.id`, 'must be a non-empty string', ev.id);
    if (ids.has(ev.id)) throw new InputError(`${p}.id`, 'must be unique within the plan', ev.id);
    ids.add(ev.id);
    if (typeof ev.name !== 'string') throw new InputError(`${p}.name`, 'must be a string', ev.name);
    if (ev.type === 'burn') {
      if (ev.t !== null) requireFinite(`${p}.t`, ev.t);
      if (ev.frame !== 'vnb' && ev.frame !== 'rtn' && ev.frame !== 'inertial')
        throw new InputError(`${p}.frame`, "must be 'vnb', 'rtn' or 'inertial'", ev.frame);
      vec3(`${p}.dv`, ev.dv, MAX_PLAN_SPEED, 'm/s');
      if (ev.mode !== 'impulsive' && ev.mode !== 'finite') throw new InputError(`${p}.mode`, "must be 'impulsive' or 'finite'", ev.mode);
      if (ev.pointing !== 'velocity' && ev.pointing !== 'inertial') throw new InputError(`${p}.pointing`, "must be 'velocity' or 'inertial'", ev.pointing);
      const sv = ev.solve;
      obj(`${p}.solve`, sv);
      switch (sv.kind) {
        case 'fixed':
          break;
        case 'transfer': {
          const tk = bodyId(system, `${p}.solve.to`, sv.to);
          if (tk === 0) throw new InputError(`${p}.solve.to`, 'must name a body other than the star', sv.to);
          requireFinite(`${p}.solve.arrive`, sv.arrive);
          if (sv.revs !== undefined && !(Number.isInteger(sv.revs) && sv.revs >= 0))
            throw new InputError(`${p}.solve.revs`, 'must be an integer >= 0', sv.revs);
          if (sv.retrograde !== undefined && typeof sv.retrograde !== 'boolean')
            throw new InputError(`${p}.solve.retrograde`, 'must be a boolean', sv.retrograde);
          if (sv.periapsisAltitude !== undefined) altitude(system, tk, `${p}.solve.periapsisAltitude`, sv.periapsisAltitude);
          if (sv.flyby !== undefined) {
            obj(`${p}.solve.flyby`, sv.flyby);
            const nk = bodyId(system, `${p}.solve.flyby.next`, sv.flyby.next);
            if (nk === tk || nk === 0) throw new InputError(`${p}.solve.flyby.next`, 'must name a body other than the flyby body and the star', sv.flyby.next);
            requireFinite(`${p}.solve.flyby.arrive`, sv.flyby.arrive);
            if (sv.flyby.powered !== undefined && typeof sv.flyby.powered !== 'boolean')
              throw new InputError(`${p}.solve.flyby.powered`, 'must be a boolean', sv.flyby.powered);
            if (!(sv.flyby.arrive > sv.arrive)) throw new InputError(`${p}.solve.flyby.arrive`, 'must be after the flyby (solve.arrive)', sv.flyby.arrive);
            if (sv.periapsisAltitude !== undefined)
              throw new InputError(`${p}.solve.periapsisAltitude`, 'must be omitted with flyby (the periapsis is solved)', sv.periapsisAltitude);
          }
          break;
        }
        case 'capture':
          eccentricity(`${p}.solve.e`, sv.e);
          break;
        case 'plane':
          requireFinite(`${p}.solve.i`, sv.i);
          if (!(sv.i >= 0 && sv.i <= Math.PI)) throw new InputError(`${p}.solve.i`, 'must be in [0, π] rad', sv.i);
          break;
        case 'apsis':
          requireFinite(`${p}.solve.altitude`, sv.altitude);
          break;
        default:
          throw new InputError(`${p}.solve.kind`, "must be 'fixed', 'transfer', 'capture', 'plane' or 'apsis'", (sv as { kind: unknown }).kind);
      }
    } else if (ev.type === 'coast') {
      const u = ev.until;
      obj(`${p}.until`, u);
      switch (u.kind) {
        case 'time':
          requireFinite(`${p}.until.t`, u.t);
          break;
        case 'duration':
          nonNeg(`${p}.until.dt`, u.dt);
          break;
        case 'periapsis':
        case 'apoapsis':
          if (u.body !== undefined) bodyId(system, `${p}.until.body`, u.body);
          break;
        case 'soi-change':
          break;
        case 'altitude':
          requireFinite(`${p}.until.altitude`, u.altitude);
          break;
        case 'node':
          if (u.which !== 'ascending' && u.which !== 'descending' && u.which !== 'any')
            throw new InputError(`${p}.until.which`, "must be 'ascending', 'descending' or 'any'", u.which);
          break;
        default:
          throw new InputError(`${p}.until.kind`, 'must be a known coast condition', (u as { kind: unknown }).kind);
      }
    } else if (ev.type === 'flyby') {
      bodyId(system, `${p}.body`, ev.body);
    } else if (ev.type !== 'stage') {
      throw new InputError(`${p}.type`, "must be 'burn', 'coast', 'stage' or 'flyby'", (ev as { type: unknown }).type);
    }
  });
  if (plan.target !== null) {
    const tg = plan.target;
    obj('target', tg);
    const tk = bodyId(system, 'target.body', tg.body);
    altitude(system, tk, 'target.periapsisAltitude', tg.periapsisAltitude);
    if (tg.e !== null) eccentricity('target.e', tg.e);
    if (tg.apoapsisAltitude !== null) altitude(system, tk, 'target.apoapsisAltitude', tg.apoapsisAltitude);
    if (tg.i !== null) {
      requireFinite('target.i', tg.i);
      if (!(tg.i >= 0 && tg.i <= Math.PI)) throw new InputError('target.i', 'must be in [0, π] rad', tg.i);
    }
    obj('target.tolerance', tg.tolerance);
    nonNeg('target.tolerance.periapsisAltitude', tg.tolerance.periapsisAltitude);
    nonNeg('target.tolerance.e', tg.tolerance.e);
    nonNeg('target.tolerance.i', tg.tolerance.i);
  }
  obj('reserve', plan.reserve);
  nonNeg('reserve.percent', plan.reserve.percent);
  nonNeg('reserve.absolute', plan.reserve.absolute);
  if (plan.end !== null) requireFinite('end', plan.end);
}
