import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { BASIS_EXTRAPOLATED, BASIS_MEASURED, BASIS_MEASURED_PLUS } from '../../../../core/gamestep/check.ts';
import { errorLanes, splitByBasis, styleOf } from '../../../../app/renderer/gamestep/errorSeries.ts';
import { demoCheck } from './fixture.ts';

const M = BASIS_MEASURED;
const E = BASIS_EXTRAPOLATED;
const C = BASIS_MEASURED_PLUS;

describe('game-step error series split by basis', () => {
  it('gives each stretch the weaker basis of its ends, neighbouring runs sharing their boundary sample', () => {
    expect(splitByBasis([M, M, E, E, C, C, M])).toEqual([
      { style: 'measured', from: 0, to: 1 },
      { style: 'extrapolated', from: 1, to: 4 },
      { style: 'carried', from: 4, to: 6 },
    ]);
    expect(splitByBasis([M, M, M])).toEqual([{ style: 'measured', from: 0, to: 2 }]);
    expect(splitByBasis([E])).toEqual([{ style: 'extrapolated', from: 0, to: 0 }]);
    expect(splitByBasis([])).toEqual([]);
  });

  it('covers every sample in order, each run at least one stretch long, no two neighbours alike (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(M, E, C), { minLength: 2, maxLength: 60 }), (basis) => {
        const runs = splitByBasis(basis);
        expect(runs[0].from).toBe(0);
        expect(runs[runs.length - 1].to).toBe(basis.length - 1);
        for (let k = 0; k < runs.length; k++) {
          expect(runs[k].to).toBeGreaterThan(runs[k].from);
          if (k > 0) {
            expect(runs[k].from).toBe(runs[k - 1].to);
            expect(runs[k].style).not.toBe(runs[k - 1].style);
          }
          // a solid run has only measured ends
          if (runs[k].style === 'measured') for (let i = runs[k].from; i <= runs[k].to; i++) expect(styleOf(basis[i])).toBe('measured');
          // an extrapolated run touches an extrapolated sample in every stretch
          if (runs[k].style === 'extrapolated') {
            for (let i = runs[k].from; i < runs[k].to; i++) expect(basis[i] === E || basis[i + 1] === E).toBe(true);
          }
        }
      }),
    );
  });

  it('reads the lanes off a demo check: one value per sample, both bases, the tolerance and the reference accuracy as lines', () => {
    const r = demoCheck();
    const l = errorLanes(r);
    expect(l.t.length).toBe(r.series.t.length);
    expect(l.lanes.map((x) => x.key)).toEqual(['position', 'velocity', 'energy']);
    for (const lane of l.lanes) {
      expect(lane.values.length).toBe(l.t.length);
      expect(lane.domain).not.toBeNull();
      let max = 0;
      for (const v of lane.values) {
        expect(v).toBeGreaterThanOrEqual(0);
        max = Math.max(max, v);
      }
      expect(lane.domain!.hi).toBeGreaterThanOrEqual(max);
    }
    // energy lane is |relative energy error|
    expect(Array.from(l.lanes[2].values)).toEqual(Array.from(r.series.energyError, Math.abs));
    expect(l.hasExtrapolated).toBe(true); // the cruise is over the test's step budget
    expect(l.runs.some((x) => x.style === 'measured')).toBe(true);
    expect(l.lanes[0].lines.map((x) => x.kind)).toEqual(['tolerance', 'resolution']);
    expect(l.lanes[0].lines[0].value).toBe(r.tolerance);
    expect(l.firstExceed).toBe(r.firstExceed ? r.firstExceed.t : null);
  });
});
