import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { sampleEphemeris } from '../../../core/conic/ephemerisSampler.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import type { PlanResult } from '../../../core/plan/result.ts';
import { ACC, R0, TESSEL, ilmar, syntheticResult } from '../io/syntheticResult.ts';

describe('sampleEphemeris', () => {
  const result = syntheticResult();

  it('groups spans by central body; span ends are sampled and shared across an SOI change', () => {
    const eph = sampleEphemeris(ilmar, result, { step: 600 });
    expect(eph.spans.map((s) => s.center)).toEqual([TESSEL, 0]);
    const [a, b] = eph.spans;
    expect(a.t[0]).toBe(0);
    expect(a.t[a.t.length - 1]).toBe(9000);
    expect(b.t[0]).toBe(9000);
    expect(b.t[b.t.length - 1]).toBe(30000);
    // Fixed grid t0 + k·600 in between.
    expect(Array.from(a.t)).toEqual([0, 600, 1200, 1800, 2400, 3000, 3600, 4200, 4800, 5400, 6000, 6600, 7200, 7800, 8400, 9000]);
    for (let j = 1; j < b.t.length - 1; j++) expect(b.t[j] % 600).toBe(0);
    expect(b.states.length).toBe(6 * b.t.length);
  });

  it('coast samples match the analytic circular orbit (r = R0·(cos nt, sin nt, 0))', () => {
    const eph = sampleEphemeris(ilmar, result, { step: 250 });
    const span = eph.spans[0];
    const mu = ilmar.bodies[TESSEL].mu;
    const vc = Math.sqrt(mu / R0);
    const n = vc / R0;
    for (let j = 0; j < span.t.length && span.t[j] < 4000; j++) {
      const t = span.t[j];
      const o = 6 * j;
      expect(span.states[o] / R0).toBeCloseTo(Math.cos(n * t), 10);
      expect(span.states[o + 1] / R0).toBeCloseTo(Math.sin(n * t), 10);
      expect(Math.abs(span.states[o + 2])).toBe(0);
      expect(span.states[o + 3] / vc).toBeCloseTo(-Math.sin(n * t), 10);
      expect(span.states[o + 4] / vc).toBeCloseTo(Math.cos(n * t), 10);
      expect(span.mass[j]).toBe(1200);
    }
  });

  it('at an impulsive burn the sample shows the state just after it', () => {
    const eph = sampleEphemeris(ilmar, result, { step: 1000 });
    const span = eph.spans[0];
    const j = Array.from(span.t).indexOf(4000);
    expect(span.states[6 * j + 4]).toBeCloseTo(result.segments[1].state0[4], 6);
    expect(span.mass[j]).toBe(1000);
  });

  it('finite burn: the Hermite interpolant reproduces constant-acceleration motion (analytic) and mass falls linearly', () => {
    const eph = sampleEphemeris(ilmar, result, { step: 37 });
    const span = eph.spans[1];
    const burn = result.segments[3];
    for (let j = 0; j < span.t.length; j++) {
      const t = span.t[j];
      if (t < 20000 || t >= 20600) continue;
      const tau = t - 20000;
      for (let k = 0; k < 3; k++) {
        const r = burn.state0[k] + burn.state0[3 + k] * tau + 0.5 * ACC[k] * tau * tau;
        const v = burn.state0[3 + k] + ACC[k] * tau;
        expect(Math.abs(span.states[6 * j + k] - r)).toBeLessThan(1e-3);
        // Positions near 1.1e11 m carry ~1.5e-5 m of rounding; over 100 s spacing that is ~1e-7 m/s.
        expect(Math.abs(span.states[6 * j + 3 + k] - v)).toBeLessThan(2e-6);
      }
      expect(span.mass[j]).toBeCloseTo(1000 - (50 * tau) / 600, 9);
    }
  });

  it('re-centres on a chosen body with the analytic ephemeris', () => {
    const central = sampleEphemeris(ilmar, result, { step: 500 });
    const onStar = sampleEphemeris(ilmar, result, { step: 500, center: 0 });
    expect(onStar.spans.length).toBe(1);
    const a = central.spans[0];
    const all = onStar.spans[0];
    const tmp = new Float64Array(6);
    for (let j = 0; j < a.t.length - 1; j++) {
      const k = Array.from(all.t).indexOf(a.t[j]);
      bodyState(ilmar, TESSEL, a.t[j], tmp);
      for (let c = 0; c < 6; c++) expect(all.states[6 * k + c]).toBeCloseTo(a.states[6 * j + c] + tmp[c], 3);
    }
  });

  it("a ship flying exactly on Tessel's own conic stays on Tessel: Kepler propagation agrees with the ephemeris", () => {
    // Independent implementations: universal-variable propagation (kepler.ts) and the
    // Kepler-equation ephemeris (ephemeris.ts) with μ = μ_star + μ_Tessel.
    const st = bodyState(ilmar, TESSEL, 0, new Float64Array(6));
    const r: PlanResult = {
      ...syntheticResult(),
      t1: 3e7,
      segments: [{ ...syntheticResult().segments[2], t0: 0, t1: 3e7, state0: st, mu: ilmar.bodies[TESSEL].derived.orbitMu }],
    };
    const eph = sampleEphemeris(ilmar, r, { step: 1e6, center: TESSEL });
    const s = eph.spans[0].states;
    for (let j = 0; j < eph.spans[0].t.length; j++) expect(Math.hypot(s[6 * j], s[6 * j + 1], s[6 * j + 2])).toBeLessThan(1);
  });

  it('rejects a bad step, a bad centre and a step giving too many samples', () => {
    expect(() => sampleEphemeris(ilmar, result, { step: 0 })).toThrow(InputError);
    expect(() => sampleEphemeris(ilmar, result, { step: Number.NaN })).toThrow(/step must be a finite number > 0/);
    expect(() => sampleEphemeris(ilmar, result, { step: 10, center: 99 })).toThrow(/center must be/);
    expect(() => sampleEphemeris(ilmar, result, { step: 1e-3 })).toThrow(/use a larger step/);
  });
});
