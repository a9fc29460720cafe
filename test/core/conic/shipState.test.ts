import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { sampleEphemeris } from '../../../core/conic/ephemerisSampler.ts';
import { segmentIndexAt, segmentMassAt, shipStateAt } from '../../../core/conic/shipState.ts';
import { ACC, ilmar, syntheticResult } from '../io/syntheticResult.ts';

const root = new URL('../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const plan = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const result = evaluate(system, plan);
const s6 = new Float64Array(6);

describe('ship state at a time of the flight', () => {
  it('agrees with the drawing samples of every coast (sampled in the universal anomaly, an independent parametrisation)', () => {
    for (const seg of result.segments) {
      if (seg.kind !== 'coast') continue;
      for (let k = 0; k < seg.sampleT.length; k += 7) {
        const t = seg.sampleT[k];
        if (t > seg.t1) break;
        shipStateAt(result, t, s6);
        const r = Math.hypot(seg.samples[3 * k], seg.samples[3 * k + 1], seg.samples[3 * k + 2]);
        const d = Math.hypot(s6[0] - seg.samples[3 * k], s6[1] - seg.samples[3 * k + 1], s6[2] - seg.samples[3 * k + 2]);
        // two routes through the universal Kepler equation, each solved to ~1e-12 relative
        expect(d / r).toBeLessThan(1e-8);
      }
    }
  });

  it('stands at the SOI radius when the evaluation says the ship crosses it', () => {
    for (const e of result.events.filter((x) => x.kind === 'soi-exit')) {
      const k = shipStateAt(result, e.t - 1e-3, s6);
      expect(result.segments[k].central).toBe(e.central);
      expect(Math.hypot(s6[0], s6[1], s6[2]) / system.bodies[e.central].derived.soiRadius).toBeCloseTo(1, 6);
    }
  });

  it('is continuous in position across an impulsive burn', () => {
    // The demo's mid-course correction: impulsive, about the star.
    const row = result.budget.rows.find((r) => /mid-course/i.test(r.name))!;
    const a = new Float64Array(6);
    const b = new Float64Array(6);
    const ka = shipStateAt(result, row.t - 1e-3, a);
    const kb = shipStateAt(result, row.t + 1e-3, b);
    expect(ka).not.toBe(kb);
    expect(result.segments[ka].central).toBe(result.segments[kb].central);
    // 1 ms at ~30 km/s moves 30 m; the velocity jumps by the burn's Δv.
    expect(Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2])).toBeLessThan(100);
    expect(Math.hypot(a[3] - b[3], a[4] - b[4], a[5] - b[5])).toBeCloseTo(row.dv, 3);
  });

  it('across a finite burn follows constant-acceleration motion r0 + v0·τ + ½aτ² (analytic), between the drawing samples too', () => {
    const synth = syntheticResult();
    const burn = synth.segments[3];
    for (let tau = 0; tau <= 600; tau += 13) {
      const k = shipStateAt(synth, 20000 + tau, s6);
      expect(k).toBe(tau === 600 ? 4 : 3);
      for (let c = 0; c < 3; c++) {
        const r = burn.state0[c] + burn.state0[3 + c] * tau + 0.5 * ACC[c] * tau * tau;
        const v = burn.state0[3 + c] + ACC[c] * tau;
        // a cubic reproduces the quadratic exactly; what is left is rounding of positions ~1e11 m
        expect(Math.abs(s6[c] - r)).toBeLessThan(1e-3);
        // finite-difference tangents of a quadratic are exact; rounding over 100 s spacing ~1e-7 m/s
        expect(Math.abs(s6[3 + c] - v)).toBeLessThan(2e-6);
      }
      expect(segmentMassAt(burn, 20000 + tau)).toBeCloseTo(1000 - (50 * tau) / 600, 9);
    }
  });

  it('is the state the exports sample: every sample of sampleEphemeris (about the central body) is shipStateAt of its time', () => {
    const synth = syntheticResult();
    const eph = sampleEphemeris(ilmar, synth, { step: 311 });
    for (let s = 0; s < eph.spans.length; s++) {
      const span = eph.spans[s];
      // a span's last time is the next span's first (an SOI crossing): there the view shows the next segment
      const n = s < eph.spans.length - 1 ? span.t.length - 1 : span.t.length;
      for (let j = 0; j < n; j++) {
        shipStateAt(synth, span.t[j], s6);
        for (let c = 0; c < 6; c++) expect(s6[c]).toBe(span.states[6 * j + c]);
      }
    }
  });

  it('clamps to the first and last segment outside the flight', () => {
    expect(segmentIndexAt(result.segments, -1e12)).toBe(0);
    expect(segmentIndexAt(result.segments, 1e12)).toBe(result.segments.length - 1);
    expect(segmentIndexAt([], 0)).toBe(-1);
    expect(shipStateAt({ ...result, segments: [] }, 0, s6)).toBe(-1);
    const first = result.segments[0];
    shipStateAt(result, first.t0 - 1e6, s6);
    expect(Array.from(s6)).toEqual(Array.from(first.state0.subarray(0, 6)));
  });
});
