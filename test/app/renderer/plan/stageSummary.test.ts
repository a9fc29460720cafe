import { describe, expect, it } from 'vitest';
import { stageSummaries } from '../../../../app/renderer/plan/stageSummary.ts';

describe('stage summaries', () => {
  it('stacks stages in firing order (Tsiolkovsky by hand, g0 = 9.80665 m/s²)', () => {
    const vehicle = {
      name: 'v',
      payloadMass: 1000,
      stages: [
        { name: 'a', dryMass: 1000, propellantMass: 8000, isp: 300, thrust: 200e3 },
        { name: 'b', dryMass: 500, propellantMass: 2000, isp: 350, thrust: 20e3 },
      ],
    };
    const body = { mu: 9.80665 * 1e12, radius: 1e6 }; // surface gravity exactly g0
    const [a, b] = stageSummaries(vehicle, body);
    // stage a: 12 500 kg → 4 500 kg; stage b: 3 500 kg → 1 500 kg
    expect(a.ignitionMass).toBe(12500);
    expect(a.dv).toBeCloseTo(9.80665 * 300 * Math.log(12500 / 4500), 9);
    expect(b.ignitionMass).toBe(3500);
    expect(b.dv).toBeCloseTo(9.80665 * 350 * Math.log(3500 / 1500), 9);
    expect(a.twr).toBeCloseTo(200e3 / (12500 * 9.80665), 12);
    expect(b.twr).toBeCloseTo(20e3 / (3500 * 9.80665), 12);
  });
});
