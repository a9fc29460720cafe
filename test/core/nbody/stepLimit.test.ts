import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { propagate } from '../../../core/integrate/propagate.ts';
import { NBodyModel } from '../../../core/nbody/model.ts';
import { STEPS_PER_FASTEST_PERIOD, fieldStepLimit } from '../../../core/nbody/stepLimit.ts';
import { ShipForces } from '../../../core/dynamics/shipForces.ts';
import { skerryPlan } from '../../fixtures/skerryPlan.ts';
import { L, starCentredAccel } from '../dynamics/starCentred.ts';
import { OdexSolverClass, ODEX_CONVERGED } from '../integrate/odexRef.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
const DAY = 86400;

/** Kepler's third law from the system's own elements: T = 2π √(a³ / (μ_parent + μ_body)). */
function keplerPeriod(id: string): number {
  const b = sys.bodies[sys.indexById[id]];
  const mu = sys.bodies[b.parentIndex].mu + b.mu;
  return 2 * Math.PI * Math.sqrt((b.elements?.a ?? Number.NaN) ** 3 / mu);
}

describe('the field step limit: half the shortest orbital period of a pulling body', () => {
  it('is Skerry’s period / 2 for the demo system (its fastest body), the fastest pulling body’s with a pull subset, none with only the star or in two-body mode', () => {
    expect(STEPS_PER_FASTEST_PERIOD).toBe(2);
    const periods = sys.bodies.slice(1).map((b) => keplerPeriod(b.id));
    const fastest = sys.bodies[1 + periods.indexOf(Math.min(...periods))].id;
    expect(fastest).toBe('skerry');
    // the system's derived periods against Kepler's third law: rounding only
    expect(Math.abs(fieldStepLimit(new ShipForces(sys)) / (keplerPeriod('skerry') / 2) - 1)).toBeLessThan(1e-12);
    expect(Math.abs(fieldStepLimit(new ShipForces(sys, { pull: ['ilmar', 'moravel', 'lough'] })) / (keplerPeriod('lough') / 2) - 1)).toBeLessThan(1e-12);
    expect(fieldStepLimit(new ShipForces(sys, { pull: ['ilmar'] }))).toBe(Infinity);
    expect(fieldStepLimit(new ShipForces(sys, { gravity: 'two-body' }))).toBe(Infinity);
    // the n-body model takes it as its default bound, and a caller's own
    expect(new NBodyModel(sys).maxStep).toBe(fieldStepLimit(new ShipForces(sys)));
    expect(new NBodyModel(sys, { pull: ['ilmar'] }).maxStep).toBeUndefined();
    expect(new NBodyModel(sys, { maxStep: DAY }).maxStep).toBe(DAY);
    expect(() => new NBodyModel(sys, { maxStep: 0 })).toThrow(/options\.maxStep must be > 0/);
  });

  it('keeps DOP853 at the n-body default rtol near odex through the moon demo’s cruise to Moravel; without it the steps outrun Skerry’s pull and the error grows tenfold', () => {
    // The conic moon demo's heliocentric coast, from the mid-course burn to 30 days before
    // Moravel's sphere of influence: 730 days, up to 6.7e11 m from the star, passing Moravel's
    // moons at 1e11 m.
    const conic = evaluate(sys, skerryPlan(), { samplesPerSegment: 0 });
    const seg = conic.segments.find((s) => s.central === 0 && s.t1 - s.t0 > 100 * DAY)!;
    const t0 = seg.t0;
    const t1 = seg.t1 - 30 * DAY;
    const x0 = seg.state0.slice(0, 3);
    const v0 = seg.state0.slice(3, 6);
    // odex (independent solver) on the star-centred equations written plainly, steps of at most
    // a day; at rtol 1e-13 it agrees with a DOP853 run at rtol 2.5e-14 and quarter-day steps to 1 cm
    const V = Math.sqrt(sys.bodies[0].mu / L);
    const T = L / V;
    const f = (tt: number, y: number[]): number[] => {
      const a = starCentredAccel(sys, tt * T, [y[0] * L, y[1] * L, y[2] * L]);
      return [y[3], y[4], y[5], (a[0] * T) / V, (a[1] * T) / V, (a[2] * T) / V];
    };
    const ox = new OdexSolverClass(6);
    ox.relativeTolerance = 1e-13;
    ox.absoluteTolerance = 1e-13;
    ox.maxSteps = 1e6;
    ox.maxStepSize = DAY / T;
    const ref = ox.solve(f, t0 / T, [x0[0] / L, x0[1] / L, x0[2] / L, v0[0] / V, v0[1] / V, v0[2] / V], t1 / T);
    expect(ref.outcome).toBe(ODEX_CONVERGED);
    const fly = (maxStep?: number): { miss: number; steps: number } => {
      const m = new NBodyModel(sys, maxStep === undefined ? {} : { maxStep });
      m.origin = 0;
      const r = propagate({ accel: m.accel, t0, x0, v0, tEnd: t1, rtol: m.rtol, atol: m.atol, maxStep: m.maxStep, maxSteps: 1e6 });
      expect(r.spans[0].method).toBe('dop853');
      return { miss: Math.hypot(r.x[0] - ref.y[0] * L, r.x[1] - ref.y[1] * L, r.x[2] - ref.y[2] * L), steps: r.spans[0].stats.accepted };
    };
    const bounded = fly();
    const free = fly(t1 - t0);
    // rtol 1e-10 allows 10–70 m of local error per step this far out; bounded, the flight ends
    // within 30 m of odex (measured 13 m; RK45 at the same rtol 43 m)
    expect(bounded.miss).toBeLessThan(30);
    expect(bounded.steps).toBeGreaterThanOrEqual((t1 - t0) / (keplerPeriod('skerry') / 2));
    // unbounded, DOP853 takes 20–50-day steps over Skerry's 8.4-day period with true local errors
    // above its tolerance (measured 475 m)
    expect(free.steps).toBeLessThan(bounded.steps / 2);
    expect(free.miss).toBeGreaterThan(10 * bounded.miss);
  });
});
