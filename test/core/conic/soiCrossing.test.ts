import { describe, expect, it } from 'vitest';
import { elementsToState } from '../../../core/orbit/elements.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { conicInfo, EVENT_TIME_TOL, findSoiEntry, timeToApsis, timeToNode, timeToRadius } from '../../../core/conic/soiCrossing.ts';
import { bodyStateRelativeToParent } from '../../../core/system/ephemeris.ts';
import { MU_EARTH, MU_SUN, testSystem } from '../plan/helpers.ts';

const DEG = Math.PI / 180;

// Event times come in closed form from the anomalies and are polished by Brent's method to
// EVENT_TIME_TOL (1e-7 s); measured errors against the hand-worked times are at most 1.2e-10 s.
describe('apsis passages', () => {
  const a = 2.4e7;
  const e = 0.6;
  const T = 2 * Math.PI * Math.sqrt(a ** 3 / MU_EARTH);
  const s0 = elementsToState(MU_EARTH, { a, e, i: 0.4, raan: 1, argp: 2, nu: 0 });

  it('from periapsis: apoapsis after half a period, periapsis after a full period (Kepler’s third law, analytic)', () => {
    expect(Math.abs(timeToApsis(MU_EARTH, s0, 'apoapsis') - T / 2)).toBeLessThan(EVENT_TIME_TOL);
    expect(Math.abs(timeToApsis(MU_EARTH, s0, 'periapsis') - T)).toBeLessThan(EVENT_TIME_TOL);
  });

  it('from ν = 100°: time to periapsis from Kepler’s equation by hand (Curtis, eqs. 3.10b and 3.14, from memory)', () => {
    const nu = 100 * DEG;
    const s = elementsToState(MU_EARTH, { a, e, i: 0.4, raan: 1, argp: 2, nu });
    // tan(E/2) = √((1−e)/(1+e))·tan(ν/2); M = E − e sin E
    const E = 2 * Math.atan(Math.sqrt((1 - e) / (1 + e)) * Math.tan(nu / 2));
    const M = E - e * Math.sin(E);
    const n = Math.sqrt(MU_EARTH / a ** 3);
    expect(Math.abs(timeToApsis(MU_EARTH, s, 'periapsis') - (2 * Math.PI - M) / n)).toBeLessThan(EVENT_TIME_TOL);
    expect(Math.abs(timeToApsis(MU_EARTH, s, 'apoapsis') - (Math.PI - M) / n)).toBeLessThan(EVENT_TIME_TOL);
  });

  it('a hyperbola past periapsis has no periapsis ahead and never an apoapsis', () => {
    const h = elementsToState(MU_EARTH, { a: -2e7, e: 1.4, i: 0, raan: 0, argp: 0, nu: 0.3 });
    expect(timeToApsis(MU_EARTH, h, 'periapsis')).toBe(Infinity);
    expect(timeToApsis(MU_EARTH, h, 'apoapsis')).toBe(Infinity);
  });

  it('respects tMax', () => {
    expect(timeToApsis(MU_EARTH, s0, 'apoapsis', T / 4)).toBe(Infinity);
  });
});

describe('radius crossings', () => {
  it('hyperbolic escape reaches r = R at the time of the hyperbolic Kepler equation (Curtis, eqs. 3.40–3.44, from memory)', () => {
    const rp = 7.0e6;
    const vinf = 3000;
    const a = -MU_EARTH / (vinf * vinf);
    const e = 1 - rp / a;
    const s = elementsToState(MU_EARTH, { a, e, i: 0.2, raan: 0.3, argp: 0.4, nu: 0 });
    const R = 9.25e8;
    // r = a(1 − e cosh F) → cosh F = (1 − R/a)/e; M = e sinh F − F; t = M/n, n = √(μ/(−a)³)
    const F = Math.acosh((1 - R / a) / e);
    const t = (e * Math.sinh(F) - F) / Math.sqrt(MU_EARTH / (-a) ** 3);
    expect(Math.abs(timeToRadius(MU_EARTH, s, R, 1) - t)).toBeLessThan(EVENT_TIME_TOL);
    // inbound crossing of the same radius lies in the past: none ahead
    expect(timeToRadius(MU_EARTH, s, R, -1)).toBe(Infinity);
  });

  it('an ellipse crosses a radius between its apsides twice per revolution, inbound after outbound', () => {
    const a = 2e7,
      e = 0.5;
    const s = elementsToState(MU_EARTH, { a, e, i: 0, raan: 0, argp: 0, nu: 0 });
    const T = 2 * Math.PI * Math.sqrt(a ** 3 / MU_EARTH);
    const R = a; // r = a at E = ±π/2: M = π/2 − e
    const tOut = ((Math.PI / 2 - e) / (2 * Math.PI)) * T;
    expect(Math.abs(timeToRadius(MU_EARTH, s, R, 1) - tOut)).toBeLessThan(EVENT_TIME_TOL);
    expect(Math.abs(timeToRadius(MU_EARTH, s, R, -1) - (T - tOut))).toBeLessThan(EVENT_TIME_TOL);
    expect(Math.abs(timeToRadius(MU_EARTH, s, R, 0) - tOut)).toBeLessThan(EVENT_TIME_TOL);
    expect(timeToRadius(MU_EARTH, s, 2 * a, 0)).toBe(Infinity); // beyond apoapsis (1.5a)
  });
});

describe('node crossings', () => {
  it('a circular inclined orbit at argument of latitude 30° meets the ascending node after 330/360 of a period (geometry)', () => {
    const r = 7e6;
    const s = elementsToState(MU_EARTH, { a: r, e: 0, i: 51 * DEG, raan: 40 * DEG, argp: 0, nu: 30 * DEG });
    const T = 2 * Math.PI * Math.sqrt(r ** 3 / MU_EARTH);
    expect(Math.abs(timeToNode(MU_EARTH, s, 'ascending') - (330 / 360) * T)).toBeLessThan(EVENT_TIME_TOL);
    expect(Math.abs(timeToNode(MU_EARTH, s, 'descending') - (150 / 360) * T)).toBeLessThan(EVENT_TIME_TOL);
    expect(Math.abs(timeToNode(MU_EARTH, s, 'any') - (150 / 360) * T)).toBeLessThan(EVENT_TIME_TOL);
    const after = propagateKepler(MU_EARTH, s, timeToNode(MU_EARTH, s, 'descending'));
    expect(Math.abs(after[2])).toBeLessThan(1e-3);
    expect(after[5]).toBeLessThan(0);
  });

  it('an orbit in the reference plane has no nodes', () => {
    const s = elementsToState(MU_EARTH, { a: 7e6, e: 0.1, i: 0, raan: 0, argp: 0, nu: 0 });
    expect(timeToNode(MU_EARTH, s, 'any')).toBe(Infinity);
  });
});

describe('conic info', () => {
  it('reproduces the elements it was built from', () => {
    const s = elementsToState(MU_EARTH, { a: 3e7, e: 0.3, i: 0.7, raan: 0, argp: 0, nu: 2 });
    const c = conicInfo(MU_EARTH, s);
    expect(c.e).toBeCloseTo(0.3, 12);
    // a few roundings of 2e7–4e7 m radii, 4e-9–9e-9 m each (measured 1.1e-8 and 1.5e-8 m)
    expect(Math.abs(c.rp - 2.1e7)).toBeLessThan(1e-7);
    expect(Math.abs(c.ra - 3.9e7)).toBeLessThan(1e-7);
    expect(c.i).toBeCloseTo(0.7, 12);
    expect(c.nu).toBeCloseTo(2, 10);
  });
});

describe('SOI entry search', () => {
  // A ship on heliocentric conics that pass the planet at 0.2 … 1.3 SOI radii: the search must
  // agree with brute-force sampling of the distance (every 20 s) refined by bisection.
  const system = testSystem();
  const loam = system.indexById['loam'];
  const R = system.bodies[loam].derived.soiRadius;

  function shipState(miss: number, tCa: number): Float64Array {
    // at tCa the ship is `miss` from the planet (out of the plane by a third), moving 4 km/s
    // radially outward relative to it; heliocentric state back-propagated to t = 0 on its conic
    const p = new Float64Array(6);
    bodyStateRelativeToParent(system, loam, tCa, p);
    const rn = Math.hypot(p[0], p[1], p[2]);
    const rhat = [p[0] / rn, p[1] / rn, p[2] / rn];
    const side = [-rhat[1], rhat[0], 0];
    const k = miss / Math.hypot(1, 1 / 3);
    const rel = [side[0] * k, side[1] * k, k / 3];
    const vr = 4000;
    const s = [p[0] + rel[0], p[1] + rel[1], p[2] + rel[2], p[3] + rhat[0] * vr, p[4] + rhat[1] * vr, p[5] + rhat[2] * vr];
    return propagateKepler(MU_SUN, s, -tCa) as Float64Array;
  }

  function bruteForce(s0: Float64Array, tEnd: number): number {
    const sh = new Float64Array(6);
    const pl = new Float64Array(6);
    const g = (t: number): number => {
      propagateKepler(MU_SUN, s0, t, sh);
      bodyStateRelativeToParent(system, loam, t, pl);
      return Math.hypot(sh[0] - pl[0], sh[1] - pl[1], sh[2] - pl[2]) - R;
    };
    let prev = g(0);
    for (let t = 20; t <= tEnd; t += 20) {
      const cur = g(t);
      if (prev > 0 && cur <= 0) {
        let lo = t - 20,
          hi = t;
        for (let k = 0; k < 60; k++) {
          const m = 0.5 * (lo + hi);
          if (g(m) > 0) lo = m;
          else hi = m;
        }
        return hi;
      }
      prev = cur;
    }
    return Infinity;
  }

  const misses = [0.2, 0.6, 0.9, 0.97, 0.995, 0.9999, 1.0001, 1.01, 1.05, 1.3];
  const outcomes: boolean[] = [];
  for (const m of misses) {
    it(`miss distance ${m} × R_soi: same entry as brute-force sampling`, () => {
      const tCa = 5e5;
      const s0 = shipState(m * R, tCa);
      const tEnd = 1.2e6;
      const res = findSoiEntry({ system, central: 0, mu: MU_SUN, state0: s0, t0: 0, tEnd, justLeft: -1, track: loam });
      const ref = bruteForce(s0, tEnd);
      if (ref === Infinity) {
        expect(res.body).toBe(-1);
      } else {
        expect(res.body).toBe(loam);
        // the brute force bisects to rounding; the search polishes to EVENT_TIME_TOL (measured 1.5e-8 s)
        expect(Math.abs(res.t - ref)).toBeLessThan(EVENT_TIME_TOL);
      }
      expect(res.evaluations).toBeLessThan(2000);
      outcomes.push(ref !== Infinity);
    });
  }

  it('the cases above include both entries and misses', () => {
    expect(outcomes.length).toBe(misses.length);
    expect(outcomes.some((x) => x)).toBe(true);
    expect(outcomes.some((x) => !x)).toBe(true);
  });

  it('follows the closest approach of a flyby outside the SOI (against fine sampling)', () => {
    const s0 = shipState(1.3 * R, 5e5);
    const res = findSoiEntry({ system, central: 0, mu: MU_SUN, state0: s0, t0: 0, tEnd: 1.2e6, justLeft: -1, track: loam });
    const sh = new Float64Array(6);
    const pl = new Float64Array(6);
    let best = Infinity;
    for (let t = 0; t <= 1.2e6; t += 5) {
      propagateKepler(MU_SUN, s0, t, sh);
      bodyStateRelativeToParent(system, loam, t, pl);
      best = Math.min(best, Math.hypot(sh[0] - pl[0], sh[1] - pl[1], sh[2] - pl[2]));
    }
    expect(res.caDistance).toBeLessThanOrEqual(best + 1e-3);
    expect(res.caDistance).toBeGreaterThan(best - 1e3);
  });
});
