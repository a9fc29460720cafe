/**
 * RK45 near singular close approaches and surface impacts, alone and through the propagation
 * front door: the CI budget of the rk45 fuzz target (test/fuzz/rk45Cases.ts — radial falls into
 * a point mass, grazing passes down to e = 1 − 10⁻⁹), and two fixed cases checked against the
 * analytic radial fall.
 */
import { describe, expect, it } from 'vitest';
import { propagate } from '../../core/integrate/propagate.ts';
import { rk45 } from '../../core/integrate/rk45.ts';
import { TARGETS } from '../fuzz/targets.ts';
import { count, runBudget } from './budget.ts';

const MU = 3.986004418e14; // Earth, reference input (Vallado, 4th ed., Table D-3, from memory)

const fall = (mu: number) => (_t: number, y: Float64Array, dy: Float64Array) => {
  const r2 = y[0] * y[0] + y[1] * y[1] + y[2] * y[2];
  const k = -mu / (r2 * Math.sqrt(r2));
  dy[0] = y[3];
  dy[1] = y[4];
  dy[2] = y[5];
  dy[3] = k * y[0];
  dy[4] = k * y[1];
  dy[5] = k * y[2];
};

/** Radial free fall from rest at r0 to radius r: t = √(r0³/2μ)·(√(x(1−x)) + acos √x), x = r/r0 (analytic; Bate, Mueller & White, ch. 4, from memory). */
const fallTime = (r0: number, r: number) => Math.sqrt(r0 ** 3 / (2 * MU)) * (Math.sqrt((r / r0) * (1 - r / r0)) + Math.acos(Math.sqrt(r / r0)));

describe('RK45 near singularities, fuzzed', () => {
  it('stops at the surface event at the analytic time, or ends with a failure status, or falls back with its reason; finite, within its step budget, never a hang', () => {
    const outcomes = runBudget(TARGETS.rk45, 400);
    expect(count(outcomes, 'rk45: event') + count(outcomes, 'propagate: event')).toBeGreaterThan(100);
    expect(count(outcomes, 'rk45: step-') + count(outcomes, 'propagate: step-')).toBeGreaterThan(50);
  });
});

describe('RK45: a radial fall from rest into a point mass', () => {
  const r0 = 7e6;
  const y0 = [r0, 0, 0, 0, 0, 0];
  const tEnd = 2 * fallTime(r0, 0);
  const atol = [1e-3, 1e-3, 1e-3, 1e-6, 1e-6, 1e-6];

  it('with a surface at 6,378 km it stops there, at the analytic fall time to 1e-9', () => {
    const R = 6.378e6;
    const r = rk45(fall(MU), 0, y0, tEnd, { rtol: 1e-11, atol, events: [{ g: (_t, y) => Math.hypot(y[0], y[1], y[2]) - R, terminal: true, direction: -1 }] });
    expect(r.status).toBe('event');
    expect(Math.abs(r.t - fallTime(r0, R)) / fallTime(r0, R)).toBeLessThan(1e-9);
  });

  it('without a surface it stops short of the centre with a failure status within its budget; propagate() says why it did not fall back', () => {
    const r = rk45(fall(MU), 0, y0, tEnd, { rtol: 1e-9, atol, maxSteps: 20_000 });
    expect(['step-underflow', 'step-budget']).toContain(r.status);
    expect(r.t).toBeLessThan(fallTime(r0, 0));
    expect(r.stats.accepted + r.stats.rejected).toBeLessThanOrEqual(20_000);
    expect(r.y.every(Number.isFinite)).toBe(true);
    const p = propagate({
      accel: (_t, x, _v, out) => {
        const r2 = x[0] * x[0] + x[1] * x[1] + x[2] * x[2];
        const k = -MU / (r2 * Math.sqrt(r2));
        out[0] = k * x[0];
        out[1] = k * x[1];
        out[2] = k * x[2];
      },
      t0: 0,
      x0: [r0, 0, 0],
      v0: [0, 0, 0],
      tEnd,
      rtol: 1e-9,
      maxSteps: 20_000,
    });
    expect(p.spans[0].method).toBe('rk45');
    if (p.spans.length > 1) expect(p.spans[1].reason).toMatch(/^RK45 failed: step-/);
    else expect(p.message).toMatch(/no fallback/);
  });
});
