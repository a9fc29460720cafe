import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FLOAT32_MAX, ulp32 } from '../../../core/gamestep/float32.ts';
import { GameCraft, kernelFor } from '../../../core/gamestep/kernel.ts';

// IEEE 754 binary32: positive values are ordered like their bit patterns, so the next value up
// is the pattern plus one — an independent way to get the spacing.
function nextUp32(x: number): number {
  const f = new Float32Array([x]);
  const u = new Uint32Array(f.buffer);
  u[0] += 1;
  return f[0];
}

describe('float32 spacing (IEEE 754 binary32)', () => {
  it('is 2^(e−23) for x in [2^e, 2^(e+1)) and equals the gap to the next binary32 value', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-30, max: 1e30, noNaN: true }), (y) => {
        const x = Math.fround(y);
        const e = Math.floor(Math.log2(x));
        const spacing = ulp32(x);
        expect(spacing).toBe(nextUp32(x) - x);
        // the formula, with e fixed exactly by the power-of-two bracket
        const ee = 2 ** e > x ? e - 1 : 2 ** (e + 1) <= x ? e + 1 : e;
        expect(spacing).toBe(2 ** (ee - 23));
      }),
      { numRuns: 2000 },
    );
  });

  it('matches known values: 2^-23 at 1 (FLT_EPSILON of the C standard, from memory), 0.5 m at 6,200 km, 8,192 m at 1.1e11 m', () => {
    expect(ulp32(1)).toBe(1.1920928955078125e-7);
    expect(ulp32(6.2e6)).toBe(0.5);
    expect(ulp32(1.1e11)).toBe(8192);
    expect(ulp32(2 ** 24)).toBe(2); // 16,777,216: above it odd integers are not representable
    expect(ulp32(2 ** 24 - 1)).toBe(1);
    expect(ulp32(1e-40)).toBe(2 ** -149); // subnormal
    expect(() => ulp32(FLOAT32_MAX * 2)).toThrow(/binary32 range/);
  });

  it('a float32 position at distance x resolves motion in steps of exactly ulp32(x)', () => {
    const K = kernelFor('float32');
    for (const x of [6.2e6, 6.8e8, 1.1e11]) {
      const spacing = ulp32(x);
      const h = Math.fround(1 / 60);
      // a step's motion just under half the spacing is rounded away ...
      const slow = new GameCraft(Math.fround);
      slow.px = Math.fround(x);
      slow.ux = Math.fround((0.49 * spacing) / h);
      K.advance(slow, 'symplectic-euler', 0, h, 1000);
      expect(slow.px).toBe(Math.fround(x));
      // ... just over half moves the craft by exactly one spacing per step
      const fast = new GameCraft(Math.fround);
      fast.px = Math.fround(x);
      fast.ux = Math.fround((0.51 * spacing) / h);
      const p0 = fast.px;
      K.advance(fast, 'symplectic-euler', 0, h, 1);
      expect(fast.px - p0).toBe(spacing);
      K.advance(fast, 'symplectic-euler', 0, h, 9);
      expect(fast.px - p0).toBe(10 * spacing);
    }
  });
});
