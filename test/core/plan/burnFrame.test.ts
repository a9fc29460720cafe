import { describe, expect, it } from 'vitest';
import { burnToInertial, inertialToBurn } from '../../../core/plan/burnFrame.ts';

describe('burn frames', () => {
  // circular orbit in the xy plane at +x moving +y: V = +y, N = +z, B = V × N = +x; R = +x, T = +y
  const r = [7e6, 0, 0];
  const v = [0, 7.5e3, 0];
  it('VNB on a circular equatorial orbit: [v, n, b] → [b, v, n] in xyz (frame definitions, Vallado §3.3)', () => {
    expect(burnToInertial('vnb', r, v, [1, 2, 3])).toEqual([3, 1, 2]);
  });
  it('RTN: [r, t, n] → xyz', () => {
    expect(burnToInertial('rtn', r, v, [1, 2, 3])).toEqual([1, 2, 3]);
  });
  it('inertial passes through; round trips invert', () => {
    expect(burnToInertial('inertial', r, v, [1, 2, 3])).toEqual([1, 2, 3]);
    const r2 = [1e7, -3e6, 2e6];
    const v2 = [1e3, 6e3, -2e3];
    for (const f of ['vnb', 'rtn', 'inertial'] as const) {
      const w = burnToInertial(f, r2, v2, [10, -20, 5]);
      const back = inertialToBurn(f, r2, v2, w);
      expect(back[0]).toBeCloseTo(10, 12);
      expect(back[1]).toBeCloseTo(-20, 12);
      expect(back[2]).toBeCloseTo(5, 12);
    }
  });
  it('r ∥ v has no local frame: InputError', () => {
    expect(() => burnToInertial('vnb', [1, 0, 0], [2, 0, 0], [1, 0, 0])).toThrow(/parallel/);
  });
});
