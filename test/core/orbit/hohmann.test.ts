import { describe, expect, it } from 'vitest';
import { hohmann } from '../../../core/orbit/hohmann.ts';
import { InputError } from '../../../core/math/errors.ts';

describe('hohmann', () => {
  it('matches Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Example 6-1 (from memory)', () => {
    // 191.34411 km altitude to 35,781.34857 km altitude (1.03 to 6.61 Earth radii), μ = 398600.4418 km³/s²,
    // R = 6378.137 km: Δva = 2.457 km/s, Δvb = 1.478 km/s, Δv = 3.935 km/s, τ = 5.256 h.
    const h = hohmann(398600.4418, 6378.137 + 191.34411, 6378.137 + 35781.34857);
    expect(h.dv1).toBeCloseTo(2.457, 3);
    expect(h.dv2).toBeCloseTo(1.478, 3);
    expect(h.dvTotal).toBeCloseTo(3.935, 3);
    expect(h.tof / 3600).toBeCloseTo(5.256, 2);
  });

  it('gives the usual 300 km LEO to GEO figures (common practice: 2.43 + 1.47 = 3.89 km/s, about 5.3 h)', () => {
    const h = hohmann(398600, 6678, 42164);
    expect(h.dv1).toBeCloseTo(2.426, 3);
    expect(h.dv2).toBeCloseTo(1.467, 3);
    expect(h.dvTotal).toBeCloseTo(3.893, 3);
    expect(h.tof / 3600).toBeCloseTo(5.275, 3); // to the quoted 0.001 h (measured 2e-5 h off)
  });

  it('equals vis-viva differences computed independently (analytic)', () => {
    const mu = 1.32712440018e20;
    for (const [r1, r2] of [
      [1.5e11, 2.28e11],
      [1.5e11, 1.08e11],
      [7e6, 7e6 * 60],
    ]) {
      const h = hohmann(mu, r1, r2);
      // Energy of the transfer ellipse −μ/(r1 + r2); angular momentum conservation gives the apse speeds.
      const eps = -mu / (r1 + r2);
      const vp = Math.sqrt(2 * (eps + mu / r1));
      const va = (vp * r1) / r2;
      // the same speeds by another route: a few roundings of speeds of size vp (measured 2.3e-10 m/s at vp = 6.1e6 m/s)
      const tol = 8 * Number.EPSILON * vp;
      expect(Math.abs(h.dv1 - (vp - Math.sqrt(mu / r1)))).toBeLessThan(tol);
      expect(Math.abs(h.dv2 - (Math.sqrt(mu / r2) - va))).toBeLessThan(tol);
      expect(Math.abs(h.dvTotal - (Math.abs(vp - Math.sqrt(mu / r1)) + Math.abs(Math.sqrt(mu / r2) - va)))).toBeLessThan(2 * tol);
      // Kepler's third law for the half period (measured: equal)
      const half = Math.PI * Math.sqrt(((r1 + r2) / 2) ** 3 / mu);
      expect(Math.abs(h.tof - half)).toBeLessThan(4 * Number.EPSILON * half);
      expect(h.aTransfer).toBe((r1 + r2) / 2);
    }
  });

  it('works inward: the reverse transfer has the same burns with retrograde sign, in reverse order (time reversal)', () => {
    const out = hohmann(398600, 6678, 42164);
    const back = hohmann(398600, 42164, 6678);
    expect(back.dv1).toBeCloseTo(-out.dv2, 12);
    expect(back.dv2).toBeCloseTo(-out.dv1, 12);
    expect(back.dvTotal).toBeCloseTo(out.dvTotal, 12);
    expect(back.tof).toBeCloseTo(out.tof, 9);
    const same = hohmann(398600, 7000, 7000);
    expect(same.dv1).toBeCloseTo(0, 12);
    expect(same.dv2).toBeCloseTo(0, 12);
    expect(same.dvTotal).toBeCloseTo(0, 12);
  });

  it('rejects bad input with InputError', () => {
    expect(() => hohmann(0, 1, 2)).toThrow(InputError);
    expect(() => hohmann(1, -1, 2)).toThrow(InputError);
    expect(() => hohmann(1, 1, NaN)).toThrow(InputError);
    expect(() => hohmann(1, 1, Infinity)).toThrow(InputError);
  });
});
