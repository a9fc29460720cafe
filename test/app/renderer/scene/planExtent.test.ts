import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { bodyPosition, findBodyIndex } from '../../../../core/system/index.ts';
import { planExtent } from '../../../../app/renderer/scene/planExtent.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const plan = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const result = evaluate(system, plan);
const tessel = findBodyIndex(system, 'tessel');
const ochre = findBodyIndex(system, 'ochre');
const dist = (i: number, t: number, about = 0) => {
  const p = bodyPosition(system, i, t, [0, 0, 0], about);
  return Math.hypot(p[0], p[1], p[2]);
};

describe('the whole plan to frame', () => {
  it('an interplanetary plan centres on the star and reaches the start world and the destination at departure and arrival', () => {
    const e = planExtent(system, result, [tessel, ochre], [result.t0, result.t1]);
    expect(e.centre).toBe(0);
    for (const t of [result.t0, result.t1]) {
      expect(e.radius).toBeGreaterThanOrEqual(dist(ochre, t));
      expect(e.radius).toBeGreaterThanOrEqual(dist(tessel, t));
    }
    // no more than the outer of the two orbits' aphelia and the bodies' own reach (no stray far point)
    const outer = Math.max(system.bodies[ochre].derived.apoapsis, system.bodies[tessel].derived.apoapsis);
    expect(e.radius).toBeLessThan(outer * 1.05);
  });

  it('a flight that stays about its world centres on that world; adding a body about the star moves the centre to the star', () => {
    // the departure burn alone: the flight stays in Tessel's sphere of influence
    const short = { ...plan, events: plan.events.slice(0, 1), end: null };
    const r = evaluate(system, short);
    expect(r.segments.every((s) => s.central === tessel)).toBe(true);
    const e = planExtent(system, r, [tessel], [r.t0, r.t1]);
    expect(e.centre).toBe(tessel);
    expect(e.radius).toBeGreaterThan(0);
    expect(e.radius).toBeLessThanOrEqual(system.bodies[tessel].derived.soiRadius * 1.01);
    expect(planExtent(system, r, [tessel, ochre], [r.t0]).centre).toBe(0);
  });
});
