import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { STUMPFF_SERIES_LIMIT, stumpffC, stumpffCS, stumpffS } from '../../../core/orbit/stumpff.ts';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('Stumpff functions', () => {
  it('take their limits C(0) = 1/2, S(0) = 1/6 (Curtis eq. 3.53)', () => {
    expect(stumpffC(0)).toBe(0.5);
    expect(stumpffS(0)).toBe(1 / 6);
  });

  it('match closed forms at z = π², 4π², −1, −25 (analytic)', () => {
    const pi2 = Math.PI * Math.PI;
    expect(rel(stumpffC(pi2), 2 / pi2)).toBeLessThan(1e-15); // (1 − cos π)/π²
    expect(rel(stumpffS(pi2), 1 / pi2)).toBeLessThan(1e-15); // (π − sin π)/π³
    expect(Math.abs(stumpffC(4 * pi2))).toBeLessThan(1e-17); // (1 − cos 2π)/(4π²)
    expect(rel(stumpffS(4 * pi2), 1 / (4 * pi2))).toBeLessThan(1e-15);
    expect(rel(stumpffC(-1), Math.cosh(1) - 1)).toBeLessThan(1e-15);
    expect(rel(stumpffS(-1), Math.sinh(1) - 1)).toBeLessThan(1e-15);
    expect(rel(stumpffC(-25), (Math.cosh(5) - 1) / 25)).toBeLessThan(1e-15);
    expect(rel(stumpffS(-25), (Math.sinh(5) - 5) / 125)).toBeLessThan(1e-15);
  });

  it('agree with the first Maclaurin terms near zero (C ≈ 1/2 − z/24 + z²/720, S ≈ 1/6 − z/120 + z²/5040)', () => {
    for (const z of [1e-3, -1e-3, 1e-8, -1e-12]) {
      expect(rel(stumpffC(z), 0.5 - z / 24 + (z * z) / 720 - (z * z * z) / 40320)).toBeLessThan(2e-16);
      expect(rel(stumpffS(z), 1 / 6 - z / 120 + (z * z) / 5040 - (z * z * z) / 362880)).toBeLessThan(2e-16);
    }
  });

  it('series and closed forms agree on both sides of the switch at |z| = 1 (analytic)', () => {
    const closedC = (z: number): number => (z > 0 ? (1 - Math.cos(Math.sqrt(z))) / z : (Math.cosh(Math.sqrt(-z)) - 1) / -z);
    const closedS = (z: number): number => {
      const x = Math.sqrt(Math.abs(z));
      return z > 0 ? (x - Math.sin(x)) / x ** 3 : (Math.sinh(x) - x) / x ** 3;
    };
    for (const z0 of [STUMPFF_SERIES_LIMIT, -STUMPFF_SERIES_LIMIT]) {
      for (const z of [z0 * (1 - 1e-12), z0 * (1 + 1e-12)]) {
        expect(rel(stumpffC(z), closedC(z))).toBeLessThan(4e-15);
        expect(rel(stumpffS(z), closedS(z))).toBeLessThan(4e-15); // x − sin x at x ≈ 1 loses ~3 bits
      }
    }
  });

  it('satisfy z(1 − zS)² + (1 − zC)² = 1, i.e. sin² + cos² = 1 (property, analytic identity)', () => {
    fc.assert(
      fc.property(fc.double({ min: -30, max: 400, noNaN: true }), (z) => {
        const c = stumpffC(z);
        const s = stumpffS(z);
        const a = z * (1 - z * s) ** 2;
        const b = (1 - z * c) ** 2;
        expect(Math.abs(a + b - 1)).toBeLessThan(1e-13 * (Math.abs(a) + Math.abs(b) + 1));
      }),
      { numRuns: 500 },
    );
  });

  it('stumpffCS gives the same values as the separate functions', () => {
    const out = new Float64Array(2);
    for (const z of [-400, -3, -0.5, 0, 0.2, 0.99, 1.5, 30, 1e4]) {
      stumpffCS(z, out);
      expect(rel(out[0], stumpffC(z)) || 0).toBeLessThan(1e-14);
      expect(rel(out[1], stumpffS(z))).toBeLessThan(1e-14);
    }
  });

  it('never return NaN for huge |z| (overflow goes to +Infinity)', () => {
    expect(stumpffC(-1e7)).toBe(Infinity);
    expect(stumpffS(-1e7)).toBe(Infinity);
    expect(Number.isFinite(stumpffC(1e14))).toBe(true);
    expect(Number.isFinite(stumpffS(1e14))).toBe(true);
  });
});
