import { describe, expect, it } from 'vitest';
import { createPlanes, FLOAT_PLANES, INT_PLANES, planeBuffers } from '../../../core/search/planes.ts';

describe('porkchop planes', () => {
  it('hold one typed array per quantity, nRows × nCols cells each, row-major from rowStart', () => {
    const p = createPlanes(7, 3, 5);
    expect([p.rowStart, p.nRows, p.nCols]).toEqual([7, 3, 5]);
    for (const k of FLOAT_PLANES) {
      expect(p[k]).toBeInstanceOf(Float32Array);
      expect(p[k].length).toBe(15);
    }
    for (const k of INT_PLANES) {
      expect(p[k]).toBeInstanceOf(Int8Array);
      expect(p[k].length).toBe(15);
    }
    expect(FLOAT_PLANES.length + INT_PLANES.length).toBe(8);
  });

  it('give each plane its own buffer, so a transfer list moves all eight without aliasing', () => {
    const p = createPlanes(0, 4, 4);
    const bufs = planeBuffers(p);
    expect(bufs.length).toBe(8);
    expect(new Set(bufs).size).toBe(8);
    p.dvTotal[5] = 1.5;
    expect(p.dvDepart[5]).toBe(0);
    expect(bufs[FLOAT_PLANES.indexOf('dvTotal')]).toBe(p.dvTotal.buffer);
    // structured cloning with the buffers transferred hands over the data and detaches the source
    const moved = structuredClone(p, { transfer: bufs });
    expect(moved.dvTotal[5]).toBe(1.5);
    expect(p.dvTotal.length).toBe(0);
  });

  it('store values rounded to binary32: relative error at most 2^−24, below 1 mm/s up to 16.7 km/s (IEEE 754 binary32, round to nearest)', () => {
    const p = createPlanes(0, 1, 1);
    const u = 2 ** -24; // unit roundoff of binary32
    let worst = 0;
    for (let k = 0; k < 20000; k++) {
      const v = 100 + k * 0.8312345; // 100 m/s to 16.7 km/s
      p.dvTotal[0] = v;
      const err = Math.abs(p.dvTotal[0] - v);
      expect(err).toBeLessThanOrEqual(u * v);
      worst = Math.max(worst, err);
    }
    expect(worst).toBeLessThan(1e-3);
  });
});
