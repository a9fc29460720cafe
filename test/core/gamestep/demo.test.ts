import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { gameStepCheck, prepareGameStep, type GameStepResult } from '../../../core/gamestep/check.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';
import { allFinite, demoSystem, MU_SUN, AU, plan, stateStart, testSystem } from '../plan/helpers.ts';

const system = demoSystem();
const result = evaluate(system, demoPlan, { samplesPerSegment: 0 });

describe('game-step check of the demo plan (Ilmar, Tessel to Ochre)', () => {
  it("the RK45 reference reproduces the plan's patched-conic segments (analytic Kepler arcs, open-loop burns)", () => {
    const prep = prepareGameStep(system, demoPlan, { guidance: 'open-loop', result });
    const a = new Float64Array(6);
    const b = new Float64Array(6);
    const arrive = result.target!.closestApproach!.t;
    for (const s of result.segments) {
      const exact = propagateKepler(s.mu, s.state0, s.t1 - s.t0) as Float64Array;
      bodyState(system, s.central, s.t1, b);
      prep.reference.at(s.t1 - 1e-6, a); // just before a burn at the segment's end
      const d = Math.hypot(a[0] - b[0] - exact[0], a[1] - b[1] - exact[1], a[2] - b[2] - exact[2]);
      // metres after 240 days of flight; the final orbits drift a little more after capture
      expect(d).toBeLessThan(s.t1 <= arrive ? 20 : 200);
    }
  });

  it('extrapolating the cruise (step scaling) reproduces the miss of flying it whole at the game step', () => {
    const physics = { integrator: 'symplectic-euler' as const, dt: 4 };
    const full = gameStepCheck(system, demoPlan, { physics, result });
    const ext = gameStepCheck(system, demoPlan, { physics, result, maxStepsPerSpan: 1_000_000 });
    expect(full.spans.every((s) => s.mode === 'flown')).toBe(true);
    const cruise = ext.spans.findIndex((s) => s.mode === 'extrapolated');
    expect(cruise).toBe(3); // the 234-day heliocentric coast
    const x = ext.spans[cruise].extrapolation!;
    expect(x.method).toBe('step-scaling');
    expect(x.order).toBeGreaterThan(0.9); // first-order method
    expect(x.order).toBeLessThan(1.1);
    expect(ext.stats.extrapolatedTime).toBeGreaterThan(200 * 86400);
    expect(ext.arrival!.basis).toBe('extrapolated');
    expect(full.arrival!.basis).toBe('measured');
    expect(full.arrival!.positionError).toBeGreaterThan(1e5); // symplectic Euler at 4 s misses by hundreds of km ...
    expect(Math.abs(ext.arrival!.positionError / full.arrival!.positionError - 1)).toBeLessThan(0.05); // ... and the estimate agrees
    expect(ext.stats.gameSteps).toBeLessThan(0.5 * full.stats.gameSteps);
    expect(ext.series.basis.some((b) => b === 0)).toBe(true);
    expect(ext.series.basis.some((b) => b === 2)).toBe(true);
  });

  it('flies long coasts at a time-warp step when one is given', () => {
    const r = gameStepCheck(system, demoPlan, { physics: { integrator: 'verlet', dt: 4 }, result, maxStepsPerSpan: 1_000_000, warpDt: 60 });
    const s = r.spans[3];
    expect(s.mode).toBe('warp');
    expect(s.region!.dt).toBeGreaterThan(59.9);
    expect(s.region!.dt).toBeLessThanOrEqual(60);
    expect(r.stats.warpTime).toBeGreaterThan(200 * 86400);
    expect(r.arrival!.basis).toBe('measured');
  });

  it('re-solved guidance removes the departure error at the mid-course burn; open-loop burns do not', () => {
    const base = { integrator: 'verlet' as const, dt: 4 };
    const resolve = gameStepCheck(system, demoPlan, { physics: { ...base, guidance: 'resolve' }, result, maxStepsPerSpan: 1_000_000 });
    const open = gameStepCheck(system, demoPlan, { physics: { ...base, guidance: 'open-loop' }, result, maxStepsPerSpan: 1_000_000 });
    expect(resolve.passes).toBe(true);
    expect(open.arrival!.positionError).toBeGreaterThan(100 * resolve.arrival!.positionError);
    expect(open.passes).toBe(false);
  });

  it('spread burns: the game and the reference fly the same finite burns', () => {
    const r = gameStepCheck(system, demoPlan, { physics: { integrator: 'verlet', dt: 4, burns: 'spread' }, result, maxStepsPerSpan: 1_000_000 });
    expect(r.passes).toBe(true);
    expect(r.arrival!.positionError).toBeLessThan(10e3);
    // the finite departure burn (213 s) puts the reference thousands of km from the impulsive one
    const prepImp = prepareGameStep(system, demoPlan, { result });
    const a = new Float64Array(6);
    const i = r.track.t.findIndex((x) => x >= result.segments[2].t0); // leaving Tessel's sphere of influence
    prepImp.reference.at(r.track.t[i], a);
    const q = r.track.reference;
    expect(Math.hypot(a[0] - q[3 * i], a[1] - q[3 * i + 1], a[2] - q[3 * i + 2])).toBeGreaterThan(1e6);
  });

  it('all-body gravity runs and keeps every number finite', () => {
    const r = gameStepCheck(system, demoPlan, { physics: { integrator: 'verlet', dt: 16, gravity: 'all' }, result, maxStepsPerSpan: 500_000 });
    expect(allFinite(r)).toBeNull();
    expect(r.spans.length).toBe(result.segments.length);
    expect(r.reference.stats.soiChanges).toBe(0); // no sphere-of-influence switching in this model
  });

  it('result series are drawable typed arrays of one length', () => {
    const r: GameStepResult = gameStepCheck(system, demoPlan, { physics: { integrator: 'rk4', dt: 8 }, result, maxStepsPerSpan: 1_000_000, samplesPerSpan: 20 });
    const n = r.series.t.length;
    expect(r.series.t).toBeInstanceOf(Float64Array);
    for (const a of [r.series.positionError, r.series.velocityError, r.series.energyError]) expect(a.length).toBe(n);
    expect(r.series.basis.length).toBe(n);
    expect(r.track.game.length).toBe(3 * n);
    for (let i = 1; i < n; i++) expect(r.series.t[i]).toBeGreaterThanOrEqual(r.series.t[i - 1]);
    expect(allFinite(r)).toBeNull();
  });
});

describe('float32 at interplanetary distances (common practice: floating origins)', () => {
  // a heliocentric coast at 1 AU for 10 days, a quarter orbit ahead of terra: binary32 spacing there is 16 km
  const sys = testSystem();
  const v = Math.sqrt(MU_SUN / AU);
  const p = plan(stateStart('sun', [0, AU, 0], [-v, 0, 0]), [{ type: 'coast', id: 'c', name: 'cruise', until: { kind: 'duration', dt: 10 * 86400 } }]);
  it('without rebasing the position cannot follow the motion; a floating origin restores it', () => {
    const physics = { integrator: 'verlet' as const, dt: 1 };
    const f64 = gameStepCheck(sys, p, { physics });
    const raw = gameStepCheck(sys, p, { physics: { ...physics, precision: 'float32' } });
    const reb = gameStepCheck(sys, p, { physics: { ...physics, precision: 'float32', rebase: { distance: 1000, velocity: true } } });
    const row = raw.float32[0];
    expect(row.spacing).toBe(16384); // ulp32(1.496e11) = 2^14 m
    expect(row.stepMoveToSpacing).toBeLessThan(2); // ~30 km per step against 16 km spacing
    expect(raw.end!.positionError).toBeGreaterThan(1e6);
    expect(reb.end!.positionError).toBeLessThan(0.01 * raw.end!.positionError);
    expect(f64.end!.positionError).toBeLessThan(reb.end!.positionError);
    expect(reb.stats.rebases).toBeGreaterThan(100);
  });
});
