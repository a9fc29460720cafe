/**
 * The porkchop picture as pixels: filled Δv bands (the grid value bilinearly interpolated at
 * each pixel centre, then cut at LEVELS evenly spaced levels from the grid minimum up to
 * LEVEL_SPAN × minimum) with a thin dark line on every fourth level. Plain typed-array code, so
 * the Windows worker computes it beside the grid and the main thread only puts the pixels on a
 * canvas (porkchopPlot.ts); the main thread runs it itself only when the plot changes size.
 *
 * The image covers the plot area exactly: pixel column x is departure d0 + (x + ½)/width ·
 * (d1 − d0), pixel row y is flight time tMax − (y + ½)/height · (tMax − tMin). On an
 * arrival-time grid (where a flight time maps to a different column on every departure) pixels
 * outside the grid stay transparent.
 */
import { interpolateRgbBasis, rgb } from 'd3';

/** Contour levels: from the grid minimum up to LEVEL_SPAN × minimum, in LEVELS steps. */
export const LEVELS = 22;
export const LEVEL_SPAN = 2.2;
/** Every LINE_EVERY-th level is drawn as a thin dark line, LINE_ALPHA opaque. */
export const LINE_EVERY = 4;
export const LINE_ALPHA = 0.3;
const LINE_RGB = [0x0f, 0x14, 0x16] as const;
/** Values above CAP × the top level (and unsolved cells) are drawn as the top band. */
const CAP = 1.5;

/** Sand (best) → mint → deep teal (worst): the Windows view's own ramp. */
export const RAMP = interpolateRgbBasis(['#f6ecbd', '#9fdcae', '#3fa08f', '#1e5a61', '#16303a']);

/** What the raster needs of a grid: one metric plane and its axes. */
export interface RasterGrid {
  /** Row-major values, cell (i, j) at i·nCols + j (i departure, j second axis); +Infinity where unsolved. */
  plane: Float32Array;
  /** Departure time of each row, s. */
  departTimes: Float64Array;
  /** Time of flight ('tof') or arrival time ('arrival') of each column, s. */
  secondValues: Float64Array;
  secondAxis: 'tof' | 'arrival';
}

/** The colour scale of a plane: lowest value and top level (LEVEL_SPAN × lowest); lo is +Infinity when nothing was solved. */
export interface PlotLevels {
  lo: number;
  hi: number;
}

export function plotLevels(plane: Float32Array): PlotLevels {
  let lo = Infinity;
  for (let k = 0; k < plane.length; k++) if (plane[k] < lo) lo = plane[k];
  return { lo, hi: Number.isFinite(lo) ? lo * LEVEL_SPAN : 1 };
}

/** Value of level k (0 … LEVELS − 1). */
export function levelValue(levels: PlotLevels, k: number): number {
  return levels.lo + ((levels.hi - levels.lo) * k) / (LEVELS - 1);
}

/** Flight-time span the plot shows, s: the second axis itself, or on an arrival grid the flight times it reaches. */
export function flightSpan(g: Pick<RasterGrid, 'departTimes' | 'secondValues' | 'secondAxis'>): { min: number; max: number } {
  const s0 = g.secondValues[0];
  const s1 = g.secondValues[g.secondValues.length - 1];
  if (g.secondAxis === 'tof') return { min: s0, max: s1 };
  return { min: s0 - g.departTimes[g.departTimes.length - 1], max: s1 - g.departTimes[0] };
}

/**
 * Packed RGBA (little-endian: R in the low byte) of each band (index k), and of each band
 * with the line over it (index LEVELS + k).
 */
function palette(levels: PlotLevels): Uint32Array {
  const out = new Uint32Array(2 * LEVELS);
  const span = levels.hi - levels.lo;
  const pack = (r: number, g: number, b: number) => (0xff000000 | (Math.round(b) << 16) | (Math.round(g) << 8) | Math.round(r)) >>> 0;
  const a = LINE_ALPHA;
  for (let k = 0; k < LEVELS; k++) {
    const c = rgb(RAMP(span > 0 ? (levelValue(levels, k) - levels.lo) / span : 0));
    out[k] = pack(c.r, c.g, c.b);
    out[LEVELS + k] = pack(c.r * (1 - a) + LINE_RGB[0] * a, c.g * (1 - a) + LINE_RGB[1] * a, c.b * (1 - a) + LINE_RGB[2] * a);
  }
  return out;
}

/** LINES[a·LEVELS + b] = LEVELS when a level that is a positive multiple of LINE_EVERY lies between bands a and b, else 0. */
const LINES = (() => {
  const t = new Uint8Array(LEVELS * LEVELS);
  for (let a = 0; a < LEVELS; a++) {
    for (let b = 0; b < LEVELS; b++) {
      // level m separates band m − 1 from band m
      for (let m = Math.min(a, b) + 1; m <= Math.max(a, b); m++) if (m % LINE_EVERY === 0) t[a * LEVELS + b] = LEVELS;
    }
  }
  return t;
})();

// Scratch, grown as needed (the raster runs once per grid or resize, never per cell).
let bandScratch = new Int8Array(0);
let transposed = new Float32Array(0);
let colCell = new Int32Array(0);
let colFrac = new Float64Array(0);

/**
 * RGBA pixels (width × height, row-major from the top left) of the plot area; `out` is used
 * when it has the right length. Returns the pixels.
 */
export function rasterPorkchop(g: RasterGrid, levels: PlotLevels, width: number, height: number, out?: Uint8ClampedArray): Uint8ClampedArray {
  const w = Math.max(1, Math.floor(width));
  const h = Math.max(1, Math.floor(height));
  const pixels = out && out.length === w * h * 4 ? out : new Uint8ClampedArray(w * h * 4);
  const px32 = new Uint32Array(pixels.buffer, pixels.byteOffset, w * h);
  const nDep = g.departTimes.length;
  const nSec = g.secondValues.length;
  const n = nDep * nSec;
  if (!Number.isFinite(levels.lo) || n === 0) {
    px32.fill(0);
    return pixels;
  }
  const colours = palette(levels);
  // The plane transposed (a pixel row reads one second-axis sample across departures), with
  // unsolved cells and values far above the top level drawn as the top band.
  const cap = levels.hi * CAP;
  if (transposed.length < n) transposed = new Float32Array(n);
  const v = transposed;
  for (let i = 0; i < nDep; i++) {
    for (let j = 0; j < nSec; j++) {
      const x = g.plane[i * nSec + j];
      v[j * nDep + i] = x < cap ? x : cap;
    }
  }
  const lo = levels.lo;
  const inv = levels.hi > lo ? (LEVELS - 1) / (levels.hi - lo) : 0;
  const d0 = g.departTimes[0];
  const d1 = g.departTimes[nDep - 1];
  const s0 = g.secondValues[0];
  const sSpan = g.secondValues[nSec - 1] - s0;
  const fs = flightSpan(g);
  const tof = g.secondAxis === 'tof';
  // Each pixel column's departure cell and fraction (bilinear interpolation within a cell:
  // common practice for an image of a sampled field).
  if (colCell.length < w) {
    colCell = new Int32Array(w);
    colFrac = new Float64Array(w);
  }
  for (let x = 0; x < w; x++) {
    const gi = ((x + 0.5) / w) * (nDep - 1);
    const i0 = nDep > 1 ? Math.min(nDep - 2, Math.floor(gi)) : 0;
    colCell[x] = i0;
    colFrac[x] = nDep > 1 ? gi - i0 : 0;
  }
  const cell = colCell;
  const frac = colFrac;
  const iNext = nDep > 1 ? 1 : 0;
  const jNext = nSec > 1 ? nDep : 0;
  if (bandScratch.length < w * 2) bandScratch = new Int8Array(w * 2);
  // Band of each pixel of the previous and the current row (−1: outside the grid). A pixel
  // whose band differs from its left or upper neighbour across a multiple of LINE_EVERY
  // carries the line.
  let prev = bandScratch.subarray(0, w);
  let cur = bandScratch.subarray(w, 2 * w);
  prev.fill(-1);
  const L = LEVELS;
  for (let y = 0; y < h; y++) {
    const flight = fs.max - ((y + 0.5) / h) * (fs.max - fs.min);
    const row = y * w;
    let left = -1;
    if (tof) {
      const gj = sSpan !== 0 ? ((flight - s0) / sSpan) * (nSec - 1) : 0;
      const j0 = nSec > 1 ? Math.max(0, Math.min(nSec - 2, Math.floor(gj))) : 0;
      const fy = nSec > 1 ? gj - j0 : 0;
      const base = j0 * nDep;
      for (let x = 0; x < w; x++) {
        const a = base + cell[x];
        const fx = frac[x];
        const top = v[a] + (v[a + iNext] - v[a]) * fx;
        const bottom = v[a + jNext] + (v[a + jNext + iNext] - v[a + jNext]) * fx;
        let k = ((top + (bottom - top) * fy - lo) * inv) | 0;
        k = k < 0 ? 0 : k > L - 1 ? L - 1 : k;
        const up = prev[x];
        const edge = (left >= 0 ? LINES[left * L + k] : 0) | (up >= 0 ? LINES[up * L + k] : 0);
        px32[row + x] = colours[k + edge];
        cur[x] = k;
        left = k;
      }
    } else {
      for (let x = 0; x < w; x++) {
        const dep = d0 + ((x + 0.5) / w) * (d1 - d0);
        const gj = sSpan !== 0 ? ((dep + flight - s0) / sSpan) * (nSec - 1) : 0;
        if (!(gj >= 0 && gj <= nSec - 1)) {
          px32[row + x] = 0;
          cur[x] = -1;
          left = -1;
          continue;
        }
        const j0 = nSec > 1 ? Math.min(nSec - 2, Math.floor(gj)) : 0;
        const fy = nSec > 1 ? gj - j0 : 0;
        const a = j0 * nDep + cell[x];
        const fx = frac[x];
        const top = v[a] + (v[a + iNext] - v[a]) * fx;
        const bottom = v[a + jNext] + (v[a + jNext + iNext] - v[a + jNext]) * fx;
        let k = ((top + (bottom - top) * fy - lo) * inv) | 0;
        k = k < 0 ? 0 : k > L - 1 ? L - 1 : k;
        const up = prev[x];
        const edge = (left >= 0 ? LINES[left * L + k] : 0) | (up >= 0 ? LINES[up * L + k] : 0);
        px32[row + x] = colours[k + edge];
        cur[x] = k;
        left = k;
      }
    }
    const swap = prev;
    prev = cur;
    cur = swap;
  }
  return pixels;
}
