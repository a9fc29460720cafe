import { describe, expect, it } from 'vitest';
import { AERO_LANDING_ALLOWANCE, LOW_ORBIT_MARGIN, apoapsisBurn, ascentFigures, lowOrbitAltitude } from '../../../core/survey/ascent.ts';
import { buildStarSystem } from '../../../core/system/build.ts';
import type { BodyDocument } from '../../../core/system/document.ts';
import type { Body } from '../../../core/system/model.ts';
import { planet, smallDocument } from '../system/fixtures.ts';

/** One planet about a Sun-like star, built through the system file's path. */
function bodyOf(extra: Partial<BodyDocument>): Body {
  const doc = smallDocument([planet('p', { a_m: 1.496e11 }, extra)], 1.327e20);
  return buildStarSystem(doc).bodies[1];
}

// Earth-like: μ 3.986e14 m³/s², R 6371 km, air 100 km, sidereal day 86164 s (from memory).
const earthLike = () => bodyOf({ mu_m3_s2: 3.986e14, radius_m: 6.371e6, min_safe_altitude_m: 1e5, atmosphere_height_m: 1e5, rotation_period_s: 86164 });
// Moon-like: μ 4.905e12 m³/s², R 1737 km, airless, slow rotation left out (from memory).
const moonLike = () => bodyOf({ mu_m3_s2: 4.905e12, radius_m: 1.737e6, min_safe_altitude_m: 5000 });

describe('lowOrbitAltitude', () => {
  it('is the minimum safe altitude plus the stated margin', () => {
    expect(LOW_ORBIT_MARGIN).toBe(10e3);
    expect(lowOrbitAltitude(earthLike())).toBe(110e3);
    expect(lowOrbitAltitude(moonLike())).toBe(15e3);
  });
});

describe('ascentFigures: the ideal climb', () => {
  it('equals the two-burn vis-viva climb from rest at R to the circular orbit at r, computed here (analytic)', () => {
    const b = earthLike();
    const mu = 3.986e14;
    const R = 6.371e6;
    const r = R + 110e3;
    // Surface → low orbit on the ellipse R × r: v_R = √(μ(2/R − 2/(R + r))), then circularise at r.
    const vR = Math.sqrt((2 * mu * r) / (R * (R + r)));
    const vApo = Math.sqrt((2 * mu * R) / (r * (R + r)));
    const f = ascentFigures(b);
    // Same formula rearranged: agreement to rounding (a few ulps of ~8 km/s).
    expect(f.ideal).toBeCloseTo(vR + Math.sqrt(mu / r) - vApo, 8);
    expect(f.rotation).toBeCloseTo((2 * Math.PI * R) / 86164, 9);
    expect(f.total).toBeCloseTo(f.ideal - f.rotation + f.gravityLoss + f.dragLoss, 9);
  });

  it('has no rotation credit without a rotation period and takes |P| for a retrograde spin', () => {
    expect(moonLike().rotationPeriod).toBeNull();
    expect(ascentFigures(moonLike()).rotation).toBe(0);
    const retro = bodyOf({ mu_m3_s2: 3.986e14, radius_m: 6.371e6, min_safe_altitude_m: 1e5, rotation_period_s: -86164 });
    expect(ascentFigures(retro).rotation).toBeCloseTo((2 * Math.PI * 6.371e6) / 86164, 9);
  });
});

describe('ascentFigures: the rule of thumb is sane (common practice)', () => {
  it('gives 9.0–9.8 km/s to a 110 km orbit of an Earth-like body', () => {
    // Common practice, from memory: "about 9.3–10 km/s to low Earth orbit" (losses 1.5–2 km/s).
    // The band is that figure's lower half widened a little: the rule is a rule of thumb.
    const f = ascentFigures(earthLike());
    expect(f.total).toBeGreaterThan(9000);
    expect(f.total).toBeLessThan(9800);
    expect(f.dragLoss).toBeGreaterThan(0);
  });

  it('gives 1.7–2.0 km/s from the surface of an airless Moon-like body', () => {
    // Common practice, from memory: a lunar ascent to low orbit of about 1.85 km/s; ±8 % for a rule of thumb.
    const f = ascentFigures(moonLike());
    expect(f.total).toBeGreaterThan(1700);
    expect(f.total).toBeLessThan(2000);
    expect(f.dragLoss).toBe(0);
    expect(f.aeroLanding).toBeNull();
  });
});

describe('ascentFigures: aerobraked landing', () => {
  it('is the deorbit burn to a periapsis at half the air plus 2 % of the surface circular speed (vis-viva here)', () => {
    const f = ascentFigures(earthLike());
    const mu = 3.986e14;
    const R = 6.371e6;
    const r = R + 110e3;
    const rp = R + 50e3;
    const deorbit = Math.sqrt(mu / r) - Math.sqrt((2 * mu * rp) / (r * (r + rp)));
    expect(f.deorbit).toBeCloseTo(deorbit, 8);
    expect(f.aeroLanding).toBeCloseTo(deorbit + AERO_LANDING_ALLOWANCE * Math.sqrt(mu / R), 8);
    // Aerobraking is far cheaper than the powered landing: the point of it.
    expect(f.aeroLanding as number).toBeLessThan(0.1 * f.total);
  });

  it('apoapsisBurn is 0 when the periapsis would not go down', () => {
    expect(apoapsisBurn(3.986e14, 7e6, 7e6)).toBe(0);
    expect(apoapsisBurn(3.986e14, 7e6, 8e6)).toBe(0);
  });
});
