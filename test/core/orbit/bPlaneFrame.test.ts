import { describe, expect, it } from 'vitest';
import { bPlaneFrame } from '../../../core/orbit/bPlaneFrame.ts';

describe('bPlaneFrame', () => {
  it('gives T in the reference plane and perpendicular to Ŝ, R = Ŝ × T, an orthonormal right-handed triad (definition of the B-plane axes)', () => {
    const out = new Float64Array(6);
    for (const S of [
      [0.6, 0.8, 0],
      [0.48, -0.6, 0.64],
      [-0.36, 0.48, -0.8],
    ]) {
      bPlaneFrame(S[0], S[1], S[2], out);
      const T = [out[0], out[1], out[2]];
      const R = [out[3], out[4], out[5]];
      const dot = (a: number[], b: number[]) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
      // rounding of unit vectors: a few ulps
      expect(T[2]).toBe(0);
      expect(Math.abs(dot(T, T) - 1)).toBeLessThan(1e-15);
      expect(Math.abs(dot(R, R) - 1)).toBeLessThan(1e-15);
      expect(Math.abs(dot(T, S))).toBeLessThan(1e-15);
      expect(Math.abs(dot(R, S))).toBeLessThan(1e-15);
      // T = Ŝ × ẑ / |…| = (Sy, −Sx, 0)/√(Sx²+Sy²)
      const n = Math.hypot(S[0], S[1]);
      expect(T[0]).toBeCloseTo(S[1] / n, 15);
      expect(T[1]).toBeCloseTo(-S[0] / n, 15);
    }
  });

  it('falls back to T = x̂ when Ŝ is along ẑ', () => {
    const out = bPlaneFrame(0, 0, 1, new Float64Array(6));
    expect(Array.from(out)).toEqual([1, 0, 0, 0, 1, 0]);
  });
});
