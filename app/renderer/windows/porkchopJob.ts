/**
 * One porkchop computation as the Windows workers run it (plain code over injected hooks, so
 * vitest runs it without a Worker). The grid's departure rows are shared from both ends: the
 * leader computes blocks from the first row down while a helper computes blocks from the last
 * row up and sends each one over (merged into the leader's grid as it arrives); the leader stops
 * where it meets the helper's rows and tells it to stop. A helper that gets no processor time
 * (a busy machine) costs the leader nothing but a block computed twice; an idle second core
 * halves the grid time. Then the leader finds the transfer windows (core/search/windows.ts),
 * hands them on (`onWindows`, so the page lists them at once) and rasterises the picture
 * (porkchopRaster.ts). `warmPorkchop` runs a small grid so the first
 * real job runs compiled code.
 */
import { SolverError } from '../../../core/math/index.ts';
import {
  computePorkchopRows,
  createGrid,
  createPlanes,
  findWindows,
  mergeChunk,
  metricPlane,
  prepareTransfer,
  type PorkchopGrid,
  type PorkchopPlanes,
  type PorkchopRequest,
  type TransferWindow,
  type WindowOptions,
} from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { plotLevels, rasterPorkchop } from './porkchopRaster.ts';
import type { DoneImage, RasterSize } from './protocol.ts';

/** Cells per block between yields (and progress reports, and a helper's messages). */
export const CELLS_PER_BLOCK = 4000;
/** Samples per axis of the warm-up grid. */
export const WARM_N = 48;

export interface JobHooks {
  isCancelled(): boolean;
  /** Cells of this band done, of the band's total. */
  onProgress(done: number, total: number): void;
  /** Lets pending messages in (a macrotask); default `macrotask`. */
  yieldNow?(): Promise<void>;
}

/** The leader's side of a helper: the rows it has sent so far, and a way to stop it. */
export interface HelperLink {
  /** The first row of the contiguous run [row, nRows) received from the helper (nRows: none yet). */
  received(): number;
  /** Tells the helper the grid is complete. */
  stop(): void;
}

/**
 * The leader's record of its helper's blocks: each block that continues the run up from the
 * last row is merged into the grid's planes (core/search/chunks.ts mergeChunk); any other is
 * refused (the leader computes those rows itself).
 */
export class HelperBlocks implements HelperLink {
  #received: number;

  constructor(
    readonly planes: PorkchopPlanes,
    private readonly onStop: () => void,
  ) {
    this.#received = planes.rowStart + planes.nRows;
  }

  /** Merges `block` when it ends where the run received so far starts; returns whether it did. */
  accept(block: PorkchopPlanes): boolean {
    if (block.rowStart + block.nRows !== this.#received || block.rowStart < this.planes.rowStart) return false;
    mergeChunk(this.planes, block);
    this.#received = block.rowStart;
    return true;
  }

  received(): number {
    return this.#received;
  }

  stop(): void {
    this.onStop();
  }
}

export interface JobOptions {
  /** A helper computing from the last row up; given the grid's planes to merge its blocks into. */
  helper?: (planes: PorkchopPlanes) => HelperLink;
  /** Rasterise the picture at this size. */
  raster?: RasterSize | null;
  /** Called with the windows (and the grid and window times, ms) before the picture is rasterised. */
  onWindows?(windows: TransferWindow[], gridMs: number, windowsMs: number): void;
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

/** Rows per block for a grid of nCols columns. */
export function rowsPerBlock(nCols: number): number {
  return Math.max(1, Math.floor(CELLS_PER_BLOCK / nCols));
}

/**
 * The helper's side: blocks of rows from the last row up, each computed into planes of its own
 * and handed to `send` (which transfers them), until `shouldStop` or the first row.
 */
export async function helpFromBottom(
  system: StarSystem,
  request: PorkchopRequest,
  hooks: { shouldStop(): boolean; send(planes: PorkchopPlanes): void; yieldNow?(): Promise<void> },
): Promise<void> {
  const setup = prepareTransfer(system, request);
  const nRows = request.depart.n;
  const nCols = request.second.n;
  const per = rowsPerBlock(nCols);
  for (let end = nRows; end > 0 && !hooks.shouldStop(); end -= per) {
    const start = Math.max(0, end - per);
    const planes = createPlanes(start, end - start, nCols);
    computePorkchopRows(system, setup, start, end, planes);
    hooks.send(planes);
    await (hooks.yieldNow ?? macrotask)();
  }
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
  const { nRows, nCols } = grid.planes;
  const link = options.helper?.(grid.planes);
  const per = rowsPerBlock(nCols);
  const total = nRows * nCols;
  const signal = {
    get aborted() {
      return hooks.isCancelled();
    },
  };
  // rows [0, top) done here, [bottom, nRows) received from the helper
  let top = 0;
  let reported = 0;
  const report = (done: number) => {
    if (done <= reported) return;
    reported = done;
    hooks.onProgress(done, total);
  };
  let bottom = link ? link.received() : nRows;
  try {
    while (top < bottom) {
      const end = Math.min(bottom, top + per);
      computePorkchopRows(system, setup, top, end, grid.planes, { signal });
      top = end;
      if (link) bottom = Math.min(bottom, link.received());
      report(Math.min(total, (top + nRows - bottom) * nCols));
      if (top < bottom) {
        await (hooks.yieldNow ?? macrotask)();
        if (hooks.isCancelled()) throw cancelledAt(top);
        if (link) bottom = Math.min(bottom, link.received());
      }
    }
  } finally {
    link?.stop();
  }
  report(total);
  // rows may have been computed on both sides where the two met: count the unsolved cells once
  let unsolved = 0;
  const revs = grid.planes.revs;
  for (let k = 0; k < revs.length; k++) if (revs[k] < 0) unsolved++;
  grid.unsolved = unsolved;
  const t1 = performance.now();
  const windows = findWindows(system, grid, windowOptions);
  const t2 = performance.now();
  options.onWindows?.(windows, t1 - t0, t2 - t1);
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
