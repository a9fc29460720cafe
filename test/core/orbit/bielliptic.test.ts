import { describe, expect, it } from 'vitest';
import { bielliptic } from '../../../core/orbit/bielliptic.ts';
import { hohmann } from '../../../core/orbit/hohmann.ts';
import { InputError } from '../../../core/math/errors.ts';

/** Bisection for the root of f on [a, b] (f(a), f(b) of opposite sign). */
function bisect(f: (x: number) => number, a: number, b: number): number {
  let fa = f(a);
  for (let i = 0; i < 200 && b - a > 1e-12 * b; i++) {
    const m = (a + b) / 2;
    const fm = f(m);
    if (fm === 0) return m;
    if (fm < 0 === fa < 0) {
      a = m;
      fa = fm;
    } else b = m;
  }
  return (a + b) / 2;
}

describe('bielliptic', () => {
  it('matches Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Example 6-2 (from memory)', () => {
    // 191.34411 km altitude to 376,310 km altitude via 503,873 km altitude: Δva ≈ 3.156 km/s,
    // Δvb ≈ 0.677 km/s, Δvc ≈ −0.070 km/s, Δv ≈ 3.904 km/s, τ ≈ 593.92 h.
    const R = 6378.137;
    const b = bielliptic(398600.4418, R + 191.34411, R + 376310, R + 503873);
    expect(b.dv1).toBeCloseTo(3.156, 3);
    expect(b.dv2).toBeCloseTo(0.677, 3);
    expect(b.dv3).toBeCloseTo(-0.07, 3);
    expect(b.dvTotal).toBeCloseTo(3.904, 3);
    expect(b.tof / 3600).toBeCloseTo(593.92, 2); // to the book's 0.01 h (measured 2e-6 h off)
    // At this radius ratio (≈ 60) the bi-elliptic transfer is the cheaper one.
    expect(b.dvTotal).toBeLessThan(hohmann(398600.4418, R + 191.34411, R + 376310).dvTotal);
  });

  it('beats Hohmann with rb → ∞ beyond r2/r1 ≈ 11.94 (Hoelker & Silber 1961; Vallado section 6.3.2; from memory)', () => {
    const mu = 1;
    const gap = (R: number): number => bielliptic(mu, 1, R, Infinity).dvTotal - hohmann(mu, 1, R).dvTotal;
    const cross = bisect(gap, 5, 30);
    expect(cross).toBeCloseTo(11.94, 2);
    // A very large finite rb approaches the limit: the finite-rb terms are √(2μ/r)·r/(2rb), at most
    // 3.2e-12 at r = 20 (measured 1.0e-12 in total).
    expect(Math.abs(bielliptic(mu, 1, 20, 1e12).dvTotal - bielliptic(mu, 1, 20, Infinity).dvTotal)).toBeLessThan(1e-11);
  });

  it('beats Hohmann for every rb > r2 beyond r2/r1 ≈ 15.58 (Hoelker & Silber 1961; Curtis section 6.4; from memory)', () => {
    const mu = 1;
    // Bi-elliptic with rb just above r2 is Hohmann plus a first-order change in rb: its sign flips at 15.58.
    const gap = (R: number): number => bielliptic(mu, 1, R, R * (1 + 1e-6)).dvTotal - hohmann(mu, 1, R).dvTotal;
    const cross = bisect(gap, 12, 30);
    expect(cross).toBeCloseTo(15.58, 2);
    // Between the two ratios, only a distant rb helps.
    expect(bielliptic(mu, 1, 13, 13.5).dvTotal).toBeGreaterThan(hohmann(mu, 1, 13).dvTotal);
    expect(bielliptic(mu, 1, 13, 1000).dvTotal).toBeLessThan(hohmann(mu, 1, 13).dvTotal);
    // rb = r2 is the Hohmann transfer followed by half a circular orbit at r2 (analytic).
    const h = hohmann(mu, 1, 13);
    const b = bielliptic(mu, 1, 13, 13);
    expect(b.dv1).toBeCloseTo(h.dv1, 14);
    expect(b.dv2).toBeCloseTo(h.dv2, 14);
    expect(b.dv3).toBeCloseTo(0, 14);
    expect(b.tof).toBeCloseTo(h.tof + Math.PI * Math.sqrt(13 ** 3 / mu), 11);
  });

  it('rejects bad input with InputError', () => {
    expect(() => bielliptic(1, 1, 10, 5)).toThrow(InputError);
    expect(() => bielliptic(1, 1, 10, NaN)).toThrow(InputError);
    expect(() => bielliptic(1, 0, 10, 20)).toThrow(InputError);
    expect(() => bielliptic(-1, 1, 10, 20)).toThrow(InputError);
  });
});
