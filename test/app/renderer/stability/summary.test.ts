import { describe, expect, it } from 'vitest';
import { CLOSE_ENCOUNTER_HILL, checkStability } from '../../../../core/checks/stability.ts';
import type { StabilityEstimate } from '../../../../app/renderer/analysis/checkJobs.ts';
import { durationWords, pairRows, runEstimate, stabilitySummary } from '../../../../app/renderer/stability/summary.ts';
import { demoSystem } from '../../../core/plan/helpers.ts';
import { planet, smallSystem } from '../../../core/system/fixtures.ts';

const system = demoSystem();

describe('the stability check in plain words', () => {
  it('says "no flags" for the demo over a short span, and trusts its small energy error', () => {
    const r = checkStability(system, { years: 10, samples: 50, method: 'yoshida4' });
    const s = stabilitySummary(system, r);
    expect(s.ok).toBe(true);
    expect(s.headline).toMatch(/^No flags over 10 years:/);
    expect(s.energyOk).toBe(true);
    expect(s.merged).toBeNull();
    expect(JSON.stringify(s)).not.toMatch(/NaN/);
  });

  it("flags two planets closer than Gladman's criterion (2√3 mutual Hill radii; Gladman 1993, Icarus 106) in plain words", () => {
    // 1.6 mutual Hill radii apart: the core flags the epoch spacing and the close encounter
    const sys = smallSystem([planet('inner', { a_m: 1e11 }, { mu_m3_s2: 3e16 }), planet('outer', { a_m: 1.1e11, mean_anomaly_deg: 120 }, { mu_m3_s2: 3e16 })]);
    const r = checkStability(sys, { years: 300, samples: 50 });
    const s = stabilitySummary(sys, r);
    expect(s.ok).toBe(false);
    expect(s.flags.map((f) => f.words)).toContain('Too close for Hill stability');
    expect(s.flags.map((f) => f.words)).toContain('Close encounter');
    expect(s.flags.find((f) => f.words === 'Too close for Hill stability')!.when).toBe('at the epoch');
    const { rows } = pairRows(sys, r);
    expect(rows[0].flagged).toBe(true);
    expect(rows[0].hill).toBe(true);
    expect(rows[0].bar).toBeLessThan(rows[0].threshold);
  });

  it('puts the pairs closest first on one log bar with the 3 R_H threshold at log 3 / log max', () => {
    const r = checkStability(system, { years: 10, samples: 50, method: 'yoshida4' });
    const { rows, maxHill } = pairRows(system, r);
    expect(rows.length).toBe(r.pairs.length);
    const closest = Math.min(...r.pairs.map((p) => p.minHill));
    expect(rows[0].closest).toBe(closest.toFixed(1));
    expect(maxHill).toBe(Math.max(10, ...r.pairs.map((p) => p.minHill)));
    for (const row of rows) {
      expect(row.threshold).toBeCloseTo(Math.log(CLOSE_ENCOUNTER_HILL) / Math.log(maxHill), 12);
      expect(row.bar).toBeGreaterThan(row.threshold);
      expect(row.flagged).toBe(false);
    }
  });

  it("estimates the run: the core's own merge decision and step count, time from the measured rate", () => {
    // a step budget of 5 000: one year with moons needs more, so 'auto' merges them, as the core does
    const probe = checkStability(system, { years: 0.5, mergeMoons: false, samples: 2, method: 'yoshida4' });
    const probeMerged = checkStability(system, { years: 0.5, mergeMoons: true, samples: 2, method: 'yoshida4' });
    const est: StabilityEstimate = {
      yearLength: system.calendar.yearLength,
      hasMoons: true,
      moons: { h: probe.h, stepsPerSecond: 1e6 },
      merged: { h: probeMerged.h, stepsPerSecond: 2e6 },
      maxSteps: 5000,
    };
    const run = checkStability(system, { years: 1, maxSteps: 5000, samples: 2, method: 'yoshida4' });
    const e = runEstimate(est, 1, 'auto')!;
    expect(e.merged).toBe(run.mergedMoons);
    expect(e.merged).toBe(true);
    expect(Math.abs(e.steps - run.steps)).toBeLessThanOrEqual(1);
    expect(e.seconds).toBeCloseTo(e.steps / 2e6, 12);
    expect(e.refused).toBe(false);
    expect(runEstimate(est, 1, false)!.refused).toBe(true);
    expect(() => checkStability(system, { years: 1, maxSteps: 5000, mergeMoons: false, samples: 2, method: 'yoshida4' })).toThrow(/maxSteps/);
    expect(runEstimate(est, NaN, 'auto')).toBeNull();
    expect(runEstimate(est, 0.01, 'auto')!.text).toMatch(/^under a second here/);
  });

  it('words durations', () => {
    expect([0.2, 6.4, 130, 7200].map(durationWords)).toEqual(['under a second', '6 s', '2 min', '2.0 h']);
  });
});
