import { describe, expect, it } from 'vitest';
import { burnDuration, G0, propellantForDeltaV, rocketDeltaV, thrustToWeight } from '../../../core/plan/rocket.ts';

describe('rocket equation', () => {
  it('uses standard gravity 9.80665 m/s² (conventional value, common practice)', () => {
    expect(G0).toBe(9.80665);
  });
  it('mass ratio e gives Δv = exhaust velocity (analytic identity of Tsiolkovsky)', () => {
    expect(rocketDeltaV(300, Math.E * 1000, 1000)).toBeCloseTo(300 * 9.80665, 9);
  });
  it('matches a hand calculation: Isp 450 s, 100 t → 25 t gives 6117.9 m/s (ln 4 · 450 · g0)', () => {
    // 450 · 9.80665 · ln 4 = 4412.9925 · 1.3862944 = 6117.68 m/s
    expect(rocketDeltaV(450, 100e3, 25e3)).toBeCloseTo(6117.68, 1);
  });
  it('propellant for a Δv inverts the rocket equation (analytic)', () => {
    const m0 = 12000;
    const mp = propellantForDeltaV(320, m0, 1500);
    expect(rocketDeltaV(320, m0, m0 - mp)).toBeCloseTo(1500, 9);
  });
  it('burn duration is propellant over mass flow (analytic, constant thrust)', () => {
    const thrust = 20e3;
    const isp = 320;
    const mdot = thrust / (G0 * isp);
    expect(burnDuration(thrust, isp, 12000, 1500)).toBeCloseTo(propellantForDeltaV(isp, 12000, 1500) / mdot, 9);
    // small-Δv limit: t = (m0·Δv/F)(1 − x/2 + x²/6 − …), x = Δv/ve = 3.2e-6; the first two terms
    // leave x²/6 = 1.7e-12 of t = 6e-3 s, 1e-14 s (the first term alone is off by 9.6e-9 s)
    const x = 0.01 / (isp * G0);
    expect(Math.abs(burnDuration(thrust, isp, 12000, 0.01) - ((12000 * 0.01) / thrust) * (1 - x / 2))).toBeLessThan(2e-14);
  });
  it('thrust to weight', () => {
    expect(thrustToWeight(98066.5, 10000, G0)).toBeCloseTo(1, 12);
  });
  it('rejects bad input with the field named', () => {
    expect(() => rocketDeltaV(0, 10, 5)).toThrow(/isp must be > 0/);
    expect(() => rocketDeltaV(300, 5, 10)).toThrow(/mf must be <= m0/);
    expect(() => propellantForDeltaV(300, 10, NaN)).toThrow(/dv must be a finite number/);
  });
});
