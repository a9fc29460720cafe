import { describe, expect, it } from 'vitest';
import { sequencePaths } from '../../../../app/renderer/windows/sequencePaths.ts';
import { searchSequence } from '../../../../core/search/index.ts';
import { bodyPosition } from '../../../../core/system/index.ts';
import { demoSystem } from '../../../core/search/fixtures.ts';

const system = demoSystem();
const idx = (id: string) => system.indexById[id];

describe('sequence legs for the System view', () => {
  // a search the size of the Windows screen's default (one synodic period of Tessel and Moravel)
  const result = searchSequence(system, {
    bodies: ['tessel', 'moravel', 'fennick'],
    departFrom: 0,
    departTo: 283 * 86400,
    departAltitude: 300e3,
    arriveAltitude: 104e3,
    arriveE: 0,
    keep: 2,
  });

  it('each leg runs from its body at departure to the next body at arrival, about the star', () => {
    expect(result.solutions.length).toBeGreaterThan(0);
    const sol = result.solutions[0];
    const paths = sequencePaths(system, sol, 50);
    expect(paths.map((p) => [p.from, p.to])).toEqual([
      ['tessel', 'moravel'],
      ['moravel', 'fennick'],
    ]);
    const r = [0, 0, 0];
    paths.forEach((p, k) => {
      const leg = sol.legs[k];
      expect(p.central).toBe(0);
      expect(p.points.length).toBe(150);
      bodyPosition(system, idx(leg.from), leg.depart, r);
      expect(Math.hypot(p.points[0] - r[0], p.points[1] - r[1], p.points[2] - r[2])).toBe(0); // the arc starts at the body's position, copied
      // the arc, flown by the universal-variable propagator, ends at the arrival body as the ephemeris places it:
      // 1e-12 of the distance: measured up to 8e-15 (the Lambert solution converged to round-off, then propagated
      // over thousands of days); a wrong revolution or branch would miss by a fraction of the orbit
      bodyPosition(system, idx(leg.to), leg.arrive, r);
      const n = p.points.length;
      const miss = Math.hypot(p.points[n - 3] - r[0], p.points[n - 2] - r[1], p.points[n - 1] - r[2]);
      expect(miss).toBeLessThan(1e-12 * Math.hypot(r[0], r[1], r[2]));
      for (const x of p.points) expect(Number.isFinite(x)).toBe(true);
    });
  });
});
