import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { InputError } from '../../../core/math/errors.ts';
import { mergeChunk, partitionRows } from '../../../core/search/chunks.ts';
import { createPlanes } from '../../../core/search/planes.ts';

describe('partitionRows', () => {
  it('covers every row once, in order, in at most n bands whose sizes differ by at most one', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5000 }), fc.integer({ min: 1, max: 200 }), (rows, n) => {
        const parts = partitionRows(rows, n);
        expect(parts.length).toBe(Math.min(rows, n));
        let r = 0;
        for (const p of parts) {
          expect(p.rowStart).toBe(r);
          expect(p.rowEnd).toBeGreaterThan(p.rowStart);
          r = p.rowEnd;
        }
        expect(r).toBe(rows);
        const sizes = parts.map((p) => p.rowEnd - p.rowStart);
        expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
      }),
    );
    expect(() => partitionRows(0, 3)).toThrow(InputError);
    expect(() => partitionRows(3, 0)).toThrow(InputError);
  });
});

describe('mergeChunk', () => {
  it('copies a band into its rows and refuses a band that does not fit', () => {
    const full = createPlanes(0, 4, 3);
    const band = createPlanes(1, 2, 3);
    band.dvTotal.set([1, 2, 3, 4, 5, 6]);
    band.revs.set([0, 1, 2, 3, 4, 5]);
    mergeChunk(full, band);
    expect(Array.from(full.dvTotal)).toEqual([0, 0, 0, 1, 2, 3, 4, 5, 6, 0, 0, 0]);
    expect(Array.from(full.revs)).toEqual([0, 0, 0, 0, 1, 2, 3, 4, 5, 0, 0, 0]);
    expect(() => mergeChunk(full, createPlanes(3, 2, 3))).toThrow(InputError);
    expect(() => mergeChunk(full, createPlanes(0, 1, 4))).toThrow(InputError);
  });
});
