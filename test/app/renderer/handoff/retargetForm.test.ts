import { describe, expect, it } from 'vitest';
import { GAME_TOLERANCES } from '../../../../core/handoff/index.ts';
import {
  DEFAULT_RETARGET_FORM,
  STEP_RATE_HINT,
  TOLERANCE_PLACEHOLDERS,
  parseRetargetForm,
  verifyHints,
} from '../../../../app/renderer/handoff/retargetForm.ts';

const DEG = Math.PI / 180;

describe('the retargeting fields', () => {
  it("empty fields keep the core's defaults, which the placeholders show in the fields' units", () => {
    const p = parseRetargetForm(DEFAULT_RETARGET_FORM);
    expect(p.tolerance).toEqual({});
    expect(p.errors).toEqual({});
    expect(p.verify).toBe('every-step');
    expect(Number(TOLERANCE_PLACEHOLDERS.altitude) * 1000).toBe(GAME_TOLERANCES.altitude);
    expect(Number(TOLERANCE_PLACEHOLDERS.inclination) * DEG).toBeCloseTo(GAME_TOLERANCES.i, 15);
    expect(Number(TOLERANCE_PLACEHOLDERS.time)).toBe(GAME_TOLERANCES.time);
  });

  it('reads km, degrees and seconds, or a value with its unit', () => {
    const p = parseRetargetForm({ altitude: '2.5', inclination: '0.05', time: '90', verify: 'extrapolated' });
    expect(p.tolerance).toEqual({ altitude: 2500, i: 0.05 * DEG, time: 90 });
    expect(p.verify).toBe('extrapolated');
    const u = parseRetargetForm({ altitude: '500 m', inclination: '1e-4 rad', time: '2 min', verify: 'every-step' });
    expect(u.tolerance!.altitude).toBe(500);
    expect(u.tolerance!.i).toBeCloseTo(1e-4, 15);
    expect(u.tolerance!.time).toBe(120);
  });

  it('a field that does not read, or is not above 0, has a message and no tolerance is given', () => {
    const p = parseRetargetForm({ altitude: 'far', inclination: '0', time: '-5', verify: 'every-step' });
    expect(p.tolerance).toBeNull();
    expect(Object.keys(p.errors).sort()).toEqual(['altitude', 'inclination', 'time']);
    expect(p.errors.inclination).toBe('must be more than 0');
  });

  it('the verification hints: the steps every-step flies for the span and step, and a rough time', () => {
    const span = 240 * 86400;
    const h = verifyHints(span, 1 / 60);
    const steps = span * 60;
    expect(h['every-step']).toContain(steps.toExponential(2).replace('e+', 'e'));
    // 1.24e9 steps at the hint's rate is about a minute
    expect(steps / STEP_RATE_HINT).toBeGreaterThan(20);
    expect(h['every-step']).toMatch(/about a minute|about \d+ min/);
    expect(verifyHints(span, 1)['every-step']).toMatch(/seconds/);
    expect(verifyHints(null, 1)['every-step']).toMatch(/every game step/);
    expect(h.extrapolated).toMatch(/seconds/);
  });
});
