import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { altitudeKind, bodyGroups, bodyLabel, initialWindowsForm, legOf, pairDefaults, windowsRequest } from '../../../../app/renderer/windows/windowsForm.ts';
import { blankPlan } from '../../../../app/renderer/state/session.ts';
import { parsePlanFile } from '../../../../core/io/index.ts';
import { demoSystem } from '../../../core/search/fixtures.ts';

const system = demoSystem();
const body = (id: string) => system.bodies[system.indexById[id]];

function demoPlan(name: string) {
  const text = readFileSync(new URL(`../../../../assets/plans/${name}`, import.meta.url), 'utf8');
  return parsePlanFile(text, { system }).plan;
}

describe('Windows form', () => {
  it('offers every planet and moon, each moon under its planet', () => {
    const groups = bodyGroups(system);
    expect(groups.map((g) => g.planet.id)).toEqual(system.bodies.filter((b) => b.parentIndex === 0).map((b) => b.id));
    const all = groups.flatMap((g) => g.bodies.map((b) => b.id));
    expect(all.sort()).toEqual(
      system.bodies
        .slice(1)
        .map((b) => b.id)
        .sort(),
    );
    expect(groups.find((g) => g.planet.id === 'moravel')!.bodies.map((b) => b.id)).toEqual(['moravel', 'skerry', 'lough']);
    expect(bodyLabel(system, body('skerry'))).toBe('Skerry (moon of Moravel)');
    expect(bodyLabel(system, body('tessel'))).toBe('Tessel');
  });

  it('starts from the plan: its start body, its target, departures from its start epoch', () => {
    const plan = demoPlan('tessel-to-ochre.plan.json');
    const f = initialWindowsForm(system, plan, 200);
    expect([f.from, f.to]).toEqual(['tessel', 'ochre']);
    // the start of the calendar day the plan starts in
    expect(f.departStart).toBeLessThanOrEqual(plan.start.epoch);
    expect(plan.start.epoch - f.departStart).toBeLessThan(system.calendar.dayLength);
    expect(f.parkingAlt).toBe(plan.start.kind === 'parking' ? plan.start.periapsisAltitude : NaN);
  });

  it("after New plan, starts over from the new plan (not the previous plan's date ranges)", () => {
    const before = initialWindowsForm(system, demoPlan('tessel-to-ochre.plan.json'), 200);
    const after = initialWindowsForm(system, blankPlan(system), 200);
    expect(after.departStart).toBe(0); // the blank plan starts at the epoch
    expect(after.departStart).not.toBe(before.departStart);
    expect(after.from).toBe(blankPlan(system).start.body);
  });

  it("never carries a capture altitude below the body's safe altitude (a 400 km target at Moravel)", () => {
    const plan = { ...blankPlan(system), target: { body: 'moravel', periapsisAltitude: 400e3 } } as ReturnType<typeof blankPlan>;
    const f = initialWindowsForm(system, plan, 200);
    expect(f.to).toBe('moravel');
    expect(f.captureAlt).toBeGreaterThanOrEqual(body('moravel').safeAlt);
    const field = altitudeKind('Capture altitude', body('moravel'));
    const low = field.parse('400');
    expect(low.ok).toBe(false);
    if (!low.ok) expect(low.message).toBe("Capture altitude must be at least Moravel's minimum safe altitude, 1,000 km");
    expect(field.parse('1200')).toEqual({ ok: true, value: 1200e3 });
  });

  it('a moon of another planet: the leg with the window and the words on screen; its ranges follow the leg', () => {
    const leg = legOf(system, 'tessel', 'skerry')!;
    expect(leg.through).toBe('Skerry is reached through Moravel: the window shown is Tessel → Moravel');
    const plan = blankPlan(system);
    const viaMoon = pairDefaults(system, plan, 'tessel', 'skerry')!;
    const direct = pairDefaults(system, plan, 'tessel', 'moravel')!;
    expect(viaMoon).toEqual(direct);
    expect(pairDefaults(system, plan, 'tessel', 'quill')!.tofMax).toBeLessThan(direct.tofMin); // a moon is days away, a planet months
    expect(legOf(system, 'tessel', 'tessel')).toBeNull();
  });

  it("asks for total Δv over the form's ranges, on the leg of its pair, and for nothing when the pair has no leg", () => {
    const plan = demoPlan('tessel-to-ochre.plan.json');
    const form = initialWindowsForm(system, plan, 120);
    const r = windowsRequest(system, form)!;
    const leg = legOf(system, form.from, form.to)!;
    expect(r).toEqual({
      from: leg.from,
      to: leg.to,
      depart: { start: form.departStart, end: form.departEnd, n: 120 },
      secondAxis: 'tof',
      second: { start: form.tofMin, end: form.tofMax, n: 120 },
      parkingAltitude: form.parkingAlt,
      arrivalAltitude: form.captureAlt,
      metric: 'total',
    });
    expect(windowsRequest(system, { ...form, to: form.from })).toBeNull();
  });
});
