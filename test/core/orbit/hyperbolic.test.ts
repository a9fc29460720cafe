import { describe, expect, it } from 'vitest';
import { arrival, departure, flyby, hyperbolaPeriapsisSpeed, orbitPeriapsisSpeed } from '../../../core/orbit/hyperbolic.ts';
import { hohmann } from '../../../core/orbit/hohmann.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { InputError } from '../../../core/math/errors.ts';

const MU_EARTH_KM = 398600;
const MU_MARS_KM = 42830;
const MU_SUN_KM = 1.327e11;
const DEG = Math.PI / 180;

describe('departure', () => {
  it('matches Curtis, Orbital Mechanics for Engineering Students, Example 8.3 (from memory)', () => {
    // Earth to Mars by Hohmann (r = 149.6e6 km to 227.9e6 km, μ_sun = 1.327e11 km³/s²) gives
    // v∞ = 2.943 km/s; from a 300 km circular parking orbit (R = 6378 km): Δv = 3.590 km/s,
    // asymptote 29.16° from the apse line.
    const vInf = hohmann(MU_SUN_KM, 149.6e6, 227.9e6).dv1;
    expect(vInf).toBeCloseTo(2.943, 3);
    const d = departure({ mu: MU_EARTH_KM, rPark: 6378 + 300, vInf: [vInf, 0, 0] });
    expect(d.dv).toBeCloseTo(3.59, 3);
    expect(d.beta / DEG).toBeCloseTo(29.16, 1);
  });

  it('satisfies C3 = v∞² and vis-viva on the hyperbola (analytic)', () => {
    const mu = 3.986004418e14;
    const rp = 6.678e6;
    const v = [1200, -2500, 1800];
    const d = departure({ mu, rPark: rp, vInf: v });
    const v2 = v[0] ** 2 + v[1] ** 2 + v[2] ** 2;
    expect(d.c3).toBeCloseTo(v2, 6);
    expect(d.vInfMag).toBeCloseTo(Math.sqrt(v2), 9);
    // a = −μ/v∞², v_p² = μ(2/r_p − 1/a)
    const a = -mu / v2;
    expect(d.vPeriapsis).toBeCloseTo(Math.sqrt(mu * (2 / rp - 1 / a)), 6);
    expect(d.vPark).toBeCloseTo(Math.sqrt(mu / rp), 9);
    expect(d.dv).toBeCloseTo(d.vPeriapsis - d.vPark, 9);
    expect(d.eHyperbola).toBeCloseTo(1 + (rp * v2) / mu, 12);
  });

  it('with v∞ = 0 costs escape speed minus circular speed (analytic)', () => {
    const d = departure({ mu: MU_EARTH_KM, rPark: 7000, vInf: [0, 0, 0] });
    const vc = Math.sqrt(MU_EARTH_KM / 7000);
    expect(d.dv).toBeCloseTo((Math.SQRT2 - 1) * vc, 12);
    expect(d.declination).toBe(0);
    expect(d.rightAscension).toBe(0);
  });

  it('from an elliptic parking orbit burns at periapsis, where vis-viva gives the parking speed (analytic)', () => {
    const rp = 6678;
    const e = 0.6;
    const d = departure({ mu: MU_EARTH_KM, rPark: rp, ePark: e, vInf: [3, 0, 0] });
    const a = rp / (1 - e);
    expect(d.vPark).toBeCloseTo(Math.sqrt(MU_EARTH_KM * (2 / rp - 1 / a)), 12);
    expect(d.dv).toBeLessThan(departure({ mu: MU_EARTH_KM, rPark: rp, vInf: [3, 0, 0] }).dv);
  });

  it('gives the declination and right ascension of the outgoing asymptote (analytic)', () => {
    const a = departure({ mu: 1, rPark: 1, vInf: [0, 2, 2] });
    expect(a.declination / DEG).toBeCloseTo(45, 12);
    expect(a.rightAscension / DEG).toBeCloseTo(90, 12);
    const b = departure({ mu: 1, rPark: 1, vInf: [-1, -1, -Math.SQRT2 * Math.tan(30 * DEG)] });
    expect(b.declination / DEG).toBeCloseTo(-30, 12);
    expect(b.rightAscension / DEG).toBeCloseTo(225, 12);
    expect(departure({ mu: 1, rPark: 1, vInf: [1, -1e-300, 0] }).rightAscension).toBeLessThan(2 * Math.PI);
  });

  it('rejects bad input with InputError naming the field', () => {
    const field = (f: () => unknown): string => {
      try {
        f();
      } catch (e) {
        expect(e).toBeInstanceOf(InputError);
        return (e as InputError).field;
      }
      throw new Error('did not throw');
    };
    expect(field(() => departure({ mu: 1, rPark: 0, vInf: [1, 0, 0] }))).toBe('rPark');
    expect(field(() => departure({ mu: 1, rPark: -1, vInf: [1, 0, 0] }))).toBe('rPark');
    expect(field(() => departure({ mu: 1, rPark: NaN, vInf: [1, 0, 0] }))).toBe('rPark');
    expect(field(() => departure({ mu: 0, rPark: 1, vInf: [1, 0, 0] }))).toBe('mu');
    expect(field(() => departure({ mu: 1, rPark: 1, vInf: [1, NaN, 0] }))).toBe('vInf[1]');
    expect(field(() => departure({ mu: 1, rPark: 1, ePark: 1, vInf: [1, 0, 0] }))).toBe('ePark');
    expect(field(() => departure({ mu: 1, rPark: 1, ePark: -0.1, vInf: [1, 0, 0] }))).toBe('ePark');
    expect(field(() => arrival({ mu: 1, vInf: -1, rPeriapsis: 1, eTarget: 0 }))).toBe('vInf');
    expect(field(() => arrival({ mu: 1, vInf: 1, rPeriapsis: 0, eTarget: 0 }))).toBe('rPeriapsis');
    expect(field(() => arrival({ mu: 1, vInf: 1, rPeriapsis: 1, eTarget: 1.2 }))).toBe('eTarget');
    expect(field(() => arrival({ mu: 1, vInf: 1, rPeriapsis: 1, eTarget: 'orbit' as unknown as number }))).toBe('eTarget');
    expect(field(() => flyby(1, NaN, 1))).toBe('vInfMag');
    expect(field(() => flyby(1, 1, -1))).toBe('rPeriapsis');
  });
});

describe('arrival', () => {
  it('capture into a circular orbit costs the hyperbolic periapsis speed minus circular speed (analytic)', () => {
    const vInf = hohmann(MU_SUN_KM, 149.6e6, 227.9e6).dv2;
    // Hohmann arrival at Mars: v∞ ≈ 2.648 km/s (Curtis, section 8.6; from memory).
    expect(vInf).toBeCloseTo(2.648, 3);
    const rp = 3396 + 300;
    const a = arrival({ mu: MU_MARS_KM, vInf, rPeriapsis: rp, eTarget: 0 });
    expect(a.vPeriapsisHyperbola).toBeCloseTo(Math.sqrt(vInf ** 2 + (2 * MU_MARS_KM) / rp), 12);
    expect(a.vPeriapsisTarget).toBeCloseTo(Math.sqrt(MU_MARS_KM / rp), 12);
    expect(a.dv).toBeCloseTo(a.vPeriapsisHyperbola - a.vPeriapsisTarget, 12);
    // The vector form gives the same as the magnitude.
    expect(arrival({ mu: MU_MARS_KM, vInf: [0, -vInf, 0], rPeriapsis: rp, eTarget: 0 }).dv).toBeCloseTo(a.dv, 12);
  });

  it('an elliptic capture of given eccentricity is cheapest at r_p = 2μ(1 − e)/(v∞²(1 + e)), costing v∞√((1 − e)/2) (Curtis, section 8.9; from memory)', () => {
    const vInf = 2.648;
    for (const e of [0, 0.2, 0.5, 0.9]) {
      const dvAt = (rp: number): number => arrival({ mu: MU_MARS_KM, vInf, rPeriapsis: rp, eTarget: e }).dv;
      // Independent: scan r_p (log-spaced) for the minimum.
      let best = Infinity;
      let bestRp = 0;
      for (let k = 0; k <= 20000; k++) {
        const rp = 500 * 1000 ** (k / 20000);
        const dv = dvAt(rp);
        if (dv < best) {
          best = dv;
          bestRp = rp;
        }
      }
      const rpOpt = ((2 * MU_MARS_KM) / vInf ** 2) * ((1 - e) / (1 + e));
      expect(bestRp / rpOpt).toBeCloseTo(1, 3);
      expect(best).toBeCloseTo(vInf * Math.sqrt((1 - e) / 2), 8);
      expect(dvAt(rpOpt)).toBeCloseTo(vInf * Math.sqrt((1 - e) / 2), 12);
    }
  });

  it("a flyby burns nothing and turns v∞ by 2 asin(1/e), matching the Kepler propagator's asymptotes", () => {
    const mu = 3.2486e5; // km³/s², a Venus-like body
    const vInf = 5.2;
    const rp = 7000;
    const a = arrival({ mu, vInf, rPeriapsis: rp, eTarget: 'flyby' });
    expect(a.dv).toBe(0);
    expect(a.turnAngle).toBeCloseTo(flyby(mu, vInf, rp), 15);
    // Independent: fly from periapsis far out both ways and measure the angle between the velocities.
    const vp = Math.sqrt(vInf ** 2 + (2 * mu) / rp);
    const t = 5e7;
    const out = propagateKepler(mu, [rp, 0, 0, 0, vp, 0], t);
    const back = propagateKepler(mu, [rp, 0, 0, 0, vp, 0], -t);
    const cosTurn = (out[3] * back[3] + out[4] * back[4]) / (Math.hypot(out[3], out[4]) * Math.hypot(back[3], back[4]));
    expect(Math.acos(cosTurn)).toBeCloseTo(flyby(mu, vInf, rp), 3);
    // A slow flyby turns by nearly π, a fast one barely at all.
    expect(flyby(mu, 1e-6, rp)).toBeCloseTo(Math.PI, 6);
    expect(flyby(mu, 1e4, rp)).toBeLessThan(1e-3);
  });
});

describe('periapsis speeds (the scalar kernels the porkchop loop calls)', () => {
  it('equal vis-viva v² = μ(2/r_p − 1/a) with a = −μ/v∞² (hyperbola) and a = r_p/(1 − e) (closed orbit) (analytic)', () => {
    const mu = 3.986004418e14;
    for (const rp of [6.578e6, 4.2e7]) {
      for (const vInf of [0, 850, 3600, 1.2e4]) {
        const inv = vInf === 0 ? 0 : -(vInf * vInf) / mu; // 1/a
        // the same sum written two ways: rounding only, a few ulp
        expect(Math.abs(hyperbolaPeriapsisSpeed(mu, vInf * vInf, rp) / Math.sqrt(mu * (2 / rp - inv)) - 1)).toBeLessThan(1e-15);
      }
      for (const e of [0, 0.3, 0.9]) {
        const a = rp / (1 - e);
        // (1 + e) against 2 − (1 − e): rounding of the two forms, a few ulp
        expect(Math.abs(orbitPeriapsisSpeed(mu, rp, e) / Math.sqrt(mu * (2 / rp - 1 / a)) - 1)).toBeLessThan(1e-15);
      }
    }
  });
});
