/**
 * Porkchop grids: the patched-conic transfer cost over departure time × time of flight (or
 * arrival time), one Lambert arc per cell (transfer.ts).
 *
 * - `computePorkchopRows` fills a band of departure rows; it is what a worker runs on its
 *   chunk (chunks.ts) and what the in-thread paths below run, so every path produces the same
 *   bits. Nothing allocates per cell: the departure body's state is computed once per row; in
 *   arrival-time mode the arrival body's states are computed once per column for the whole
 *   band; in time-of-flight mode every cell has its own arrival time, so the arrival state is
 *   computed per cell. Two bodies of one parent at a single revolution (the common case) go
 *   row by row through transfer.ts's solveSiblingRow, the rest cell by cell through solveCell;
 *   both give the bits of solveCell.
 * - `computePorkchop` (synchronous) and `computePorkchopAsync` (yields to the event loop
 *   between row blocks so a progress display can redraw) compute a whole grid in the calling
 *   thread, with a progress callback and cancellation: `signal.aborted` is checked before each
 *   row and a set flag stops the work with SolverError('porkchop', 'cancelled').
 *
 * Unsolved cells (no Lambert solution, arrival before departure in arrival-time mode, a
 * non-finite result) hold +Infinity in every float plane and −1 in revs/branch; their number
 * is returned as `unsolved`. No cell is ever NaN.
 */
import { InputError, SolverError } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import { createPlanes, type PorkchopPlanes } from './planes.ts';
import { axisValue, axisValues, type PorkchopMetric, type PorkchopRequest } from './request.ts';
import {
  CELL_BRANCH,
  CELL_C3,
  CELL_DV_ARRIVE,
  CELL_DV_DEPART,
  CELL_DV_TOTAL,
  CELL_REVS,
  CELL_VINF_ARRIVE,
  CELL_VINF_DEPART,
  evaluateTransfer,
  lastCell,
  prepareTransfer,
  SIBLINGS,
  solveCell,
  solveSiblingRow,
  stateAboutCentral,
  type TransferCell,
  type TransferSetup,
} from './transfer.ts';

/** A cancellation flag checked before each row (an AbortSignal qualifies). */
export interface CancelFlag {
  readonly aborted: boolean;
}

export interface RowOptions {
  /** Checked before each row; when set, the call throws SolverError('porkchop', 'cancelled'). */
  signal?: CancelFlag;
  /** Called after each finished row with that row's index. */
  onRow?: (row: number) => void;
}

const DEP6 = new Float64Array(6);
const ARR6 = new Float64Array(6);

function cancelled(row: number): SolverError {
  return new SolverError('porkchop', 'cancelled', `cancelled before row ${row}`, { row });
}

/**
 * Computes rows [rowStart, rowEnd) of the grid of `request` into `out` (which must hold those
 * rows: `createPlanes(rowStart, rowEnd − rowStart, nCols)` for a chunk, or the full grid).
 * Returns the number of unsolved cells written. Pass a prepared setup to skip re-validation.
 */
export function computePorkchopRows(
  system: StarSystem,
  request: PorkchopRequest | TransferSetup,
  rowStart: number,
  rowEnd: number,
  out: PorkchopPlanes,
  options: RowOptions = {},
): number {
  const s = 'kind' in request ? request : prepareTransfer(system, request);
  const req = s.request;
  const nCols = req.second.n;
  if (!(Number.isInteger(rowStart) && Number.isInteger(rowEnd) && rowStart >= 0 && rowEnd <= req.depart.n && rowStart <= rowEnd)) {
    throw new InputError('rowEnd', `must give a row range inside 0..${req.depart.n} (got ${rowStart}..${rowEnd})`);
  }
  if (out.nCols !== nCols || rowStart < out.rowStart || rowEnd > out.rowStart + out.nRows) {
    throw new InputError('out', `must hold rows ${rowStart}..${rowEnd} of ${nCols} columns (holds rows ${out.rowStart}+${out.nRows} of ${out.nCols})`);
  }
  const arrivalMode = req.secondAxis === 'arrival';
  // Arrival-time mode: every row shares the column's arrival state; compute them once.
  let arrCache: Float64Array | null = null;
  if (arrivalMode && rowEnd > rowStart) {
    arrCache = new Float64Array(6 * nCols);
    for (let j = 0; j < nCols; j++) {
      stateAboutCentral(system, s, s.to, axisValue(req.second, j), ARR6);
      arrCache.set(ARR6, 6 * j);
    }
  }
  const { dvDepart, dvArrive, dvTotal, c3, vInfDepart, vInfArrive, revs, branch } = out;
  const signal = options.signal;
  const onRow = options.onRow;
  let bad = 0;
  if (s.kind === SIBLINGS && s.maxRevs === 0) {
    // the common case, one loop per row with the cell written out (transfer.ts)
    for (let i = rowStart; i < rowEnd; i++) {
      if (signal?.aborted) throw cancelled(i);
      const tDep = axisValue(req.depart, i);
      stateAboutCentral(system, s, s.from, tDep, DEP6);
      bad += solveSiblingRow(system, s, tDep, DEP6, arrCache, out, (i - out.rowStart) * nCols);
      if (onRow !== undefined) onRow(i);
    }
    return bad;
  }
  for (let i = rowStart; i < rowEnd; i++) {
    if (signal?.aborted) throw cancelled(i);
    const tDep = axisValue(req.depart, i);
    stateAboutCentral(system, s, s.from, tDep, DEP6);
    let idx = (i - out.rowStart) * nCols;
    for (let j = 0; j < nCols; j++, idx++) {
      let ok: boolean;
      if (arrCache !== null) {
        const tof = axisValue(req.second, j) - tDep;
        ARR6[0] = arrCache[6 * j];
        ARR6[1] = arrCache[6 * j + 1];
        ARR6[2] = arrCache[6 * j + 2];
        ARR6[3] = arrCache[6 * j + 3];
        ARR6[4] = arrCache[6 * j + 4];
        ARR6[5] = arrCache[6 * j + 5];
        ok = solveCell(s, DEP6, ARR6, tof);
      } else {
        const tof = axisValue(req.second, j);
        stateAboutCentral(system, s, s.to, tDep + tof, ARR6);
        ok = solveCell(s, DEP6, ARR6, tof);
      }
      if (!ok) bad++;
      dvDepart[idx] = lastCell[CELL_DV_DEPART];
      dvArrive[idx] = lastCell[CELL_DV_ARRIVE];
      dvTotal[idx] = lastCell[CELL_DV_TOTAL];
      c3[idx] = lastCell[CELL_C3];
      vInfDepart[idx] = lastCell[CELL_VINF_DEPART];
      vInfArrive[idx] = lastCell[CELL_VINF_ARRIVE];
      revs[idx] = lastCell[CELL_REVS];
      branch[idx] = lastCell[CELL_BRANCH];
    }
    if (onRow !== undefined) onRow(i);
  }
  return bad;
}

/** A whole computed grid. */
export interface PorkchopGrid {
  /** The request with defaults filled in. */
  request: Required<PorkchopRequest>;
  /** Departure time of each row, s from the epoch. */
  departTimes: Float64Array;
  /** Time of flight (axis 'tof') or arrival time (axis 'arrival') of each column, s. */
  secondValues: Float64Array;
  planes: PorkchopPlanes;
  /** Number of unsolved cells. */
  unsolved: number;
}

export interface GridOptions {
  signal?: CancelFlag;
  /** Progress in cells: called with (cells done, cells in total); reaches (total, total) at the end. */
  onProgress?: (done: number, total: number) => void;
}

/** An empty grid for a request (planes to be filled by rows or merged chunks). */
export function createGrid(system: StarSystem, request: PorkchopRequest): { grid: PorkchopGrid; setup: TransferSetup } {
  const setup = prepareTransfer(system, request);
  const req = setup.request;
  return {
    setup,
    grid: {
      request: req,
      departTimes: axisValues(req.depart),
      secondValues: axisValues(req.second),
      planes: createPlanes(0, req.depart.n, req.second.n),
      unsolved: 0,
    },
  };
}

/** The whole grid in the calling thread, synchronously. */
export function computePorkchop(system: StarSystem, request: PorkchopRequest, options: GridOptions = {}): PorkchopGrid {
  const { grid, setup } = createGrid(system, request);
  const nCols = grid.planes.nCols;
  const total = grid.planes.nRows * nCols;
  let done = 0;
  const onProgress = options.onProgress;
  grid.unsolved = computePorkchopRows(system, setup, 0, grid.planes.nRows, grid.planes, {
    signal: options.signal,
    onRow: onProgress
      ? () => {
          done += nCols;
          onProgress(done, total);
        }
      : undefined,
  });
  return grid;
}

/** Rows per block between yields of `computePorkchopAsync`: about 20 000 cells. */
function rowsPerBlock(nCols: number): number {
  return Math.max(1, Math.floor(20000 / nCols));
}

const yieldNow = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

/**
 * The whole grid in the calling thread, yielding to the event loop after each block of about
 * 20 000 cells (progress is reported per block; cancellation is still checked per row).
 */
export async function computePorkchopAsync(system: StarSystem, request: PorkchopRequest, options: GridOptions = {}): Promise<PorkchopGrid> {
  const { grid, setup } = createGrid(system, request);
  const { nRows, nCols } = grid.planes;
  const step = rowsPerBlock(nCols);
  for (let r = 0; r < nRows; r += step) {
    const end = Math.min(nRows, r + step);
    grid.unsolved += computePorkchopRows(system, setup, r, end, grid.planes, { signal: options.signal });
    options.onProgress?.(end * nCols, nRows * nCols);
    if (end < nRows) await yieldNow();
  }
  return grid;
}

/** The float plane that holds a metric. */
export function metricPlane(planes: PorkchopPlanes, metric: PorkchopMetric): Float32Array {
  switch (metric) {
    case 'total':
      return planes.dvTotal;
    case 'departure':
      return planes.dvDepart;
    case 'arrival':
      return planes.dvArrive;
    case 'c3':
      return planes.c3;
  }
}

/** Departure time and time of flight of cell (i, j). */
export function cellTimes(grid: PorkchopGrid, i: number, j: number): { departure: number; tof: number } {
  const departure = grid.departTimes[i];
  const v = grid.secondValues[j];
  return { departure, tof: grid.request.secondAxis === 'arrival' ? v - departure : v };
}

/** Row, column and value of the grid's smallest cell under `metric` (default the request's); null if every cell is unsolved. */
export function gridMinimum(grid: PorkchopGrid, metric: PorkchopMetric = grid.request.metric): { i: number; j: number; value: number } | null {
  const plane = metricPlane(grid.planes, metric);
  let best = Infinity;
  let at = -1;
  for (let k = 0; k < plane.length; k++) {
    if (plane[k] < best) {
      best = plane[k];
      at = k;
    }
  }
  if (at < 0) return null;
  return { i: Math.floor(at / grid.planes.nCols), j: at % grid.planes.nCols, value: best };
}

/** Cell (i, j) re-evaluated in double precision, as a plain object. */
export function gridCell(system: StarSystem, grid: PorkchopGrid, i: number, j: number): TransferCell {
  const setup = prepareTransfer(system, grid.request);
  const { departure, tof } = cellTimes(grid, i, j);
  return evaluateTransfer(system, setup, departure, tof);
}
