import { describe, expect, it } from 'vitest';
import { SolverError } from '../../../core/math/errors.ts';
import { hyperbolicDeparture, solveApsis, solveBurn, solveCapture, solvePlane, type SolveInfo } from '../../../core/conic/solveBurn.ts';
import { conicInfo } from '../../../core/conic/soiCrossing.ts';
import { elementsToState, stateToElements } from '../../../core/orbit/elements.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { solveLambert } from '../../../core/orbit/lambert.ts';
import { bodyPosition, bodyState } from '../../../core/system/ephemeris.ts';
import { DEMO_ARRIVE, DEMO_DEPART, demoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem, MU_EARTH, R_EARTH } from '../plan/helpers.ts';

const DEG = Math.PI / 180;
const norm = (a: ArrayLike<number>): number => Math.hypot(a[0], a[1], a[2]);
/** Sine of the angle between a and b (a cosine near ±1 hides angles of up to √(2·tol)). */
const sinAngle = (a: ArrayLike<number>, b: ArrayLike<number>): number =>
  Math.hypot(a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]) / (norm(a) * norm(b));
/** Speeds of a few km/s carry a rounding of ~1e-12 m/s: the closed forms agree to 1e-10 m/s (measured ≤ 2.7e-12). */
const SPEED_TOL = 1e-10;

describe('capture', () => {
  it('at periapsis of an approach hyperbola, Δv is the vis-viva difference (Curtis, eq. 8.59, from memory)', () => {
    const rp = R_EARTH + 500e3;
    const vinf = 3000;
    const a = -MU_EARTH / vinf ** 2;
    const s = elementsToState(MU_EARTH, { a, e: 1 - rp / a, i: 0.5, raan: 0.2, argp: 1, nu: 0 });
    for (const e of [0, 0.3, 0.8]) {
      const dv = solveCapture(MU_EARTH, s, e, [0, 0, 0]);
      const expected = Math.sqrt(vinf ** 2 + (2 * MU_EARTH) / rp) - Math.sqrt((MU_EARTH * (1 + e)) / rp);
      expect(Math.abs(norm(dv) - expected)).toBeLessThan(SPEED_TOL);
      const after = [s[0], s[1], s[2], s[3] + dv[0], s[4] + dv[1], s[5] + dv[2]];
      const c = conicInfo(MU_EARTH, after);
      expect(Math.abs(c.e - e)).toBeLessThan(1e-13); // measured 5.6e-16
      // same periapsis, to the rounding of 6.9e6 m radii (1.5e-9 m; measured 2.8e-9 m)
      expect(Math.abs(c.rp - rp)).toBeLessThan(1e-7);
      // retrograde: along −V (sine of the angle measured ≤ 7.5e-17)
      expect(sinAngle(dv, [s[3], s[4], s[5]])).toBeLessThan(1e-14);
      expect(dv[0] * s[3] + dv[1] * s[4] + dv[2] * s[5]).toBeLessThan(0);
    }
  });

  it('a circular capture a hair off periapsis (flight-path angle 1e-8 rad, as a numerically found apsis is) succeeds with e below 1e-6', () => {
    const rp = R_EARTH + 500e3;
    const a = -MU_EARTH / 3000 ** 2;
    const e = 1 - rp / a;
    // the true anomaly whose flight-path angle is 1e-8 rad: tan γ = e sin ν / (1 + e cos ν) ≈ e ν / (1 + e) near ν = 0
    const nu = (1e-8 * (1 + e)) / e;
    const s = elementsToState(MU_EARTH, { a, e, i: 0.5, raan: 0.2, argp: 1, nu });
    const dv = solveCapture(MU_EARTH, s, 0, [0, 0, 0]);
    const c = conicInfo(MU_EARTH, [s[0], s[1], s[2], s[3] + dv[0], s[4] + dv[1], s[5] + dv[2]]);
    // a burn along V cannot remove the 1e-8 rad flight-path angle: e comes out of that order
    expect(c.e).toBeLessThan(1e-6);
  });

  it('fails when the flight-path angle is too steep for the eccentricity', () => {
    const a = -MU_EARTH / 3000 ** 2;
    const s = elementsToState(MU_EARTH, { a, e: 1.5, i: 0, raan: 0, argp: 0, nu: -2.0 });
    expect(() => solveCapture(MU_EARTH, s, 0, [0, 0, 0])).toThrow(SolverError);
  });
});

describe('plane change', () => {
  it('at the node of a circular orbit: Δv = 2v·sin(Δi/2) and the new inclination (Curtis, eq. 6.23, from memory)', () => {
    const r = R_EARTH + 400e3;
    const v = Math.sqrt(MU_EARTH / r);
    const s = elementsToState(MU_EARTH, { a: r, e: 0, i: 28.5 * DEG, raan: 1.1, argp: 0, nu: 0 }); // at the ascending node
    for (const target of [0, 10 * DEG, 51.6 * DEG, 90 * DEG]) {
      const dv = solvePlane(s, target, [0, 0, 0]);
      expect(Math.abs(norm(dv) - 2 * v * Math.sin(Math.abs(target - 28.5 * DEG) / 2))).toBeLessThan(SPEED_TOL);
      const el = stateToElements(MU_EARTH, [s[0], s[1], s[2]], [s[3] + dv[0], s[4] + dv[1], s[5] + dv[2]]);
      expect(Math.abs(el.i - target)).toBeLessThan(1e-14); // measured 3e-16
      expect(el.e).toBeLessThan(1e-14); // measured 6e-16
    }
  });

  it('away from a node, inclinations below the latitude are out of reach', () => {
    const s = elementsToState(MU_EARTH, { a: 7e6, e: 0, i: 60 * DEG, raan: 0, argp: 0, nu: 90 * DEG }); // at latitude 60°
    expect(() => solvePlane(s, 30 * DEG, [0, 0, 0])).toThrow(/cannot be reached/);
    const dv = solvePlane(s, 70 * DEG, [0, 0, 0]);
    const el = stateToElements(MU_EARTH, [s[0], s[1], s[2]], [s[3] + dv[0], s[4] + dv[1], s[5] + dv[2]]);
    expect(Math.abs(el.i - 70 * DEG)).toBeLessThan(1e-14); // measured 0
  });
});

describe('apsis', () => {
  it('from a circular orbit: the Hohmann first burn √(μ/r1)(√(2r2/(r1+r2)) − 1) (Curtis, eq. 6.2 ff., common practice)', () => {
    const r1 = R_EARTH + 300e3;
    const r2 = 42164e3;
    const s = elementsToState(MU_EARTH, { a: r1, e: 0, i: 0, raan: 0, argp: 0, nu: 0.4 });
    const dv = solveApsis(MU_EARTH, s, r2, [0, 0, 0]);
    expect(Math.abs(norm(dv) - Math.sqrt(MU_EARTH / r1) * (Math.sqrt((2 * r2) / (r1 + r2)) - 1))).toBeLessThan(SPEED_TOL);
    const c = conicInfo(MU_EARTH, [s[0], s[1], s[2], s[3] + dv[0], s[4] + dv[1], s[5] + dv[2]]);
    // vis-viva at an apsis is exact: the rounding of 4.2e7 m radii, 9e-9 m (measured 3.7e-8 m)
    expect(Math.abs(c.ra - r2)).toBeLessThan(1e-6);
  });
  it('lowering: at apoapsis, putting the periapsis lower', () => {
    const s = elementsToState(MU_EARTH, { a: 2e7, e: 0.5, i: 0, raan: 0, argp: 0, nu: Math.PI });
    const dv = solveApsis(MU_EARTH, s, 8e6, [0, 0, 0]);
    const c = conicInfo(MU_EARTH, [s[0], s[1], s[2], s[3] + dv[0], s[4] + dv[1], s[5] + dv[2]]);
    // to the rounding of 8e6–3e7 m radii (measured 1.9e-9 and 3.7e-9 m)
    expect(Math.abs(c.rp - 8e6)).toBeLessThan(1e-7);
    expect(Math.abs(c.ra - 3e7)).toBeLessThan(1e-7);
  });
});

describe('hyperbolic departure', () => {
  const r = R_EARTH + 300e3;
  const vinf = 3500;

  it('at the ideal point the burn is tangential: |Δv| = √(v∞² + 2μ/r) − v_circ (Curtis, eq. 8.42, from memory)', () => {
    // circular orbit; v∞ placed at the asymptote angle ν∞ = acos(−1/e) ahead of r
    const e = 1 + (r * vinf ** 2) / MU_EARTH;
    const nuInf = Math.acos(-1 / e);
    const s = elementsToState(MU_EARTH, { a: r, e: 0, i: 0.3, raan: 0.5, argp: 0, nu: 0.9 });
    const rh = [s[0] / r, s[1] / r, s[2] / r];
    const vc = norm([s[3], s[4], s[5]]);
    const th = [s[3] / vc, s[4] / vc, s[5] / vc];
    const vInf = [0, 1, 2].map((k) => vinf * (Math.cos(nuInf) * rh[k] + Math.sin(nuInf) * th[k]));
    const vp = hyperbolicDeparture(MU_EARTH, s, vInf, [0, 0, 0]);
    const dv = [vp[0] - s[3], vp[1] - s[4], vp[2] - s[5]];
    expect(Math.abs(norm(dv) - (Math.sqrt(vinf ** 2 + (2 * MU_EARTH) / r) - Math.sqrt(MU_EARTH / r)))).toBeLessThan(SPEED_TOL);
    // tangential: the angle to the transverse direction itself (sine measured 4.4e-17)
    expect(sinAngle(dv, th)).toBeLessThan(1e-14);
    expect(dv[0] * th[0] + dv[1] * th[1] + dv[2] * th[2]).toBeGreaterThan(0);
  });

  it('from any point: energy v∞²/2 and outgoing asymptote v̂∞ = cos ν∞·P + sin ν∞·Q (two-body conic geometry)', () => {
    const s = elementsToState(MU_EARTH, { a: r, e: 0, i: 0.3, raan: 0.5, argp: 0, nu: 0.9 });
    for (const dir of [
      [1, 0, 0],
      [0.3, -0.8, 0.5],
      [-0.6, 0.2, -0.77],
      [0, 0, 1],
    ]) {
      const n = norm(dir);
      const vInf = dir.map((x) => (vinf * x) / n);
      const vp = hyperbolicDeparture(MU_EARTH, s, vInf, [0, 0, 0]);
      const st = [s[0], s[1], s[2], vp[0], vp[1], vp[2]];
      const c = conicInfo(MU_EARTH, st);
      // terms of size μ/r = 5.9e7 m²/s², ε of it 1.3e-8 (measured 3.7e-8)
      expect(Math.abs(0.5 * norm(vp) ** 2 - MU_EARTH / r - 0.5 * vinf ** 2)).toBeLessThan(2e-7);
      const nuInf = Math.acos(-1 / c.e);
      const asym = [0, 1, 2].map((k) => Math.cos(nuInf) * c.P[k] + Math.sin(nuInf) * c.Q[k]);
      for (let k = 0; k < 3; k++) expect(Math.abs(asym[k] - vInf[k] / vinf)).toBeLessThan(1e-14); // measured 5.6e-16
      // and flying outward the ship does leave (ν increasing towards ν∞)
      const far = propagateKepler(MU_EARTH, st, 5e6);
      expect(norm(far)).toBeGreaterThan(1e9);
    }
  });
});

describe('transfer', () => {
  const system = demoSystem();
  const tessel = system.indexById['tessel'];
  const ochre = system.indexById['ochre'];

  it('direct (heliocentric): the Δv puts the ship on the arc that reaches the target at the arrival time (Kepler check)', () => {
    // ship 1 day after leaving Tessel: heliocentric state near Tessel with a small extra velocity
    const t = DEMO_DEPART + 5 * 86400;
    const b = bodyState(system, tessel, t, new Float64Array(6), 0);
    const s = [b[0] + 7e8, b[1], b[2], b[3] + 2500, b[4] + 1500, b[5] - 300];
    const dv = solveBurn({ system, central: 0, t, state: s }, { kind: 'transfer', to: 'ochre', arrive: DEMO_ARRIVE }, [0, 0, 0]);
    const after = propagateKepler(system.bodies[0].mu, [s[0], s[1], s[2], s[3] + dv[0], s[4] + dv[1], s[5] + dv[2]], DEMO_ARRIVE - t);
    const target = bodyPosition(system, ochre, DEMO_ARRIVE, [0, 0, 0]);
    // Lambert's x to 1e-11 and 236 days of Kepler propagation at 1.5e11 m (ulp 3e-5 m): measured 1.1e-4 m
    expect(Math.hypot(after[0] - target[0], after[1] - target[1], after[2] - target[2])).toBeLessThan(1e-3);
  });

  it('direct with a periapsis altitude: the predicted arrival periapsis matches (patched-conic check by Kepler)', () => {
    const t = DEMO_DEPART + 5 * 86400;
    const b = bodyState(system, tessel, t, new Float64Array(6), 0);
    const s = [b[0] + 7e8, b[1], b[2], b[3] + 2500, b[4] + 1500, b[5] - 300];
    const info: SolveInfo = { vInf: null, predictedPeriapsis: null, iterations: 0 };
    solveBurn({ system, central: 0, t, state: s }, { kind: 'transfer', to: 'ochre', arrive: DEMO_ARRIVE, periapsisAltitude: 400e3 }, [0, 0, 0], info);
    expect(info.predictedPeriapsis).not.toBeNull();
    expect(Math.abs((info.predictedPeriapsis as number) - (system.bodies[ochre].radius + 400e3))).toBeLessThan(1);
    expect(info.iterations).toBeLessThan(12);
  });

  it('departure from a parking orbit: v∞ is Lambert’s v1 − v_Tessel (Lambert recomputed here)', () => {
    const start = demoPlan.start;
    if (start.kind !== 'parking') throw new Error('demo starts in a parking orbit');
    const mu = system.bodies[tessel].mu;
    const s0 = elementsToState(mu, { p: system.bodies[tessel].radius + start.periapsisAltitude, e: 0, i: start.i, raan: start.raan, argp: 0, nu: start.nu });
    const s = propagateKepler(mu, s0, DEMO_DEPART - start.epoch);
    const info: SolveInfo = { vInf: null, predictedPeriapsis: null, iterations: 0 };
    const dv = solveBurn({ system, central: tessel, t: DEMO_DEPART, state: s }, { kind: 'transfer', to: 'ochre', arrive: DEMO_ARRIVE }, [0, 0, 0], info);
    const bt = bodyState(system, tessel, DEMO_DEPART, new Float64Array(6), 0);
    const bo = bodyPosition(system, ochre, DEMO_ARRIVE, [0, 0, 0]);
    const sol = solveLambert(system.bodies[0].mu, [bt[0], bt[1], bt[2]], bo, DEMO_ARRIVE - DEMO_DEPART)[0];
    const vinf = [sol.v1[0] - bt[3], sol.v1[1] - bt[4], sol.v1[2] - bt[5]];
    expect(info.vInf).not.toBeNull();
    for (let k = 0; k < 3; k++) expect((info.vInf as number[])[k]).toBeCloseTo(vinf[k], 6);
    // the demo parking orbit is phased for a tangential burn: Curtis eq. 8.42 again
    const r = norm(s);
    // the excess over the tangential burn is second order in the phasing error: 1e-9 m/s allows
    // 3e-7 rad (measured 2.7e-12 m/s)
    expect(Math.abs(norm(dv) - (Math.sqrt(norm(vinf) ** 2 + (2 * mu) / r) - Math.sqrt(mu / r)))).toBeLessThan(1e-9);
  });

  it('fails with a reason: arrival before the burn, target not reachable from here', () => {
    const s = [7e6, 0, 0, 0, 7500, 0];
    expect(() => solveBurn({ system, central: tessel, t: DEMO_ARRIVE, state: s }, { kind: 'transfer', to: 'ochre', arrive: DEMO_DEPART }, [0, 0, 0])).toThrow(
      /not after the burn/,
    );
    expect(() => solveBurn({ system, central: tessel, t: 0, state: s }, { kind: 'transfer', to: 'skerry', arrive: 1e7 }, [0, 0, 0])).toThrow(/sibling/);
    expect(() => solveBurn({ system, central: tessel, t: 0, state: s }, { kind: 'transfer', to: 'tessel', arrive: 1e7 }, [0, 0, 0])).toThrow(/already/);
  });
});
