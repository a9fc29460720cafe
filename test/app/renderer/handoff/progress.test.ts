import { describe, expect, it } from 'vitest';
import type { RetargetProgress } from '../../../../core/handoff/index.ts';
import { RETARGET_BANDS, retargetFraction } from '../../../../app/renderer/handoff/progress.ts';

const at = (stage: RetargetProgress['stage'], fraction: number | null): RetargetProgress => ({ stage, message: '', fraction });

describe('retargetFraction', () => {
  it('each stage fills its own band, in order, from 0 to 1', () => {
    expect(retargetFraction(at('before', 0), 0)).toBe(0);
    expect(retargetFraction(at('before', 1), 0)).toBe(RETARGET_BANDS.before[1]);
    expect(retargetFraction(at('verify', 0.5), 0)).toBeCloseTo((RETARGET_BANDS.verify[0] + RETARGET_BANDS.verify[1]) / 2, 12);
    expect(retargetFraction(at('recommend', 1), 0)).toBe(1);
    const stages = Object.keys(RETARGET_BANDS) as RetargetProgress['stage'][];
    for (let k = 1; k < stages.length; k++) expect(RETARGET_BANDS[stages[k]][0]).toBe(RETARGET_BANDS[stages[k - 1]][1]);
  });

  it('never moves back: a stage restarting its fraction, or one with none, keeps what was shown', () => {
    let f = 0;
    const seq: RetargetProgress[] = [at('before', 0.5), at('before', 1), at('leg', null), at('leg', 0.9), at('leg', 0.1), at('verify', 0), at('verify', 0.3)];
    const shown = seq.map((p) => (f = retargetFraction(p, f)));
    for (let k = 1; k < shown.length; k++) expect(shown[k]).toBeGreaterThanOrEqual(shown[k - 1]);
    expect(shown[2]).toBe(RETARGET_BANDS.leg[0]);
    expect(shown[4]).toBe(shown[3]);
  });

  it('a fraction outside 0..1 or not finite stays within the band', () => {
    expect(retargetFraction(at('leg', 7), 0)).toBe(RETARGET_BANDS.leg[1]);
    expect(retargetFraction(at('leg', Number.NaN), 0)).toBe(RETARGET_BANDS.leg[0]);
    expect(retargetFraction(at('leg', -1), 0)).toBe(RETARGET_BANDS.leg[0]);
  });
});
