import { describe, expect, it } from 'vitest';
import { add, angleBetween, cross, dot, norm, normalize, sub } from '../../../core/math/vec3.ts';

describe('vec3', () => {
  it('cross product of the basis follows the right-hand rule (analytic)', () => {
    expect(cross([1, 0, 0], [0, 1, 0])).toEqual([0, 0, 1]);
    expect(cross([0, 1, 0], [0, 0, 1])).toEqual([1, 0, 0]);
  });
  it('writes into out and allows aliasing', () => {
    const a = [1, 2, 3];
    const r = cross(a, [4, 5, 6], a);
    expect(r).toBe(a);
    expect(a).toEqual([-3, 6, -3]);
    expect(add([1, 1, 1], [1, 2, 3])).toEqual([2, 3, 4]);
    expect(sub([1, 1, 1], [1, 2, 3])).toEqual([0, -1, -2]);
  });
  it('norm, dot, normalize, angle', () => {
    expect(norm([3, 4, 12])).toBe(13);
    expect(dot([1, 2, 3], [4, 5, 6])).toBe(32);
    expect(norm(normalize([3, 4, 12]))).toBeCloseTo(1, 15);
    expect(angleBetween([1, 0, 0], [0, 2, 0])).toBeCloseTo(Math.PI / 2, 15);
    expect(angleBetween([1, 0, 0], [-1, 1e-12, 0])).toBeCloseTo(Math.PI, 11);
  });
});
