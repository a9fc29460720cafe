/**
 * Piecewise fits (core/runtime/pieces.ts) of analytic functions: the stated error holds at random
 * times against the function, the uniform search finds the fewest pieces, bisection shortens pieces
 * only where the function bends, and a tolerance double precision cannot hold fails.
 */
import { describe, expect, it } from 'vitest';
import { InputError, SolverError, stream } from '../../../core/math/index.ts';
import { chebyshevPosition, checkPoints, fitChebyshev3 } from '../../../core/runtime/chebyshev.ts';
import { type FittedPieces, fitBisected, fitUniform, pieceError } from '../../../core/runtime/pieces.ts';

/** [cos t, sin t, t³/1000]: a circle of radius 1 and a cubic. */
const helix = (t: number, out: Float64Array): void => {
  out[0] = Math.cos(t);
  out[1] = Math.sin(t);
  out[2] = t ** 3 / 1000;
};

/** Series value of a fit at t (the piece holding t). */
function valueAt(fit: FittedPieces, t: number, out: Float64Array): void {
  const stride = 3 * (fit.degree + 1);
  let k: number;
  let a: number;
  let b: number;
  if (fit.length !== null) {
    k = Math.min(fit.count - 1, Math.max(0, Math.floor((t - fit.t0) / fit.length)));
    a = fit.t0 + k * fit.length;
    b = a + fit.length;
  } else {
    k = 0;
    while (k < fit.count - 1 && fit.breaks![k + 1] <= t) k++;
    a = fit.breaks![k];
    b = fit.breaks![k + 1];
  }
  chebyshevPosition(fit.coefficients, k * stride, fit.degree, a, b, t, out);
}

function worstAtRandom(fit: FittedPieces, f: (t: number, out: Float64Array) => void, n: number, seed: number): number {
  const rng = stream(seed, 0);
  const p = new Float64Array(3);
  const v = new Float64Array(6);
  let worst = 0;
  for (let k = 0; k < n; k++) {
    const t = rng.uniform(fit.t0, fit.t1);
    valueAt(fit, t, p);
    f(t, v);
    worst = Math.max(worst, Math.hypot(p[0] - v[0], p[1] - v[1], p[2] - v[2]));
  }
  return worst;
}

describe('fitUniform', () => {
  it('[cos t, sin t, t³/1000] on [0, 40] to 1e-9: the error at 5,000 random times is within the stated maxError, which is within the tolerance', () => {
    const fit = fitUniform(helix, 0, 40, 8, 1e-9, 1);
    expect(fit.maxError).toBeLessThanOrEqual(1e-9);
    expect(worstAtRandom(fit, helix, 5000, 11)).toBeLessThanOrEqual(fit.maxError);
    // the stated figure is the fit's, not a loose bound: random times reach most of it
    expect(worstAtRandom(fit, helix, 5000, 11)).toBeGreaterThan(0.5 * fit.maxError);
    expect(fit.length! * fit.count).toBeCloseTo(40, 12);
  });

  it('finds the fewest equal pieces: one piece fewer misses the tolerance (searched from far too few and from far too many)', () => {
    for (const first of [1, 500]) {
      const fit = fitUniform(helix, 0, 40, 8, 1e-9, first);
      const n = fit.count - 1;
      const coef = new Float64Array(3 * 9 * n);
      const len = 40 / n;
      let worst = 0;
      for (let k = 0; k < n; k++) {
        fitChebyshev3(helix, k * len, k * len + len, 8, coef, k * 27);
        worst = Math.max(worst, pieceError(helix, coef, k * 27, 8, k * len, k * len + len, checkPoints(8)));
      }
      expect(worst).toBeGreaterThan(1e-9);
    }
  });

  it('a source giving a non-finite position (here only at the interval’s end, a check point and no node) is an InputError naming the source', () => {
    const endNaN = (t: number, out: Float64Array) => {
      helix(t, out);
      if (t === 40) out[1] = Number.NaN;
    };
    expect(() => fitUniform(endNaN, 0, 40, 8, 1e-9, 1)).toThrow(/^source must give a finite position \(at t = 40\)/);
    expect(() => fitBisected(endNaN, 0, 40, 8, () => 1e-9)).toThrow(InputError);
  });

  it('a tolerance below double precision fails with a SolverError instead of running on', () => {
    expect(() => fitUniform(helix, 0, 40, 8, 1e-20, 1, { maxPieces: 2000, minLength: 1e-3 })).toThrow(SolverError);
  });
});

describe('fitBisected', () => {
  // a kink at t = 1 (|t − 1| in x): no series is smooth across it, so pieces must shrink there
  const kinked = (t: number, out: Float64Array): void => {
    out[0] = Math.abs(t - 1);
    out[1] = Math.sin(t);
    out[2] = 0;
  };

  it('pieces shrink only near the kink; the error at random times is within the stated maxError ≤ tolerance', () => {
    const fit = fitBisected(kinked, 0, 3, 6, () => 1e-6, { maxPieces: 10_000, minLength: 1e-9 });
    expect(fit.maxError).toBeLessThanOrEqual(1e-6);
    expect(worstAtRandom(fit, kinked, 5000, 5)).toBeLessThanOrEqual(fit.maxError);
    const br = fit.breaks!;
    expect(br[0]).toBe(0);
    expect(br[fit.count]).toBe(3);
    // the shortest piece holds t = 1 (halving never lands on it: 1 is not 3k/2ⁿ), the pieces away from it stay long
    let shortest = 0;
    for (let k = 1; k < fit.count; k++) if (br[k + 1] - br[k] < br[shortest + 1] - br[shortest]) shortest = k;
    expect(br[shortest] < 1 && br[shortest + 1] > 1).toBe(true);
    expect(br[shortest + 1] - br[shortest]).toBeLessThan(1e-4);
    expect(br[1] - br[0]).toBeGreaterThan(0.3);
    expect(br[fit.count] - br[fit.count - 1]).toBeGreaterThan(0.3);
  });

  it('a tighter tolerance in a window gives shorter pieces there', () => {
    const tolOf = (a: number, b: number) => (a < 2.6 && b > 2.4 ? 1e-12 : 1e-6);
    const fit = fitBisected(helix, 0, 10, 6, tolOf);
    const br = fit.breaks!;
    for (let k = 0; k < fit.count; k++) {
      expect(fit.errors[k]).toBeLessThanOrEqual(tolOf(br[k], br[k + 1]));
    }
    const inWindow = [...br].filter((t) => t > 2.4 && t < 2.6).length;
    expect(inWindow).toBeGreaterThan(0);
  });

  it('a tolerance no piece can meet fails with a SolverError (the piece would get shorter than minLength)', () => {
    expect(() => fitBisected(kinked, 0, 3, 6, () => 1e-12, { maxPieces: 10_000, minLength: 1e-3 })).toThrow(/runtime-fit: precision-lost/);
  });
});
