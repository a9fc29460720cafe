import { describe, expect, it } from 'vitest';
import { solveLambert } from '../../../core/orbit/lambert.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { demoSystem } from '../plan/helpers.ts';

/**
 * The demo transfer window (test/fixtures/demoPlan.ts): repeats the 1-day refinement of the scan
 * that picked departure day 162, flight time 241 days. Cost: departure burn from a 300 km circular
 * orbit at Tessel plus a circular capture at 300 km at Ochre, √(v∞² + 2μ/r) − √(μ/r) at each end
 * (Curtis, eq. 8.42, from memory).
 */
describe('demo transfer window', () => {
  it('Tessel → Ochre: the cheapest single-revolution transfer near day 160 departs on day 162 and flies 241 days', () => {
    const system = demoSystem();
    const T = system.indexById['tessel'];
    const O = system.indexById['ochre'];
    const muS = system.bodies[0].mu;
    const cost = (mu: number, r: number, vinf: number): number => Math.sqrt(vinf ** 2 + (2 * mu) / r) - Math.sqrt(mu / r);
    const s1 = new Float64Array(6);
    const s2 = new Float64Array(6);
    let best = { dep: 0, tof: 0, dv: Infinity };
    for (let dep = 150; dep <= 175; dep++) {
      for (let tof = 225; tof <= 255; tof++) {
        bodyState(system, T, dep * 86400, s1);
        bodyState(system, O, (dep + tof) * 86400, s2);
        const sol = solveLambert(muS, s1.subarray(0, 3), s2.subarray(0, 3), tof * 86400)[0];
        const v1 = Math.hypot(sol.v1[0] - s1[3], sol.v1[1] - s1[4], sol.v1[2] - s1[5]);
        const v2 = Math.hypot(sol.v2[0] - s2[3], sol.v2[1] - s2[4], sol.v2[2] - s2[5]);
        const dv = cost(system.bodies[T].mu, 6.2e6, v1) + cost(system.bodies[O].mu, 3.7e6, v2);
        if (dv < best.dv) best = { dep, tof, dv };
      }
    }
    expect(best.dep).toBe(162);
    expect(best.tof).toBe(241);
    expect(best.dv).toBeGreaterThan(5700);
    expect(best.dv).toBeLessThan(5900);
  });
});
