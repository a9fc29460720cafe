/**
 * The Chebyshev series of one piece (core/runtime/chebyshev.ts) against closed forms: the
 * expansion of exp, the Chebyshev form of a cubic, the interpolation error bound at Chebyshev
 * nodes, and exact derivatives of polynomials.
 */
import { describe, expect, it } from 'vitest';
import { InputError, stream } from '../../../core/math/index.ts';
import { MAX_DEGREE, checkPoints, chebyshevPosition, chebyshevVelocity, fitChebyshev3, requireDegree } from '../../../core/runtime/chebyshev.ts';

/** Modified Bessel function I_j(x) by its ascending series (Abramowitz & Stegun 9.6.10, from memory). */
function besselI(j: number, x: number): number {
  let term = (x / 2) ** j;
  for (let k = 1; k <= j; k++) term /= k;
  let sum = 0;
  for (let m = 0; m < 40; m++) {
    sum += term;
    term *= (x * x) / 4 / ((m + 1) * (m + 1 + j));
  }
  return sum;
}

const factorial = (n: number): number => (n <= 1 ? 1 : n * factorial(n - 1));

describe('fitChebyshev3: coefficients against closed forms', () => {
  it('exp on [−1, 1]: c_0 = I_0(1), c_j = 2 I_j(1) (e^{cos θ} = I_0 + 2 Σ I_j cos jθ, Abramowitz & Stegun 9.6.34, from memory)', () => {
    const degree = 14;
    const coef = new Float64Array(3 * (degree + 1));
    fitChebyshev3(
      (t, out) => {
        out[0] = Math.exp(t);
        out[1] = Math.exp(-t); // e^{−x}: the same with (−1)^j
        out[2] = 0;
      },
      -1,
      1,
      degree,
      coef,
    );
    for (let j = 0; j <= degree; j++) {
      const exact = (j === 0 ? 1 : 2) * besselI(j, 1);
      // Aliasing at N + 1 = 15 nodes adds the terms of order 30 − j and up (2 I_16(1) ≈ 2e-18 at
      // most); the cosine sums' roundoff is a few ε·e ≈ 1e-15: 2e-15 holds both.
      expect(Math.abs(coef[j] - exact)).toBeLessThan(2e-15);
      expect(Math.abs(coef[degree + 1 + j] - (j % 2 === 0 ? exact : -exact))).toBeLessThan(2e-15);
    }
    // the series itself against tabulated values: I_0(1) = 1.266065878, I_1(1) = 0.565159104 (A&S Table 9.8, from memory)
    expect(coef[0]).toBeCloseTo(1.266065878, 9);
    expect(coef[1]).toBeCloseTo(2 * 0.565159104, 9);
  });

  it('t³ on [−1, 1] is (3T_1 + T_3)/4 exactly (T_3 = 4t³ − 3t), and a cubic on [a, b] has no terms above degree 3', () => {
    const degree = 8;
    const coef = new Float64Array(3 * (degree + 1));
    fitChebyshev3(
      (t, out) => {
        out[0] = t ** 3;
        out[1] = 0;
        out[2] = 0;
      },
      -1,
      1,
      degree,
      coef,
    );
    const expected = [0, 0.75, 0, 0.25, 0, 0, 0, 0, 0];
    // cosine sums of values ≤ 1 over 9 nodes: roundoff a few ε
    for (let j = 0; j <= degree; j++) expect(Math.abs(coef[j] - expected[j])).toBeLessThan(1e-15);
  });
});

describe('fitChebyshev3 + chebyshevPosition: interpolation error', () => {
  it('[cos t, sin t, t³] on [0.3, 2.1], degree 10: within the Chebyshev-node bound max|f⁽ᴺ⁺¹⁾|·h^{N+1}/(2^N (N+1)!) (Burden & Faires, Numerical Analysis, §8.3, from memory) at 2,000 random times', () => {
    const a = 0.3;
    const b = 2.1;
    const degree = 10;
    const coef = new Float64Array(3 * (degree + 1));
    const f = (t: number, out: Float64Array) => {
      out[0] = Math.cos(t);
      out[1] = Math.sin(t);
      out[2] = t ** 3;
    };
    fitChebyshev3(f, a, b, degree, coef);
    const h = (b - a) / 2;
    // |d^11 cos| ≤ 1; t³ is a polynomial of degree 3 < 11, interpolated exactly
    const bound = h ** (degree + 1) / (2 ** degree * factorial(degree + 1));
    expect(bound).toBeLessThan(1e-11); // the check is a tight one
    // roundoff of the sums: coefficients ≤ ~10 (t³ ≤ 9.3), 11 terms: a few ε·10·11 ≈ 3e-14
    const roundoff = 5e-14;
    const rng = stream(20261205, 0);
    const p = new Float64Array(3);
    const truth = new Float64Array(6);
    let worstTrig = 0;
    let worstCubic = 0;
    for (let k = 0; k < 2000; k++) {
      const t = rng.uniform(a, b);
      chebyshevPosition(coef, 0, degree, a, b, t, p);
      f(t, truth);
      worstTrig = Math.max(worstTrig, Math.abs(p[0] - truth[0]), Math.abs(p[1] - truth[1]));
      worstCubic = Math.max(worstCubic, Math.abs(p[2] - truth[2]));
    }
    expect(worstTrig).toBeLessThanOrEqual(bound + roundoff);
    expect(worstCubic).toBeLessThanOrEqual(roundoff);
    // and the bound is not far above what is achieved (within a factor 20 of it)
    expect(worstTrig).toBeGreaterThan(bound / 20);
  });

  it('the series passes through the function at the nodes and at no check point does the error exceed its peak order', () => {
    const degree = 6;
    const coef = new Float64Array(3 * (degree + 1));
    const f = (t: number, out: Float64Array) => {
      out[0] = Math.exp(t);
      out[1] = 1 / (2 + t);
      out[2] = Math.atan(t);
    };
    fitChebyshev3(f, -0.5, 0.5, degree, coef);
    const p = new Float64Array(3);
    const v = new Float64Array(6);
    for (let k = 0; k <= degree; k++) {
      const t = 0.5 * Math.cos((Math.PI * (k + 0.5)) / (degree + 1));
      chebyshevPosition(coef, 0, degree, -0.5, 0.5, t, p);
      f(t, v);
      // interpolation: equal at the nodes up to the roundoff of the sums (values ≤ 1.7, 7 terms)
      for (let c = 0; c < 3; c++) expect(Math.abs(p[c] - v[c])).toBeLessThan(4e-15);
    }
    expect(checkPoints(degree)).toHaveLength(2 * (degree + 1) + 1);
    expect(checkPoints(degree)[0]).toBe(1);
  });
});

describe('chebyshevVelocity: the derivative series', () => {
  it('is exact (to roundoff) for polynomials of degree ≤ N: [t⁴ − 2t, 3t² + 1, t⁵] on [−2, 3], degree 6', () => {
    const a = -2;
    const b = 3;
    const degree = 6;
    const coef = new Float64Array(3 * (degree + 1));
    fitChebyshev3(
      (t, out) => {
        out[0] = t ** 4 - 2 * t;
        out[1] = 3 * t * t + 1;
        out[2] = t ** 5;
      },
      a,
      b,
      degree,
      coef,
    );
    const v = new Float64Array(3);
    const rng = stream(7, 1);
    for (let k = 0; k < 500; k++) {
      const t = rng.uniform(a, b);
      chebyshevVelocity(coef, 0, degree, a, b, t, v);
      const exact = [4 * t ** 3 - 2, 6 * t, 5 * t ** 4];
      // coefficients up to ~150 (t⁵ ≤ 243), the derivative sum weights them by up to N² = 36 and
      // 2/(b − a): roundoff ≲ ε·36·Σ|c| ≈ 2e-12; 1e-11 bounds it (values up to 405)
      for (let c = 0; c < 3; c++) expect(Math.abs(v[c] - exact[c])).toBeLessThan(1e-11);
    }
  });

  it('of cos on [0, 1.2], degree 12, matches −sin to the size of the dropped terms times N²', () => {
    const degree = 12;
    const coef = new Float64Array(3 * (degree + 1));
    fitChebyshev3(
      (t, out) => {
        out[0] = Math.cos(t);
        out[1] = 0;
        out[2] = 0;
      },
      0,
      1.2,
      degree,
      coef,
    );
    const v = new Float64Array(3);
    // position bound h^{N+1}/(2^N (N+1)!) at h = 0.6 ≈ 2e-17 (below roundoff); the derivative's
    // error is at most (N+1)²·2/(b − a) times the position's by Markov's inequality, so roundoff
    // dominates: ε·N²·(2/1.2)·Σ|c| ≈ 1e-13
    for (let k = 0; k <= 50; k++) {
      const t = (1.2 * k) / 50;
      chebyshevVelocity(coef, 0, degree, 0, 1.2, t, v);
      expect(Math.abs(v[0] + Math.sin(t))).toBeLessThan(1e-13);
    }
  });
});

describe('bad input', () => {
  it('a degree outside [1, MAX_DEGREE] and a source giving NaN are InputErrors naming the field', () => {
    expect(() => requireDegree('degree', 0)).toThrow(InputError);
    expect(() => requireDegree('degree', MAX_DEGREE + 1)).toThrow(/degree must be an integer in \[1, 40\]/);
    expect(() => requireDegree('degree', 2.5)).toThrow(InputError);
    const coef = new Float64Array(9);
    expect(() =>
      fitChebyshev3(
        (_t, out) => {
          out[0] = Number.NaN;
        },
        0,
        1,
        2,
        coef,
      ),
    ).toThrow(/source must give a finite position/);
  });
});
