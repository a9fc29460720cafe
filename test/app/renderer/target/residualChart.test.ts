import { describe, expect, it } from 'vitest';
import { decade, residualChart } from '../../../../app/renderer/target/residualChart.ts';

describe('the residual chart', () => {
  it('writes decades with superscripts', () => {
    expect(decade(0)).toBe('1');
    expect(decade(1)).toBe('10');
    expect(decade(3)).toBe('10³');
    expect(decade(-2)).toBe('10⁻²');
    expect(decade(12)).toBe('10¹²');
  });

  it('draws one path per leg on a log scale, with the met line at a residual of 1', () => {
    const c = residualChart(
      [
        { leg: 1, flights: 1, residual: 1e6 },
        { leg: 1, flights: 10, residual: 1e2 },
        { leg: 1, flights: 20, residual: 0.05 },
        { leg: 2, flights: 21, residual: 3e3 },
        { leg: 2, flights: 40, residual: 0.2 },
      ],
      300,
      80,
    )!;
    expect(c.legs.map((l) => l.leg)).toEqual([1, 2]);
    expect(c.flights).toBe(40);
    // decades 10⁻² … 10⁶ span the plot: 1 lies 2/8 of the way up from the bottom
    expect(c.metY).toBeCloseTo(c.bottom - ((c.bottom - c.top) * 2) / 8, 9);
    // the last point of leg 2 is at the right end, at 0.2 (log10 0.2 ≈ −0.699 → (2 − 0.699)/8 up)
    expect(c.legs[1].lastX).toBeCloseTo(c.right, 9);
    expect(c.legs[1].lastY).toBeCloseTo(c.bottom - ((c.bottom - c.top) * (2 + Math.log10(0.2))) / 8, 9);
    // eight decades: every other one labelled, counted from 1, so no label crowds the "met" line's
    expect(c.yTicks.map((t) => t.label)).toEqual(['10⁻²', '1', '10²', '10⁴', '10⁶']);
    for (const l of c.legs) expect(l.d).toMatch(/^M[\d.]+,[\d.]+/);
  });

  it('is null without a point to draw', () => {
    expect(residualChart([], 300, 80)).toBeNull();
    expect(residualChart([{ leg: 1, flights: 1, residual: Number.POSITIVE_INFINITY }], 300, 80)).toBeNull();
  });
});
