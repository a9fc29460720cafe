import { describe, expect, it } from 'vitest';
import type { SweepResult } from '../../../../core/gamestep/sweep.ts';
import { ulp32 } from '../../../../core/gamestep/float32.ts';
import { laneValue } from '../../../../app/renderer/gamestep/errorChart.ts';
import { gameStepCheck } from '../../../../core/gamestep/check.ts';
import { VERDICT_WORDS, errorLength, errorSpeed, gameVerdict, maxPathError, ratio, stepText, sweepView } from '../../../../app/renderer/gamestep/verdict.ts';
import { demoCheck, plan, planResult, system } from './fixture.ts';

describe('the game-step verdict in plain words', () => {
  it('formats errors across their range and shows "—" for a missing value, never NaN', () => {
    expect([4.77e-3, 3.67, 22_200, 1.21e9, 0].map(errorLength)).toEqual(['4.77 mm', '3.67 m', '22.2 km', '1.21 Gm', '0 m']);
    expect(errorLength(3.5e-5)).toBe('0.035 mm');
    expect(errorLength(Number.MAX_VALUE)).toBe('diverged');
    expect([NaN, null, undefined, Infinity].map((x) => errorLength(x as number))).toEqual(['—', '—', '—', '—']);
    expect(errorSpeed(0.0027)).toBe('2.7 mm/s');
    expect(errorSpeed(NaN)).toBe('—');
    expect(ratio(1.5e-12)).toBe('1.5e\u221212');
    expect(ratio(null)).toBe('—');
    expect(stepText(1 / 60)).toBe('16.7 ms');
    expect(stepText(8)).toBe('8 s');
    expect(laneValue('position', 37.42)).toBe('37.4 m');
    expect(laneValue('velocity', 0.00722)).toBe('7.22 mm/s');
    expect(laneValue('energy', 1.04e-8)).toBe('1.0e-8');
    expect(laneValue('position', Number.MAX_VALUE)).toBe('diverged');
  });

  it("reads a demo check: the verdict agrees with the core's, the miss is the arrival's, nothing is NaN", () => {
    const r = demoCheck();
    const v = gameVerdict(system, r);
    expect(v.word).toBe(!r.passes ? 'fails' : r.firstExceed ? 'arrival-only' : 'passes');
    const miss = v.lines.find((l) => l.key === 'miss')!;
    expect(miss.value).toBe(errorLength(r.arrival!.positionError));
    expect(miss.note).toContain('Ochre');
    expect(miss.tone).toBe(r.arrival!.positionError <= r.tolerance ? 'good' : 'bad');
    expect(v.lines.find((l) => l.key === 'exceed')!.value).toEqual(r.firstExceed ? expect.stringMatching(/^T\+/) : 'never');
    expect(JSON.stringify(v)).not.toMatch(/NaN|undefined|Infinity/);
  });

  describe('the headline agrees with every line shown', () => {
    /** The fixture's check flown again with another position tolerance. */
    const withTolerance = (tolerance: number) =>
      gameStepCheck(system, plan, { physics: { integrator: 'verlet', dt: 10 }, result: planResult, maxStepsPerSpan: 100_000, samplesPerSpan: 60, tolerance });
    const r = demoCheck();
    const miss = r.arrival!.positionError;
    const pathMax = maxPathError(r)!;

    it('the arrival within tolerance but the path beyond it on the way: not "Passes", and the headline says where it exceeds', () => {
      // the demo's cruise is extrapolated: its error grows well past the arrival miss (the fixture's check)
      expect(pathMax).toBeGreaterThan(2 * miss);
      const t = Math.sqrt(miss * pathMax);
      const c = withTolerance(t);
      expect(c.passes).toBe(true); // the core's criterion: arrival and drift
      expect(c.firstExceed).not.toBeNull();
      const v = gameVerdict(system, c);
      expect(v.word).toBe('arrival-only');
      expect(VERDICT_WORDS[v.word]).not.toBe('Passes');
      expect(v.headline).toContain(`The arrival is within tolerance (${errorLength(miss)} of ${errorLength(t)})`);
      expect(v.headline).toContain(`the path exceeds it on the way: up to ${errorLength(maxPathError(c))}`);
      expect(v.lines.find((l) => l.key === 'exceed')!.tone).toBe('bad');
    });

    it('every shown error within tolerance: "Passes", every toned line good', () => {
      const c = withTolerance(2 * pathMax);
      expect(c.firstExceed).toBeNull();
      const v = gameVerdict(system, c);
      expect(v.word).toBe('passes');
      expect(v.headline).toBe('The game flies this plan within tolerance.');
      expect(v.lines.filter((l) => l.tone && l.tone !== 'good')).toEqual([]);
    });

    it('the arrival outside tolerance: "Fails", naming the miss', () => {
      const c = withTolerance(miss / 2);
      const v = gameVerdict(system, c);
      expect(v.word).toBe('fails');
      expect(v.headline).toBe(`The game misses: arrival off by ${errorLength(c.arrival!.positionError)}.`);
      expect(v.lines.find((l) => l.key === 'miss')!.tone).toBe('bad');
    });
  });

  it('names the float32 spacing at the largest distance of the mission (IEEE 754 binary32 spacing)', () => {
    const r = demoCheck();
    const v = gameVerdict(system, r);
    let worst = r.float32[0];
    for (const f of r.float32) if (f.spacing > worst.spacing) worst = f;
    // the cruise about the star: ~1.8e11 m, where binary32 values are 2^(37−23) = 16 384 m apart
    expect(worst.spacing).toBe(ulp32(worst.distance));
    expect(worst.spacing).toBe(16_384);
    expect(v.float32.summary).toContain(`steps of ${errorLength(16_384)}`);
    expect(v.float32.summary).toContain('Ilmar');
    expect(v.float32.rows.length).toBe(r.float32.length);
  });

  it('says when the flight diverged, with no miss to show', () => {
    const r = demoCheck();
    const v = gameVerdict(system, { ...r, status: 'diverged', divergedAt: r.t0 + 3600, arrival: null, passes: false });
    expect(v.word).toBe('diverged');
    expect(v.lines.find((l) => l.key === 'miss')!.value).toBe('—');
    expect(v.lines.find((l) => l.key === 'diverged')!.value).toMatch(/^T\+ 0 d 01 h 00 min/);
    expect(JSON.stringify(v)).not.toMatch(/NaN/);
  });

  it("lays out a sweep: per integrator the largest passing step, the cheapest marked, the precision verdict's words", () => {
    const s = {
      physics: { integrator: 'verlet', dt: 8, precision: 'float64', rebase: null, gravity: 'central', burns: 'impulsive', guidance: 'resolve' },
      tolerance: 1e4,
      energyTolerance: 1e-6,
      ladder: [8, 16, 32],
      rows: [],
      best: [
        { integrator: 'symplectic-euler', dt: null, missionEvals: null },
        { integrator: 'verlet', dt: 8, missionEvals: 2_616_188 },
        { integrator: 'explicit-euler', dt: null, missionEvals: null },
        { integrator: 'rk4', dt: 16, missionEvals: 5_232_376 },
      ],
      cheapest: { integrator: 'verlet', dt: 8, missionEvals: 2_616_188 },
      precision: {
        integrator: 'verlet',
        dt: 8,
        rows: [{ precision: 'float32', rebase: { distance: 1e4, velocity: true }, passes: false, arrivalMiss: 5.4e5, maxDriftPerOrbit: null }],
        verdict: 'float64',
        float32: [],
      },
      notes: [],
    } as unknown as SweepResult;
    const v = sweepView(s);
    expect(v.rows.map((r) => r.step)).toEqual(['none ≥ 8 s', '8 s', 'none ≥ 8 s', '16 s']);
    expect(v.rows.filter((r) => r.cheapest).map((r) => r.integrator)).toEqual(['verlet']);
    expect(v.cheapest).toMatch(/^Cheapest: velocity Verlet \(leapfrog\) at 8 s \(2\u202f616\u202f188 gravity evaluations/);
    expect(v.precision!.words).toMatch(/float64 is needed/);
    expect(v.precision!.rows[0]).toEqual({ label: 'float32 + floating origin 10.0 km', miss: '540 km', drift: '—', passes: false });
    expect(sweepView({ ...s, cheapest: null, best: s.best.map((b) => ({ ...b, dt: null, missionEvals: null })) }).cheapest).toMatch(/^No integrator passes/);
  });
});
