import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { checkPlan, MAX_PLAN_SPEED, MAX_START_DISTANCE } from '../../../core/plan/checkPlan.ts';
import type { Plan } from '../../../core/plan/plan.ts';
import { clonePlan, demoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem } from './helpers.ts';

const system = demoSystem();
// events of the demo plan: 0 departure burn (transfer), 1 stage, 2 coast soi-change, 3 coast duration,
// 4 mid-course burn (transfer with aim), 5 coast periapsis (body), 6 capture, 7 coast node, 8 plane,
// 9 coast periapsis, 10 apsis burn, 11 coast duration
// edits reach into the plan as loose data, the way a bad file or a buggy caller would
type Loose = Record<string, any>;
type Edit = (p: Loose) => void;

function problem(edit: Edit): string {
  const p = clonePlan(demoPlan) as unknown as Loose;
  edit(p);
  try {
    checkPlan(system, p as unknown as Plan);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).field;
  }
  return 'no error';
}

const stateStart = (p: Loose): void => {
  p.start = { kind: 'state', body: 'tessel', epoch: 0, r: [7e6, 0, 0], v: [0, 7.5e3, 0] };
};

/** A state-vector start, then `edit`. */
const fromStateStart =
  (edit: Edit): Edit =>
  (p) => {
    stateStart(p);
    edit(p);
  };

describe('plan input checks', () => {
  it('accepts the demo plan and a state start', () => {
    expect(problem(() => {})).toBe('no error');
    expect(problem(stateStart)).toBe('no error');
  });

  it('names the start field at fault', () => {
    expect(problem((p) => (p.start.body = 'nowhere'))).toBe('start.body');
    expect(problem((p) => (p.start.epoch = NaN))).toBe('start.epoch');
    expect(problem((p) => (p.start.periapsisAltitude = -7e6))).toBe('start.periapsisAltitude'); // below Tessel's centre
    expect(problem((p) => (p.start.e = 1))).toBe('start.e');
    for (const k of ['i', 'raan', 'argp', 'nu']) expect(problem((p) => (p.start[k] = Infinity))).toBe(`start.${k}`);
    expect(problem((p) => (p.start.kind = 'orbit'))).toBe('start.kind');
    expect(problem(fromStateStart((p) => (p.start.r = [0, 0, 0])))).toBe('start.r');
    expect(problem(fromStateStart((p) => (p.start.r = [1, 2])))).toBe('start.r');
    expect(problem(fromStateStart((p) => (p.start.r[1] = NaN)))).toBe('start.r[1]');
    expect(problem(fromStateStart((p) => (p.start.r = [MAX_START_DISTANCE * 1.01, 0, 0])))).toBe('start.r');
    expect(problem(fromStateStart((p) => (p.start.v = [0, 0, MAX_PLAN_SPEED * 1.01])))).toBe('start.v');
    expect(problem(fromStateStart((p) => (p.start.r = [MAX_START_DISTANCE, 0, 0])))).toBe('no error');
  });

  it('names the event field at fault', () => {
    expect(problem((p) => (p.events = {}))).toBe('events');
    expect(problem((p) => (p.events[3] = null))).toBe('events[3]');
    expect(problem((p) => (p.events[3].id = ''))).toBe('events[3].id');
    expect(problem((p) => (p.events[3].id = p.events[2].id))).toBe('events[3].id');
    expect(problem((p) => (p.events[3].name = 5))).toBe('events[3].name');
    expect(problem((p) => (p.events[3].type = 'wait'))).toBe('events[3].type');
    // burns
    expect(problem((p) => (p.events[0].t = NaN))).toBe('events[0].t');
    expect(problem((p) => (p.events[0].frame = 'lvlh'))).toBe('events[0].frame');
    expect(problem((p) => (p.events[0].dv = [0, 0]))).toBe('events[0].dv');
    expect(problem((p) => (p.events[0].dv[2] = NaN))).toBe('events[0].dv[2]');
    expect(problem((p) => (p.events[0].dv = [1e308, 0, 0]))).toBe('events[0].dv');
    expect(problem((p) => (p.events[0].mode = 'slow'))).toBe('events[0].mode');
    expect(problem((p) => (p.events[0].pointing = 'sun'))).toBe('events[0].pointing');
    expect(problem((p) => (p.events[0].solve = null))).toBe('events[0].solve');
    expect(problem((p) => (p.events[0].solve.kind = 'lambert'))).toBe('events[0].solve.kind');
    expect(problem((p) => (p.events[0].solve.to = 'ilmar'))).toBe('events[0].solve.to'); // the star
    expect(problem((p) => (p.events[0].solve.to = 'nowhere'))).toBe('events[0].solve.to');
    expect(problem((p) => (p.events[0].solve.arrive = NaN))).toBe('events[0].solve.arrive');
    expect(problem((p) => (p.events[0].solve.revs = -1))).toBe('events[0].solve.revs');
    expect(problem((p) => (p.events[0].solve.retrograde = 1))).toBe('events[0].solve.retrograde');
    expect(problem((p) => (p.events[4].solve.periapsisAltitude = -4e6))).toBe('events[4].solve.periapsisAltitude'); // Ochre's radius is 3.4 Mm
    expect(problem((p) => (p.events[6].solve.e = 1))).toBe('events[6].solve.e');
    // flyby aim: the next body must be another planet, after the flyby, and the periapsis is solved
    const flyby = (p: Loose, f: unknown): void => {
      p.events[4].solve = { kind: 'transfer', to: 'ochre', arrive: p.events[4].solve.arrive, flyby: f };
    };
    expect(problem((p) => flyby(p, { next: 'fennick', arrive: p.events[4].solve.arrive + 1e7 }))).toBe('no error');
    expect(problem((p) => flyby(p, null))).toBe('events[4].solve.flyby');
    expect(problem((p) => flyby(p, { next: 'nowhere', arrive: p.events[4].solve.arrive + 1e7 }))).toBe('events[4].solve.flyby.next');
    expect(problem((p) => flyby(p, { next: 'ochre', arrive: p.events[4].solve.arrive + 1e7 }))).toBe('events[4].solve.flyby.next');
    expect(problem((p) => flyby(p, { next: 'fennick', arrive: p.events[4].solve.arrive }))).toBe('events[4].solve.flyby.arrive');
    expect(
      problem((p) => {
        flyby(p, { next: 'fennick', arrive: p.events[4].solve.arrive + 1e7 });
        p.events[4].solve.periapsisAltitude = 4e5;
      }),
    ).toBe('events[4].solve.periapsisAltitude');
    // flyby marker: a known body
    expect(problem((p) => p.events.push({ type: 'flyby', id: 'f', name: 'Pass', body: 'moravel' }))).toBe('no error');
    expect(problem((p) => p.events.push({ type: 'flyby', id: 'f', name: 'Pass', body: 'nowhere' }))).toBe(`events[${12}].body`);
    expect(problem((p) => (p.events[8].solve.i = 4))).toBe('events[8].solve.i'); // > π
    expect(problem((p) => (p.events[10].solve.altitude = Infinity))).toBe('events[10].solve.altitude');
    // coasts
    expect(problem((p) => (p.events[3].until = null))).toBe('events[3].until');
    expect(problem((p) => (p.events[3].until.dt = -1))).toBe('events[3].until.dt');
    expect(problem((p) => (p.events[3].until = { kind: 'time', t: NaN }))).toBe('events[3].until.t');
    expect(problem((p) => (p.events[5].until.body = 'nowhere'))).toBe('events[5].until.body');
    expect(problem((p) => (p.events[7].until.which = 'both'))).toBe('events[7].until.which');
    expect(problem((p) => (p.events[3].until = { kind: 'altitude', altitude: NaN }))).toBe('events[3].until.altitude');
    expect(problem((p) => (p.events[3].until = { kind: 'forever' }))).toBe('events[3].until.kind');
  });

  it('names the vehicle, target, reserve and end fields at fault', () => {
    expect(problem((p) => (p.vehicle.stages[1].isp = 0))).toBe('vehicle.stages[1].isp');
    expect(problem((p) => (p.target.body = 'nowhere'))).toBe('target.body');
    expect(problem((p) => (p.target.periapsisAltitude = -4e6))).toBe('target.periapsisAltitude');
    expect(problem((p) => (p.target.e = 1.5))).toBe('target.e');
    expect(problem((p) => (p.target.apoapsisAltitude = NaN))).toBe('target.apoapsisAltitude');
    expect(problem((p) => (p.target.i = -0.1))).toBe('target.i');
    expect(problem((p) => (p.target.tolerance = null))).toBe('target.tolerance');
    expect(problem((p) => (p.target.tolerance.i = -1))).toBe('target.tolerance.i');
    expect(problem((p) => (p.target = null))).toBe('no error');
    expect(problem((p) => (p.reserve = null))).toBe('reserve');
    expect(problem((p) => (p.reserve.percent = -3))).toBe('reserve.percent');
    expect(problem((p) => (p.reserve.absolute = NaN))).toBe('reserve.absolute');
    expect(problem((p) => (p.end = Infinity))).toBe('end');
    expect(problem((p) => (p.end = 5e7))).toBe('no error');
  });
});
