import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MAX_DECADES, clampLog, decadeTicks, lengthTick, logDomain, powerOfTen, speedTick } from '../../../../app/renderer/gamestep/logAxis.ts';

describe('log error axes', () => {
  it('takes whole decades around the positive values, leaving zero, negatives, non-finite and diverged values out', () => {
    expect(logDomain([0, 3e-3, 42, -5, NaN, Infinity, Number.MAX_VALUE])).toEqual({ lo: 1e-3, hi: 100 });
    expect(logDomain([0, 0])).toBeNull();
    // an exact decade stays the bound; one value gets a decade of room
    expect(logDomain([10, 1000])).toEqual({ lo: 10, hi: 1000 });
    expect(logDomain([5])).toEqual({ lo: 1, hi: 10 });
    // a tolerance line is brought inside the domain
    expect(logDomain([0.5, 3], [1e4])).toEqual({ lo: 0.1, hi: 1e4 });
  });

  it('shows at most MAX_DECADES decades, keeping the top (the large errors matter)', () => {
    const d = logDomain([1e-12, 1e5])!;
    expect(d.hi).toBe(1e5);
    expect(Math.round(Math.log10(d.hi / d.lo))).toBe(MAX_DECADES);
    expect(clampLog(1e-12, d)).toBe(d.lo);
    expect(clampLog(0, d)).toBe(d.lo);
    expect(clampLog(NaN, d)).toBe(d.lo);
    expect(clampLog(Number.MAX_VALUE, d)).toBe(d.hi);
    expect(clampLog(3, d)).toBe(3);
  });

  it('decade ticks fit the lane, are ascending, lie in the domain and include the top decade (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: -20, max: 10 }), fc.integer({ min: 1, max: 14 }), fc.integer({ min: 2, max: 8 }), (e0, n, most) => {
        const d = { lo: 10 ** e0, hi: 10 ** (e0 + n) };
        const t = decadeTicks(d, most);
        expect(t.length).toBeLessThanOrEqual(most);
        expect(t.length).toBeGreaterThanOrEqual(Math.min(2, n + 1));
        expect(t[t.length - 1]).toBeCloseTo(d.hi, 12 - e0 - n);
        for (let k = 1; k < t.length; k++) expect(t[k]).toBeGreaterThan(t[k - 1]);
        for (const v of t) {
          expect(v).toBeGreaterThanOrEqual(d.lo * (1 - 1e-12));
          expect(v).toBeLessThanOrEqual(d.hi * (1 + 1e-12));
        }
      }),
    );
    expect(decadeTicks({ lo: 1e-6, hi: 1e3 }, 4)).toEqual([1e-6, 1e-3, 1, 1e3]);
  });

  it('labels decades in the units a reader expects', () => {
    expect([1e-6, 1e-3, 1e-2, 1, 100, 1e3, 1e4, 1e6, 1e9].map(lengthTick)).toEqual([
      '10⁻⁶ m',
      '1 mm',
      '10 mm',
      '1 m',
      '100 m',
      '1 km',
      '10 km',
      '1000 km',
      '10⁶ km',
    ]);
    expect([1e-4, 1e-3, 1, 1e3].map(speedTick)).toEqual(['10⁻⁴ m/s', '1 mm/s', '1 m/s', '1 km/s']);
    expect(powerOfTen(1e-12)).toBe('10⁻¹²');
    expect(powerOfTen(1e10)).toBe('10¹⁰');
  });
});
