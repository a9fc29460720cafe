import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { meanToTrue } from '../../../core/orbit/anomaly.ts';
import { elementsToState } from '../../../core/orbit/elements.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { bodyPosition, bodyState, bodyStateRelativeToParent, conicState, sampleOrbit } from '../../../core/system/ephemeris.ts';
import type { StarSystem } from '../../../core/system/model.ts';
import { ODEX_CONVERGED, odexSolve, odexTwoBody } from '../integrate/odexRef.ts';
import { demoText, planet, smallSystem } from './fixtures.ts';

const DEG = Math.PI / 180;
const demo: StarSystem = parseSystemFile(demoText()).system;
const idx = (id: string) => demo.indexById[id];

function norm3(a: ArrayLike<number>, o = 0): number {
  return Math.hypot(a[o], a[o + 1], a[o + 2]);
}
function maxDiff(a: ArrayLike<number>, b: ArrayLike<number>, from: number, to: number): number {
  let m = 0;
  for (let k = from; k < to; k++) m = Math.max(m, Math.abs(a[k] - b[k]));
  return m;
}

describe('conic ephemeris: analytic cases', () => {
  const mu = 1e20;
  const a = 1e11;

  it('puts a circular equatorial orbit at (0, a, 0) moving (−v, 0, 0) a quarter period after periapsis (analytic)', () => {
    const sys = smallSystem([planet('p', { a_m: a }, { mu_m3_s2: 1e-6 * mu })], mu);
    const T = sys.bodies[1].derived.period;
    const s = bodyStateRelativeToParent(sys, 1, T / 4, new Float64Array(6));
    const v = Math.sqrt((mu * (1 + 1e-6)) / a);
    expect(s[0] / a).toBeCloseTo(0, 12);
    expect(s[1] / a).toBeCloseTo(1, 12);
    expect(s[2] / a).toBeCloseTo(0, 12);
    expect(s[3] / v).toBeCloseTo(-1, 12);
    expect(s[4] / v).toBeCloseTo(0, 12);
    expect(s[5] / v).toBeCloseTo(0, 12);
  });

  it('rotates by Ω, i: a polar circular orbit with Ω = 90° starts on +y and climbs to +z (analytic)', () => {
    const sys = smallSystem([planet('p', { a_m: a, i_deg: 90, raan_deg: 90 })], mu);
    const T = sys.bodies[1].derived.period;
    const p0 = bodyPosition(sys, 1, 0, new Float64Array(3));
    const p1 = bodyPosition(sys, 1, T / 4, new Float64Array(3));
    [0, 1, 0].forEach((x, c) => expect(p0[c] / a).toBeCloseTo(x, 12));
    [0, 0, 1].forEach((x, c) => expect(p1[c] / a).toBeCloseTo(x, 12));
  });

  it('puts an eccentric orbit at periapsis a(1 − e) at t = 0 when M0 = 0 and at apoapsis half a period later (analytic)', () => {
    const e = 0.6;
    const sys = smallSystem([planet('p', { a_m: a, e, argp_deg: 30 })], mu);
    const T = sys.bodies[1].derived.period;
    const s0 = bodyStateRelativeToParent(sys, 1, 0, new Float64Array(6));
    const s1 = bodyStateRelativeToParent(sys, 1, T / 2, new Float64Array(6));
    expect(norm3(s0) / (a * (1 - e))).toBeCloseTo(1, 13);
    expect(norm3(s1) / (a * (1 + e))).toBeCloseTo(1, 13);
    expect(Math.atan2(s0[1], s0[0]) / DEG).toBeCloseTo(30, 10);
  });

  it('conserves vis-viva energy and angular momentum h = √(μ a (1 − e²)) along the demo orbits, with h along (sin i sin Ω, −sin i cos Ω, cos i) (analytic)', () => {
    const s = new Float64Array(6);
    for (let j = 1; j < demo.bodies.length; j++) {
      const b = demo.bodies[j];
      const el = b.elements!;
      const m = b.derived.orbitMu;
      const hExp = Math.sqrt(m * el.a * (1 - el.e * el.e));
      const nExp = [Math.sin(el.i) * Math.sin(el.raan), -Math.sin(el.i) * Math.cos(el.raan), Math.cos(el.i)];
      for (let k = 0; k < 17; k++) {
        const t = (k / 17) * b.derived.period * 3.3 - 1e7;
        bodyStateRelativeToParent(demo, j, t, s);
        const r = norm3(s);
        const v2 = s[3] ** 2 + s[4] ** 2 + s[5] ** 2;
        expect(v2 / (m * (2 / r - 1 / el.a)) - 1).toBeCloseTo(0, 11);
        const h = [s[1] * s[5] - s[2] * s[4], s[2] * s[3] - s[0] * s[5], s[0] * s[4] - s[1] * s[3]];
        expect(norm3(h) / hExp - 1).toBeCloseTo(0, 11);
        for (let c = 0; c < 3; c++) expect(h[c] / norm3(h)).toBeCloseTo(nExp[c], 11);
      }
    }
  });

  it('points the eccentricity vector (from the state) along the periapsis direction Rz(Ω)·Rx(i)·Rz(ω)·x̂ (analytic)', () => {
    const s = new Float64Array(6);
    const j = idx('fennick');
    const el = demo.bodies[j].elements!;
    const m = demo.bodies[j].derived.orbitMu;
    bodyStateRelativeToParent(demo, j, 4.2e8, s);
    const r = norm3(s);
    const v2 = s[3] ** 2 + s[4] ** 2 + s[5] ** 2;
    const rv = s[0] * s[3] + s[1] * s[4] + s[2] * s[5];
    const ev = [0, 1, 2].map((c) => ((v2 - m / r) * s[c] - rv * s[3 + c]) / m);
    expect(norm3(ev)).toBeCloseTo(el.e, 12);
    // Rotation matrices multiplied out here, independently of ephemeris.ts's P vector.
    const Rz = (x: number) => [
      [Math.cos(x), -Math.sin(x), 0],
      [Math.sin(x), Math.cos(x), 0],
      [0, 0, 1],
    ];
    const Rx = (x: number) => [
      [1, 0, 0],
      [0, Math.cos(x), -Math.sin(x)],
      [0, Math.sin(x), Math.cos(x)],
    ];
    const mul = (A: number[][], B: number[][]) => A.map((row) => B[0].map((_, c) => row.reduce((acc, x, k) => acc + x * B[k][c], 0)));
    const R = mul(mul(Rz(el.raan), Rx(el.i)), Rz(el.argp));
    for (let c = 0; c < 3; c++) expect(ev[c] / el.e).toBeCloseTo(R[c][0], 11);
  });

  it('repeats after one period, also far from the epoch (analytic)', () => {
    const j = idx('ochre');
    const T = demo.bodies[j].derived.period;
    const a0 = bodyStateRelativeToParent(demo, j, 3e9, new Float64Array(6));
    const a1 = bodyStateRelativeToParent(demo, j, 3e9 + T, new Float64Array(6));
    expect(maxDiff(a0, a1, 0, 3) / demo.bodies[j].elements!.a).toBeLessThan(1e-9);
  });
});

describe('conic ephemeris against other methods', () => {
  it('matches propagating the epoch state with universal-variable Kepler (core/orbit/kepler.ts) for every demo body', () => {
    const s0 = new Float64Array(6);
    const s = new Float64Array(6);
    const p = new Float64Array(6);
    for (let j = 1; j < demo.bodies.length; j++) {
      const b = demo.bodies[j];
      bodyStateRelativeToParent(demo, j, 0, s0);
      for (const frac of [0.13, 0.5, 0.77, 2.31]) {
        const t = frac * b.derived.period;
        bodyStateRelativeToParent(demo, j, t, s);
        propagateKepler(b.derived.orbitMu, s0, t, p);
        expect(maxDiff(s, p, 0, 3) / b.elements!.a).toBeLessThan(1e-12);
        expect(maxDiff(s, p, 3, 6) / norm3(p, 3)).toBeLessThan(1e-12);
      }
    }
  });

  it('matches mean → true anomaly → elementsToState (core/orbit) for every demo body', () => {
    const s = new Float64Array(6);
    const q = new Float64Array(6);
    for (let j = 1; j < demo.bodies.length; j++) {
      const b = demo.bodies[j];
      const el = b.elements!;
      for (const t of [-2e8, 0, 1.234e6, 7.7e7, 9e9]) {
        bodyStateRelativeToParent(demo, j, t, s);
        const nu = meanToTrue(el.M0 + b.derived.meanMotion * t, el.e);
        elementsToState(b.derived.orbitMu, { a: el.a, e: el.e, i: el.i, raan: el.raan, argp: el.argp, nu }, q);
        // At t = 9e9 s a moon's M is ~1e5 rad: reducing it mod 2π differs between the two paths by ~1e-11 rad.
        expect(maxDiff(s, q, 0, 3) / el.a).toBeLessThan(1e-11);
        expect(maxDiff(s, q, 3, 6) / norm3(q, 3)).toBeLessThan(1e-11);
      }
    }
  });

  it("matches integrating the two-body equations with ODEX (odex npm package, Hairer's extrapolation method) over one Fennick orbit", () => {
    const j = idx('fennick');
    const b = demo.bodies[j];
    const m = b.derived.orbitMu;
    const s0 = bodyStateRelativeToParent(demo, j, 0, new Float64Array(6));
    const f = odexTwoBody(m);
    const s = new Float64Array(6);
    let t0 = 0;
    let y = Array.from(s0);
    for (const frac of [0.25, 0.5, 0.75, 1]) {
      const t1 = frac * b.derived.period;
      // atol 1e-3 (m, m/s) on a 1e12 m orbit, rtol 1e-13.
      const res = odexSolve(f, t0, y, t1, 1e-13, 1e-3);
      expect(res.outcome).toBe(ODEX_CONVERGED);
      y = res.y;
      t0 = t1;
      bodyStateRelativeToParent(demo, j, t1, s);
      expect(maxDiff(s, y, 0, 3) / b.elements!.a).toBeLessThan(1e-8);
    }
  });
});

describe('relative states through the parent chain', () => {
  const t = 3.7e7;
  const st = (i: number, rel?: number) => bodyState(demo, i, t, new Float64Array(6), rel);
  const relParent = (i: number) => bodyStateRelativeToParent(demo, i, t, new Float64Array(6));

  it('gives a moon relative to the star as moon-rel-planet + planet-rel-star', () => {
    const q = st(idx('quill'));
    const sum = relParent(idx('quill')).map((x, c) => x + relParent(idx('tessel'))[c]);
    expect(maxDiff(q, sum, 0, 6) / norm3(q)).toBeLessThan(1e-15);
  });

  it('gives a body relative to its parent as bodyStateRelativeToParent', () => {
    expect(Array.from(st(idx('skerry'), idx('moravel')))).toEqual(Array.from(relParent(idx('skerry'))));
  });

  it('gives sibling moons relative to each other as the difference of their planet-relative states', () => {
    const d = st(idx('skerry'), idx('lough'));
    const ref = relParent(idx('skerry')).map((x, c) => x - relParent(idx('lough'))[c]);
    expect(maxDiff(d, ref, 0, 6) / norm3(ref)).toBeLessThan(1e-15);
  });

  it('gives a moon relative to another planet as the difference of star-relative states', () => {
    const d = st(idx('quill'), idx('ochre'));
    const ref = st(idx('quill')).map((x, c) => x - st(idx('ochre'))[c]);
    expect(maxDiff(d, ref, 0, 3) / norm3(ref)).toBeLessThan(1e-12);
  });

  it('is antisymmetric and zero relative to itself; the star is at the origin', () => {
    const a = st(idx('lough'), idx('quill'));
    const b = st(idx('quill'), idx('lough'));
    // the two chains add the same four conic states in another order: a few ulps of the largest
    // (Moravel about the star), not exact equality
    const big = st(idx('moravel'));
    for (let c = 0; c < 6; c++) expect(Math.abs(a[c] + b[c])).toBeLessThanOrEqual(4 * Number.EPSILON * norm3(big, c < 3 ? 0 : 3));
    expect(Array.from(st(idx('tessel'), idx('tessel')))).toEqual([0, 0, 0, 0, 0, 0]);
    expect(Array.from(st(0))).toEqual([0, 0, 0, 0, 0, 0]);
    expect(Array.from(st(0, idx('tessel'))).map((x, c) => x + relParent(idx('tessel'))[c])).toEqual([0, 0, 0, 0, 0, 0]);
  });

  it('gives conicState (the unchecked form for hot loops) the numbers of bodyStateRelativeToParent exactly, for every body, before and long after the epoch', () => {
    const out = new Float64Array(6);
    let compared = 0;
    for (let i = 1; i < demo.bodies.length; i++) {
      for (const time of [-4.1e9, -1, 0, 1, t, 8.3e10]) {
        conicState(demo.ephemeris, i, time, out);
        const ref = bodyStateRelativeToParent(demo, i, time, new Float64Array(6));
        // === rather than toEqual: a zero component may come out as −0 (stored, not added to 0)
        for (let c = 0; c < 6; c++) expect(out[c] === ref[c]).toBe(true);
        compared++;
      }
    }
    expect(compared).toBe(6 * (demo.bodies.length - 1));
  });

  it('gives bodyPosition equal to the position part of bodyState', () => {
    const p = bodyPosition(demo, idx('lough'), t, new Float64Array(3), idx('kiln'));
    const s = st(idx('lough'), idx('kiln'));
    expect(Array.from(p)).toEqual(Array.from(s.subarray(0, 3)));
  });
});

describe('sampleOrbit', () => {
  it('gives points on the ellipse in the orbit plane, starting at periapsis', () => {
    const j = idx('fennick');
    const b = demo.bodies[j];
    const el = b.elements!;
    const pts = sampleOrbit(demo, j, 64);
    expect(pts).toHaveLength(192);
    const n = [Math.sin(el.i) * Math.sin(el.raan), -Math.sin(el.i) * Math.cos(el.raan), Math.cos(el.i)];
    const rs: number[] = [];
    for (let k = 0; k < 64; k++) {
      const p = pts.subarray(3 * k, 3 * k + 3);
      expect(Math.abs(p[0] * n[0] + p[1] * n[1] + p[2] * n[2]) / el.a).toBeLessThan(1e-14);
      rs.push(norm3(p));
    }
    expect(rs[0] / b.derived.periapsis).toBeCloseTo(1, 14);
    expect(rs[32] / b.derived.apoapsis).toBeCloseTo(1, 14);
    for (const r of rs) {
      expect(r).toBeGreaterThanOrEqual(b.derived.periapsis * (1 - 1e-14));
      expect(r).toBeLessThanOrEqual(b.derived.apoapsis * (1 + 1e-14));
    }
  });

  it('refuses the star and too few points', () => {
    expect(() => sampleOrbit(demo, 0, 10)).toThrow(InputError);
    expect(() => sampleOrbit(demo, 1, 2)).toThrow(InputError);
  });
});

describe('bad input', () => {
  it('throws InputError for out-of-range indices and non-finite times, never NaN', () => {
    const s = new Float64Array(6);
    expect(() => bodyState(demo, 99, 0, s)).toThrow(InputError);
    expect(() => bodyState(demo, 1.5, 0, s)).toThrow(InputError);
    expect(() => bodyState(demo, 1, 0, s, -1)).toThrow(InputError);
    expect(() => bodyState(demo, 1, NaN, s)).toThrow(InputError);
    expect(() => bodyPosition(demo, 1, Infinity, s)).toThrow(InputError);
    expect(() => bodyStateRelativeToParent(demo, -1, 0, s)).toThrow(InputError);
  });
});
