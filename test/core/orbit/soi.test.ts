import { describe, expect, it } from 'vitest';
import { hillRadius, sphereOfInfluence } from '../../../core/orbit/soi.ts';
import { InputError } from '../../../core/math/errors.ts';

describe('sphereOfInfluence', () => {
  // Curtis, Orbital Mechanics for Engineering Students, Table A.1 (masses, semi-major axes) and
  // Table A.2 (sphere-of-influence radii, three significant figures) — from memory.
  const SUN = 1.989e30; // kg
  const table: Array<[string, number, number, number]> = [
    // name, mass (kg), semi-major axis (km), SOI radius (km)
    ['Mercury', 330.2e21, 57.91e6, 112e3],
    ['Venus', 4.869e24, 108.2e6, 616e3],
    ['Earth', 5.974e24, 149.6e6, 925e3],
    ['Mars', 641.9e21, 227.9e6, 577e3],
    ['Jupiter', 1.899e27, 778.6e6, 48.2e6],
    ['Saturn', 568.5e24, 1.433e9, 54.8e6],
    ['Uranus', 86.83e24, 2.872e9, 51.8e6],
    ['Neptune', 102.4e24, 4.495e9, 86.6e6],
    ['Pluto', 12.5e21, 5.87e9, 3.08e6],
  ];
  for (const [name, m, a, ref] of table) {
    it(`matches Curtis, Table A.2, ${name}: ${ref} km to the table's three figures (from memory)`, () => {
      const r = sphereOfInfluence(a, m, SUN);
      expect(Number(r.toPrecision(3))).toBe(ref);
    });
  }
  it('takes gravitational parameters as well as masses (only the ratio enters)', () => {
    const G = 6.6743e-20;
    expect(sphereOfInfluence(149.6e6, 5.974e24 * G, SUN * G)).toBeCloseTo(sphereOfInfluence(149.6e6, 5.974e24, SUN), 6);
  });
  it('rejects bad input', () => {
    expect(() => sphereOfInfluence(0, 1, 2)).toThrow(InputError);
    expect(() => sphereOfInfluence(1, 3, 2)).toThrow(InputError);
    expect(() => sphereOfInfluence(1, NaN, 2)).toThrow(InputError);
    expect(() => sphereOfInfluence(1, 1, -2)).toThrow(InputError);
  });
});

describe('hillRadius', () => {
  it("gives Earth's Hill sphere of about 1.5 million km (common practice)", () => {
    const r = hillRadius(149.6e6, 0, 5.974e24, 1.989e30);
    expect(r / 1.5e6).toBeCloseTo(1, 2);
  });
  it('scales with periapsis distance a(1 − e) and with (m/3M)^(1/3) (analytic)', () => {
    expect(hillRadius(10, 0.25, 3e-6, 1)).toBeCloseTo(0.75 * hillRadius(10, 0, 3e-6, 1), 14);
    // m/3M = 1e-6 → cube root 1e-2.
    expect(hillRadius(1, 0, 3e-6, 1)).toBeCloseTo(0.01, 15);
  });
  it('rejects bad eccentricity and masses', () => {
    expect(() => hillRadius(1, 1, 1, 2)).toThrow(InputError);
    expect(() => hillRadius(1, -0.1, 1, 2)).toThrow(InputError);
    expect(() => hillRadius(1, 0.1, 2, 2)).toThrow(InputError);
  });
});
