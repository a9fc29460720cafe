import { describe, expect, it } from 'vitest';
import { det2, halvingRatios, oneRevErrors, oscillatorMap } from './convergence.ts';

describe('explicit Euler (comparison method)', () => {
  it('converges at first order (analytic Kepler reference)', () => {
    for (const q of halvingRatios(oneRevErrors('explicit-euler', [4000, 8000, 16000]))) {
      expect(q).toBeGreaterThan(1.9);
      expect(q).toBeLessThan(2.1);
    }
  });

  it('expands phase-space area on the harmonic oscillator: det of the step map = 1 + ω²h² (analytic)', () => {
    const w = 2,
      h = 0.1;
    const m = oscillatorMap('explicit-euler', w, h);
    expect(m).toEqual([
      [1, h],
      [-w * w * h, 1],
    ]);
    expect(det2(m)).toBeCloseTo(1 + w * w * h * h, 14);
  });
});
