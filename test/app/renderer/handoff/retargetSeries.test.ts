import { describe, expect, it } from 'vitest';
import type { ErrorCurve, RetargetResult } from '../../../../core/handoff/index.ts';
import { CURVE_LABELS, retargetLaneData, splitExtrapolated } from '../../../../app/renderer/handoff/retargetSeries.ts';

const curve = (error: number[], flags: number[]): ErrorCurve => ({
  t: Float64Array.from(error, (_, i) => 100 * i),
  error: Float64Array.from(error),
  extrapolated: Uint8Array.from(flags),
});
const result = (before: ErrorCurve | null, after: ErrorCurve) => ({ curves: { before, after } }) as unknown as RetargetResult;

describe('splitExtrapolated', () => {
  it('a stretch is extrapolated when either end is; runs share their boundary sample and cover every sample', () => {
    expect(splitExtrapolated([0, 0, 1, 1, 0, 0])).toEqual([
      { extrapolated: false, from: 0, to: 1 },
      { extrapolated: true, from: 1, to: 4 },
      { extrapolated: false, from: 4, to: 5 },
    ]);
    expect(splitExtrapolated([1])).toEqual([{ extrapolated: true, from: 0, to: 0 }]);
    expect(splitExtrapolated([])).toEqual([]);
    expect(splitExtrapolated([0, 0, 0])).toEqual([{ extrapolated: false, from: 0, to: 2 }]);
  });
});

describe('retargetLaneData', () => {
  it('both curves, labelled, on one whole-decade log domain covering both; the largest and last values', () => {
    const d = retargetLaneData(result(curve([0, 3e3, 2e6, 4e6], [0, 1, 1, 0]), curve([0, 2, 40, 900], [0, 1, 1, 0])));
    expect(d.curves.map((c) => c.label)).toEqual([CURVE_LABELS.before, CURVE_LABELS.after]);
    expect(d.domain).toEqual({ lo: 1, hi: 1e7 });
    expect(d.curves[0].max).toBe(4e6);
    expect(d.curves[1].end).toBe(900);
    expect(d.hasExtrapolated).toBe(true);
  });

  it('without the comparison only the retargeted curve; a diverged (non-finite) sample is left out of the domain and the extent', () => {
    const d = retargetLaneData(result(null, curve([5, 50, Number.NaN], [0, 0, 0])));
    expect(d.curves.map((c) => c.key)).toEqual(['after']);
    expect(d.domain).toEqual({ lo: 1, hi: 100 });
    expect(d.curves[0].max).toBe(50);
    expect(Number.isNaN(d.curves[0].end)).toBe(true);
    expect(d.hasExtrapolated).toBe(false);
  });
});
