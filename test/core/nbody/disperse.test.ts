import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import {
  disperse,
  mergeBlocks,
  perturbBurn,
  prepareDispersion,
  quantileSorted,
  runSamples,
  SAMPLE_FLOWN,
  SAMPLE_IMPACT,
  SAMPLE_NO_ARRIVAL,
  summarizeDispersion,
} from '../../../core/nbody/disperse.ts';
import { demoPlan, heavyDemoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
const DEG = Math.PI / 180;

describe('disperse: zero σ reproduces the nominal', () => {
  for (const resolve of ['frozen', 'retarget'] as const) {
    it(`${resolve}: every sample equals the nominal margin and arrival, and the probabilities are exactly the nominal's`, () => {
      const r = disperse(sys, demoPlan, { samples: 40, seed: 3, resolve });
      expect(r.nominal.margin).toBeGreaterThan(0);
      for (let k = 0; k < 40; k++) {
        expect(r.perSample.margin[k]).toBe(r.perSample.margin[0]);
        expect(r.perSample.periapsisAltitude[k]).toBe(r.perSample.periapsisAltitude[0]);
      }
      expect(r.perSample.margin[0]).toBeCloseTo(r.nominal.margin, 6);
      expect(r.perSample.periapsisAltitude[0]).toBeCloseTo(r.nominal.periapsisAltitude!, 0);
      expect(r.pMarginHolds).toBe(1);
      expect(r.pPeriapsisSafe).toBe(1);
      expect(r.pArrive).toBe(1);
      expect(r.margin.p5).toBe(r.margin.p95);
    });
  }

  it('the negative-margin demo: P(margin holds) is exactly 0', () => {
    const r = disperse(sys, heavyDemoPlan, { samples: 10, seed: 3 });
    expect(r.nominal.margin).toBeLessThan(0);
    expect(r.pMarginHolds).toBe(0);
  });
});

describe('disperse: the error model', () => {
  const N = 2000;
  const sigmaMag = 0.5; // %
  const sigmaPoint = 0.2; // deg
  const p = prepareDispersion(sys, demoPlan, {
    samples: N,
    seed: 11,
    magnitudeSigma: sigmaMag,
    pointingSigma: sigmaPoint,
    perBurn: { trim: { magnitudeSigma: 2 } },
  });
  const block = runSamples(p, 0, N);
  const B = p.burns.length;

  it('applied magnitude errors: mean 0 and standard deviation σ within sampling bounds (normal sampling theory, common practice)', () => {
    for (let b = 0; b < B; b++) {
      const s = b === B - 1 ? 0.02 : sigmaMag / 100;
      let sum = 0;
      let sq = 0;
      for (let k = 0; k < N; k++) {
        const e = block.magnitudeError[k * B + b];
        sum += e;
        sq += e * e;
      }
      const mean = sum / N;
      const sd = Math.sqrt(sq / N - mean * mean);
      expect(Math.abs(mean)).toBeLessThan((4 * s) / Math.sqrt(N)); // 4 standard errors
      expect(Math.abs(sd / s - 1)).toBeLessThan(4 / Math.sqrt(2 * N)); // sd of the sample sd ≈ σ/√(2N)
    }
  });

  it('applied pointing tilts: E[θ²] = 2σ² (Rayleigh) within sampling bounds', () => {
    const s = sigmaPoint * DEG;
    let sq = 0;
    for (let k = 0; k < N; k++) sq += block.pointingError[k * B] ** 2;
    // θ²/σ² is χ² with 2 degrees of freedom: mean 2, variance 4
    expect(Math.abs(sq / N / (s * s) - 2)).toBeLessThan((4 * 2) / Math.sqrt(N));
  });

  it('perturbBurn: the magnitude scales by 1 + ε and the direction tilts by exactly θ', () => {
    const dv = [120, -40, 33];
    const out = perturbBurn(dv, 0.01, 0.003, -0.004, [0, 0, 0]);
    const m0 = Math.hypot(...dv);
    expect(Math.hypot(...out)).toBeCloseTo(m0 * 1.01, 9);
    const cos = (out[0] * dv[0] + out[1] * dv[1] + out[2] * dv[2]) / (Math.hypot(...out) * m0);
    expect(Math.acos(cos)).toBeCloseTo(0.005, 9);
    expect(perturbBurn(dv, 0, 0, 0, [0, 0, 0])).toEqual(dv);
  });

  it('summarises margins with type-7 percentiles (Hyndman & Fan 1996)', () => {
    expect(quantileSorted([1, 2, 3, 4], 0.5)).toBe(2.5);
    expect(quantileSorted([1, 2, 3, 4, 5], 0.05)).toBeCloseTo(1.2, 12);
    const r = summarizeDispersion(p, block);
    const sorted = Array.from(block.margin)
      .filter(Number.isFinite)
      .sort((a, b) => a - b);
    expect(r.margin.p50).toBe(quantileSorted(sorted, 0.5));
    expect(r.margin.p5).toBeLessThanOrEqual(r.margin.p50);
    expect(r.margin.p50).toBeLessThanOrEqual(r.margin.p95);
    // a sample holds only when it is flown to the end: no impact, and it reaches the target
    const flownHolding = Array.from(block.margin).filter((m, k) => block.outcome[k] === SAMPLE_FLOWN && m >= 0).length;
    expect(r.pMarginHolds).toBe(flownHolding / N);
    expect(r.pMarginHolds).toBeLessThanOrEqual(r.pArrive!);
  });
});

describe('disperse: a sample that does not complete its flight fails', () => {
  it('regression (σ pointing 30°: every budget margin ≥ 0 but no sample arrives — reported 100 % holding with 0 % arriving): P(margin holds) is 0', () => {
    const p = prepareDispersion(sys, demoPlan, { samples: 60, seed: 1, pointingSigma: 30 });
    const block = runSamples(p, 0, 60);
    const r = summarizeDispersion(p, block);
    // the budgets alone would all hold: frozen burns keep their magnitudes
    expect(Array.from(block.margin).every((m) => m >= 0)).toBe(true);
    expect(r.pArrive).toBe(0);
    expect(r.pMarginHolds).toBe(0);
    // each failed sample is counted by its cause, and the causes agree with the per-sample arrival
    expect(r.impacts + r.missed + r.failed).toBe(60);
    for (let k = 0; k < 60; k++) {
      expect(block.outcome[k]).not.toBe(SAMPLE_FLOWN);
      if (block.outcome[k] === SAMPLE_NO_ARRIVAL) expect(block.periapsisAltitude[k]).toBe(Infinity);
    }
    expect(r.impacts).toBe(Array.from(block.outcome).filter((o) => o === SAMPLE_IMPACT).length);
  });

  it('an impact fails the sample though its budget holds (no target: the impact alone decides)', () => {
    // from the demo's parking orbit, a 300 m/s retrograde burn drops the periapsis under
    // Tessel's surface (about 75 m/s would do): every sample hits Tessel with most of its Δv left
    // (re-solved mode, so the coast keeps its condition and flies on to the impact)
    const plan = {
      ...structuredClone(demoPlan),
      target: null,
      events: [
        {
          type: 'burn' as const,
          id: 'drop',
          name: 'Drop',
          t: null,
          frame: 'vnb' as const,
          dv: [-300, 0, 0] as [number, number, number],
          solve: { kind: 'fixed' as const },
          mode: 'impulsive' as const,
          pointing: 'velocity' as const,
        },
        { type: 'coast' as const, id: 'fall', name: 'Fall', until: { kind: 'periapsis' as const } },
      ],
    };
    const r = disperse(sys, plan, { samples: 5, seed: 2, magnitudeSigma: 1, resolve: 'retarget' });
    expect(Array.from(r.perSample.margin).every((m) => m > 0)).toBe(true);
    expect(r.impacts).toBe(5);
    expect(Array.from(r.perSample.outcome)).toEqual([SAMPLE_IMPACT, SAMPLE_IMPACT, SAMPLE_IMPACT, SAMPLE_IMPACT, SAMPLE_IMPACT]);
    expect(r.pArrive).toBeNull();
    expect(r.pMarginHolds).toBe(0);
  });
});

describe('disperse: reproducible and independent of how samples are split', () => {
  const opts = { samples: 60, seed: 99, magnitudeSigma: 0.2, pointingSigma: 0.1, resolve: 'retarget' as const };

  it('the same seed gives the same samples; another seed does not', () => {
    const a = disperse(sys, demoPlan, opts);
    const b = disperse(sys, demoPlan, opts);
    expect(Array.from(b.perSample.margin)).toEqual(Array.from(a.perSample.margin));
    const c = disperse(sys, demoPlan, { ...opts, seed: 100 });
    expect(Array.from(c.perSample.margin)).not.toEqual(Array.from(a.perSample.margin));
  });

  it('chunks of any size (as workers run them) merge into the single-run result bit for bit', () => {
    const whole = disperse(sys, demoPlan, opts);
    const p = prepareDispersion(sys, demoPlan, opts);
    const blocks = [runSamples(p, 37, 23), runSamples(p, 0, 11), runSamples(p, 11, 26)];
    const merged = summarizeDispersion(p, mergeBlocks(blocks, 60, p.burns.length));
    expect(Array.from(merged.perSample.margin)).toEqual(Array.from(whole.perSample.margin));
    expect(Array.from(merged.perSample.magnitudeError)).toEqual(Array.from(whole.perSample.magnitudeError));
    expect(merged.margin).toEqual(whole.margin);
    expect(merged.pPeriapsisSafe).toBe(whole.pPeriapsisSafe);
  });
});

describe('disperse: bad input', () => {
  it('throws InputError naming the option', () => {
    expect(() => disperse(sys, demoPlan, { samples: 0 })).toThrow(/options.samples/);
    expect(() => disperse(sys, demoPlan, { samples: 5, magnitudeSigma: -1 })).toThrow(InputError);
    expect(() => disperse(sys, demoPlan, { samples: 5, perBurn: { nope: { magnitudeSigma: 1 } } })).toThrow(/options.perBurn.nope/);
    expect(() => disperse(sys, demoPlan, { samples: 5, resolve: 'both' as never })).toThrow(/options.resolve/);
    const p = prepareDispersion(sys, demoPlan, { samples: 5 });
    expect(() => runSamples(p, 3, 4)).toThrow(/count/);
    expect(() => mergeBlocks([runSamples(p, 0, 2)], 5, p.burns.length)).toThrow(/blocks/);
  });
});
