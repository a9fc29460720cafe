import { rgb } from 'd3';
import { describe, expect, it } from 'vitest';
import {
  flightSpan,
  LEVELS,
  LINE_ALPHA,
  levelValue,
  plotLevels,
  RAMP,
  rasterPorkchop,
  type RasterGrid,
} from '../../../../app/renderer/windows/porkchopRaster.ts';

const DAY = 86400;

/** A grid of nDep × nSec samples of f(departure s, second-axis value s) over the given axes. */
function grid(
  nDep: number,
  nSec: number,
  dep: [number, number],
  sec: [number, number],
  secondAxis: 'tof' | 'arrival',
  f: (d: number, s: number) => number,
): RasterGrid {
  const departTimes = Float64Array.from({ length: nDep }, (_, i) => dep[0] + ((dep[1] - dep[0]) * i) / (nDep - 1));
  const secondValues = Float64Array.from({ length: nSec }, (_, j) => sec[0] + ((sec[1] - sec[0]) * j) / (nSec - 1));
  const plane = new Float32Array(nDep * nSec);
  for (let i = 0; i < nDep; i++) for (let j = 0; j < nSec; j++) plane[i * nSec + j] = f(departTimes[i], secondValues[j]);
  return { plane, departTimes, secondValues, secondAxis };
}

const rgba = (px: Uint8ClampedArray, w: number, x: number, y: number) => Array.from(px.subarray(4 * (y * w + x), 4 * (y * w + x) + 4));
const rampColour = (levels: { lo: number; hi: number }, k: number) => rgb(RAMP((levelValue(levels, k) - levels.lo) / (levels.hi - levels.lo)));
const bandColour = (levels: { lo: number; hi: number }, k: number) => {
  const c = rampColour(levels, k);
  return [Math.round(c.r), Math.round(c.g), Math.round(c.b), 255];
};
/** The band's colour with the line (#0f1416) laid over it at LINE_ALPHA. */
const lineColour = (levels: { lo: number; hi: number }, k: number) => {
  const c = rampColour(levels, k);
  const a = LINE_ALPHA;
  return [Math.round(c.r * (1 - a) + 0x0f * a), Math.round(c.g * (1 - a) + 0x14 * a), Math.round(c.b * (1 - a) + 0x16 * a), 255];
};

describe('porkchop picture (raster)', () => {
  // A bowl with its minimum inside the grid: bands ring the minimum.
  const bowl = (d: number, s: number) => 4000 + 3e-11 * ((d - 200 * DAY) ** 2 + 2 * (s - 240 * DAY) ** 2);
  const g = grid(41, 31, [0, 400 * DAY], [100 * DAY, 380 * DAY], 'tof', bowl);
  const levels = plotLevels(g.plane);
  const W = 160;
  const H = 120;
  const px = rasterPorkchop(g, levels, W, H);

  /** Band of each pixel read back from its colour, and whether it carries the line (−1: not a palette colour). */
  function decode(p: Uint8ClampedArray, lv: { lo: number; hi: number }, w: number, h: number): { band: Int8Array; line: Uint8Array } {
    const byColour = new Map<string, [number, boolean]>();
    for (let k = 0; k < LEVELS; k++) {
      byColour.set(bandColour(lv, k).join(), [k, false]);
      byColour.set(lineColour(lv, k).join(), [k, true]);
    }
    const band = new Int8Array(w * h).fill(-1);
    const line = new Uint8Array(w * h);
    for (let q = 0; q < w * h; q++) {
      const hit = byColour.get(Array.from(p.subarray(4 * q, 4 * q + 4)).join());
      if (hit) {
        band[q] = hit[0];
        line[q] = hit[1] ? 1 : 0;
      }
    }
    return { band, line };
  }
  const { band: seen, line: onLine } = decode(px, levels, W, H);

  it("uses only the palette: each band's colour from the ramp, or that colour under the line", () => {
    for (let q = 0; q < W * H; q++) expect(seen[q]).toBeGreaterThanOrEqual(0);
  });

  it('colours a pixel with the band of its grid cell where all four corners lie in one band (bilinear values stay between the corners)', () => {
    const nDep = g.departTimes.length;
    const nSec = g.secondValues.length;
    const band = (v: number) => Math.min(LEVELS - 1, Math.max(0, Math.floor(((v - levels.lo) * (LEVELS - 1)) / (levels.hi - levels.lo))));
    const span = flightSpan(g);
    let checked = 0;
    for (let y = 0; y < H; y++) {
      for (let x = 0; x < W; x++) {
        const gi = ((x + 0.5) / W) * (nDep - 1);
        const flight = span.max - ((y + 0.5) / H) * (span.max - span.min);
        const gj = ((flight - g.secondValues[0]) / (g.secondValues[nSec - 1] - g.secondValues[0])) * (nSec - 1);
        const i0 = Math.min(nDep - 2, Math.floor(gi));
        const j0 = Math.min(nSec - 2, Math.floor(gj));
        const corners = [g.plane[i0 * nSec + j0], g.plane[i0 * nSec + j0 + 1], g.plane[(i0 + 1) * nSec + j0], g.plane[(i0 + 1) * nSec + j0 + 1]].map(band);
        if (corners.some((k) => k !== corners[0])) continue;
        expect(seen[y * W + x]).toBe(corners[0]);
        checked++;
      }
    }
    // most of the picture lies in cells of one band (the bowl spans 22 bands over 40 × 30 cells)
    expect(checked).toBeGreaterThan(0.5 * W * H);
  });

  it("draws the line exactly where a pixel's band differs from its left or upper neighbour's across a multiple of four", () => {
    const crosses = (a: number, b: number) => {
      for (let m = Math.min(a, b) + 1; m <= Math.max(a, b); m++) if (m % 4 === 0) return true;
      return false;
    };
    let lines = 0;
    for (let y = 0; y < H; y++) {
      for (let x = 0; x < W; x++) {
        const k = seen[y * W + x];
        const expected = (x > 0 && crosses(seen[y * W + x - 1], k)) || (y > 0 && crosses(seen[(y - 1) * W + x], k));
        expect(onLine[y * W + x] === 1).toBe(expected);
        if (expected) lines++;
      }
    }
    expect(lines).toBeGreaterThan(0);
  });

  it('draws the grid minimum in the brightest band and the far corner in the top band', () => {
    // the minimum (day 200, 240 d) sits at x = W/2, y = (380 − 240)/280 · H
    expect(seen[Math.round(((380 - 240) / 280) * H) * W + W / 2]).toBe(0);
    expect(seen[0]).toBe(LEVELS - 1);
  });

  it('draws unsolved cells (+Infinity) as the top band, never transparent', () => {
    const holes = grid(21, 21, [0, 400 * DAY], [100 * DAY, 380 * DAY], 'tof', (d, s) => (d > 300 * DAY ? Infinity : bowl(d, s)));
    const lv = plotLevels(holes.plane);
    const p = rasterPorkchop(holes, lv, 80, 60);
    expect(rgba(p, 80, 79, 30).join()).toBe(bandColour(lv, LEVELS - 1).join());
    for (let k = 3; k < p.length; k += 4) expect(p[k]).toBe(255);
  });

  it('on an arrival-time grid leaves transparent exactly the pixels whose arrival falls outside the grid', () => {
    const a = grid(21, 21, [0, 200 * DAY], [300 * DAY, 500 * DAY], 'arrival', (d, s) => 5000 + 1e-3 * (s - d));
    const lv = plotLevels(a.plane);
    const w = 50;
    const h = 40;
    const p = rasterPorkchop(a, lv, w, h);
    const span = flightSpan(a);
    // flight times shown: 300 − 200 = 100 d up to 500 − 0 = 500 d
    expect(span.min / DAY).toBe(100);
    expect(span.max / DAY).toBe(500);
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        const dep = ((x + 0.5) / w) * 200 * DAY;
        const flight = span.max - ((y + 0.5) / h) * (span.max - span.min);
        const arrival = dep + flight;
        const inside = arrival >= 300 * DAY && arrival <= 500 * DAY;
        expect(rgba(p, w, x, y)[3]).toBe(inside ? 255 : 0);
      }
    }
  });

  it('is all transparent when nothing was solved', () => {
    const none = grid(5, 5, [0, DAY], [DAY, 2 * DAY], 'tof', () => Infinity);
    const lv = plotLevels(none.plane);
    expect(lv.lo).toBe(Infinity);
    expect(Array.from(rasterPorkchop(none, lv, 8, 8)).every((b) => b === 0)).toBe(true);
  });
});
