import { describe, expect, it } from 'vitest';
import type { LegReport } from '../../../../core/target/index.ts';
import { burnChanges } from '../../../../app/renderer/target/burnChanges.ts';

function leg(controls: [string, string, number, number][]): LegReport {
  return {
    name: 'leg',
    kind: 'final',
    status: 'converged',
    message: '',
    goals: [],
    controls: controls.map(([burnId, name, before, after]) => ({ burnId, name, before, after, units: 'm/s' as const })),
    iterations: 1,
    flights: 1,
    residuals: [],
    failure: null,
  };
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
});
