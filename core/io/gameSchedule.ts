/**
 * A game schedule (core/handoff `GameSchedule`: SI, Waymark's axes) written in a game's units and
 * axes, as JSON ("waymark-game-schedule", version 1; shape in gameScheduleShape.ts, schema
 * assets/schema/game-schedule.schema.json) and as a CSV burn table, and the JSON read back.
 *
 * Options (each recorded in the JSON's `units`):
 * - length: 'm' | 'km';
 * - time: 's' | 'steps' — with steps, times are step indices, velocities length per step
 *   (velocity · dt) and accelerations length per step squared (acceleration · dt²), the usual
 *   per-step quantities of a fixed-step game loop;
 * - axes: one of gameAxes.ts GAME_AXES (z-up or y-up, right- or left-handed).
 * Conversion: length ÷ L, velocity × T/L, acceleration × T²/L, time since step 0 ÷ T, with
 * L = 1 or 1000 m and T = 1 s or dt; vectors also × M (gameAxes.ts). Reading divides by the same
 * factors and applies Mᵀ, so a round trip differs from the original only by rounding.
 *
 * Fields with an SI unit in their name (t0_s, physics.dt_s, thrust_N, mass_kg, …) are never
 * converted. CSV: csv.ts's dialect (RFC 4180, CRLF, shortest round-trip numbers), one row per
 * burn, the unit named in each column header.
 */
import schema from '../../assets/schema/game-schedule.schema.json' with { type: 'json' };
import type { GameSchedule, ScheduledBurn, ScheduledThrust } from '../handoff/index.ts';
import { InputError } from '../math/index.ts';
import { CSV_EOL, csvRow } from './csv.ts';
import { compileFileSchema } from './fileValidator.ts';
import { GAME_AXES, GAME_AXES_NAMES, type GameAxesName, fromGameAxes, toGameAxes } from './gameAxes.ts';
import type { GameScheduleBurnDocument, GameScheduleDocument } from './gameScheduleShape.ts';
import { planSchemaIssues } from './planFile.ts';

export type { GameScheduleDocument } from './gameScheduleShape.ts';

export const GAME_SCHEDULE_FORMAT = 'waymark-game-schedule' satisfies GameScheduleDocument['format'];
export const GAME_SCHEDULE_VERSION = 1 satisfies GameScheduleDocument['version'];

export const GAME_LENGTH_UNITS = ['m', 'km'] as const;
export const GAME_TIME_UNITS = ['s', 'steps'] as const;

export interface GameScheduleOptions {
  length: (typeof GAME_LENGTH_UNITS)[number];
  time: (typeof GAME_TIME_UNITS)[number];
  axes: GameAxesName;
}

/** Waymark's own units and axes: metres, seconds, z-up right-handed. */
export const GAME_SCHEDULE_DEFAULTS: Readonly<GameScheduleOptions> = { length: 'm', time: 's', axes: 'z-up-right-handed' };

type V3 = [number, number, number];

/** No conversion (unit vectors). */
const ONE = { mul: 1, div: 1 } as const;

const quoted = (xs: readonly string[]): string => xs.map((x) => `"${x}"`).join(', ');

function choice<T extends string>(field: string, value: unknown, allowed: readonly T[]): T {
  if (typeof value === 'string' && (allowed as readonly string[]).includes(value)) return value as T;
  throw new InputError(field, `must be one of ${quoted(allowed)}`, value);
}

/** The options with defaults filled in; InputError naming the option and its allowed values. */
export function gameScheduleOptions(options: Partial<GameScheduleOptions> = {}): GameScheduleOptions {
  if (typeof options !== 'object' || options === null) throw new InputError('options', 'must be an object', options);
  const known = ['length', 'time', 'axes'];
  for (const k of Object.keys(options)) if (!known.includes(k)) throw new InputError(`options.${k}`, `is not an option (the options are ${quoted(known)})`);
  return {
    length: choice('options.length', options.length ?? GAME_SCHEDULE_DEFAULTS.length, GAME_LENGTH_UNITS),
    time: choice('options.time', options.time ?? GAME_SCHEDULE_DEFAULTS.time, GAME_TIME_UNITS),
    axes: choice('options.axes', options.axes ?? GAME_SCHEDULE_DEFAULTS.axes, GAME_AXES_NAMES),
  };
}

/** A conversion from SI to the game's unit: x · mul / div (and back: x · div / mul). */
interface Scale {
  mul: number;
  div: number;
}

/** The conversions of a schedule: length ÷ L, time ÷ T, velocity × T / L, acceleration × T² / L. */
interface Factors {
  axes: GameAxesName;
  length: Scale;
  time: Scale;
  velocity: Scale;
  acceleration: Scale;
}

function factors(o: GameScheduleOptions, dt: number): Factors {
  if (!(Number.isFinite(dt) && dt > 0)) throw new InputError('schedule.physics.dt', 'must be a finite number greater than 0 s', dt);
  const L = o.length === 'km' ? 1000 : 1;
  const T = o.time === 'steps' ? dt : 1;
  return { axes: o.axes, length: { mul: 1, div: L }, time: { mul: 1, div: T }, velocity: { mul: T, div: L }, acceleration: { mul: T * T, div: L } };
}

const toUnit = (x: number, s: Scale): number => (x * s.mul) / s.div;
const fromUnit = (x: number, s: Scale): number => (x * s.div) / s.mul;

/** A finite number, or InputError naming the schedule's field (no NaN leaves the core). */
function finite(x: number, field: string): number {
  if (!Number.isFinite(x)) throw new InputError(field, 'must be a finite number', x);
  return x;
}

function vecOut(v: readonly number[], s: Scale, f: Factors, field: string): V3 {
  for (let i = 0; i < 3; i++) finite(v[i], `${field}[${i}]`);
  const out = toGameAxes(f.axes, v, s.mul, s.div, [0, 0, 0]);
  for (let i = 0; i < 3; i++) finite(out[i], `${field}[${i}]`);
  return out;
}

const copy = (m: (typeof GAME_AXES)[GameAxesName]['matrix']): [V3, V3, V3] => [[...m[0]], [...m[1]], [...m[2]]];

/** The schedule as a "waymark-game-schedule" version-1 document in the game's units and axes. */
export function gameScheduleJson(schedule: GameSchedule, options: Partial<GameScheduleOptions> = {}): GameScheduleDocument {
  const o = gameScheduleOptions(options);
  const p = schedule.physics;
  const f = factors(o, p.dt);
  const t0 = finite(schedule.t0, 'schedule.t0');
  const s = schedule.start.state;
  return {
    format: GAME_SCHEDULE_FORMAT,
    version: GAME_SCHEDULE_VERSION,
    units: { length: o.length, time: o.time, axes: o.axes },
    axes_matrix: copy(GAME_AXES[o.axes].matrix),
    plan: schedule.plan,
    system: schedule.system,
    physics: {
      integrator: p.integrator,
      dt_s: p.dt,
      precision: p.precision,
      gravity: p.gravity,
      burns: p.burns,
      rebase: p.rebase ? { distance_m: p.rebase.distance, velocity: p.rebase.velocity } : null,
      guidance: p.guidance,
    },
    t0_s: t0,
    end_step: schedule.endStep,
    start: {
      central: schedule.start.central,
      position: vecOut(s.slice(0, 3), f.length, f, 'schedule.start.state'),
      velocity: vecOut(s.slice(3, 6), f.velocity, f, 'schedule.start.state'),
    },
    burns: schedule.burns.map((b, k) => burnOut(b, t0, f, `schedule.burns[${k}]`)),
  };
}

function burnOut(b: ScheduledBurn, t0: number, f: Factors, at: string): GameScheduleBurnDocument {
  const k = f.velocity;
  const th = b.thrust;
  return {
    id: b.id,
    name: b.name,
    step: b.step,
    elapsed: finite(toUnit(b.t - t0, f.time), `${at}.t`),
    dv: vecOut(b.dv, k, f, `${at}.dv`),
    dv_magnitude: finite(toUnit(b.dvMag, k), `${at}.dvMag`),
    dv_burn_frame: {
      velocity: finite(toUnit(b.dvBurnFrame[0], k), `${at}.dvBurnFrame[0]`),
      normal: finite(toUnit(b.dvBurnFrame[1], k), `${at}.dvBurnFrame[1]`),
      binormal: finite(toUnit(b.dvBurnFrame[2], k), `${at}.dvBurnFrame[2]`),
    },
    change: vecOut(b.change, k, f, `${at}.change`),
    central: b.central,
    thrust: th
      ? {
          steps: th.steps,
          direction: vecOut(th.direction, ONE, f, `${at}.thrust.direction`),
          thrust_N: finite(th.thrust, `${at}.thrust.thrust`),
          mass_kg: finite(th.mass0, `${at}.thrust.mass0`),
          mass_flow_kg_per_s: finite(th.mdot, `${at}.thrust.mdot`),
          acceleration: finite(toUnit(th.thrust / th.mass0, f.acceleration), `${at}.thrust`),
          first_step_dv: finite(toUnit(th.firstStepDv, k), `${at}.thrust.firstStepDv`),
          last_step_dv: finite(toUnit(th.lastStepDv, k), `${at}.thrust.lastStepDv`),
        }
      : null,
  };
}

/** Unit words of the CSV headers: velocity mps / kmps / m_per_step / km_per_step, acceleration …2. */
function unitWords(o: GameScheduleOptions): { time: string; velocity: string; acceleration: string } {
  const perSecond = o.length === 'm' ? 'mps' : 'kmps';
  return o.time === 's'
    ? { time: 's', velocity: perSecond, acceleration: `${perSecond}2` }
    : { time: 'steps', velocity: `${o.length}_per_step`, acceleration: `${o.length}_per_step2` };
}

/**
 * The CSV columns for these options, in order. Vector components are along the game's axes
 * (x, y, z of `options.axes`); the thrust columns are empty for an impulsive burn.
 */
export function gameScheduleCsvColumns(options: Partial<GameScheduleOptions> = {}): string[] {
  const u = unitWords(gameScheduleOptions(options));
  const v = u.velocity;
  return [
    'step',
    `elapsed_${u.time}`,
    'id',
    'name',
    'central',
    `dv_x_${v}`,
    `dv_y_${v}`,
    `dv_z_${v}`,
    `dv_${v}`,
    `dv_velocity_${v}`,
    `dv_normal_${v}`,
    `dv_binormal_${v}`,
    `change_x_${v}`,
    `change_y_${v}`,
    `change_z_${v}`,
    'thrust_steps',
    'thrust_direction_x',
    'thrust_direction_y',
    'thrust_direction_z',
    'thrust_N',
    'mass_kg',
    'mass_flow_kgps',
    `acceleration_${u.acceleration}`,
    `first_step_dv_${v}`,
    `last_step_dv_${v}`,
  ];
}

/** The schedule's burns as an RFC 4180 CSV table (csv.ts dialect), one row per burn, in the game's units and axes. */
export function gameScheduleCsv(schedule: GameSchedule, options: Partial<GameScheduleOptions> = {}): string {
  const doc = gameScheduleJson(schedule, options);
  const out = [csvRow(gameScheduleCsvColumns(doc.units))];
  for (const b of doc.burns) {
    const th = b.thrust;
    out.push(
      csvRow([
        b.step,
        b.elapsed,
        b.id,
        b.name,
        b.central,
        ...b.dv,
        b.dv_magnitude,
        b.dv_burn_frame.velocity,
        b.dv_burn_frame.normal,
        b.dv_burn_frame.binormal,
        ...b.change,
        th ? th.steps : null,
        ...(th ? th.direction : [null, null, null]),
        th ? th.thrust_N : null,
        th ? th.mass_kg : null,
        th ? th.mass_flow_kg_per_s : null,
        th ? th.acceleration : null,
        th ? th.first_step_dv : null,
        th ? th.last_step_dv : null,
      ]),
    );
  }
  return out.join(CSV_EOL) + CSV_EOL;
}

const validateSchema = compileFileSchema(schema);

/**
 * A thrust direction read back must be a unit vector to this relative tolerance: a direction
 * written by hand with 7 significant digits per component is still accepted.
 */
const UNIT_TOLERANCE = 1e-6;

/**
 * A "waymark-game-schedule" document (parsed JSON) back to a GameSchedule in SI and Waymark's
 * axes. Checks the schema (assets/schema/game-schedule.schema.json), that `axes_matrix` is the
 * matrix of `units.axes` and that thrust directions are unit vectors; the first problem found is
 * an InputError naming the field (its path in the document) and the rule in words.
 */
export function readGameScheduleJson(document: unknown): GameSchedule {
  if (!validateSchema(document)) {
    const issues = planSchemaIssues(validateSchema.errors ?? []);
    const first = issues[0] ?? { path: '', rule: 'does not match the game schedule schema' };
    const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? 's' : ''})` : '';
    throw new InputError(first.path || 'document', `${first.rule}${more}`);
  }
  const doc = document as GameScheduleDocument;
  const o = doc.units;
  const m = GAME_AXES[o.axes].matrix;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      if (doc.axes_matrix[i][j] !== m[i][j]) {
        throw new InputError(
          `axes_matrix[${i}][${j}]`,
          `must be ${m[i][j]}: the matrix must be that of units.axes "${o.axes}" (${JSON.stringify(m)})`,
          doc.axes_matrix[i][j],
        );
      }
    }
  }
  const p = doc.physics;
  const f = factors(o, p.dt_s);
  const t0 = doc.t0_s;
  const [x, y, z] = fromGameAxes(f.axes, doc.start.position, f.length.mul, f.length.div, [0, 0, 0]);
  const [vx, vy, vz] = fromGameAxes(f.axes, doc.start.velocity, f.velocity.mul, f.velocity.div, [0, 0, 0]);
  return {
    plan: doc.plan,
    system: doc.system,
    physics: {
      integrator: p.integrator,
      dt: p.dt_s,
      precision: p.precision,
      gravity: p.gravity,
      burns: p.burns,
      rebase: p.rebase ? { distance: p.rebase.distance_m, velocity: p.rebase.velocity } : null,
      guidance: p.guidance,
    },
    t0,
    start: { central: doc.start.central, state: [x, y, z, vx, vy, vz] },
    endStep: doc.end_step,
    burns: doc.burns.map((b, k) => burnIn(b, t0, f, `burns[${k}]`)),
  };
}

function burnIn(b: GameScheduleBurnDocument, t0: number, f: Factors, at: string): ScheduledBurn {
  const k = f.velocity;
  const th = b.thrust;
  let thrust: ScheduledThrust | null = null;
  if (th) {
    const d = th.direction;
    const n = Math.hypot(d[0], d[1], d[2]);
    if (!(Math.abs(n - 1) <= UNIT_TOLERANCE)) throw new InputError(`${at}.thrust.direction`, `must be a unit vector (its length is ${n})`);
    thrust = {
      steps: th.steps,
      direction: fromGameAxes(f.axes, d, 1, 1, [0, 0, 0]),
      thrust: th.thrust_N,
      mass0: th.mass_kg,
      mdot: th.mass_flow_kg_per_s,
      firstStepDv: fromUnit(th.first_step_dv, k),
      lastStepDv: fromUnit(th.last_step_dv, k),
    };
  }
  return {
    id: b.id,
    name: b.name,
    step: b.step,
    t: t0 + fromUnit(b.elapsed, f.time),
    dv: fromGameAxes(f.axes, b.dv, k.mul, k.div, [0, 0, 0]),
    dvMag: fromUnit(b.dv_magnitude, k),
    dvBurnFrame: [fromUnit(b.dv_burn_frame.velocity, k), fromUnit(b.dv_burn_frame.normal, k), fromUnit(b.dv_burn_frame.binormal, k)],
    change: fromGameAxes(f.axes, b.change, k.mul, k.div, [0, 0, 0]),
    central: b.central,
    thrust,
  };
}
