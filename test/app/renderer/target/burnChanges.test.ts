import { describe, expect, it } from 'vitest';
import type { LegReport } from '../../../../core/target/index.ts';
import { burnChanges, otherChanges } from '../../../../app/renderer/target/burnChanges.ts';

/** A leg report with only what the grouping reads filled in (the rest as a converged leg would have it). */
function leg(controls: [string, string, number, number][], kind: 'burn-dv' | 'burn-time' = 'burn-dv'): LegReport {
  const report: Omit<LegReport, 'shift'> = {
    name: 'leg',
    kind: 'final',
    status: 'converged',
    message: '',
    goals: [],
    controls: controls.map(([burnId, name, before, after]) => ({
      burnId,
      name,
      kind,
      before,
      after,
      units: kind === 'burn-dv' ? 'm/s' : 'h',
      unitScale: kind === 'burn-dv' ? 1 : 3600,
    })),
    iterations: 1,
    flights: 1,
    residuals: [],
    failure: null,
  };
  return { ...report, shift: 0 } as LegReport;
}

describe('the targeter’s changes per burn', () => {
  it('groups the Δv components by burn: magnitudes before and after and the size of the change (3-4-5 and 3-4-12-13 triangles)', () => {
    const out = burnChanges([
      leg([
        ['a', 'A Δv prograde', 3, 3],
        ['a', 'A Δv normal', 4, 4],
        ['a', 'A Δv binormal', 0, 12],
        ['b', 'B Δv prograde', 10, 7],
      ]),
    ]);
    expect(out.map((b) => b.burnId)).toEqual(['a', 'b']);
    expect(out[0]).toMatchObject({ before: 5, after: 13, change: 12 });
    expect(out[1]).toMatchObject({ before: 10, after: 7, change: 3 });
  });

  it('a burn varied in two legs keeps its first before and its last after', () => {
    const out = burnChanges([leg([['a', 'A Δv prograde', 1, 2]]), leg([['a', 'A Δv prograde', 2, 5]])]);
    expect(out).toHaveLength(1);
    expect(out[0]).toMatchObject({ before: 1, after: 5, change: 4 });
  });

  it('lists the controls that are not Δv components on their own (a burn’s time), first before and last after', () => {
    const legs = [leg([['a', 'A Δv prograde', 1, 2]]), leg([['a', 'A time', 7200, 9000]], 'burn-time'), leg([['a', 'A time', 9000, 10800]], 'burn-time')];
    expect(burnChanges(legs).map((b) => b.burnId)).toEqual(['a']);
    const other = otherChanges(legs);
    expect(other).toHaveLength(1);
    expect(other[0]).toMatchObject({ name: 'A time', before: 7200, after: 10800, units: 'h', unitScale: 3600 });
  });
});
