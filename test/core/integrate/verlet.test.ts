import { describe, expect, it } from 'vitest';
import { integrateFixed } from '../../../core/integrate/fixed.ts';
import { MU, ORBIT, det2, halvingRatios, oneRevErrors, oscillatorMap } from './convergence.ts';
import { posError, stateAt, twoBodyAccel } from './twoBody.ts';

describe('velocity Verlet / leapfrog', () => {
  it('converges at second order: halving h divides the error by 4 (analytic Kepler reference)', () => {
    for (const q of halvingRatios(oneRevErrors('verlet', [200, 400, 800]))) {
      expect(q).toBeGreaterThan(3.8);
      expect(q).toBeLessThan(4.2);
    }
  });

  it('is time-reversible: N steps forward then N back return to the start to rounding (Hairer, Lubich & Wanner, GNI, §V.1)', () => {
    const s0 = stateAt(ORBIT, 0);
    const fwd = integrateFixed('verlet', twoBodyAccel(MU), 0, s0.subarray(0, 3), s0.subarray(3), { h: 20, tEnd: 4000 });
    const back = integrateFixed('verlet', twoBodyAccel(MU), 4000, fwd.x, fwd.v, { h: 20, tEnd: 0 });
    expect(posError(back.x, s0) / ORBIT.a).toBeLessThan(1e-12);
  });

  it('step map on the harmonic oscillator has det 1 and matches the Störmer–Verlet matrix (analytic)', () => {
    const w = 2,
      h = 0.1,
      q = (w * h) ** 2;
    const m = oscillatorMap('verlet', w, h);
    // x1 = (1 − q/2)x0 + h v0; v1 = −ω²h(1 − q/4)x0 + (1 − q/2)v0
    expect(m[0][0]).toBeCloseTo(1 - q / 2, 14);
    expect(m[0][1]).toBeCloseTo(h, 14);
    expect(m[1][0]).toBeCloseTo(-w * w * h * (1 - q / 4), 14);
    expect(m[1][1]).toBeCloseTo(1 - q / 2, 14);
    expect(det2(m)).toBeCloseTo(1, 14);
  });
});
