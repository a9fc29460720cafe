import { describe, expect, it } from 'vitest';
import { checkStability } from '../../../../core/checks/stability.ts';
import { histories, linearTicks, paddedDomain, tickLabels, yearTicks } from '../../../../app/renderer/stability/historySeries.ts';
import { demoSystem } from '../../../core/plan/helpers.ts';

const system = demoSystem();
const run = checkStability(system, { years: 20, samples: 200 });

describe('stability history series', () => {
  it('pads a domain around its values, and gives a flat series a band of its own', () => {
    expect(paddedDomain([1, 2, 3])).toEqual([1 - 0.16, 3 + 0.16]);
    const [lo, hi] = paddedDomain([0.012, 0.012, 0.012]);
    expect(lo).toBeLessThan(0.012);
    expect(hi).toBeGreaterThan(0.012);
    expect(hi - lo).toBeCloseTo(2 * 0.012e-6, 12);
    expect(paddedDomain([0, 0])).toEqual([-1e-12, 1e-12]);
    expect(paddedDomain([NaN, 5, Infinity, 7])).toEqual([5 - 0.16, 7 + 0.16]);
    expect(paddedDomain([])).toEqual([0, 1]);
  });

  it("labels ticks with d3's precision, and tiny or huge values as powers of ten; neighbouring labels always differ", () => {
    expect(linearTicks(0, 1, 3).map((t) => t.label)).toEqual(['0.0', '0.5', '1.0']);
    expect(linearTicks(-2.4e-4, 2.4e-4, 3).map((t) => t.label)).toEqual(['\u22122.0e\u22124', '0', '2.0e\u22124']);
    expect(tickLabels([1e7, 2e7], 1e7, 2e7, 2)).toEqual(['1.0e+7', '2.0e+7']);
    for (const [lo, hi] of [
      [0.0119999, 0.0120001],
      [1.09999, 1.10001],
      [-3e-13, 5e-13],
      [110e9, 110.0001e9],
    ]) {
      const labels = linearTicks(lo, hi, 3).map((t) => t.label);
      expect(labels.length).toBeGreaterThanOrEqual(2);
      expect(new Set(labels).size).toBe(labels.length);
      for (const l of labels) expect(l).not.toMatch(/NaN/);
    }
  });

  it('thins year ticks to the room of an axis, digits grouped', () => {
    expect(yearTicks(10_000, 2).map((t) => t.label)).toEqual(['0', '5\u202f000', '10\u202f000']);
    for (const n of [1, 2, 3, 5, 8]) for (const span of [7, 200, 10_000, 123_456]) expect(yearTicks(span, n).length).toBeLessThanOrEqual(n + 1);
  });

  it('reads a demo run: years from the epoch, a in percent of its epoch value (0 at the start), i in degrees', () => {
    const h = histories(system, run);
    expect(h.years.length).toBe(run.t.length);
    expect(h.years[h.years.length - 1]).toBeCloseTo(20, 6);
    expect(h.span).toBeCloseTo(20, 6);
    expect(h.bodies.map((b) => b.name)).toEqual(run.bodies.map((b) => b.name));
    const tessel = h.bodies.find((b) => b.name === 'Tessel')!;
    const src = run.bodies.find((b) => b.name === 'Tessel')!;
    const [a, e, i] = tessel.panels;
    expect(a.values[0]).toBe(0);
    const k = 57;
    expect(a.values[k]).toBeCloseTo(((src.history.a[k] - src.history.a[0]) / src.history.a[0]) * 100, 12);
    expect(e.values).toBe(src.history.e);
    expect(i.values[k]).toBeCloseTo((src.history.i[k] * 180) / Math.PI, 12);
    expect(tessel.about).toBe('about Ilmar');
    for (const b of h.bodies) for (const p of b.panels) for (const v of p.values) expect(v >= p.domain[0] && v <= p.domain[1]).toBe(true);
    expect(h.energy.values).toBe(run.energy.history);
    expect(h.yearTicks[0]).toEqual({ v: 0, label: '0' });
    expect(h.yearTicks[h.yearTicks.length - 1].v).toBeLessThanOrEqual(20);
  });
});
