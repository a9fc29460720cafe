/**
 * One porkchop computation as the Windows worker runs it: the grid row block by row block
 * (core/search/porkchop.ts computePorkchopRows), yielding between blocks so a cancel message
 * can arrive, reporting progress, then the transfer windows (core/search/windows.ts). Plain
 * code over injected hooks so vitest runs it without a Worker.
 */
import { SolverError } from '../../../core/math/index.ts';
import { computePorkchopRows, createGrid, type PorkchopGrid } from '../../../core/search/index.ts';
import type { PorkchopRequest } from '../../../core/search/index.ts';
import { findWindows, type TransferWindow, type WindowOptions } from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';

/** Cells per block between yields (and progress reports). */
export const CELLS_PER_BLOCK = 10_000;

export interface JobHooks {
  isCancelled(): boolean;
  onProgress(done: number, total: number): void;
  /** Lets pending messages in (a macrotask); default setTimeout 0. */
  yieldNow?(): Promise<void>;
}

export interface JobResult {
  grid: PorkchopGrid;
  windows: TransferWindow[];
  /** Grid and window times, ms. */
  gridMs: number;
  windowsMs: number;
}

const macrotask = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

export async function runPorkchopJob(system: StarSystem, request: PorkchopRequest, windowOptions: WindowOptions, hooks: JobHooks): Promise<JobResult> {
  const t0 = performance.now();
  const { grid, setup } = createGrid(system, request);
  const { nRows, nCols } = grid.planes;
  const rows = Math.max(1, Math.floor(CELLS_PER_BLOCK / nCols));
  const signal = {
    get aborted() {
      return hooks.isCancelled();
    },
  };
  for (let r = 0; r < nRows; r += rows) {
    const end = Math.min(nRows, r + rows);
    grid.unsolved += computePorkchopRows(system, setup, r, end, grid.planes, { signal });
    hooks.onProgress(end * nCols, nRows * nCols);
    if (end < nRows) {
      await (hooks.yieldNow ?? macrotask)();
      if (hooks.isCancelled()) throw new SolverError('porkchop', 'cancelled', `cancelled after row ${end}`, { row: end });
    }
  }
  const t1 = performance.now();
  const windows = findWindows(system, grid, windowOptions);
  return { grid, windows, gridMs: t1 - t0, windowsMs: performance.now() - t1 };
}
