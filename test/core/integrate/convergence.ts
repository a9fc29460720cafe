/** Convergence-order helper for the fixed-step method tests: error after one revolution vs the analytic orbit. */
import { type FixedMethod, integrateFixed } from '../../../core/integrate/fixed.ts';
import { type Ellipse, period, posError, stateAt, twoBodyAccel } from './twoBody.ts';

// Earth's μ (Vallado, 4th ed., Table D-3, from memory) as a realistic reference input.
export const MU = 3.986004418e14;
export const ORBIT: Ellipse = { mu: MU, a: 8.0e6, e: 0.3, i: 0.5, raan: 1.0, argp: 0.7, M0: 0.3 };

/** Relative position errors after one revolution with h = P/N for each N. */
export function oneRevErrors(method: FixedMethod, Ns: number[], o: Ellipse = ORBIT): number[] {
  const P = period(o);
  const s0 = stateAt(o, 0);
  return Ns.map((N) => {
    const r = integrateFixed(method, twoBodyAccel(o.mu), 0, s0.subarray(0, 3), s0.subarray(3), { h: P / N, tEnd: P });
    return posError(r.x, stateAt(o, P)) / o.a;
  });
}

/** Successive error ratios e(h)/e(h/2). */
export function halvingRatios(errs: number[]): number[] {
  return errs.slice(1).map((e, k) => errs[k] / e);
}

/**
 * The linear map of one step on the harmonic oscillator x'' = −ω²x, as the matrix taking
 * (x0, v0) to (x1, v1): columns are the images of (1, 0) and (0, 1).
 */
export function oscillatorMap(method: FixedMethod, omega: number, h: number): number[][] {
  const accel = (_t: number, x: Float64Array, _v: Float64Array, out: Float64Array) => {
    for (let i = 0; i < 3; i++) out[i] = -omega * omega * x[i];
  };
  const col = (x: number, v: number) => {
    const r = integrateFixed(method, accel, 0, [x, 0, 0], [v, 0, 0], { h, steps: 1 });
    return [r.x[0], r.v[0]];
  };
  const c1 = col(1, 0),
    c2 = col(0, 1);
  return [
    [c1[0], c2[0]],
    [c1[1], c2[1]],
  ];
}

export function det2(m: number[][]): number {
  return m[0][0] * m[1][1] - m[0][1] * m[1][0];
}
