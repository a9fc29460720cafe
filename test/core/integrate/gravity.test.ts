import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { type GravitySource, mutualAccel, spacecraftAccel, spacecraftOde } from '../../../core/integrate/gravity.ts';
import { integrateFixed } from '../../../core/integrate/fixed.ts';
import { rk45 } from '../../../core/integrate/rk45.ts';
import { type Ellipse, period, posError, stateAt } from './twoBody.ts';

const at = (p: number[]) => (_t: number, out: Float64Array) => out.set(p);

describe('spacecraftAccel: point-mass gravity −μ·r/|r|³ (Newton; Vallado, 4th ed., §1.3)', () => {
  it('one source: matches the inverse-square law by hand (analytic)', () => {
    const mu = 3.986004418e14;
    const a = spacecraftAccel([{ mu, position: at([0, 0, 0]) }]);
    const x = Float64Array.from([7e6, -2e6, 1e6]);
    const out = new Float64Array(3);
    a(0, x, new Float64Array(3), out);
    const r = Math.hypot(7e6, -2e6, 1e6);
    for (let i = 0; i < 3; i++) expect(out[i]).toBeCloseTo((-mu * x[i]) / r ** 3, 12);
  });

  it('several moving sources superpose, evaluated at the given time; thrust adds; several craft share a call', () => {
    const sources: GravitySource[] = [
      { mu: 1e20, position: at([0, 0, 0]), name: 'star' },
      { mu: 3e14, position: (t, out) => out.set([1.5e11 + t, 0, 0]), name: 'world' },
    ];
    const thrust = {
      accel: (_t: number, _x: Float64Array, _v: Float64Array, out: Float64Array) => {
        for (let c = 0; c < out.length; c += 3) out[c + 2] += 0.01;
      },
    };
    const a = spacecraftAccel(sources, thrust);
    const x = Float64Array.from([1.5e11 + 100 + 7e6, 0, 0, 1e11, 1e11, 0]);
    const out = new Float64Array(6);
    a(100, x, new Float64Array(6), out);
    const hand = (px: number, py: number) => {
      const r1 = Math.hypot(px, py);
      const dx = px - (1.5e11 + 100),
        r2 = Math.hypot(dx, py);
      return [(-1e20 * px) / r1 ** 3 + (-3e14 * dx) / r2 ** 3, (-1e20 * py) / r1 ** 3 + (-3e14 * py) / r2 ** 3, 0.01];
    };
    const e1 = hand(1.5e11 + 100 + 7e6, 0),
      e2 = hand(1e11, 1e11);
    [...e1, ...e2].forEach((v, i) => expect(out[i]).toBeCloseTo(v, 10));
  });

  it('spacecraftOde is the first-order form [v, a]', () => {
    const ode = spacecraftOde([{ mu: 1e14, position: at([1, 2, 3]) }]);
    const y = Float64Array.from([1e6, 2, 3, 4, 5, 6]);
    const dy = new Float64Array(6);
    ode(0, y, dy);
    expect(Array.from(dy.subarray(0, 3))).toEqual([4, 5, 6]);
    const r = 1e6 - 1;
    expect(dy[3]).toBeCloseTo(-1e14 / r ** 2, 10);
    expect(dy[4]).toBeCloseTo(0, 12);
  });

  it('conserves the Jacobi integral in the circular restricted three-body problem (Szebehely, Theory of Orbits, 1967, ch. 1, from memory)', () => {
    // Primaries on circular orbits about their barycentre at the origin; E − ω·h_z is constant
    // for the massless craft.
    const mu1 = 3e14,
      mu2 = 3.7e12,
      d = 3.8e8;
    const w = Math.sqrt((mu1 + mu2) / d ** 3);
    const r1 = (d * mu2) / (mu1 + mu2),
      r2 = (d * mu1) / (mu1 + mu2);
    const sources: GravitySource[] = [
      { mu: mu1, position: (t, o) => o.set([-r1 * Math.cos(w * t), -r1 * Math.sin(w * t), 0]) },
      { mu: mu2, position: (t, o) => o.set([r2 * Math.cos(w * t), r2 * Math.sin(w * t), 0]) },
    ];
    const p1 = new Float64Array(3),
      p2 = new Float64Array(3);
    const jacobi = (t: number, y: ArrayLike<number>) => {
      sources[0].position(t, p1);
      sources[1].position(t, p2);
      const d1 = Math.hypot(y[0] - p1[0], y[1] - p1[1], y[2] - p1[2]);
      const d2 = Math.hypot(y[0] - p2[0], y[1] - p2[1], y[2] - p2[2]);
      const E = 0.5 * (y[3] ** 2 + y[4] ** 2 + y[5] ** 2) - mu1 / d1 - mu2 / d2;
      return E - w * (y[0] * y[4] - y[1] * y[3]);
    };
    const y0 = [2.0e8, 0, 1e7, 0, 1400, 0];
    const T = 20 * 86400;
    const r = rk45(spacecraftOde(sources), 0, y0, T, { rtol: 1e-11, atol: 1e-6 });
    expect(r.status).toBe('done');
    const J0 = jacobi(0, y0);
    expect(Math.abs(jacobi(T, r.y) - J0) / Math.abs(J0)).toBeLessThan(1e-8);
    // The test is not vacuous: energy alone is not conserved here.
    const E = (t: number, y: ArrayLike<number>) => jacobi(t, y) + w * (y[0] * y[4] - y[1] * y[3]);
    expect(Math.abs(E(T, r.y) - E(0, y0)) / Math.abs(J0)).toBeGreaterThan(1e-4);
  });

  it('rejects bad sources with InputError', () => {
    expect(() => spacecraftAccel([{ mu: -1, position: at([0, 0, 0]) }])).toThrow(/sources\[0\].mu must be >= 0/);
    expect(() => spacecraftAccel([{ mu: NaN, position: at([0, 0, 0]) }])).toThrow(InputError);
    expect(() => spacecraftAccel([{ mu: 1 } as never])).toThrow(/sources\[0\].position must be a function/);
    expect(() => spacecraftAccel([], { accel: 3 } as never)).toThrow(/thrust.accel must be a function/);
  });
});

describe('mutualAccel: N bodies pulling on each other', () => {
  it("Σ μ_i·a_i = 0 (Newton's third law: total momentum is conserved), random configurations (property)", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.tuple(
            fc.double({ min: 1e10, max: 1e20, noNaN: true }),
            fc.double({ min: -1e11, max: 1e11, noNaN: true }),
            fc.double({ min: -1e11, max: 1e11, noNaN: true }),
            fc.double({ min: -1e10, max: 1e10, noNaN: true }),
          ),
          { minLength: 2, maxLength: 8 },
        ),
        (bodies) => {
          const mus = bodies.map((b) => b[0]);
          const x = Float64Array.from(bodies.flatMap((b) => [b[1], b[2], b[3]]));
          // Distinct positions only (coincident point masses have no finite force).
          for (let i = 0; i < mus.length; i++)
            for (let j = i + 1; j < mus.length; j++) {
              fc.pre(Math.hypot(x[3 * i] - x[3 * j], x[3 * i + 1] - x[3 * j + 1], x[3 * i + 2] - x[3 * j + 2]) > 1e6);
            }
          const out = new Float64Array(x.length);
          mutualAccel(mus)(0, x, new Float64Array(x.length), out);
          let scale = 0;
          const p = [0, 0, 0];
          for (let i = 0; i < mus.length; i++)
            for (let k = 0; k < 3; k++) {
              p[k] += mus[i] * out[3 * i + k];
              scale = Math.max(scale, Math.abs(mus[i] * out[3 * i + k]));
            }
          for (let k = 0; k < 3; k++) expect(Math.abs(p[k])).toBeLessThanOrEqual(1e-12 * scale * mus.length);
        },
      ),
      { numRuns: 100, seed: 7 },
    );
  });

  it('two bodies: the separation follows the Kepler orbit with μ1 + μ2 and the barycentre moves uniformly (analytic)', () => {
    const mu1 = 3.0e14,
      mu2 = 1.0e14;
    const rel: Ellipse = { mu: mu1 + mu2, a: 2.0e7, e: 0.4, i: 0.3, raan: 0.2, argp: 1.1, M0: 0.5 };
    const s = stateAt(rel, 0);
    const vb = [10, -20, 5];
    const f2 = mu2 / (mu1 + mu2),
      f1 = mu1 / (mu1 + mu2);
    const x0 = [-f2 * s[0], -f2 * s[1], -f2 * s[2], f1 * s[0], f1 * s[1], f1 * s[2]];
    const v0 = [vb[0] - f2 * s[3], vb[1] - f2 * s[4], vb[2] - f2 * s[5], vb[0] + f1 * s[3], vb[1] + f1 * s[4], vb[2] + f1 * s[5]];
    const T = 2 * period(rel);
    const r = integrateFixed('yoshida4', mutualAccel([mu1, mu2]), 0, x0, v0, { h: period(rel) / 2000, tEnd: T });
    const sep = [r.x[3] - r.x[0], r.x[4] - r.x[1], r.x[5] - r.x[2]];
    expect(posError(sep, stateAt(rel, T)) / rel.a).toBeLessThan(1e-8);
    for (let k = 0; k < 3; k++) expect(Math.abs((mu1 * r.x[k] + mu2 * r.x[3 + k]) / (mu1 + mu2) - vb[k] * T)).toBeLessThan(1e-6 * rel.a);
  });

  it('a body with μ = 0 is pulled but does not pull', () => {
    const out = new Float64Array(6);
    mutualAccel([1e14, 0])(0, Float64Array.from([0, 0, 0, 1e7, 0, 0]), new Float64Array(6), out);
    expect(Array.from(out.subarray(0, 3))).toEqual([0, 0, 0]);
    expect(out[3]).toBeCloseTo(-1e14 / 1e14, 12);
  });

  it('rejects bad input with InputError', () => {
    expect(() => mutualAccel([1, -2])).toThrow(/mus\[1\] must be >= 0/);
    expect(() => mutualAccel([])).toThrow(/mus must have at least 1 entry/);
    expect(() => mutualAccel([1, 2])(0, new Float64Array(3), new Float64Array(3), new Float64Array(3))).toThrow(/x must have 6 components/);
  });
});
