import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { DenseOutput } from '../../../core/integrate/dense.ts';
import { rk45 } from '../../../core/integrate/rk45.ts';
import { type Ellipse, period, posError, stateAt, twoBodyOde } from './twoBody.ts';

// Earth's μ (Vallado, 4th ed., Table D-3, from memory) as a realistic reference input.
const MU = 3.986004418e14;
const O: Ellipse = { mu: MU, a: 8.0e6, e: 0.3, i: 0.5, raan: 1.0, argp: 0.7, M0: 0.3 };

describe('DenseOutput of rk45 (Dormand–Prince 4th-order continuous extension, Hairer et al. II.6)', () => {
  it('interpolation error inside one step falls like h^5 (local error of a 4th-order interpolant, analytic reference)', () => {
    const P = period(O);
    const y0 = stateAt(O, 0);
    const mid: number[] = [];
    for (const h of [P / 40, P / 80, P / 160]) {
      // One step of exactly h: loose tolerances so the first trial step is accepted.
      const r = rk45(twoBodyOde(MU), 0, y0, h, { h0: h, rtol: 1, atol: 1e3, dense: true });
      expect(r.stats.accepted).toBe(1);
      expect(r.stats.rejected).toBe(0);
      let worst = 0;
      for (const th of [0.25, 0.5, 0.75]) worst = Math.max(worst, posError(r.dense!.at(th * h), stateAt(O, th * h)));
      mid.push(worst);
    }
    const ratios = [mid[0] / mid[1], mid[1] / mid[2]];
    for (const q of ratios) {
      expect(q).toBeGreaterThan(24); // 2^5 = 32
      expect(q).toBeLessThan(42);
    }
  });

  it('between steps matches the analytic orbit at the tolerance level (rtol 1e-10, 2 revolutions)', () => {
    const T = 2 * period(O);
    const r = rk45(twoBodyOde(MU), 0, stateAt(O, 0), T, { rtol: 1e-10, atol: 1e-10, dense: true });
    const d = r.dense!;
    expect(d.tStart).toBe(0);
    expect(d.tEnd).toBe(T);
    expect(d.steps).toBe(r.stats.accepted);
    const out = new Float64Array(6);
    let worst = 0;
    for (let k = 0; k <= 997; k++) {
      const t = (k / 997) * T;
      expect(d.at(t, out)).toBe(out);
      worst = Math.max(worst, posError(out, stateAt(O, t)) / O.a);
    }
    expect(worst).toBeLessThan(1000 * 1e-10);
    // The end points reproduce the solver's states.
    expect(Array.from(d.at(T))).toEqual(Array.from(r.y));
    expect(Array.from(d.at(0))).toEqual(Array.from(stateAt(O, 0)));
  });

  it('works for a backward solve', () => {
    const P = period(O);
    const r = rk45(twoBodyOde(MU), P, stateAt(O, P), 0, { rtol: 1e-10, atol: 1e-10, dense: true });
    const d = r.dense!;
    expect(d.tStart).toBe(P);
    expect(d.tEnd).toBe(0);
    for (const t of [0, 0.1 * P, 0.37 * P, 0.9 * P, P]) expect(posError(d.at(t), stateAt(O, t)) / O.a).toBeLessThan(1e-7);
  });

  it('rejects times outside the covered span with InputError', () => {
    const r = rk45(twoBodyOde(MU), 0, stateAt(O, 0), 100, { dense: true });
    expect(() => r.dense!.at(100.5)).toThrow(InputError);
    expect(() => r.dense!.at(-1)).toThrow(/must lie within the dense output span/);
    expect(() => r.dense!.at(NaN)).toThrow(/t must be a finite number/);
  });
});

describe('DenseOutput Hermite steps', () => {
  it('reproduce a cubic polynomial exactly (cubic Hermite interpolation is exact for cubics, analytic)', () => {
    const p = (t: number) => 2 - 3 * t + 0.5 * t * t + 0.25 * t ** 3;
    const dp = (t: number) => -3 + t + 0.75 * t * t;
    const d = new DenseOutput(1, 0, 1); // capacity 1: exercises growth
    const knots = [0, 0.7, 1.1, 2.5, 4];
    for (let k = 0; k + 1 < knots.length; k++) {
      const a = knots[k],
        b = knots[k + 1];
      d.appendHermite(a, b - a, [p(a)], [dp(a)], [p(b)], [dp(b)]);
    }
    expect(d.steps).toBe(4);
    for (let t = 0; t <= 4; t += 0.0625) expect(d.at(t)[0]).toBeCloseTo(p(t), 12);
  });

  it('rejects an empty interpolant', () => {
    expect(() => new DenseOutput(2, 0).at(0)).toThrow(/holds no steps/);
    expect(() => new DenseOutput(0, 0)).toThrow(InputError);
  });
});
