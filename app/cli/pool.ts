/**
 * A pool of Node worker threads (piscina) that computes porkchop grids in chunks of departure
 * rows. Each worker runs the same core function as the in-thread path
 * (core/search/porkchop.ts `computePorkchopRows`), so the merged grid is bit-for-bit the grid
 * the calling thread would compute.
 *
 * - Progress is reported once per finished chunk, in cells.
 * - Cancellation: abort the AbortSignal given to `compute`; queued chunks are dropped and
 *   running workers are stopped (piscina terminates their threads), and `compute` rejects
 *   with SolverError('porkchop', 'cancelled').
 * - Validation happens in the calling thread before any work is sent.
 */
import { setMaxListeners } from 'node:events';
import { Piscina } from 'piscina';
import { SolverError } from '../../core/math/errors.ts';
import { mergeChunk, partitionRows } from '../../core/search/chunks.ts';
import { createGrid, type PorkchopGrid } from '../../core/search/porkchop.ts';
import type { PorkchopRequest } from '../../core/search/request.ts';
import type { StarSystem } from '../../core/system/model.ts';
import type { ChunkResult, ChunkTask } from './workers/porkchopWorker.ts';

/** The worker entry (a .mjs bootstrap that registers tsx, then loads porkchopWorker.ts). */
export const PORKCHOP_WORKER_URL = new URL('./workers/porkchopWorker.mjs', import.meta.url).href;

/** Chunks per worker by default: enough for load balance and a smooth progress bar. */
export const CHUNKS_PER_WORKER = 8;

export interface PooledGridOptions {
  /** Number of chunks (default workers × CHUNKS_PER_WORKER, at most one per row). */
  chunks?: number;
  /** Called after each finished chunk with (cells done, cells in total). */
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
}

export class PorkchopPool {
  readonly workers: number;
  private readonly pool: Piscina;

  constructor(workers: number) {
    if (!Number.isInteger(workers) || workers < 1) throw new RangeError(`workers must be an integer >= 1 (got ${workers})`);
    this.workers = workers;
    this.pool = new Piscina({ filename: PORKCHOP_WORKER_URL, minThreads: workers, maxThreads: workers, idleTimeout: 30_000 });
  }

  /** Computes a whole grid across the pool. */
  async compute(system: StarSystem, request: PorkchopRequest, options: PooledGridOptions = {}): Promise<PorkchopGrid> {
    const { grid } = createGrid(system, request); // validates here, not in a worker
    const { nRows, nCols } = grid.planes;
    const chunks = partitionRows(nRows, options.chunks ?? this.workers * CHUNKS_PER_WORKER);
    const total = nRows * nCols;
    const outer = options.signal;
    const inner = new AbortController();
    setMaxListeners(0, inner.signal); // one listener per queued chunk
    const relay = (): void => inner.abort();
    if (outer?.aborted) inner.abort();
    else outer?.addEventListener('abort', relay, { once: true });
    let done = 0;
    let failure: unknown = null;
    try {
      await Promise.all(
        chunks.map((c) => {
          const task: ChunkTask = { system, request: grid.request, rowStart: c.rowStart, rowEnd: c.rowEnd };
          return this.pool.run(task, { signal: inner.signal }).then(
            (r: ChunkResult) => {
              if (inner.signal.aborted) return;
              mergeChunk(grid.planes, r.planes);
              grid.unsolved += r.unsolved;
              done += r.planes.nRows * nCols;
              options.onProgress?.(done, total);
            },
            (err: unknown) => {
              if (failure === null && !inner.signal.aborted) failure = err;
              inner.abort();
            },
          );
        }),
      );
    } finally {
      outer?.removeEventListener('abort', relay);
    }
    if (failure !== null) throw failure;
    if (inner.signal.aborted) {
      throw new SolverError('porkchop', 'cancelled', `cancelled after ${done} of ${total} cells`, { done, total });
    }
    return grid;
  }

  /** Stops every worker. */
  async close(): Promise<void> {
    await this.pool.destroy();
  }
}

/** One grid on a pool made for the occasion (closed afterwards). */
export async function computePorkchopPooled(
  system: StarSystem,
  request: PorkchopRequest,
  workers: number,
  options: PooledGridOptions = {},
): Promise<PorkchopGrid> {
  const pool = new PorkchopPool(workers);
  try {
    return await pool.compute(system, request, options);
  } finally {
    await pool.close();
  }
}
