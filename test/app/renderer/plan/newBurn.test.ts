import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { shipStateAt } from '../../../../core/conic/index.ts';
import { formatCompactDate } from '../../../../core/system/index.ts';
import type { Plan } from '../../../../core/plan/index.ts';
import { lastEventEnd, newBurn, snapToMinute } from '../../../../app/renderer/plan/newBurn.ts';
import { displayCalendar } from '../../../../app/renderer/format/dayMode.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const demo = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const upTo = (n: number): Plan => ({ ...structuredClone(demo), events: structuredClone(demo.events.slice(0, n)) });
const ochre = system.bodies.find((b) => b.id === 'ochre')!;
const star = system.bodies[0];

describe('snapToMinute', () => {
  it('puts a time on a whole minute of the shown clock (home days and standard days), never earlier when rounding up', () => {
    for (const cal of [system.calendar, displayCalendar(system.calendar, 'standard')])
      for (const t of [0.4, 1234567.891, 24184348.873735305, 34819200]) {
        const up = snapToMinute(cal, t, 'up');
        expect(up).toBeGreaterThanOrEqual(t - 1e-6);
        expect(up - t).toBeLessThan(60);
        expect(formatCompactDate(cal, up, { seconds: true })).toMatch(/:00$/);
        const near = snapToMinute(cal, t);
        expect(Math.abs(near - t)).toBeLessThanOrEqual(30 + 1e-6);
        expect(formatCompactDate(cal, near, { seconds: true })).toMatch(/:00$/);
      }
  });
});

describe('a new burn at the end of the plan', () => {
  it('is a zero burn after the last event when the plan already ends in its target orbit', () => {
    const result = evaluate(system, demo);
    expect(result.target?.reached).toBe(true);
    const nb = newBurn(demo, system, result);
    expect(nb.kind).toBe('zero');
    expect(nb.burn.dv).toEqual([0, 0, 0]);
    expect(nb.burn.solve).toEqual({ kind: 'fixed' });
    expect(nb.burn.t!).toBeGreaterThanOrEqual(result.t1 - 1e-6);
    expect(nb.burn.t! - result.t1).toBeLessThan(60);
    expect(nb.why).toMatch(/already ends in its target orbit about Ochre/);
    // named after the burns already there, id fresh
    expect(nb.burn.name).toBe(`Burn ${demo.events.filter((e) => e.type === 'burn').length + 1}`);
    expect(demo.events.some((e) => e.id === nb.burn.id)).toBe(false);
  });

  it('is a zero burn to fill in when the plan has no target or has not been flown', () => {
    const noTarget = { ...structuredClone(demo), target: null };
    expect(newBurn(noTarget, system, evaluate(system, noTarget)).why).toMatch(/no target orbit/);
    const nb = newBurn(demo, system, null);
    expect(nb.kind).toBe('zero');
    expect(nb.burn.t).toBeNull();
  });

  it('is a Lambert transfer to the target, departing after the last event and arriving a Hohmann time later, while the plan does not reach the target body', () => {
    const plan = upTo(4); // departure, staging, leave Tessel, cruise: about Ilmar
    const result = evaluate(system, plan);
    const end = lastEventEnd(plan, result)!;
    const nb = newBurn(plan, system, result);
    expect(nb.kind).toBe('transfer');
    expect(nb.burn.t!).toBeGreaterThanOrEqual(end - 1e-6);
    expect(nb.burn.t! - end).toBeLessThan(60);
    if (nb.burn.solve.kind !== 'transfer') throw new Error('not a transfer');
    expect(nb.burn.solve.to).toBe('ochre');
    // half the period of the ellipse between the ship's distance from Ilmar and Ochre's orbit (analytic)
    const s = new Float64Array(6);
    shipStateAt(result, end, s);
    const a = (Math.hypot(s[0], s[1], s[2]) + ochre.elements!.a) / 2;
    const tof = Math.PI * Math.sqrt((a * a * a) / star.mu);
    // the arrival is moved up to a whole minute, and the departure too: within two minutes
    expect(nb.burn.solve.arrive - nb.burn.t!).toBeGreaterThan(tof - 120);
    expect(nb.burn.solve.arrive - nb.burn.t!).toBeLessThan(tof + 120);
    expect(nb.why).toMatch(/Transfer \(Lambert\) to Ochre/);
    // the plan with it is flown (the burn solves)
    const next = evaluate(system, { ...plan, events: [...plan.events, nb.burn] });
    expect(next.flags.some((f) => f.code === 'solve-failed')).toBe(false);
  });

  it('is a capture at the next periapsis when the plan ends about the target body short of its target orbit', () => {
    const plan = upTo(7); // … Ochre capture into e = 0.5: about Ochre, inclination not yet 30°
    const result = evaluate(system, plan);
    expect(result.target?.reached).toBe(false);
    const end = lastEventEnd(plan, result)!;
    const nb = newBurn(plan, system, result);
    expect(nb.kind).toBe('capture');
    expect(nb.burn.solve).toEqual({ kind: 'capture', e: 0 });
    // the capture left the ship at periapsis, so the next one is a period later (vis-viva, analytic)
    const s = new Float64Array(6);
    shipStateAt(result, end, s); // the state before the capture, the last event: add its Δv
    const row = result.budget.rows.at(-1)!;
    for (let j = 0; j < 3; j++) s[3 + j] += row.dvInertial[j];
    const r = Math.hypot(s[0], s[1], s[2]);
    const v2 = s[3] ** 2 + s[4] ** 2 + s[5] ** 2;
    const sma = 1 / (2 / r - v2 / ochre.mu);
    const period = 2 * Math.PI * Math.sqrt(sma ** 3 / ochre.mu);
    // 1 s: the periapsis time is polished by a root finder to far better; the period is ~hours
    expect(Math.abs(nb.burn.t! - end - period)).toBeLessThan(1);
    expect(nb.why).toMatch(/Capture about Ochre at the next periapsis/);
  });
});
