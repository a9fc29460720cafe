import { describe, expect, it } from 'vitest';
import { addResidual, legStart, targetFraction, type ResidualPoint } from '../../../../app/renderer/target/progress.ts';

const p = (leg: number, flights: number, residual: number) => ({ leg, legs: 2, legName: `leg ${leg}`, flights, residual });

describe('targeting progress', () => {
  it('counts legs done plus the residual fallen on a log scale towards 1 (hand computed)', () => {
    // leg 1 of 2 from 1e6 down to 1e3: half the decades to 1 → (0 + 0.5) / 2
    expect(targetFraction(p(1, 10, 1e3), 1e6)).toBeCloseTo(0.25, 12);
    // leg 2 at its start: one leg done
    expect(targetFraction(p(2, 30, 500), 500)).toBeCloseTo(0.5, 12);
    // at or below 1 a leg shows nearly done, never beyond the run's end
    expect(targetFraction(p(2, 40, 0.5), 500)).toBeCloseTo((1 + 0.97) / 2, 12);
    expect(targetFraction(p(2, 40, 0.5), 500)).toBeLessThan(1);
    // a residual above where the leg started does not go backwards past the leg's start
    expect(targetFraction(p(1, 3, 2e6), 1e6)).toBe(0);
  });

  it('gives a finite fraction for a failed flight (infinite residual) or no start', () => {
    expect(targetFraction(p(1, 1, Number.POSITIVE_INFINITY), Number.NaN)).toBe(0);
    expect(targetFraction({ ...p(1, 1, 5), legs: 0 }, 5)).toBe(0);
  });

  it('keeps a point only when the residual falls or a new leg starts', () => {
    let s: readonly ResidualPoint[] = [];
    s = addResidual(s, p(1, 1, 100));
    s = addResidual(s, p(1, 2, 120)); // worse: not drawn
    const same = s;
    expect(addResidual(s, p(1, 3, 100))).toBe(same); // no fall: the same array back
    s = addResidual(s, p(1, 4, 10));
    s = addResidual(s, p(1, 5, Number.POSITIVE_INFINITY)); // a failed flight
    s = addResidual(s, p(2, 6, 300)); // a new leg starts higher
    expect(s).toEqual([
      { leg: 1, flights: 1, residual: 100 },
      { leg: 1, flights: 4, residual: 10 },
      { leg: 2, flights: 6, residual: 300 },
    ]);
    expect(legStart(s, 2)).toBe(300);
    expect(legStart(s, 3)).toBeNaN();
  });
});
