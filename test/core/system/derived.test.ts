import { describe, expect, it } from 'vitest';
import { hillRadiusOf, laplaceSoiRadius, meanMotionOf, meanSolarDay, orbitalPeriod } from '../../../core/system/derived.ts';
import { planet, smallSystem } from './fixtures.ts';

// Reference constants (textbook values, from memory): Curtis, Orbital Mechanics for Engineering
// Students, Table A.1 / A.2.
const MU_SUN = 1.32712440018e20; // m³/s²
const MU_EARTH = 3.986004418e14;
const AU = 1.495978707e11; // m (IAU 2012 definition)
const M_SUN = 1.989e30; // kg
const DAY = 86400;

describe('orbital period', () => {
  it("gives Earth's sidereal year, 365.256 d, from Kepler's third law with μ_sun + μ_earth+moon (common practice; values from memory)", () => {
    const muEarthMoon = MU_EARTH * (1 + 1 / 81.3);
    expect(orbitalPeriod(MU_SUN + muEarthMoon, AU) / DAY).toBeCloseTo(365.256, 3); // to the quoted 0.001 d (measured 3.4e-4 d off)
  });

  it('matches T² = 4π² a³ / (G (M + m)) worked in kilograms for a demo-like body', () => {
    const G = 6.6743e-11;
    const M = 1.5e30;
    const m = 4.5e24;
    const a = 1.1e11;
    const T = Math.sqrt((4 * Math.PI ** 2 * a ** 3) / (G * (M + m)));
    const sys = smallSystem([planet('p', { a_m: a }, { mu_m3_s2: undefined, mass_kg: m })], G * M);
    expect(sys.bodies[1].derived.period / T - 1).toBeLessThan(1e-14);
    expect(Math.abs(sys.bodies[1].derived.meanMotion * T - 2 * Math.PI)).toBeLessThan(1e-12);
    expect(meanMotionOf(1, 1)).toBe(1);
  });
});

describe('sphere of influence and Hill radius', () => {
  // Curtis, Orbital Mechanics for Engineering Students, 3rd ed., Table 8.1 (from memory):
  // SOI radii Earth 925,000 km, Mars 577,000 km, Jupiter 48.2 million km, Moon (wrt Earth) 66,200 km.
  const cases: [string, number, number, number, number][] = [
    ['Earth', 149.6e9, 5.974e24, M_SUN, 925e6],
    ['Mars', 227.9e9, 641.9e21, M_SUN, 577e6],
    ['Jupiter', 778.6e9, 1.899e27, M_SUN, 48.2e9],
    ['Moon', 384.4e6, 73.48e21, 5.974e24, 66.2e6],
  ];
  for (const [name, a, m, M, soi] of cases) {
    it(`gives ${name}'s SOI within 1% of Curtis Table 8.1 (from memory)`, () => {
      // the table's three significant digits: half a unit of the last is up to 1e-3 (measured 5.1e-4)
      expect(Math.abs(laplaceSoiRadius(a, m, M) / soi - 1)).toBeLessThan(1e-3);
    });
  }

  it("gives Earth's Hill radius ≈ 1.5 million km (common practice, from memory)", () => {
    const r = hillRadiusOf(149.6e9, 0.0167, 5.974e24, M_SUN);
    expect(r / 1.5e9).toBeGreaterThan(0.97);
    expect(r / 1.5e9).toBeLessThan(1.01);
  });
});

describe('periapsis and apoapsis', () => {
  it('gives periapsis a(1 − e) and apoapsis a(1 + e)', () => {
    const sys = smallSystem([planet('p', { a_m: 2e11, e: 0.25 })]);
    expect(sys.bodies[1].derived.periapsis).toBe(1.5e11);
    expect(sys.bodies[1].derived.apoapsis).toBe(2.5e11);
  });
});

describe('mean solar day', () => {
  it("gives Earth's 86,400 s solar day from its 86,164.09 s sidereal day and 365.256 d year (common practice, from memory)", () => {
    expect(meanSolarDay(86164.0905, 365.25636 * DAY)).toBeCloseTo(86400, 1); // 86,400.009 s from these inputs
  });

  it('is shorter than the sidereal day for retrograde rotation', () => {
    expect(meanSolarDay(-1e5, 1e7)).toBeLessThan(1e5);
    expect(meanSolarDay(-1e5, 1e7)).toBeCloseTo(1 / (1e-5 + 1e-7), 6);
  });
});
