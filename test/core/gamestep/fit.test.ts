import { describe, expect, it } from 'vitest';
import { driftPerOrbit, fitPowerLaw, powerLawAt, trendSlope } from '../../../core/gamestep/fit.ts';

describe('game-step fits', () => {
  it('recovers an exact power law e = A·τ^q (analytic)', () => {
    const tau = Array.from({ length: 50 }, (_, i) => (i + 1) * 10);
    const e = tau.map((t) => 3e-4 * t ** 1.7);
    const f = fitPowerLaw(tau, e, 0);
    // least squares on exact data: rounding only (measured 2.2e-14, 1.2e-13 relative, 1.3e-14)
    expect(Math.abs(f.order - 1.7)).toBeLessThan(1e-13);
    expect(Math.abs(f.coefficient / 3e-4 - 1)).toBeLessThan(1e-12);
    expect(f.r2).toBeCloseTo(1, 12);
    // extrapolated 20× past the data: the exponent's error times ln τ ≈ 9 (measured 9e-14 relative)
    expect(Math.abs(powerLawAt(f, 1e4) / (3e-4 * 1e4 ** 1.7) - 1)).toBeLessThan(1e-12);
  });

  it('falls back to linear growth through the last point with too few points', () => {
    const f = fitPowerLaw([0, 10, 20], [0, 1, 4], 0);
    expect(f.order).toBe(1);
    expect(f.coefficient).toBeCloseTo(0.2, 12);
    expect(f.r2).toBe(0);
  });

  it('trend slope of a straight line is its slope (analytic)', () => {
    const t = [0, 1, 2, 3, 4];
    expect(
      trendSlope(
        t,
        t.map((x) => 2 - 0.5 * x),
      ),
    ).toBeCloseTo(-0.5, 14);
  });

  it('drift per orbit removes a periodic part at the orbital period (analytic)', () => {
    const T = 5000;
    const t = Array.from({ length: 3001 }, (_, i) => i * 5); // three periods
    const y = t.map((x) => (2e-7 * x) / T + 3e-5 * Math.sin((2 * Math.PI * x) / T + 0.4));
    const d = driftPerOrbit(t, y, T);
    expect(d.method).toBe('per-orbit');
    // the 5 s grid divides the period, so one-period differences cancel the sine exactly; left is
    // the rounding of its 3e-5 terms, 7e-21 each (measured 3e-21)
    expect(Math.abs(d.perOrbit - 2e-7)).toBeLessThan(2e-19);
    // the straight-line trend over a quarter orbit counts the periodic part as drift
    const q = driftPerOrbit(t.slice(0, 251), y.slice(0, 251), T);
    expect(q.method).toBe('trend');
    expect(Math.abs(q.perOrbit)).toBeGreaterThan(1e-5);
  });
});
