import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { energyOf, energyScale, fromRtn, interpolateNorm, norm3, toRtn } from '../../../core/gamestep/measure.ts';

const MU = 3.986e14; // Earth, Curtis, Orbital Mechanics for Engineering Students, Table A.2 (from memory)
// an arbitrary absolute state of the central body: the measures work on differences
const B = new Float64Array([1.2e11, -3.4e10, 5e8, 2.9e4, 1.1e3, -40]);

function relativeTo(body: ArrayLike<number>, rel: number[]): Float64Array {
  return Float64Array.from(rel, (x, i) => x + body[i]);
}

describe('specific orbital energy', () => {
  it('is −μ/(2a) at the periapsis of an ellipse (vis-viva, Curtis, 3rd ed., eq. 2.80)', () => {
    const a = 9000e3;
    const e = 0.3;
    const rp = a * (1 - e);
    const vp = Math.sqrt((MU * (1 + e)) / rp); // periapsis speed from h = √(μ a (1 − e²))
    const s = relativeTo(B, [0, rp, 0, -vp, 0, 0]);
    const eps = energyOf(s, B, MU);
    // from differences of 1e11 m absolute coordinates: their rounding (ulp 1.5e-5 m) is 2.4e-12
    // of r, and μ/r ≈ 2.6|ε| here; 1e-11 bounds that (measured 2e-16 on these values)
    expect(Math.abs(eps / (-MU / (2 * a)) - 1)).toBeLessThan(1e-11);
  });

  it('is v²/2 − μ/r on a hyperbola (positive)', () => {
    const s = relativeTo(B, [7000e3, 0, 0, 0, 12e3, 0]);
    expect(energyOf(s, B, MU)).toBeCloseTo(0.5 * 12e3 ** 2 - MU / 7000e3, 2);
    expect(energyOf(s, B, MU)).toBeGreaterThan(0);
  });

  it('scales the relative error by |ε|, but at least 1e-6·μ/r near a parabola', () => {
    const r = relativeTo(B, [7000e3, 0, 0, 0, 0, 0]);
    expect(energyScale(-2.2e7, r, B, MU)).toBe(2.2e7);
    expect(energyScale(3, r, B, MU)).toBeCloseTo((1e-6 * MU) / 7000e3, 6);
  });
});

describe('radial–transverse–normal differences', () => {
  it('on a state along +x moving +y, R T N are x y z (analytic)', () => {
    const r = relativeTo(B, [7000e3, 0, 0, 0, 7.5e3, 0]);
    const g = Float64Array.from(r, (x, i) => x + [1, 2, 3, 0.4, 0.5, 0.6][i]);
    const out = [0, 0, 0, 0, 0, 0];
    toRtn(r, B, g, out);
    const want = [1, 2, 3, 0.4, 0.5, 0.6];
    // g is rounded at 1e11 m and 3e4 m/s: half an ulp is 7.6e-6 m and 1.8e-12 m/s per
    // component (measured 0 m and 1.5e-12 m/s)
    for (let i = 0; i < 3; i++) expect(Math.abs(out[i] - want[i])).toBeLessThan(3e-5);
    for (let i = 3; i < 6; i++) expect(Math.abs(out[i] - want[i])).toBeLessThan(1e-11);
  });

  it('on a state along +y moving −x, R is +y and T is −x (rotated 90° about z, analytic)', () => {
    const r = [0, 7000e3, 0, -7.5e3, 0, 0];
    const zero = [0, 0, 0, 0, 0, 0];
    const g = r.map((x, i) => x + [1, 2, 3, 0, 0, 0][i]);
    const out = [0, 0, 0, 0, 0, 0];
    toRtn(r, zero, g, out);
    expect(out[0]).toBeCloseTo(2, 9);
    expect(out[1]).toBeCloseTo(-1, 9);
    expect(out[2]).toBeCloseTo(3, 9);
  });

  it('fromRtn adds back what toRtn took out: the basis is orthonormal (property)', () => {
    const comp = fc.double({ min: -1e4, max: 1e4, noNaN: true });
    fc.assert(
      fc.property(fc.array(comp, { minLength: 6, maxLength: 6 }), fc.array(comp, { minLength: 6, maxLength: 6 }), (p, d) => {
        const r = [7000e3 + p[0], 1e5 + p[1], -2e5 + p[2], 10 + p[3], 7.5e3 + p[4], 300 + p[5]];
        const zero = [0, 0, 0, 0, 0, 0];
        const g = r.map((x, i) => x + d[i]);
        const c = [0, 0, 0, 0, 0, 0];
        toRtn(r, zero, g, c);
        // an orthonormal basis keeps lengths. g − r is exact only to the rounding of g (|g| ≈ 7e6 m),
        // so the bounds are in units of ε = 2^−52 times |r| + |d|: measured at most 0.3 ε for the
        // length and 3.4 ε for the way back over 2e5 random cases
        const eps = Number.EPSILON;
        const dn = Math.hypot(d[0], d[1], d[2]);
        const scale = Math.hypot(r[0], r[1], r[2]) + Math.hypot(...d);
        expect(Math.abs(norm3(c, 0) - dn)).toBeLessThan(2 * eps * scale);
        const back = Float64Array.from(r);
        fromRtn(r, zero, c, back);
        for (let i = 0; i < 6; i++) expect(Math.abs(back[i] - g[i])).toBeLessThan(8 * eps * (Math.abs(g[i]) + Math.hypot(...d)));
      }),
      { numRuns: 300 },
    );
  });
});

describe('interpolateNorm', () => {
  it('interpolates the position error linearly from 0 at t0 (analytic)', () => {
    const times = [10, 20];
    const v = [
      [3, 4, 0, 9, 9, 9],
      [6, 8, 0, 9, 9, 9],
    ];
    expect(interpolateNorm(times, v, 5, 0)).toBe(2.5);
    expect(interpolateNorm(times, v, 10, 0)).toBe(5);
    expect(interpolateNorm(times, v, 15, 0)).toBe(7.5);
    expect(interpolateNorm(times, v, 30, 0)).toBe(10); // held after the last point
    expect(norm3([0, 3, 4, 12], 1)).toBe(13);
  });
});
