import { describe, expect, it } from 'vitest';
import { integrateFixed } from '../../../core/integrate/fixed.ts';
import { YOSHIDA_W0, YOSHIDA_W1 } from '../../../core/integrate/yoshida4.ts';
import { MU, ORBIT, det2, halvingRatios, oneRevErrors, oscillatorMap } from './convergence.ts';
import { posError, stateAt, twoBodyAccel } from './twoBody.ts';

describe('Yoshida 4th-order composition (Yoshida 1990, Phys. Lett. A 150)', () => {
  it('weights: 2·w1 + w0 = 1 and 2·w1³ + w0³ = 0 (the order-4 conditions of the paper)', () => {
    expect(2 * YOSHIDA_W1 + YOSHIDA_W0).toBeCloseTo(1, 15);
    expect(2 * YOSHIDA_W1 ** 3 + YOSHIDA_W0 ** 3).toBeCloseTo(0, 14);
  });

  it('converges at fourth order: halving h divides the error by 16 (analytic Kepler reference)', () => {
    for (const q of halvingRatios(oneRevErrors('yoshida4', [100, 200, 400, 800]))) {
      expect(q).toBeGreaterThan(15);
      expect(q).toBeLessThan(17);
    }
  });

  it('is time-reversible (symmetric composition; Hairer, Lubich & Wanner, GNI, §V.1)', () => {
    const s0 = stateAt(ORBIT, 0);
    const fwd = integrateFixed('yoshida4', twoBodyAccel(MU), 0, s0.subarray(0, 3), s0.subarray(3), { h: 30, tEnd: 6000 });
    const back = integrateFixed('yoshida4', twoBodyAccel(MU), 6000, fwd.x, fwd.v, { h: 30, tEnd: 0 });
    expect(posError(back.x, s0) / ORBIT.a).toBeLessThan(1e-12);
  });

  it('step map on the harmonic oscillator is area-preserving (det 1, analytic)', () => {
    expect(det2(oscillatorMap('yoshida4', 2, 0.1))).toBeCloseTo(1, 14);
  });
});
