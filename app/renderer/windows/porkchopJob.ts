/**
 * One porkchop computation as the Windows workers run it (plain code over injected hooks, so
 * vitest runs it without a Worker):
 * - `computeBand`: a band of departure rows (core/search/porkchop.ts computePorkchopRows), block
 *   by block, yielding between blocks so a cancel message can arrive, reporting progress;
 * - `runPorkchopJob`: the leader's whole job: its own band into the full grid, the other
 *   workers' bands merged in (core/search/chunks.ts), the transfer windows
 *   (core/search/windows.ts), and the picture (porkchopRaster.ts);
 * - `warmPorkchop`: a small grid and its windows, so the first real job runs compiled code.
 */
import { SolverError } from '../../../core/math/index.ts';
import {
  computePorkchopRows,
  createGrid,
  findWindows,
  mergeChunk,
  metricPlane,
  type PorkchopGrid,
  type PorkchopPlanes,
  type PorkchopRequest,
  type TransferWindow,
  type WindowOptions,
} from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { plotLevels, rasterPorkchop } from './porkchopRaster.ts';
import type { DoneImage, RasterSize, Rows } from './protocol.ts';

/** Cells per block between yields (and progress reports). */
export const CELLS_PER_BLOCK = 10_000;
/** Samples per axis of the warm-up grid. */
export const WARM_N = 48;

export interface JobHooks {
  isCancelled(): boolean;
  /** Cells of this band done, of the band's total. */
  onProgress(done: number, total: number): void;
  /** Lets pending messages in (a macrotask); default `macrotask`. */
  yieldNow?(): Promise<void>;
}

/** A band computed by another worker. */
export interface Band {
  planes: PorkchopPlanes;
  unsolved: number;
}

export interface JobOptions {
  /** The rows this worker computes; default the whole grid. */
  rows?: Rows;
  /** The other workers' bands (together with `rows`, the whole grid). */
  bands?: () => Promise<Band[]>;
  /** Rasterise the picture at this size. */
  raster?: RasterSize | null;
}

export interface JobResult {
  grid: PorkchopGrid;
  windows: TransferWindow[];
  /** Grid (until every band is in), window and picture times, ms. */
  gridMs: number;
  windowsMs: number;
  rasterMs: number;
  image: DoneImage | null;
}

let channel: MessageChannel | null = null;
const waiting: (() => void)[] = [];

/**
 * A macrotask through a MessageChannel: lets pending messages in without setTimeout's clamp
 * (nested timeouts wait at least 4 ms, HTML Living Standard §8.6 timers).
 */
export function macrotask(): Promise<void> {
  if (typeof MessageChannel === 'undefined') return new Promise((resolve) => setTimeout(resolve, 0));
  if (!channel) {
    channel = new MessageChannel();
    channel.port1.onmessage = () => waiting.shift()?.();
    // Node's ports would keep the process alive.
    (channel.port1 as unknown as { unref?(): void }).unref?.();
  }
  const c = channel;
  return new Promise((resolve) => {
    waiting.push(resolve);
    c.port2.postMessage(0);
  });
}

const cancelledAt = (row: number) => new SolverError('porkchop', 'cancelled', `cancelled after row ${row}`, { row });

/** Rows `rows` of `request` into `out` (which holds them), block by block; returns the unsolved cells. */
export async function computeBand(
  system: StarSystem,
  setup: Parameters<typeof computePorkchopRows>[1],
  rows: Rows,
  out: PorkchopPlanes,
  hooks: JobHooks,
): Promise<number> {
  const nCols = out.nCols;
  const per = Math.max(1, Math.floor(CELLS_PER_BLOCK / nCols));
  const total = (rows.rowEnd - rows.rowStart) * nCols;
  const signal = {
    get aborted() {
      return hooks.isCancelled();
    },
  };
  let unsolved = 0;
  for (let r = rows.rowStart; r < rows.rowEnd; r += per) {
    const end = Math.min(rows.rowEnd, r + per);
    unsolved += computePorkchopRows(system, setup, r, end, out, { signal });
    hooks.onProgress((end - rows.rowStart) * nCols, total);
    if (end < rows.rowEnd) {
      await (hooks.yieldNow ?? macrotask)();
      if (hooks.isCancelled()) throw cancelledAt(end);
    }
  }
  return unsolved;
}

export async function runPorkchopJob(
  system: StarSystem,
  request: PorkchopRequest,
  windowOptions: WindowOptions,
  hooks: JobHooks,
  options: JobOptions = {},
): Promise<JobResult> {
  const t0 = performance.now();
  const { grid, setup } = createGrid(system, request);
  const rows = options.rows ?? { rowStart: 0, rowEnd: grid.planes.nRows };
  grid.unsolved = await computeBand(system, setup, rows, grid.planes, hooks);
  if (options.bands) {
    for (const b of await options.bands()) {
      if (hooks.isCancelled()) throw cancelledAt(rows.rowEnd);
      mergeChunk(grid.planes, b.planes);
      grid.unsolved += b.unsolved;
    }
  }
  const t1 = performance.now();
  const windows = findWindows(system, grid, windowOptions);
  const t2 = performance.now();
  let image: DoneImage | null = null;
  if (options.raster) {
    const plane = metricPlane(grid.planes, grid.request.metric);
    const levels = plotLevels(plane);
    const { width, height } = options.raster;
    const pixels = rasterPorkchop(
      { plane, departTimes: grid.departTimes, secondValues: grid.secondValues, secondAxis: grid.request.secondAxis },
      levels,
      width,
      height,
    );
    image = { width: Math.max(1, Math.floor(width)), height: Math.max(1, Math.floor(height)), pixels, levels };
  }
  return { grid, windows, gridMs: t1 - t0, windowsMs: t2 - t1, rasterMs: performance.now() - t2, image };
}

/** A small grid of the request's pair over its ranges, its windows and a small picture: compiles the hot code. */
export function warmPorkchop(system: StarSystem, request: PorkchopRequest): Promise<JobResult> {
  const small: PorkchopRequest = { ...request, depart: { ...request.depart, n: WARM_N }, second: { ...request.second, n: WARM_N } };
  return runPorkchopJob(system, small, { count: 1 }, { isCancelled: () => false, onProgress: () => undefined }, { raster: { width: 256, height: 256 } });
}
