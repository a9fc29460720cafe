/**
 * The Timeline's chart paths, written directly, against d3-shape (an independent library): the
 * same strings as d3.line and d3.area with their default linear curve, for any points.
 */
import * as d3 from 'd3';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { areaPath, linePath } from '../../../../app/renderer/timeline/timelineChart.ts';

const coord = fc.oneof(
  fc.double({ noNaN: true, min: -1e6, max: 1e6 }),
  fc.integer({ min: -2000, max: 2000 }),
  fc.constantFrom(0, -0, 0.1, 1 / 3, 0.0005, -0.0005, Number.NaN, Number.POSITIVE_INFINITY),
);
const points = fc.array(fc.tuple(coord, coord), { maxLength: 60 });

describe('chart paths (d3-shape as the reference)', () => {
  it('linePath draws what d3.line draws, from no point to many', () => {
    fc.assert(
      fc.property(points, (pts) => {
        const xs = pts.map((p) => p[0]);
        const ys = pts.map((p) => p[1]);
        const ref = d3
          .line<number>()
          .x((k) => xs[k])
          .y((k) => ys[k])(d3.range(pts.length));
        expect(linePath(Float64Array.from(xs), Float64Array.from(ys))).toBe(ref);
      }),
    );
  });

  it('areaPath draws what d3.area draws down to a level', () => {
    fc.assert(
      fc.property(points, coord, (pts, base) => {
        const xs = pts.map((p) => p[0]);
        const ys = pts.map((p) => p[1]);
        const ref = d3
          .area<number>()
          .x((k) => xs[k])
          .y0(base)
          .y1((k) => ys[k])(d3.range(pts.length));
        expect(areaPath(Float64Array.from(xs), Float64Array.from(ys), base)).toBe(ref);
      }),
    );
  });

  it('one point: a closed move (as d3), no point: no path', () => {
    expect(linePath([1.5], [10])).toBe('M1.5,10Z');
    expect(areaPath([1.5], [10], 33)).toBe('M1.5,10L1.5,33Z');
    expect(linePath([], [])).toBeNull();
    expect(areaPath([], [], 0)).toBeNull();
  });
});
