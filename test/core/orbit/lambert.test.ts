import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createRequire } from 'node:module';
import {
  lambertAll,
  lambertBest,
  lambertCodeBranch,
  lambertCodeRevs,
  lambertSingleRev,
  solveLambert,
  type LambertSolution,
} from '../../../core/orbit/lambert.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { hohmann } from '../../../core/orbit/hohmann.ts';
import { InputError } from '../../../core/math/errors.ts';

// odex (npm): Hairer & Wanner's ODEX extrapolation code, loaded through require with the small
// typed surface used here (the package's entry is its TypeScript source).
interface OdexSolver {
  maxSteps: number;
  relativeTolerance: number;
  absoluteTolerance: number;
  solve(f: (x: number, y: number[]) => number[], x: number, y0: number[], xEnd: number): { y: number[]; outcome: number };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver; Outcome: { Converged: number } };

const MU_EARTH_KM = 398600; // km³/s², Curtis's value
const MU_EARTH = 3.986004418e14; // m³/s²

const norm = (v: ArrayLike<number>): number => Math.hypot(v[0], v[1], v[2]);
const cross = (a: ArrayLike<number>, b: ArrayLike<number>): number[] => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const dot = (a: ArrayLike<number>, b: ArrayLike<number>): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];

/** Relative miss in position and velocity at r2 after flying (r1, v1) for tof with the project's Kepler propagator. */
function keplerMiss(mu: number, r1: ArrayLike<number>, r2: ArrayLike<number>, tof: number, s: LambertSolution): { pos: number; vel: number } {
  const st = propagateKepler(mu, [r1[0], r1[1], r1[2], s.v1[0], s.v1[1], s.v1[2]], tof);
  const pos = Math.hypot(st[0] - r2[0], st[1] - r2[1], st[2] - r2[2]) / norm(r2);
  const vel = Math.hypot(st[3] - s.v2[0], st[4] - s.v2[1], st[5] - s.v2[2]) / norm(s.v2);
  return { pos, vel };
}

/** Flies (r1, v1) for tof through two-body gravity with odex (Hairer's GBS extrapolation code), independent of the core. */
function odexFly(mu: number, r1: ArrayLike<number>, v1: ArrayLike<number>, tof: number): number[] {
  const solver = new odex.Solver(6);
  solver.absoluteTolerance = 1e-13;
  solver.relativeTolerance = 1e-13;
  solver.maxSteps = 1_000_000;
  const L = norm(r1);
  const V = Math.sqrt(mu / L);
  const tau = L / V;
  // Non-dimensional (units L, V) so that one tolerance suits positions and velocities.
  const f = (_t: number, y: number[]): number[] => {
    const r = Math.hypot(y[0], y[1], y[2]);
    const k = -1 / (r * r * r);
    return [y[3], y[4], y[5], k * y[0], k * y[1], k * y[2]];
  };
  const y0 = [r1[0] / L, r1[1] / L, r1[2] / L, v1[0] / V, v1[1] / V, v1[2] / V];
  const res = solver.solve(f, 0, y0, tof / tau);
  expect(res.outcome).toBe(odex.Outcome.Converged);
  return [res.y[0] * L, res.y[1] * L, res.y[2] * L, res.y[3] * V, res.y[4] * V, res.y[5] * V];
}

describe('solveLambert: published worked examples', () => {
  it('matches Curtis, Orbital Mechanics for Engineering Students, Example 5.2 (from memory)', () => {
    // r1 = [5000, 10000, 2100] km, r2 = [−14600, 2500, 7000] km, Δt = 1 h, μ = 398600 km³/s².
    const sols = solveLambert(MU_EARTH_KM, [5000, 10000, 2100], [-14600, 2500, 7000], 3600);
    expect(sols).toHaveLength(1);
    const { v1, v2, revs, branch } = sols[0];
    expect(revs).toBe(0);
    expect(branch).toBe('single');
    const e1 = [-5.9925, 1.9254, 3.2456];
    const e2 = [-3.3125, -4.1966, -0.38529];
    for (let i = 0; i < 3; i++) {
      expect(v1[i]).toBeCloseTo(e1[i], 4);
      expect(v2[i]).toBeCloseTo(e2[i], 4);
    }
  });

  it('matches Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Example 7-5 (from memory)', () => {
    // r0 = 15945.34 I km, r = 12214.83899 I + 10249.46731 J km, Δt = 76 min, μ = 398600.4418 km³/s²;
    // v0 = 2.058913 I + 2.915965 J km/s, v = −3.451565 I + 0.910315 J km/s.
    const [s] = solveLambert(398600.4418, [15945.34, 0, 0], [12214.83899, 10249.46731, 0], 76 * 60);
    expect(s.v1[0]).toBeCloseTo(2.058913, 5);
    expect(s.v1[1]).toBeCloseTo(2.915965, 5);
    expect(s.v1[2]).toBe(0);
    expect(s.v2[0]).toBeCloseTo(-3.451565, 5);
    expect(s.v2[1]).toBeCloseTo(0.910315, 5);
  });
});

describe('solveLambert: analytic solutions', () => {
  it("gives a parabola for the parabolic flight time of Euler's equation (Battin, An Introduction to the Mathematics and Methods of Astrodynamics, section 4.2)", () => {
    const r1 = [7e6, 0, 0];
    const r2 = [-3e6, 11e6, 2e6];
    const r1n = norm(r1);
    const r2n = norm(r2);
    const c = Math.hypot(r2[0] - r1[0], r2[1] - r1[1], r2[2] - r1[2]);
    const s = (r1n + r2n + c) / 2;
    // Transfer angle < π (prograde about +z here): t_p = (1/3)√(2/μ) (s^{3/2} − (s − c)^{3/2}).
    const tp = (Math.sqrt(2 / MU_EARTH) * (s ** 1.5 - (s - c) ** 1.5)) / 3;
    const [sol] = solveLambert(MU_EARTH, r1, r2, tp);
    const energy = dot(sol.v1, sol.v1) / 2 - MU_EARTH / r1n;
    expect(Math.abs(energy) / (MU_EARTH / r1n)).toBeLessThan(1e-12);
    expect(sol.x).toBeCloseTo(1, 10);
    // Slightly longer / shorter flights are elliptic / hyperbolic.
    const [longer] = solveLambert(MU_EARTH, r1, r2, tp * 1.01);
    const [shorter] = solveLambert(MU_EARTH, r1, r2, tp * 0.99);
    expect(dot(longer.v1, longer.v1) / 2 - MU_EARTH / r1n).toBeLessThan(0);
    expect(dot(shorter.v1, shorter.v1) / 2 - MU_EARTH / r1n).toBeGreaterThan(0);
  });

  it("gives the minimum-energy ellipse a = s/2 for Lambert's minimum-energy time (Bate, Mueller & White, Fundamentals of Astrodynamics, section 5.2)", () => {
    const r1 = [8e6, 1e6, -5e5];
    const r2 = [-2e6, 9e6, 3e6];
    const r1n = norm(r1);
    const r2n = norm(r2);
    const c = Math.hypot(r2[0] - r1[0], r2[1] - r1[1], r2[2] - r1[2]);
    const s = (r1n + r2n + c) / 2;
    const am = s / 2;
    // Transfer angle < π: t_m = √(a_m³/μ) (π − (β − sin β)), sin(β/2) = √((s − c)/s).
    const beta = 2 * Math.asin(Math.sqrt((s - c) / s));
    const tm = Math.sqrt(am ** 3 / MU_EARTH) * (Math.PI - (beta - Math.sin(beta)));
    const [sol] = solveLambert(MU_EARTH, r1, r2, tm);
    const a = 1 / (2 / r1n - dot(sol.v1, sol.v1) / MU_EARTH);
    expect(a / am).toBeCloseTo(1, 12);
    expect(sol.x).toBeCloseTo(0, 10);
  });

  it('reproduces a Hohmann transfer for a 180° transfer in the Hohmann time (vis-viva, hohmann.ts cross-check)', () => {
    const rA = 7e6;
    const rB = 4.2e7;
    const h = hohmann(MU_EARTH, rA, rB);
    const [sol] = solveLambert(MU_EARTH, [rA, 0, 0], [-rB, 0, 0], h.tof, { normalHint: [0, 0, 1] });
    expect(sol.v1[0] / sol.v1[1]).toBeCloseTo(0, 9);
    expect(sol.v1[1]).toBeCloseTo(Math.sqrt(MU_EARTH / rA) + h.dv1, 6);
    expect(-sol.v2[1]).toBeCloseTo(Math.sqrt(MU_EARTH / rB) - h.dv2, 6);
  });

  it('agrees with an independent integration of two-body gravity by odex (single and multi-revolution)', () => {
    const cases: Array<{ r1: number[]; r2: number[]; tof: number; revs: number; retrograde: boolean }> = [
      { r1: [7e6, 1e6, 5e5], r2: [-1.5e7, 8e6, -3e6], tof: 8000, revs: 0, retrograde: false },
      { r1: [7e6, 1e6, 5e5], r2: [-1.5e7, 8e6, -3e6], tof: 8000, revs: 0, retrograde: true },
      { r1: [9e6, -2e6, 1e6], r2: [3e6, 1.1e7, -4e6], tof: 60000, revs: 3, retrograde: false },
      { r1: [2.5e7, 0, 3e6], r2: [-6e6, -1e7, 0], tof: 3e5, revs: 2, retrograde: true },
    ];
    let checked = 0;
    for (const k of cases) {
      const sols = solveLambert(MU_EARTH, k.r1, k.r2, k.tof, { revs: k.revs, retrograde: k.retrograde });
      expect(sols.length).toBe(2 * k.revs + 1);
      for (const s of sols) {
        const y = odexFly(MU_EARTH, k.r1, s.v1, k.tof);
        // odex at rtol 1e-13 over up to 3 revolutions: measured 1.1e-9 and 6.3e-10
        expect(Math.hypot(y[0] - k.r2[0], y[1] - k.r2[1], y[2] - k.r2[2]) / norm(k.r2)).toBeLessThan(4e-9);
        expect(Math.hypot(y[3] - s.v2[0], y[4] - s.v2[1], y[5] - s.v2[2]) / norm(s.v2)).toBeLessThan(4e-9);
        checked++;
      }
    }
    expect(checked).toBe(1 + 1 + 7 + 5);
  });
});

// --- Property tests against the universal-variable Kepler propagator -------------------------

const direction = fc
  .tuple(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: 0, max: 2 * Math.PI, noNaN: true, maxExcluded: true }))
  .map(([z, phi]) => {
    const s = Math.sqrt(1 - z * z);
    return [s * Math.cos(phi), s * Math.sin(phi), z];
  });
const radius = fc.double({ min: 6.6e6, max: 4.2e7, noNaN: true });
const position = fc.tuple(direction, radius).map(([d, r]) => [d[0] * r, d[1] * r, d[2] * r]);

/** Semi-perimeter of the triangle (focus, r1, r2). */
function semiPerimeter(r1: number[], r2: number[]): number {
  return (norm(r1) + norm(r2) + Math.hypot(r2[0] - r1[0], r2[1] - r1[1], r2[2] - r1[2])) / 2;
}

/** Rejects geometries within 1e-6 rad of 0 or 180° (their plane is ill-defined; tested separately). */
function wellPosed(r1: number[], r2: number[]): boolean {
  return norm(cross(r1, r2)) / (norm(r1) * norm(r2)) > 1e-6;
}

/** Prograde: angular momentum along +z; retrograde: against it (polar planes, h_z ≈ 0, count as either). */
function expectSense(r1: number[], v1: ArrayLike<number>, retrograde: boolean): void {
  const h = cross(r1, v1);
  const hz = h[2] / norm(h);
  if (retrograde) expect(hz).toBeLessThan(1e-12);
  else expect(hz).toBeGreaterThan(-1e-12);
}

describe('solveLambert: properties against propagateKepler (core/orbit/kepler.ts)', () => {
  it('single revolution: flying (r1, v1) for tof reaches r2 to 1e-10, prograde and retrograde', () => {
    fc.assert(
      fc.property(position, position, fc.double({ min: Math.log(0.02), max: Math.log(20), noNaN: true }), fc.boolean(), (r1, r2, logF, retrograde) => {
        fc.pre(wellPosed(r1, r2));
        const rmax = Math.max(norm(r1), norm(r2));
        const period = 2 * Math.PI * Math.sqrt(rmax ** 3 / MU_EARTH);
        const tof = period * Math.exp(logF);
        const sols = solveLambert(MU_EARTH, r1, r2, tof, { retrograde });
        expect(sols).toHaveLength(1);
        const s = sols[0];
        const miss = keplerMiss(MU_EARTH, r1, r2, tof, s);
        // x converges past LAMBERT_DEFAULT_TOL (1e-11); the miss adds the arc's conditioning:
        // measured at most 1.2e-11 and 6.6e-12 over these 4,000 fixed-seed cases
        expect(miss.pos).toBeLessThan(1e-10);
        expect(miss.vel).toBeLessThan(1e-10);
        expectSense(r1, s.v1, retrograde);
      }),
      { numRuns: 4000, seed: 20240611 },
    );
  });

  it('multi-revolution: every branch reaches r2 to 1e-11, and the solution count obeys the minimum-energy period bounds', () => {
    let branches = 0;
    fc.assert(
      fc.property(position, position, fc.double({ min: 0.3, max: 4.5, noNaN: true }), fc.boolean(), (r1, r2, f, retrograde) => {
        fc.pre(wellPosed(r1, r2));
        const s = semiPerimeter(r1, r2);
        // Period of the minimum-energy ellipse a_m = s/2: no N-revolution arc is faster than N of
        // these, and N + 1 of them always leave room for both N-revolution branches.
        const pm = 2 * Math.PI * Math.sqrt((s / 2) ** 3 / MU_EARTH);
        const tof = f * pm;
        const maxRevs = 3;
        const sols = solveLambert(MU_EARTH, r1, r2, tof, { revs: maxRevs, retrograde });
        const nSolved = (sols.length - 1) / 2;
        expect(Number.isInteger(nSolved)).toBe(true);
        expect(nSolved).toBeLessThanOrEqual(Math.min(maxRevs, Math.ceil(f) - 1));
        expect(nSolved).toBeGreaterThanOrEqual(Math.min(maxRevs, Math.floor(f) - 1));
        expect(sols[0].branch).toBe('single');
        for (let n = 1; n <= nSolved; n++) {
          const left = sols[2 * n - 1];
          const right = sols[2 * n];
          expect([left.revs, left.branch, right.revs, right.branch]).toEqual([n, 'left', n, 'right']);
          expect(left.x).toBeLessThan(right.x);
        }
        for (const sol of sols) {
          const miss = keplerMiss(MU_EARTH, r1, r2, tof, sol);
          // measured at most 7.6e-13 and 5.2e-13 over these fixed-seed cases
          expect(miss.pos).toBeLessThan(1e-11);
          expect(miss.vel).toBeLessThan(1e-11);
          expectSense(r1, sol.v1, retrograde);
          branches++;
        }
      }),
      { numRuns: 2000, seed: 7 },
    );
    expect(branches).toBeGreaterThan(4000);
  });

  it('lambertSingleRev and lambertAll agree with solveLambert', () => {
    const o1 = new Float64Array(3);
    const o2 = new Float64Array(3);
    const V1 = new Float64Array(3 * 7);
    const V2 = new Float64Array(3 * 7);
    const R = new Int32Array(7);
    const B = new Uint8Array(7);
    fc.assert(
      fc.property(position, position, fc.double({ min: 0.05, max: 4, noNaN: true }), fc.boolean(), (r1, r2, f, retrograde) => {
        fc.pre(wellPosed(r1, r2));
        const pm = 2 * Math.PI * Math.sqrt((semiPerimeter(r1, r2) / 2) ** 3 / MU_EARTH);
        const tof = f * pm;
        const ref = solveLambert(MU_EARTH, r1, r2, tof, { revs: 3, retrograde });
        const it = lambertSingleRev(MU_EARTH, r1[0], r1[1], r1[2], r2[0], r2[1], r2[2], tof, retrograde, o1, o2);
        expect(it).toBe(ref[0].iterations);
        expect(Array.from(o1)).toEqual(Array.from(ref[0].v1));
        expect(Array.from(o2)).toEqual(Array.from(ref[0].v2));
        const n = lambertAll(MU_EARTH, r1, r2, tof, 3, retrograde, V1, V2, R, B);
        expect(n).toBe(ref.length);
        for (let k = 0; k < n; k++) {
          expect(R[k]).toBe(ref[k].revs);
          expect(['single', 'left', 'right'][B[k]]).toBe(ref[k].branch);
          expect(Array.from(V1.subarray(3 * k, 3 * k + 3))).toEqual(Array.from(ref[k].v1));
          expect(Array.from(V2.subarray(3 * k, 3 * k + 3))).toEqual(Array.from(ref[k].v2));
        }
      }),
      { numRuns: 300, seed: 11 },
    );
  });
});

describe('lambertBest', () => {
  it('returns the cheapest solution under the given cost, with its code', () => {
    const r1 = [9e6, -2e6, 1e6];
    const r2 = [3e6, 1.1e7, -4e6];
    const tof = 60000;
    const sols = solveLambert(MU_EARTH, r1, r2, tof, { revs: 3 });
    // Cost: departure speed change from a fixed reference velocity.
    const ref = [1000, 6500, 500];
    const costOf = (v: ArrayLike<number>): number => Math.hypot(v[0] - ref[0], v[1] - ref[1], v[2] - ref[2]);
    let bestK = 0;
    for (let k = 1; k < sols.length; k++) if (costOf(sols[k].v1) < costOf(sols[bestK].v1)) bestK = k;
    const o1 = new Float64Array(3);
    const o2 = new Float64Array(3);
    const code = lambertBest(MU_EARTH, r1, r2, tof, 3, false, (a, b, c) => Math.hypot(a - ref[0], b - ref[1], c - ref[2]), o1, o2);
    expect(code).toBe(bestK);
    expect(lambertCodeRevs(code)).toBe(sols[bestK].revs);
    expect(lambertCodeBranch(code)).toBe(sols[bestK].branch);
    expect(Array.from(o1)).toEqual(Array.from(sols[bestK].v1));
    expect(Array.from(o2)).toEqual(Array.from(sols[bestK].v2));
    expect(lambertBest(MU_EARTH, r1, r1, tof, 3, false, () => 0, o1, o2)).toBe(-1);
    expect([0, 1, 2, 3, 4].map(lambertCodeBranch)).toEqual(['single', 'left', 'right', 'left', 'right']);
  });
});

describe('solveLambert: transfers near 0° and 180°', () => {
  const rA = 7e6;
  const rB = 1.2e7;
  const tof = 5000;

  it('uses the normal hint to choose the plane of an exactly 180° transfer; motion is prograde about it', () => {
    for (const hint of [
      [0, 0, 1],
      [0, 1, 0],
      [0, -1, 1],
      [0.3, 0.2, -1],
    ]) {
      const [s] = solveLambert(MU_EARTH, [rA, 0, 0], [-rB, 0, 0], tof, { normalHint: hint });
      const h = cross([rA, 0, 0], s.v1);
      // Angular momentum along the hint's component perpendicular to r1.
      const hp = [0, hint[1], hint[2]];
      // parallel, not merely close: the sine of the angle between them (a cosine within 5e-13 of 1
      // would allow 1e-6 rad); measured 0
      expect(norm(cross(h, hp)) / (norm(h) * norm(hp))).toBeLessThan(1e-14);
      expect(dot(h, hp)).toBeGreaterThan(0);
      const miss = keplerMiss(MU_EARTH, [rA, 0, 0], [-rB, 0, 0], tof, s);
      expect(miss.pos).toBeLessThan(1e-12); // measured 2e-14, as for the nearly coincident points below
      const [r] = solveLambert(MU_EARTH, [rA, 0, 0], [-rB, 0, 0], tof, { normalHint: hint, retrograde: true });
      expect(dot(cross([rA, 0, 0], r.v1), hp)).toBeLessThan(0);
    }
  });

  it('is continuous through 180° in a plane (no jump between just-short and just-long transfers)', () => {
    const [at] = solveLambert(MU_EARTH, [rA, 0, 0], [-rB, 0, 0], tof);
    for (const eps of [1e-3, 1e-6, 1e-9]) {
      for (const sign of [1, -1]) {
        const r2 = [-rB * Math.cos(eps), sign * rB * Math.sin(eps), 0];
        const [s] = solveLambert(MU_EARTH, [rA, 0, 0], r2, tof);
        expect(keplerMiss(MU_EARTH, [rA, 0, 0], r2, tof, s).pos).toBeLessThan(1e-12); // measured 2e-14
        expect(Math.hypot(s.v1[0] - at.v1[0], s.v1[1] - at.v1[1], s.v1[2] - at.v1[2]) / norm(at.v1)).toBeLessThan(10 * eps);
      }
    }
  });

  it('gives the rectilinear solution for a 0° transfer (analytic: no transverse velocity)', () => {
    const [s] = solveLambert(MU_EARTH, [rA, 0, 0], [rB, 0, 0], 2000);
    expect(s.v1[1]).toBe(0);
    expect(s.v1[2]).toBe(0);
    expect(s.v1[0]).toBeGreaterThan(0);
    // Radial energy check: ½v1² − μ/r1 = ½v2² − μ/r2, to a few roundings of terms of size μ/r1
    // (5.7e7 m²/s², ε of it 1.3e-8; measured 3.7e-9)
    expect(Math.abs(dot(s.v1, s.v1) / 2 - MU_EARTH / rA - (dot(s.v2, s.v2) / 2 - MU_EARTH / rB))).toBeLessThan(4 * Number.EPSILON * (MU_EARTH / rA));
  });

  it('solves nearly coincident points: short arcs and whole-revolution returns (resonant orbits)', () => {
    const P = 2 * Math.PI * Math.sqrt(rA ** 3 / MU_EARTH);
    for (const d of [1e-3, 1e-6, 1e-9, 1e-12]) {
      const r2 = [rA * Math.cos(d), rA * Math.sin(d), 0];
      const short = solveLambert(MU_EARTH, [rA, 0, 0], r2, P * d * 1.1);
      expect(keplerMiss(MU_EARTH, [rA, 0, 0], r2, P * d * 1.1, short[0]).pos).toBeLessThan(1e-12);
      // The minimum-energy ellipse (a ≈ rA/2) has period P/2^{3/2}: 1.5 P leaves room for 2 revolutions.
      const sols = solveLambert(MU_EARTH, [rA, 0, 0], r2, 1.5 * P, { revs: 2 });
      expect(sols).toHaveLength(5);
      for (const s of sols) expect(keplerMiss(MU_EARTH, [rA, 0, 0], r2, 1.5 * P, s).pos).toBeLessThan(1e-12);
    }
  });

  it('asks for a normal hint where none can be inferred', () => {
    expect(() => solveLambert(MU_EARTH, [0, 0, rA], [0, 0, -rB], tof)).toThrow(InputError);
    expect(() => solveLambert(MU_EARTH, [rA, 0, 0], [-rB, 0, 0], tof, { normalHint: [2, 0, 0] })).toThrow(InputError);
    const [s] = solveLambert(MU_EARTH, [0, 0, rA], [0, 0, -rB], tof, { normalHint: [1, 0, 0] });
    expect(keplerMiss(MU_EARTH, [0, 0, rA], [0, 0, -rB], tof, s).pos).toBeLessThan(1e-12); // measured 1.9e-14
    const o = new Float64Array(3);
    expect(lambertSingleRev(MU_EARTH, 0, 0, rA, 0, 0, -rB, tof, false, o, o)).toBe(-1);
  });
});

describe('solveLambert: typed errors', () => {
  const r1 = [7e6, 0, 0];
  const r2 = [0, 8e6, 0];
  const field = (f: () => unknown): string => {
    try {
      f();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      return (e as InputError).field;
    }
    throw new Error('did not throw');
  };
  it('rejects bad times, points, radii, μ and options with InputError naming the field', () => {
    expect(field(() => solveLambert(MU_EARTH, r1, r2, 0))).toBe('tof');
    expect(field(() => solveLambert(MU_EARTH, r1, r2, -5))).toBe('tof');
    expect(field(() => solveLambert(MU_EARTH, r1, r2, NaN))).toBe('tof');
    expect(field(() => solveLambert(MU_EARTH, r1, [7e6, 0, 0], 100))).toBe('r2');
    expect(field(() => solveLambert(MU_EARTH, [0, 0, 0], r2, 100))).toBe('r1');
    expect(field(() => solveLambert(MU_EARTH, r1, [0, 0, 0], 100))).toBe('r2');
    expect(field(() => solveLambert(MU_EARTH, [7e6, NaN, 0], r2, 100))).toBe('r1[1]');
    expect(field(() => solveLambert(MU_EARTH, r1, [1, 2], 100))).toBe('r2');
    expect(field(() => solveLambert(0, r1, r2, 100))).toBe('mu');
    expect(field(() => solveLambert(-1, r1, r2, 100))).toBe('mu');
    expect(field(() => solveLambert(MU_EARTH, r1, r2, 100, { revs: -1 }))).toBe('options.revs');
    expect(field(() => solveLambert(MU_EARTH, r1, r2, 100, { revs: 1.5 }))).toBe('options.revs');
    expect(field(() => solveLambert(MU_EARTH, r1, r2, 100, { normalHint: [0, 0, 0] }))).toBe('options.normalHint');
    expect(field(() => solveLambert(MU_EARTH, r1, r2, 100, { tol: 0 }))).toBe('options.tol');
  });
  it('the fast paths return −1 instead of throwing', () => {
    const o1 = new Float64Array(3);
    const o2 = new Float64Array(3);
    expect(lambertSingleRev(MU_EARTH, 7e6, 0, 0, 0, 8e6, 0, 0, false, o1, o2)).toBe(-1);
    expect(lambertSingleRev(MU_EARTH, 7e6, 0, 0, 7e6, 0, 0, 100, false, o1, o2)).toBe(-1);
    expect(lambertSingleRev(MU_EARTH, 0, 0, 0, 0, 8e6, 0, 100, false, o1, o2)).toBe(-1);
    expect(lambertSingleRev(NaN, 7e6, 0, 0, 0, 8e6, 0, 100, false, o1, o2)).toBe(-1);
    expect(lambertSingleRev(MU_EARTH, 7e6, NaN, 0, 0, 8e6, 0, 100, false, o1, o2)).toBe(-1);
    expect(lambertAll(MU_EARTH, r1, r2, -1, 2, false, new Float64Array(15), new Float64Array(15), new Int32Array(5))).toBe(-1);
  });
  it('a too-small iteration budget is a SolverError, not a wrong answer', () => {
    expect(() => solveLambert(MU_EARTH, r1, [-3e7, 1e6, 0], 5e4, { maxIter: 1 })).toThrow(/lambert: no-convergence/);
  });
});
