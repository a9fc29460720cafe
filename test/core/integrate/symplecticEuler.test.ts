import { describe, expect, it } from 'vitest';
import { integrateFixed } from '../../../core/integrate/fixed.ts';
import { det2, halvingRatios, oneRevErrors, oscillatorMap } from './convergence.ts';

describe('semi-implicit (symplectic) Euler', () => {
  it('converges at first order: halving h halves the error (analytic Kepler reference)', () => {
    for (const q of halvingRatios(oneRevErrors('symplectic-euler', [4000, 8000, 16000]))) {
      expect(q).toBeGreaterThan(1.9);
      expect(q).toBeLessThan(2.1);
    }
  });

  it('is the game-loop form v ← v + a·h, then x ← x + v·h (common practice), bit for bit', () => {
    const accel = (_t: number, x: Float64Array, _v: Float64Array, out: Float64Array) => {
      out[0] = -x[0] * 4;
      out[1] = -x[1] * 4 - 0.5;
      out[2] = 0;
    };
    const h = 1 / 60;
    const r = integrateFixed('symplectic-euler', accel, 0, [1, 0, 0], [0, 1, 0], { h, steps: 120 });
    let x0 = 1,
      x1 = 0,
      v0 = 0,
      v1 = 1;
    for (let k = 0; k < 120; k++) {
      v0 += -x0 * 4 * h;
      v1 += (-x1 * 4 - 0.5) * h;
      x0 += v0 * h;
      x1 += v1 * h;
    }
    expect([r.x[0], r.x[1], r.v[0], r.v[1]]).toEqual([x0, x1, v0, v1]);
  });

  it('preserves phase-space area on the harmonic oscillator: det of the step map = 1 (analytic: [[1−ω²h², h], [−ω²h, 1]])', () => {
    const w = 2,
      h = 0.1;
    const m = oscillatorMap('symplectic-euler', w, h);
    expect(m[0][0]).toBeCloseTo(1 - w * w * h * h, 14);
    expect(m[0][1]).toBeCloseTo(h, 14);
    expect(m[1][0]).toBeCloseTo(-w * w * h, 14);
    expect(m[1][1]).toBeCloseTo(1, 14);
    expect(det2(m)).toBeCloseTo(1, 14);
  });
});
