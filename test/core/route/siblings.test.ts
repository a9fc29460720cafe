import { describe, expect, it } from 'vitest';
import { synodicPeriod } from '../../../core/orbit/index.ts';
import { bestWindow, windowOutsideRange } from '../../../core/route/siblings.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
const x = sys.indexById.tessel;
const y = sys.indexById.moravel;
const aim = { altitude: 900e6, e: 0.35 };
const day = sys.calendar.dayLength;
const synodic = synodicPeriod(sys.bodies[x].derived.period, sys.bodies[y].derived.period);

describe('route: the window of a hop between sister bodies', () => {
  it('is the cheapest window of the range, not the earliest (a range from day 99 took its start edge at 32 km/s)', () => {
    const after = 99 * day;
    const before = after + 1.5 * synodic;
    const w = bestWindow(sys, x, y, after, before, 300e3, aim);
    // the range holds more than one synodic period, so a window opens inside it: the best is not on its edge
    expect(before - after).toBeGreaterThan(synodic);
    expect(w.atEdge).toBe(false);
    // and it is no dearer than the best of the same search over any shorter stretch of the range
    for (const [a, b] of [
      [after, after + 0.5 * synodic],
      [after + 0.25 * synodic, after + 0.75 * synodic],
      [after + 0.5 * synodic, before],
    ]) {
      expect(w.dvTotal).toBeLessThanOrEqual(bestWindow(sys, x, y, a, b, 300e3, aim).dvTotal + 1e-6);
    }
    expect(windowOutsideRange(sys, x, y, w, after, before, 300e3, aim)).toBeNull();
  });

  it('says when a cheaper window opens outside a range that holds none, and what it costs', () => {
    const inRange = bestWindow(sys, x, y, 99 * day, 160 * day, 300e3, aim);
    expect(inRange.atEdge).toBe(true);
    const note = windowOutsideRange(sys, x, y, inRange, 99 * day, 160 * day, 300e3, aim);
    expect(note).toMatch(/^no Tessel → Moravel window opens between .* a window opens Year 41[23] TR, day \d+.*km\/s\) — widen the departure range/);
  });
});
