import { describe, expect, it } from 'vitest';
import { hohmannPhaseAngle, nextHohmannDeparture, synodicPeriod } from '../../../core/orbit/synodic.ts';
import { hohmann } from '../../../core/orbit/hohmann.ts';
import { solveLambert } from '../../../core/orbit/lambert.ts';
import { InputError } from '../../../core/math/errors.ts';

const MU_SUN_KM = 1.327e11; // km³/s², Curtis's value
const R_EARTH_ORBIT = 149.6e6; // km
const R_MARS_ORBIT = 227.9e6; // km
const R_VENUS_ORBIT = 108.2e6; // km
const DEG = Math.PI / 180;

describe('synodicPeriod', () => {
  it('gives the Earth–Mars synodic period of about 780 days (2.135 years; common practice)', () => {
    expect(synodicPeriod(365.26, 687.0)).toBeCloseTo(779.9, 1);
    expect(synodicPeriod(687.0, 365.26)).toBe(synodicPeriod(365.26, 687.0));
  });
  it('rejects equal and non-positive periods', () => {
    expect(() => synodicPeriod(10, 10)).toThrow(InputError);
    expect(() => synodicPeriod(0, 10)).toThrow(InputError);
    expect(() => synodicPeriod(10, NaN)).toThrow(InputError);
  });
});

describe('hohmannPhaseAngle', () => {
  it('Mars leads Earth by about 44° at a Hohmann departure, transfer 259 days (Curtis, Orbital Mechanics for Engineering Students, section 8.3; from memory)', () => {
    expect(hohmannPhaseAngle(MU_SUN_KM, R_EARTH_ORBIT, R_MARS_ORBIT) / DEG).toBeCloseTo(44.3, 1);
    expect(hohmann(MU_SUN_KM, R_EARTH_ORBIT, R_MARS_ORBIT).tof / 86400).toBeCloseTo(258.8, 1);
  });
  it('Venus trails Earth by about 54° at a Hohmann departure (common practice)', () => {
    expect(hohmannPhaseAngle(MU_SUN_KM, R_EARTH_ORBIT, R_VENUS_ORBIT) / DEG).toBeCloseTo(-54.05, 2); // to the quoted 0.01° (measured 0.0013° off)
  });
  it('stays in (−π, π] over a wide range of radius ratios', () => {
    for (let k = -30; k <= 30; k++) {
      const phi = hohmannPhaseAngle(1, 1, Math.exp(k / 6));
      expect(phi).toBeGreaterThan(-Math.PI);
      expect(phi).toBeLessThanOrEqual(Math.PI);
    }
    expect(hohmannPhaseAngle(1, 1, 1)).toBeCloseTo(0, 14);
  });
});

describe('nextHohmannDeparture', () => {
  it('finds the departure at which a 180° Lambert arc in the Hohmann time meets the target (Lambert cross-check)', () => {
    const mu = MU_SUN_KM;
    const r1 = R_EARTH_ORBIT;
    const n1 = Math.sqrt(mu / r1 ** 3);
    for (const [r2, phaseNow] of [
      [R_MARS_ORBIT, 2.0],
      [R_MARS_ORBIT, -2.5],
      [R_VENUS_ORBIT, 0.3],
    ]) {
      const n2 = Math.sqrt(mu / r2 ** 3);
      const tNow = 1e7;
      const t = nextHohmannDeparture(mu, r1, r2, phaseNow, tNow);
      expect(t).toBeGreaterThanOrEqual(tNow);
      expect(t - tNow).toBeLessThan(synodicPeriod((2 * Math.PI) / n1, (2 * Math.PI) / n2));
      // Positions: departure body at angle 0 at tNow, target at phaseNow.
      const th1 = n1 * (t - tNow);
      const h = hohmann(mu, r1, r2);
      const th2 = phaseNow + n2 * (t + h.tof - tNow);
      const p1 = [r1 * Math.cos(th1), r1 * Math.sin(th1), 0];
      const p2 = [r2 * Math.cos(th2), r2 * Math.sin(th2), 0];
      // The arrival point is opposite the departure point: the angle itself (a cosine within 5e-11
      // of −1 would allow 1e-5 rad, 2,000 km at Mars). Angles of up to 17 rad carry a rounding of
      // ~2e-15 rad each (measured ≤ 1.3e-15 rad).
      const ang = Math.atan2(p1[0] * p2[1] - p1[1] * p2[0], p1[0] * p2[0] + p1[1] * p2[1]);
      expect(Math.abs(Math.PI - Math.abs(ang))).toBeLessThan(1e-13);
      const [sol] = solveLambert(mu, p1, p2, h.tof, { normalHint: [0, 0, 1] });
      const vc = [-Math.sin(th1) * r1 * n1, Math.cos(th1) * r1 * n1, 0];
      const dv = Math.hypot(sol.v1[0] - vc[0], sol.v1[1] - vc[1], sol.v1[2] - vc[2]);
      // a few roundings of the ~30 km/s orbital speeds, 7e-15 km/s each (measured 1.8e-14 km/s)
      expect(Math.abs(dv - Math.abs(h.dv1))).toBeLessThan(1e-13);
    }
  });
  it('rejects equal radii and bad input', () => {
    expect(() => nextHohmannDeparture(1, 2, 2, 0)).toThrow(InputError);
    expect(() => nextHohmannDeparture(1, 2, 3, NaN)).toThrow(InputError);
    expect(() => nextHohmannDeparture(0, 2, 3, 0)).toThrow(InputError);
  });
});
