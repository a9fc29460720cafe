import { describe, expect, it } from 'vitest';
import { shadowPasses } from '../../../core/sky/shadowPasses.ts';
import { buildStarSystem } from '../../../core/system/build.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import type { StarSystem } from '../../../core/system/model.ts';
import { planet, smallDocument } from '../system/fixtures.ts';

// An invented star (μ 1e20 m³/s²) and one planet (R = 6e6 m, μ = 3e14 m³/s²) on a circular orbit of 1e11 m in the xy-plane.
const R = 6e6;
function world(starRadius: number): StarSystem {
  const doc = smallDocument([planet('p', { a_m: 1e11 }, { radius_m: R })]);
  doc.star.radius_m = starRadius;
  return buildStarSystem(doc);
}

/**
 * A ship on a circular orbit of radius r about the planet in the planet's orbit plane (β = 0: the
 * plane holds the star direction), written by hand: r(cos nt, sin nt, 0) about the planet.
 */
function circularShip(system: StarSystem, r: number) {
  const n = Math.sqrt(system.bodies[1].mu / r ** 3);
  const p = new Float64Array(6);
  return {
    n,
    at: (t: number, out: Float64Array) => {
      bodyState(system, 1, t, p);
      const c = Math.cos(n * t);
      const s = Math.sin(n * t);
      out[0] = p[0] + r * c;
      out[1] = p[1] + r * s;
      out[2] = 0;
      out[3] = p[3] - r * n * s;
      out[4] = p[4] + r * n * c;
      out[5] = 0;
    },
  };
}

/*
 * Cylindrical shadow of a circular orbit with β = 0 (analytic geometry): the shadow is the strip
 * |y'| < R, x' > 0 in axes whose x' points away from the star. The ship at angle ψ from x' is at
 * (r cos ψ, r sin ψ): in the shadow while |ψ| < asin(R/r). ψ grows at n − n_p (the star line turns at
 * the planet's mean motion n_p), so one passage lasts 2·asin(R/r)/(n − n_p) = (P/π)·asin(R/r) with
 * P = 2π/(n − n_p) the period relative to the star line (the orbital period as the star recedes),
 * centred on the times ψ = 2πk, i.e. t = k·P (the planet starts on the +x axis, M0 = 0).
 */
describe('shadow passes of a circular orbit about a planet (β = 0)', () => {
  const r = 2 * R;
  const tol = 0.1;

  it('cylindrical: entry, exit and duration (P/π)·asin(R/r), to the bisection tolerance', () => {
    const system = world(5e8);
    const ship = circularShip(system, r);
    const nP = system.bodies[1].derived.meanMotion;
    const P = (2 * Math.PI) / (ship.n - nP);
    const dur = (P / Math.PI) * Math.asin(R / r);
    const res = shadowPasses(system, ship.at, 0.25 * P, 3.25 * P, { model: 'cylindrical', tolerance: tol });
    expect(res.passes.map((p) => p.kind)).toEqual(['umbra', 'umbra', 'umbra']);
    expect(res.eclipses).toBe(3);
    res.passes.forEach((p, k) => {
      // each end is the midpoint of a bracket narrower than tol: within tol/2 (plus rounding of t ~ 1e4 s)
      expect(Math.abs(p.t0 - ((k + 1) * P - dur / 2))).toBeLessThanOrEqual(tol / 2 + 1e-9);
      expect(Math.abs(p.t1 - ((k + 1) * P + dur / 2))).toBeLessThanOrEqual(tol / 2 + 1e-9);
      expect(p.bodyName).toBe('p');
    });
    expect(Math.abs(res.inShadow - 3 * dur)).toBeLessThanOrEqual(3 * tol + 1e-9);
  });

  it('conical: the umbra is shorter and umbra + penumbra longer than the cylindrical passage', () => {
    const system = world(5e8);
    const ship = circularShip(system, r);
    const P = (2 * Math.PI) / (ship.n - system.bodies[1].derived.meanMotion);
    const dur = (P / Math.PI) * Math.asin(R / r);
    const res = shadowPasses(system, ship.at, 0.25 * P, 3.25 * P, { tolerance: tol });
    expect(res.eclipses).toBe(3);
    expect(res.passes.map((p) => p.kind)).toEqual(Array(3).fill(['penumbra', 'umbra', 'penumbra']).flat());
    for (let k = 0; k < 3; k++) {
      const [pIn, u, pOut] = res.passes.slice(3 * k, 3 * k + 3);
      // penumbra in → umbra → penumbra out, joined end to end
      expect(u.t0).toBe(pIn.t1);
      expect(pOut.t0).toBe(u.t1);
      // each penumbral limb: the shadow's edge a distance x ≈ √(r² − R²) behind the limb is blurred over x·a (a = R★/d the star's
      // apparent radius); the ship crosses it at r·(n − n_p)·cos ψ with cos ψ = √(1 − (R/r)²), so it lasts a/(n − n_p) ≈ 12 s
      // (first order in a = 5e-3; 1 s covers the second-order terms and the bisection's 0.1 s)
      const limb = Math.asin(5e8 / 1e11) / (ship.n - system.bodies[1].derived.meanMotion);
      expect(Math.abs(dur - (u.t1 - u.t0) - 2 * limb)).toBeLessThan(1);
      expect(Math.abs(pOut.t1 - pIn.t0 - dur - 2 * limb)).toBeLessThan(1);
    }
  });

  it('conical with the star radius → 0 tends to the cylindrical passage (analytic limit)', () => {
    const system = world(1e3);
    const ship = circularShip(system, r);
    const P = (2 * Math.PI) / (ship.n - system.bodies[1].derived.meanMotion);
    const dur = (P / Math.PI) * Math.asin(R / r);
    const res = shadowPasses(system, ship.at, 0.25 * P, 1.25 * P, { tolerance: tol });
    const umbra = res.passes.filter((p) => p.kind === 'umbra');
    expect(umbra).toHaveLength(1);
    // a point star 1e11 m away casts a shadow wider than the body by R·r/d at r behind it: asin grows by ≤ (R·r/d)/√(r² − R²),
    // which over the angular rate is the cone's extra time; the star's 1 km radius adds ~1e-8 rad of penumbra (~0.03 s)
    const extra = (2 * ((R * r) / 1e11) * (1 / Math.sqrt(r * r - R * R))) / (ship.n - system.bodies[1].derived.meanMotion);
    expect(Math.abs(umbra[0].t1 - umbra[0].t0 - dur)).toBeLessThanOrEqual(extra + tol);
    expect(Math.abs(res.inShadow - dur)).toBeLessThanOrEqual(extra + tol + 0.1);
  });
});

describe('ships away from the shadows', () => {
  const system = world(5e8);
  const still = (x: number, y: number, z: number) => (_t: number, out: Float64Array) => {
    out[0] = x;
    out[1] = y;
    out[2] = z;
    out[3] = out[4] = out[5] = 0;
  };

  it('a ship far from any body is never in shadow', () => {
    const res = shadowPasses(system, still(-4e10, 5e10, 3e9), 0, 3e7);
    expect(res.passes).toEqual([]);
    expect(res.inShadow).toBe(0);
    expect(res.eclipses).toBe(0);
  });

  it('a ship behind the planet beyond its umbra cone sees an annular eclipse: penumbra only, as deep as 1 − b²/a²', () => {
    // the planet's axis sweeps over a ship resting at twice the umbra cone's length behind where the planet is at t = 1e5 s
    const L = (R * 1e11) / (5e8 - R);
    const p = new Float64Array(6);
    bodyState(system, 1, 1e5, p);
    const u = Math.hypot(p[0], p[1]);
    const k = (u + 2 * L) / u;
    const res = shadowPasses(system, still(p[0] * k, p[1] * k, 0), 0, 2e5, { tolerance: 0.5 });
    expect(res.passes.every((q) => q.kind === 'penumbra')).toBe(true);
    expect(res.passes).toHaveLength(1);
    expect(res.eclipses).toBe(1);
    const mid = 0.5 * (res.passes[0].t0 + res.passes[0].t1);
    // symmetric about t = 1e5 s, when the axis crosses the ship (the circular orbit keeps the planet's distance): each end within the 0.25 s
    // of the bisection; the axis turns about the star, not a straight sweep, which shifts the middle by far less than 1 s over a 20-min passage
    expect(Math.abs(mid - 1e5)).toBeLessThan(1);
  });

  it('rejects bad options', () => {
    expect(() => shadowPasses(system, still(0, 1e11, 0), 10, 0)).toThrow(/t1/);
    expect(() => shadowPasses(system, still(0, 1e11, 0), 0, 10, { tolerance: 0 })).toThrow(/tolerance/);
    expect(() => shadowPasses(system, still(0, 1e11, 0), 0, 10, { model: 'flat' as 'conical' })).toThrow(/model/);
    expect(() => shadowPasses(system, still(1.5e11, 0, 0), 0, 1e9, { maxSteps: 3 })).toThrow(/step-budget/);
  });
});
