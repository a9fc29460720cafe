import { describe, expect, it } from 'vitest';
import { discFraction, PENUMBRA, SUNLIGHT, UMBRA, shadowKind, sunlitFraction, umbraLength } from '../../../core/sky/shadow.ts';

// An invented star of radius 5e8 m and a planet of radius 6e6 m, 1e11 m from it along +x.
const RS = 5e8;
const R = 6e6;
const D = 1e11;
const frac = (x: number, y: number, model: 'conical' | 'cylindrical' = 'conical') => sunlitFraction(x, y, 0, D, 0, 0, RS, R, model);

describe('shadow of one body', () => {
  it('umbra cone: length R·d/(R★ − R) and half-angle asin((R★ − R)/d) (similar triangles of the tangent lines)', () => {
    const L = (R * D) / (RS - R);
    expect(umbraLength(RS, R, D)).toBeCloseTo(L, 3);
    // on the axis just inside and just beyond the cone's tip: 1e-6 of L is 1.2 km, far beyond rounding of 1e11 m positions (~1e-5 m)
    expect(frac(D + L * (1 - 1e-6), 0)).toBe(0);
    const beyond = frac(D + L * (1 + 1e-6), 0);
    expect(shadowKind(beyond)).toBe(PENUMBRA);
    // the tip: the body's disc just fits the star's (b = a), so just past it almost all the disc is covered
    expect(beyond).toBeLessThan(1e-5);
    // off the axis at x behind the body the umbra's radius is (L − x)·tan α
    const alpha = Math.asin((RS - R) / D);
    for (const x of [1e7, 3e8, 1e9]) {
      const rho = (L - x) * Math.tan(alpha);
      // ±1e-4 of the radius: ≥ 24 m, a separation of ≥ 2e-8 rad against rounding near 1e-16 rad
      expect(frac(D + x, rho * (1 - 1e-4))).toBe(0);
      expect(shadowKind(frac(D + x, rho * (1 + 1e-4)))).toBe(PENUMBRA);
    }
  });

  it('penumbra cone: apex R·d/(R★ + R) in front of the body, half-angle asin((R★ + R)/d)', () => {
    const Lp = (R * D) / (RS + R);
    const beta = Math.asin((RS + R) / D);
    for (const x of [1e7, 3e8, 3e9]) {
      const rho = (Lp + x) * Math.tan(beta);
      expect(frac(D + x, rho * (1 - 1e-4))).toBeLessThan(1);
      expect(frac(D + x, rho * (1 + 1e-4))).toBe(1);
    }
  });

  it('antumbra: beyond the tip the body inside the star disc leaves 1 − b²/a² of it (areas of the two discs)', () => {
    const L = (R * D) / (RS - R);
    const x = 2 * L;
    const a = Math.asin(RS / (D + x));
    const b = Math.asin(R / x);
    // the same formula evaluated here and in the code, from the geometry rebuilt by hand: rounding only
    expect(frac(D + x, 0)).toBeCloseTo(1 - (b * b) / (a * a), 12);
  });

  it('the overlap of two discs: half covered when a = b and the limbs cross at the centre line; the area formula against the ends', () => {
    // equal discs whose centres are apart by c: the lens area 2a²acos(c/2a) − (c/2)√(4a² − c²) (circle–circle intersection, common geometry)
    const a = 1e-3;
    for (const c of [1e-4, 5e-4, 1e-3, 1.9e-3]) {
      const lens = 2 * a * a * Math.acos(c / (2 * a)) - (c / 2) * Math.sqrt(4 * a * a - c * c);
      expect(discFraction(a, a, c)).toBeCloseTo(1 - lens / (Math.PI * a * a), 12);
    }
    // continuity at the branch points
    expect(discFraction(a, 0.5 * a, 1.5 * a * (1 - 1e-9))).toBeGreaterThan(1 - 1e-6);
    expect(discFraction(a, 0.5 * a, 0.5 * a * (1 + 1e-9))).toBeCloseTo(0.75, 6);
    expect(discFraction(a, 2 * a, a * (1 + 1e-9))).toBeLessThan(1e-6);
  });

  it('cylindrical: the cylinder of the body radius behind it, whatever the distance', () => {
    expect(frac(D + 1e12, R * 0.999, 'cylindrical')).toBe(0);
    expect(frac(D + 1e12, R * 1.001, 'cylindrical')).toBe(1);
    expect(frac(D - 1e7, 0, 'cylindrical')).toBe(1);
    expect(shadowKind(0)).toBe(UMBRA);
    expect(shadowKind(1)).toBe(SUNLIGHT);
  });

  it('a ship inside the body is in umbra; a ship on the sunward side is lit', () => {
    expect(frac(D + 1e6, 0)).toBe(0);
    expect(frac(D - 1e7, 0)).toBe(1);
  });
});
