/**
 * The burn schedule a game reads (core/io/gameSchedule.ts): round trips through JSON in every
 * unit and axis choice, the axis conventions against geometry, the unit conversions against
 * common practice, the CSV against the JSON, the emitted JSON Schema against the JSON output
 * (ajv), and the errors of bad options and bad documents.
 */
import { readFileSync } from 'node:fs';
import { Ajv2020 } from 'ajv/dist/2020.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { GameSchedule, ScheduledBurn } from '../../../core/handoff/index.ts';
import { GAME_INTEGRATORS } from '../../../core/gamestep/index.ts';
import { parseCsv } from '../../../core/io/csv.ts';
import { GAME_AXES_NAMES, type GameAxesName } from '../../../core/io/gameAxes.ts';
import {
  GAME_LENGTH_UNITS,
  GAME_TIME_UNITS,
  type GameScheduleOptions,
  gameScheduleCsv,
  gameScheduleCsvColumns,
  gameScheduleJson,
  readGameScheduleJson,
} from '../../../core/io/gameSchedule.ts';
import { InputError } from '../../../core/math/index.ts';

type V3 = [number, number, number];

/** Unit roundoff of a double (half an ulp of 1). */
const U = 2 ** -53;

const COMBOS: GameScheduleOptions[] = GAME_LENGTH_UNITS.flatMap((length) =>
  GAME_TIME_UNITS.flatMap((time) => GAME_AXES_NAMES.map((axes) => ({ length, time, axes }))),
);

// ---------------------------------------------------------------------------------------------
// Random schedules

/**
 * A dimensional value of either sign, 0 or 1e-6 to 1e13 in magnitude: the span of the lengths
 * (m), speeds (m/s) and times a schedule holds, kept clear of subnormal doubles, whose relative
 * precision is lost in any unit conversion.
 */
const value = fc.double({ min: -1e13, max: 1e13, noNaN: true }).map((x) => (Math.abs(x) < 1e-6 ? 0 : x));
const positive = fc.double({ min: 1e-6, max: 1e13, noNaN: true });
const nonNegative = (max: number) => fc.double({ min: 0, max, noNaN: true }).map((x) => (x < 1e-6 ? 0 : x));
const vec = fc.tuple(value, value, value);
// Names with the characters CSV must quote (comma, double quote, line break) among others.
const text = fc.string({ minLength: 1, maxLength: 12, unit: fc.constantFrom('a', 'Q', ' ', ',', '"', '\n', 'é', 'Δ', '-', '1') });

const unitVector = fc
  .tuple(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }))
  .filter(([x, y, z]) => Math.hypot(x, y, z) > 0.1)
  .map(([x, y, z]): V3 => {
    const n = Math.hypot(x, y, z);
    return [x / n, y / n, z / n];
  });

const thrust = fc.record({
  steps: fc.integer({ min: 1, max: 1_000_000 }),
  direction: unitVector,
  thrust: positive,
  mass0: positive,
  mdot: nonNegative(1e6),
  firstStepDv: nonNegative(1e4),
  lastStepDv: nonNegative(1e4),
});

const schedule: fc.Arbitrary<GameSchedule> = fc
  .record({
    plan: text,
    system: text,
    integrator: fc.constantFrom(...GAME_INTEGRATORS),
    dt: fc.oneof(fc.constantFrom(1 / 60, 1 / 50, 1 / 30, 0.02, 1), fc.double({ min: 1e-3, max: 100, noNaN: true })),
    precision: fc.constantFrom('float64' as const, 'float32' as const),
    gravity: fc.constantFrom('central' as const, 'all' as const),
    burnModel: fc.constantFrom('impulsive' as const, 'spread' as const),
    rebase: fc.option(fc.record({ distance: positive, velocity: fc.boolean() }), { nil: null }),
    guidance: fc.constantFrom('resolve' as const, 'open-loop' as const),
    t0: fc.double({ min: -1e10, max: 1e10, noNaN: true }),
    central: text,
    state: fc.tuple(value, value, value, value, value, value),
    burns: fc.array(
      fc.record({
        id: text,
        name: text,
        step: fc.integer({ min: 0, max: 10_000_000 }),
        dv: vec,
        frame: vec,
        change: vec,
        central: text,
        thrust: fc.option(thrust, { nil: null }),
      }),
      { maxLength: 4 },
    ),
  })
  .map((r) => ({
    plan: r.plan,
    system: r.system,
    physics: { integrator: r.integrator, dt: r.dt, precision: r.precision, gravity: r.gravity, burns: r.burnModel, rebase: r.rebase, guidance: r.guidance },
    t0: r.t0,
    start: { central: r.central, state: r.state },
    endStep: r.burns.reduce((m, b) => Math.max(m, b.step), 0) + 100,
    burns: r.burns.map(
      (b): ScheduledBurn => ({
        id: b.id,
        name: b.name,
        step: b.step,
        t: r.t0 + b.step * r.dt,
        dv: b.dv,
        dvMag: Math.hypot(...b.dv),
        dvBurnFrame: b.frame,
        change: b.change,
        central: b.central,
        thrust: b.thrust,
      }),
    ),
  }));

const options = fc.record({
  length: fc.constantFrom(...GAME_LENGTH_UNITS),
  time: fc.constantFrom(...GAME_TIME_UNITS),
  axes: fc.constantFrom(...GAME_AXES_NAMES),
});

// ---------------------------------------------------------------------------------------------
// Comparison within rounding

/**
 * Each converted value goes out as x · mul / div and back as y · div / mul: four roundings of at
 * most half an ulp each (the axis matrices are signed permutations and exact), so the relative
 * error is at most 4u to first order; the bound below allows 8u (u = 2⁻⁵³). Measured: at most
 * 2.0u over 20 000 random values in km and steps.
 */
const VALUE_TOL = 8 * U;

/**
 * A time goes out as (t − t0) / T and back as t0 + e · T: the subtraction, the division, the
 * product and the addition each round once, so |Δt| ≤ 3u|t − t0| + u|t|; the bound allows twice
 * that, 8u(|t − t0| + |t|).
 */
const timeTol = (t: number, t0: number): number => 8 * U * (Math.abs(t - t0) + Math.abs(t));

function expectClose(got: number, want: number, tol: number, what: string): void {
  if (!(Math.abs(got - want) <= tol)) throw new Error(`${what}: got ${got}, want ${want} (|Δ| ${Math.abs(got - want)} > ${tol})`);
}

function expectVecClose(got: readonly number[], want: readonly number[], what: string): void {
  expect(got.length).toBe(want.length);
  for (let i = 0; i < want.length; i++) expectClose(got[i], want[i], VALUE_TOL * Math.abs(want[i]), `${what}[${i}]`);
}

function expectScheduleClose(got: GameSchedule, want: GameSchedule): void {
  expect(got.plan).toBe(want.plan);
  expect(got.system).toBe(want.system);
  expect(got.physics).toEqual(want.physics);
  expect(got.t0).toBe(want.t0);
  expect(got.endStep).toBe(want.endStep);
  expect(got.start.central).toBe(want.start.central);
  expectVecClose(got.start.state, want.start.state, 'start.state');
  expect(got.burns.length).toBe(want.burns.length);
  got.burns.forEach((b, k) => {
    const w = want.burns[k];
    const at = `burns[${k}]`;
    expect([b.id, b.name, b.step, b.central]).toEqual([w.id, w.name, w.step, w.central]);
    expectClose(b.t, w.t, timeTol(w.t, want.t0), `${at}.t`);
    expectVecClose(b.dv, w.dv, `${at}.dv`);
    expectClose(b.dvMag, w.dvMag, VALUE_TOL * w.dvMag, `${at}.dvMag`);
    expectVecClose(b.dvBurnFrame, w.dvBurnFrame, `${at}.dvBurnFrame`);
    expectVecClose(b.change, w.change, `${at}.change`);
    if (w.thrust === null) expect(b.thrust).toBeNull();
    else {
      const t = b.thrust;
      expect(t).not.toBeNull();
      if (!t) return;
      expect([t.steps, t.thrust, t.mass0, t.mdot]).toEqual([w.thrust.steps, w.thrust.thrust, w.thrust.mass0, w.thrust.mdot]);
      expect(t.direction.map((x) => x + 0)).toEqual(w.thrust.direction.map((x) => x + 0)); // a signed permutation each way: exact (up to the sign of a zero)
      expectClose(t.firstStepDv, w.thrust.firstStepDv, VALUE_TOL * w.thrust.firstStepDv, `${at}.thrust.firstStepDv`);
      expectClose(t.lastStepDv, w.thrust.lastStepDv, VALUE_TOL * w.thrust.lastStepDv, `${at}.thrust.lastStepDv`);
    }
  });
}

/** A fixed schedule: two burns (an impulse and a spread burn) around Tessel. */
function demoSchedule(over: Partial<GameSchedule> = {}): GameSchedule {
  const dt = 1 / 60;
  const t0 = 86_400 * 100;
  return {
    plan: 'Tessel to Ochre',
    system: 'Ilmar',
    physics: { integrator: 'symplectic-euler', dt, precision: 'float64', gravity: 'central', burns: 'impulsive', rebase: null, guidance: 'resolve' },
    t0,
    start: { central: 'Tessel', state: [6_300_000, -1_200_000, 40_000, 1_500, 7_600, 120] },
    endStep: 600_000,
    burns: [
      {
        id: 'departure',
        name: 'Departure, "prograde"',
        step: 1200,
        t: t0 + 1200 * dt,
        dv: [1, 0, 0],
        dvMag: 1,
        dvBurnFrame: [0.98, 0.1, -0.17],
        change: [0.002, -0.001, 0],
        central: 'Tessel',
        thrust: null,
      },
      {
        id: 'capture',
        name: 'Capture',
        step: 450_000,
        t: t0 + 450_000 * dt,
        dv: [-300, 1200, 45],
        dvMag: Math.hypot(-300, 1200, 45),
        dvBurnFrame: [-1236, 3, 12],
        change: [0.5, -0.25, 0.125],
        central: 'Ochre',
        thrust: { steps: 5000, direction: [0.6, 0, -0.8], thrust: 20_000, mass0: 10_000, mdot: 6.5, firstStepDv: 2 * dt, lastStepDv: 0.01 },
      },
    ],
    ...over,
  };
}

// ---------------------------------------------------------------------------------------------

describe('game schedule: round trip through JSON', () => {
  for (const o of COMBOS) {
    it(`${o.length}, ${o.time}, ${o.axes}: JSON text read back equals the schedule within rounding (random schedules)`, () => {
      fc.assert(
        fc.property(schedule, (s) => {
          const text = JSON.stringify(gameScheduleJson(s, o));
          const back = readGameScheduleJson(JSON.parse(text));
          expectScheduleClose(back, s);
        }),
        { numRuns: 60, seed: 15 },
      );
    });
  }

  it('the conversions are not the identity where they should not be (the round trip can fail)', () => {
    const s = demoSchedule();
    const doc = gameScheduleJson(s, { length: 'km', time: 'steps', axes: 'y-up-right-handed' });
    // Read as if written in metres and seconds: a different schedule.
    const wrong = readGameScheduleJson({ ...doc, units: { length: 'm', time: 's', axes: 'y-up-right-handed' } });
    expect(() => expectScheduleClose(wrong, s)).toThrow();
  });
});

describe('game schedule: axis conventions against geometry', () => {
  const cross = (a: readonly number[], b: readonly number[]): V3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
  const dot = (a: readonly number[], b: readonly number[]): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
  const norm = (a: readonly number[]): number => Math.hypot(a[0], a[1], a[2]);
  const magnitude = fc.double({ min: 1, max: 1e9, noNaN: true });
  const direction = unitVector;
  const r6 = fc.tuple(direction, magnitude, direction, magnitude).map(([d, m, e, n]) => [d.map((x) => x * m), e.map((x) => x * n)] as const);

  /** Position, velocity and a burn's Δv = r × v as the game sees them (m, m/s, no scaling). */
  function inGame(axes: GameAxesName, r: readonly number[], v: readonly number[], dv: readonly number[]) {
    const base = demoSchedule();
    const s = demoSchedule({
      start: { central: 'Tessel', state: [r[0], r[1], r[2], v[0], v[1], v[2]] },
      burns: [{ ...base.burns[0], dv: [dv[0], dv[1], dv[2]] }],
    });
    const doc = gameScheduleJson(s, { length: 'm', time: 's', axes });
    return { r: doc.start.position, v: doc.start.velocity, dv: doc.burns[0].dv };
  }

  for (const axes of GAME_AXES_NAMES) {
    const [up, , handed] = axes.split('-') as ['y' | 'z', 'up', 'right' | 'left', 'handed'];
    it(`${axes}: lengths and dot products are kept; r × v becomes ${handed === 'right' ? '' : '−'}(r′ × v′)`, () => {
      fc.assert(
        fc.property(r6, ([r, v]) => {
          const g = inGame(axes, r, v, cross(r, v));
          const scale = norm(r) * norm(v);
          // hypot and a three-term dot product in another summation order: a few roundings of the result's size.
          expectClose(norm(g.r), norm(r), 4 * U * norm(r), '|r′|');
          expectClose(norm(g.v), norm(v), 4 * U * norm(v), '|v′|');
          expectClose(dot(g.r, g.v), dot(r, v), 8 * U * scale, 'r′·v′');
          // A cross product of doubles is within 2u|a||b| per component of the exact one, for both sides: 4u|r||v|.
          const sign = handed === 'right' ? 1 : -1;
          const c = cross(g.r, g.v);
          for (let i = 0; i < 3; i++) expectClose(g.dv[i], sign * c[i], 4 * U * scale, `(r×v)′[${i}]`);
        }),
        { numRuns: 200, seed: 15 },
      );
    });

    it(`${axes}: Waymark's +z (north) becomes the game's +${up}`, () => {
      const g = inGame(axes, [0, 0, 7e6], [0, 0, 1], [0, 0, 0]);
      const k = up === 'y' ? 1 : 2;
      expect(g.r[k]).toBe(7e6);
      expect(g.r.filter((_, i) => i !== k).map(Math.abs)).toEqual([0, 0]);
    });
  }

  it("Waymark's own convention (z-up right-handed) leaves vectors as they are", () => {
    const s = demoSchedule();
    const doc = gameScheduleJson(s, { axes: 'z-up-right-handed' });
    expect(doc.start.position).toEqual(s.start.state.slice(0, 3));
    expect(doc.burns[1].dv).toEqual(s.burns[1].dv);
  });
});

describe('game schedule: units (common practice: per-step velocity = velocity · dt, per-step² acceleration = acceleration · dt²)', () => {
  const s = demoSchedule();
  const dt = s.physics.dt;

  it('km divides every length and velocity by 1000', () => {
    const m = gameScheduleJson(s, { length: 'm' });
    const km = gameScheduleJson(s, { length: 'km' });
    expect(km.start.position).toEqual(m.start.position.map((x) => x / 1000));
    expect(km.start.velocity).toEqual(m.start.velocity.map((x) => x / 1000));
    expect(km.burns[1].dv).toEqual(m.burns[1].dv.map((x) => x / 1000));
    expect(km.burns[1].dv_magnitude).toBe(m.burns[1].dv_magnitude / 1000);
    // Fields with an SI unit in their name do not change.
    expect(km.burns[1].thrust?.thrust_N).toBe(20_000);
    expect(km.burns[1].thrust?.mass_kg).toBe(10_000);
    expect(km.t0_s).toBe(s.t0);
    expect(km.physics.dt_s).toBe(dt);
  });

  it('steps: a Δv of 1 m/s at dt = 1/60 s is 1/60 m per step (1/60 000 km per step); times are step indices', () => {
    const m = gameScheduleJson(s, { length: 'm', time: 'steps' });
    const km = gameScheduleJson(s, { length: 'km', time: 'steps' });
    // One rounding of the product (and one of the division by 1000): within 2u.
    expectClose(m.burns[0].dv[0], 1 / 60, 2 * U * (1 / 60), 'dv m/step');
    expectClose(m.burns[0].dv_magnitude, 1 / 60, 2 * U * (1 / 60), '|dv| m/step');
    expectClose(km.burns[0].dv[0], 1 / 60_000, 2 * U * (1 / 60_000), 'dv km/step');
    // t = t0 + step·dt rounds once at |t| (about 8.6e6 s), so the step index read back is within u|t|/dt of the step, plus the subtraction's and division's own rounding.
    for (const b of m.burns) expectClose(b.elapsed, b.step, (2 * U * (s.t0 + b.step * dt)) / dt + 2 * U * b.step, `${b.id} elapsed`);
    // Thrust 20 kN on 10 t: 2 m/s², i.e. 2/3600 m per step² at 1/60 s (dt² rounds once, the product once).
    expectClose(m.burns[1].thrust?.acceleration ?? Number.NaN, 2 / 3600, 4 * U * (2 / 3600), 'acceleration m/step²');
    expectClose(m.burns[1].thrust?.first_step_dv ?? Number.NaN, 2 * dt * dt, 2 * U * (2 * dt * dt), 'first step Δv m/step');
  });

  it('seconds: times are seconds since step 0; velocities m/s or km/s', () => {
    const sec = gameScheduleJson(s, { time: 's', length: 'km' });
    expectClose(sec.burns[0].elapsed, 1200 * dt, timeTol(s.burns[0].t, s.t0), 'elapsed s');
    expect(sec.burns[0].dv[0]).toBe(0.001);
  });

  it('the burn frame components do not depend on the axes, only on the units', () => {
    for (const o of COMBOS) {
      const doc = gameScheduleJson(s, o);
      const ref = gameScheduleJson(s, { ...o, axes: 'z-up-right-handed' });
      expect(doc.burns.map((b) => b.dv_burn_frame)).toEqual(ref.burns.map((b) => b.dv_burn_frame));
      expect(doc.burns.map((b) => b.dv_magnitude)).toEqual(ref.burns.map((b) => b.dv_magnitude));
    }
  });

  it('the document records its options and the matrix of its axes', () => {
    const doc = gameScheduleJson(s, { length: 'km', time: 'steps', axes: 'y-up-left-handed' });
    expect(doc.format).toBe('waymark-game-schedule');
    expect(doc.version).toBe(1);
    expect(doc.units).toEqual({ length: 'km', time: 'steps', axes: 'y-up-left-handed' });
    // y-up left-handed: x′ = x, y′ = z, z′ = y (its definition).
    expect(doc.axes_matrix).toEqual([
      [1, 0, 0],
      [0, 0, 1],
      [0, 1, 0],
    ]);
  });
});

describe('game schedule: CSV', () => {
  const VELOCITY_UNITS = /_(mps|kmps|m_per_step|km_per_step)$/;
  const UNITLESS = new Set(['step', 'id', 'name', 'central', 'thrust_steps', 'thrust_direction_x', 'thrust_direction_y', 'thrust_direction_z']);

  it('each column header names its unit', () => {
    for (const o of COMBOS) {
      for (const c of gameScheduleCsvColumns(o)) {
        if (UNITLESS.has(c)) continue;
        const named = VELOCITY_UNITS.test(c) || /^elapsed_(s|steps)$/.test(c) || /_(mps2|kmps2|m_per_step2|km_per_step2)$/.test(c) || /_(N|kg|kgps)$/.test(c);
        expect(named, `${c} (${o.length}, ${o.time})`).toBe(true);
        if (VELOCITY_UNITS.test(c)) expect(c.endsWith(o.time === 's' ? (o.length === 'm' ? '_mps' : '_kmps') : `_${o.length}_per_step`)).toBe(true);
      }
    }
  });

  it('parses back (csv.ts parseCsv) to the same numbers and names as the JSON, in every unit and axis choice', () => {
    fc.assert(
      fc.property(schedule, options, (s, o) => {
        const doc = gameScheduleJson(s, o);
        const text = gameScheduleCsv(s, o);
        expect(text.endsWith('\r\n')).toBe(true);
        const rows = parseCsv(text);
        expect(rows[0]).toEqual(gameScheduleCsvColumns(o));
        expect(rows.length).toBe(doc.burns.length + 1);
        doc.burns.forEach((b, k) => {
          const row = Object.fromEntries(rows[0].map((c, i) => [c, rows[k + 1][i]]));
          const n = (c: string): number | null => (row[c] === '' ? null : Number(row[c]));
          const cols = rows[0];
          const v = cols.find((c) => c.startsWith('dv_x_'))?.slice('dv_x_'.length);
          expect([row.id, row.name, row.central]).toEqual([b.id, b.name, b.central]);
          expect(n('step')).toBe(b.step);
          expect(n(`elapsed_${o.time}`)).toBe(b.elapsed);
          expect([n(`dv_x_${v}`), n(`dv_y_${v}`), n(`dv_z_${v}`)]).toEqual(b.dv.map((x) => x + 0));
          expect(n(`dv_${v}`)).toBe(b.dv_magnitude);
          expect([n(`dv_velocity_${v}`), n(`dv_normal_${v}`), n(`dv_binormal_${v}`)]).toEqual(
            [b.dv_burn_frame.velocity, b.dv_burn_frame.normal, b.dv_burn_frame.binormal].map((x) => x + 0),
          );
          expect([n(`change_x_${v}`), n(`change_y_${v}`), n(`change_z_${v}`)]).toEqual(b.change.map((x) => x + 0));
          const th = b.thrust;
          const a = cols.find((c) => c.startsWith('acceleration_')) ?? '';
          const thrustCells = [
            n('thrust_steps'),
            n('thrust_direction_x'),
            n('thrust_direction_y'),
            n('thrust_direction_z'),
            n('thrust_N'),
            n('mass_kg'),
            n('mass_flow_kgps'),
            n(a),
            n(`first_step_dv_${v}`),
            n(`last_step_dv_${v}`),
          ];
          if (th === null) expect(thrustCells).toEqual(Array(10).fill(null));
          else
            expect(thrustCells).toEqual(
              [th.steps, ...th.direction, th.thrust_N, th.mass_kg, th.mass_flow_kg_per_s, th.acceleration, th.first_step_dv, th.last_step_dv].map((x) => x + 0),
            );
        });
      }),
      { numRuns: 300, seed: 15 },
    );
  });
});

describe('game schedule: JSON Schema (assets/schema/game-schedule.schema.json, checked by ajv)', () => {
  const schemaJson = JSON.parse(readFileSync(new URL('../../../assets/schema/game-schedule.schema.json', import.meta.url), 'utf8'));
  const validate = new Ajv2020({ allErrors: true, strict: true }).compile(schemaJson);

  it('accepts the JSON output in every unit and axis choice', () => {
    fc.assert(
      fc.property(schedule, options, (s, o) => {
        const ok = validate(JSON.parse(JSON.stringify(gameScheduleJson(s, o))));
        if (!ok) throw new Error(JSON.stringify(validate.errors));
      }),
      { numRuns: 200, seed: 15 },
    );
  });

  it('rejects broken documents, naming the broken field', () => {
    const good = JSON.parse(JSON.stringify(gameScheduleJson(demoSchedule(), { length: 'km', time: 'steps', axes: 'y-up-right-handed' })));
    expect(validate(good)).toBe(true);
    const cases: [(d: Record<string, any>) => void, string][] = [
      [(d) => (d.units.axes = 'sideways'), '/units/axes'],
      [(d) => (d.burns[0].step = 1.5), '/burns/0/step'],
      [(d) => (d.burns[1].thrust.direction = [1, 0]), '/burns/1/thrust/direction'],
      [(d) => (d.physics.dt_s = 0), '/physics/dt_s'],
      [(d) => delete d.format, ''],
      [(d) => (d.burns[0].extra = 1), '/burns/0'],
      [(d) => (d.burns[0].thrust = 'none'), '/burns/0/thrust'],
    ];
    for (const [breakIt, path] of cases) {
      const bad = structuredClone(good);
      breakIt(bad);
      expect(validate(bad), path).toBe(false);
      expect(validate.errors?.map((e) => e.instancePath)).toContain(path);
    }
  });

  it('describes every property (with its unit where it has one)', () => {
    const missing: string[] = [];
    const walk = (node: Record<string, any>, at: string): void => {
      for (const [k, p] of Object.entries<Record<string, any>>(node.properties ?? {})) {
        if (typeof p.description !== 'string' || p.description.length < 10) missing.push(`${at}.${k}`);
        walk(p, `${at}.${k}`);
        if (p.items?.properties) walk(p.items, `${at}.${k}[]`);
      }
    };
    walk(schemaJson, '');
    expect(missing).toEqual([]);
  });
});

describe('game schedule: errors', () => {
  const s = demoSchedule();

  it('bad options: an InputError naming the option and the allowed values', () => {
    const bad: [Record<string, unknown>, string, string[]][] = [
      [{ axes: 'up-y' }, 'options.axes', [...GAME_AXES_NAMES]],
      [{ length: 'ft' }, 'options.length', ['m', 'km']],
      [{ time: 'ms' }, 'options.time', ['s', 'steps']],
      [{ units: 'km' }, 'options.units', ['length', 'time', 'axes']],
    ];
    for (const [o, field, allowed] of bad) {
      let e: unknown;
      try {
        gameScheduleJson(s, o as Partial<GameScheduleOptions>);
      } catch (x) {
        e = x;
      }
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).field).toBe(field);
      for (const a of allowed) expect((e as InputError).rule).toContain(`"${a}"`);
      expect(() => gameScheduleCsv(s, o as Partial<GameScheduleOptions>)).toThrow(InputError);
    }
  });

  it('a non-finite value in the schedule is an InputError naming it, not a NaN in the file', () => {
    const broken = demoSchedule();
    broken.burns[1].dv = [1, Number.NaN, 0];
    expect(() => gameScheduleJson(broken)).toThrow(/schedule\.burns\[1\]\.dv\[1\] must be a finite number/);
  });

  it('reading a broken document: an InputError naming the field and the rule in words', () => {
    const good = JSON.parse(JSON.stringify(gameScheduleJson(s, { axes: 'y-up-right-handed' })));
    const cases: [(d: Record<string, any>) => void, string, RegExp][] = [
      [(d) => (d.units.axes = 'sideways'), 'units.axes', /must be one of: "z-up-right-handed", "y-up-right-handed", "y-up-left-handed", "z-up-left-handed"/],
      [(d) => (d.burns[0].step = -1), 'burns[0].step', /must be >= 0/],
      [(d) => (d.burns[1].thrust.direction = [1, 0]), 'burns[1].thrust.direction', /exactly 3 items/],
      [(d) => (d.physics.dt_s = 'fast'), 'physics.dt_s', /must be a number/],
      [(d) => (d.axes_matrix[1] = [0, 1, 0]), 'axes_matrix[1][1]', /must be 0: the matrix must be that of units.axes "y-up-right-handed"/],
      [(d) => (d.burns[1].thrust.direction = [0.6, 0, -0.7]), 'burns[1].thrust.direction', /must be a unit vector/],
      [(d) => (d.format = 'waymark-plan'), 'format', /must be "waymark-game-schedule"/],
    ];
    for (const [breakIt, field, rule] of cases) {
      const bad = structuredClone(good);
      breakIt(bad);
      let e: unknown;
      try {
        readGameScheduleJson(bad);
      } catch (x) {
        e = x;
      }
      expect(e, field).toBeInstanceOf(InputError);
      expect((e as InputError).field).toBe(field);
      expect((e as InputError).rule).toMatch(rule);
    }
    expect(() => readGameScheduleJson(null)).toThrow(InputError);
    expect(() => readGameScheduleJson(good)).not.toThrow();
  });
});
