import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/index.ts';
import { InputError } from '../../../core/math/index.ts';
import type { BurnEvent, Plan } from '../../../core/plan/index.ts';
import { applyControls, burnControls, timeControl } from '../../../core/target/index.ts';
import { MU_EARTH, R_EARTH, impulsive, plan, testSystem } from '../plan/helpers.ts';

/** A circular 300 km orbit about loam (Earth-like) and one burn at the start solved to a 1,000 km apoapsis. */
function apsisPlan(): Plan {
  const burn = impulsive('raise', null, [0, 0, 0]) as BurnEvent;
  return plan({ kind: 'parking', body: 'loam', epoch: 0, periapsisAltitude: 300e3, e: 0, i: 0, raan: 0, argp: 0, nu: 0 }, [
    { ...burn, solve: { kind: 'apsis', altitude: 1000e3 } },
    { type: 'coast', id: 'after', name: 'after', until: { kind: 'duration', dt: 600 } },
  ]);
}

describe('burnControls', () => {
  it("names the burn's frame axes and starts from the Δv the evaluation resolved (vis-viva for an apsis burn)", () => {
    const p = apsisPlan();
    const { controls, x0 } = burnControls(p, 'raise', 10, evaluate(testSystem(), p));
    expect(controls.map((c) => c.name)).toEqual(['raise Δv prograde', 'raise Δv normal', 'raise Δv binormal']);
    // Curtis, Orbital Mechanics for Engineering Students, §6.2: Δv = √(μ/r1)·(√(2r2/(r1 + r2)) − 1)
    const r1 = R_EARTH + 300e3;
    const r2 = R_EARTH + 1000e3;
    const visViva = Math.sqrt(MU_EARTH / r1) * (Math.sqrt((2 * r2) / (r1 + r2)) - 1);
    // the apsis solve is closed-form; 1e-9 m/s allows the rounding of a 190 m/s value through the frames
    expect(Math.abs(x0[0] - visViva)).toBeLessThanOrEqual(1e-9);
    expect(Math.abs(x0[1])).toBeLessThanOrEqual(1e-9);
    expect(Math.abs(x0[2])).toBeLessThanOrEqual(1e-9);
  });

  it('without a result starts from the written dv; refuses an unknown burn and a bad scale', () => {
    const p = apsisPlan();
    expect(burnControls(p, 'raise', 10).x0).toEqual([0, 0, 0]);
    expect(() => burnControls(p, 'after', 10)).toThrow(InputError);
    expect(() => burnControls(p, 'raise', 0)).toThrow(InputError);
  });
});

describe('applyControls', () => {
  it('fixes the burn at the controls and leaves the plan alone', () => {
    const p = apsisPlan();
    const before = structuredClone(p);
    const { controls } = burnControls(p, 'raise', 10);
    const q = applyControls(p, controls, [1, 2, 3]);
    const burn = q.events[0] as BurnEvent;
    expect(burn.dv).toEqual([1, 2, 3]);
    expect(burn.solve).toEqual({ kind: 'fixed' });
    expect(p).toEqual(before);
    expect(q.events[1]).toBe(p.events[1]);
  });

  it('the resolved Δv applied as a fixed burn flies the same orbit as the solved burn', () => {
    const system = testSystem();
    const p = apsisPlan();
    const solved = evaluate(system, p);
    const { controls, x0 } = burnControls(p, 'raise', 10, solved);
    const fixed = evaluate(system, applyControls(p, controls, x0));
    const a = solved.events.at(-1);
    const b = fixed.events.at(-1);
    // the same impulse flown the same way: equal to rounding (1 mm on a 7,000 km radius is common practice)
    expect(Math.abs((a?.distance ?? 0) - (b?.distance ?? 1))).toBeLessThanOrEqual(1e-3);
  });

  it('keeps the components not under control and refuses a wrong count or a non-finite value', () => {
    const p = apsisPlan();
    const { controls } = burnControls(p, 'raise', 10);
    const onlyNormal = applyControls({ ...p, events: [impulsive('raise', null, [5, 0, 7]), p.events[1]] }, [controls[1]], [2]);
    expect((onlyNormal.events[0] as BurnEvent).dv).toEqual([5, 2, 7]);
    expect(() => applyControls(p, controls, [1, 2])).toThrow(InputError);
    expect(() => applyControls(p, controls, [1, Number.NaN, 3])).toThrow(InputError);
  });
});

describe('timing controls', () => {
  it('set a burn time, a transfer arrival and a coast duration on a copy, starting from the written values', () => {
    const p = apsisPlan();
    const r = evaluate(testSystem(), p);
    // the burn is timed by the plan's start (t null): its control starts where the flight put it
    const bt = timeControl(p, 'burn-time', 'raise', r);
    expect(bt.x0).toBe(r.budget.rows[0].t);
    const cd = timeControl(p, 'coast-duration', 'after');
    expect(cd.x0).toBe(600);
    expect(cd.control.units).toBe('h');
    const q = applyControls(p, [bt.control, cd.control], [bt.x0 + 60, 1200]);
    expect((q.events[0] as BurnEvent).t).toBe(bt.x0 + 60);
    expect(q.events[1]).toMatchObject({ until: { kind: 'duration', dt: 1200 } });
    expect((p.events[0] as BurnEvent).t).toBeNull();
    const transfer: Plan = { ...p, events: [{ ...(p.events[0] as BurnEvent), solve: { kind: 'transfer', to: 'loam', arrive: 5000 } }, p.events[1]] };
    const ta = timeControl(transfer, 'transfer-arrival', 'raise');
    expect(ta.x0).toBe(5000);
    expect(applyControls(transfer, [ta.control], [7000]).events[0]).toMatchObject({ solve: { kind: 'transfer', arrive: 7000 } });
  });

  it('refuse an event of the wrong kind, a burn with no time yet, and a negative duration, by name', () => {
    const p = apsisPlan();
    expect(() => timeControl(p, 'coast-duration', 'raise')).toThrow(/coast that lasts a duration/);
    expect(() => timeControl(p, 'transfer-arrival', 'raise')).toThrow(/transfer/);
    expect(() => timeControl(p, 'burn-time', 'raise')).toThrow(/fly the plan first/);
    expect(() => timeControl(p, 'burn-time', 'nope')).toThrow(InputError);
    const cd = timeControl(p, 'coast-duration', 'after');
    expect(() => applyControls(p, [cd.control], [-1])).toThrow(/duration >= 0/);
  });
});
