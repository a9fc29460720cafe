/**
 * Splitting a porkchop grid into bands of departure rows (chunks) that workers compute
 * independently, and merging a finished band back into the full grid.
 */
import { InputError } from '../math/index.ts';
import { FLOAT_PLANES, INT_PLANES, type PorkchopPlanes } from './planes.ts';

export interface RowChunk {
  /** First row (inclusive). */
  rowStart: number;
  /** Last row (exclusive). */
  rowEnd: number;
}

/**
 * Splits rows [0, nRows) into at most `nChunks` contiguous bands whose sizes differ by at
 * most one row, in order. Fewer bands when there are fewer rows than asked.
 */
export function partitionRows(nRows: number, nChunks: number): RowChunk[] {
  if (!Number.isInteger(nRows) || nRows < 1) throw new InputError('nRows', 'must be an integer >= 1', nRows);
  if (!Number.isInteger(nChunks) || nChunks < 1) throw new InputError('nChunks', 'must be an integer >= 1', nChunks);
  const k = Math.min(nRows, nChunks);
  const base = Math.floor(nRows / k);
  const extra = nRows - base * k;
  const out: RowChunk[] = [];
  let r = 0;
  for (let c = 0; c < k; c++) {
    const size = base + (c < extra ? 1 : 0);
    out.push({ rowStart: r, rowEnd: r + size });
    r += size;
  }
  return out;
}

/** Copies the rows held by `chunk` into `target` (which must hold them, with the same column count). */
export function mergeChunk(target: PorkchopPlanes, chunk: PorkchopPlanes): void {
  if (chunk.nCols !== target.nCols) throw new InputError('chunk.nCols', `must equal the target's ${target.nCols}`, chunk.nCols);
  if (chunk.rowStart < target.rowStart || chunk.rowStart + chunk.nRows > target.rowStart + target.nRows) {
    throw new InputError(
      'chunk.rowStart',
      `rows ${chunk.rowStart}..${chunk.rowStart + chunk.nRows - 1} must lie inside the target's ${target.rowStart}..${target.rowStart + target.nRows - 1}`,
    );
  }
  const offset = (chunk.rowStart - target.rowStart) * target.nCols;
  const n = chunk.nRows * chunk.nCols;
  for (const k of FLOAT_PLANES) target[k].set(chunk[k].subarray(0, n), offset);
  for (const k of INT_PLANES) target[k].set(chunk[k].subarray(0, n), offset);
}
