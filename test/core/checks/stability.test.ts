import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { checkStability, GLADMAN_SPACING } from '../../../core/checks/stability.ts';
import { demoText, planet, smallSystem } from '../system/fixtures.ts';

const STAR_MU = 1e20;

// two planets of equal μ at a1 and a2 (circular, coplanar), the second a third of an orbit ahead
function pair(a1: number, a2: number, mu: number, extra: { radius?: number } = {}) {
  return smallSystem(
    [
      planet('inner', { a_m: a1 }, { mu_m3_s2: mu, ...(extra.radius ? { radius_m: extra.radius } : {}) }),
      planet('outer', { a_m: a2, mean_anomaly_deg: 120 }, { mu_m3_s2: mu, ...(extra.radius ? { radius_m: extra.radius } : {}) }),
    ],
    STAR_MU,
  );
}

// mutual Hill radius (Gladman 1993, Icarus 106, eq. for R_H with (m1 + m2)/3M)
function mutualHill(a1: number, a2: number, mu: number): number {
  return Math.cbrt((2 * mu) / (3 * STAR_MU)) * 0.5 * (a1 + a2);
}

describe('system stability check', () => {
  it('two planets well inside Hill stability stay bounded, energy error below 1e-9 (Yoshida 4)', () => {
    const sys = pair(1e11, 1.6e11, 3e14);
    const r = checkStability(sys, { years: 2000, method: 'yoshida4' });
    expect(r.status).toBe('done');
    expect(r.flags).toEqual([]);
    expect(r.pairs[0].spacing).toBeGreaterThan(30);
    for (const b of r.bodies) {
      expect(b.a.max / b.a.min - 1).toBeLessThan(1e-4);
      // forced by a companion of 3e-6 of the star's mass, amplified by the close spacing: measured 3.7e-4
      expect(b.e.max).toBeLessThan(1e-3);
      expect(b.history.a.length).toBe(r.t.length);
    }
    expect(r.energy.maxRelativeError).toBeLessThan(1e-9);
    expect(r.pairs[0].minHill).toBeGreaterThan(20);
    expect(r.years).toBeCloseTo(2000, 6);
  });

  it("flags two planets closer than Gladman's criterion Δ < 2√3 mutual Hill radii (Gladman 1993, Icarus 106) and their close encounter", () => {
    // 1.6 mutual Hill radii apart (much closer, under ~1 R_H, the pair would settle into
    // co-orbital horseshoe motion and avoid close encounters)
    const a1 = 1e11;
    const mu = 3e16;
    const rh = mutualHill(a1, 1.1e11, mu);
    const sys = pair(a1, 1.1e11, mu);
    const r = checkStability(sys, { years: 300 });
    expect(r.pairs[0].mutualHill).toBeCloseTo(rh, -3);
    expect(r.pairs[0].spacing).toBeLessThan(GLADMAN_SPACING);
    const codes = r.flags.map((f) => f.code);
    expect(codes).toContain('hill-criterion');
    expect(codes).toContain('close-encounter');
    expect(r.pairs[0].minHill).toBeLessThan(3);
  });

  it('applies the criterion at its boundary: 3.0 R_H is flagged, 4.0 R_H is not', () => {
    const mu = 3e14;
    // a2 − a1 = k·R_H(a1, a2): solve for a2 by fixed-point iteration
    const spaced = (k: number): number => {
      let a2 = 1.1e11;
      for (let i = 0; i < 50; i++) a2 = 1e11 + k * mutualHill(1e11, a2, mu);
      return a2;
    };
    const near = checkStability(pair(1e11, spaced(3), mu), { years: 1 });
    const far = checkStability(pair(1e11, spaced(4), mu), { years: 1 });
    expect(near.pairs[0].spacing).toBeCloseTo(3, 6);
    expect(near.flags.map((f) => f.code)).toContain('hill-criterion');
    expect(far.flags.map((f) => f.code)).not.toContain('hill-criterion');
  });

  it('flags a collision and stops the run there', () => {
    // radii larger than the spacing: the planets touch at their first conjunction
    const sys = pair(1e11, 1.03e11, 3e14, { radius: 2e9 });
    const r = checkStability(sys, { years: 200 });
    expect(r.status).toBe('collision');
    expect(r.flags.some((f) => f.code === 'collision' && f.severity === 'error')).toBe(true);
    expect(r.years).toBeLessThan(200);
  });

  const demo = parseSystemFile(demoText()).system;

  it('the demo system (Ilmar) over 100 years, moons flown, reports no flags', () => {
    const r = checkStability(demo, { years: 100, method: 'yoshida4' });
    expect(r.mergedMoons).toBe(false);
    expect(r.bodies.map((b) => b.id).sort()).toEqual(
      demo.bodies
        .slice(1)
        .map((b) => b.id)
        .sort(),
    );
    expect(r.flags).toEqual([]);
    expect(r.energy.maxRelativeError).toBeLessThan(2e-12); // Yoshida 4 at its default step: measured 3.9e-13
    const quill = r.bodies.find((b) => b.id === 'quill')!;
    expect(quill.parent).toBe(demo.indexById.tessel);
    // osculating about Tessel from ~1.5e11 m barycentric states (ulp 3e-5 m): measured 1.1e-5 m
    expect(Math.abs(quill.a.initial - 2.6e8)).toBeLessThan(1e-4);
  });

  it('merges moons into their planets when the step budget would be exceeded, and says so', () => {
    const r = checkStability(demo, { years: 200, maxSteps: 1_000_000, method: 'yoshida4' });
    expect(r.mergedMoons).toBe(true);
    expect(r.mergeReason).toMatch(/moons merged.*budget/);
    expect(r.bodies.length).toBe(demo.bodies[0].children.length);
    const moravel = r.bodies.find((b) => b.id === 'moravel')!;
    expect(moravel.merged.map((k) => demo.bodies[k].id).sort()).toEqual(['lough', 'skerry']);
    expect(r.flags).toEqual([]);
    expect(() => checkStability(demo, { years: 200, maxSteps: 1_000_000, mergeMoons: false, method: 'yoshida4' })).toThrow(InputError);
  });

  it('cancels and rejects bad input with typed errors', () => {
    expect(() => checkStability(demo, { years: 10, signal: { aborted: true } })).toThrow(SolverError);
    expect(() => checkStability(demo, { years: -1 })).toThrow(InputError);
    expect(() => checkStability(demo, { years: 1, method: 'euler' as never })).toThrow(InputError);
    expect(() => checkStability(demo, { years: 1, samples: 1 })).toThrow(InputError);
  });
});
