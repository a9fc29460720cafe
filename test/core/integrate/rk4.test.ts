import { describe, expect, it } from 'vitest';
import { det2, halvingRatios, oneRevErrors, oscillatorMap } from './convergence.ts';

describe('classic RK4 (comparison method)', () => {
  it('converges at fourth order (analytic Kepler reference)', () => {
    const q = halvingRatios(oneRevErrors('rk4', [200, 400, 800, 1600]));
    for (const r of q) {
      expect(r).toBeGreaterThan(15);
      expect(r).toBeLessThan(19);
    }
  });

  it('step map on the harmonic oscillator is the Taylor polynomial of exp(hA) to degree 4, det ≠ 1 (analytic)', () => {
    const w = 2,
      h = 0.1,
      z = w * h;
    const m = oscillatorMap('rk4', w, h);
    // x1 = (1 − z²/2 + z⁴/24)x0 + h(1 − z²/6)v0
    expect(m[0][0]).toBeCloseTo(1 - (z * z) / 2 + z ** 4 / 24, 14);
    expect(m[0][1]).toBeCloseTo(h * (1 - (z * z) / 6), 14);
    // det = 1 − z⁶/72 + z⁸/576 (not symplectic)
    expect(det2(m)).toBeCloseTo(1 - z ** 6 / 72 + z ** 8 / 576, 14);
    expect(det2(m)).toBeLessThan(1);
  });
});
