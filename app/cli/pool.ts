/**
 * A pool of Node worker threads (piscina) that computes porkchop grids in chunks of departure
 * rows. Each worker runs the same core function as the in-thread path
 * (core/search/porkchop.ts `computePorkchopRows`), so the merged grid is bit-for-bit the grid
 * the calling thread would compute.
 *
 * - Progress is reported once per finished chunk, in cells.
 * - Cancellation: abort the AbortSignal given to `compute`; `compute` rejects at once with
 *   SolverError('porkchop', 'cancelled'), no further chunk is sent, and the chunks already
 *   running (at most one per worker, each a few rows) finish in the background and are dropped.
 *   Chunks are handed out one per free worker rather than all queued with piscina's own abort
 *   signal: aborting piscina tasks terminates worker threads, and a reply racing the
 *   termination surfaces as an uncaught "Unexpected message from Worker".
 * - Validation happens in the calling thread before any work is sent.
 */
import { Piscina } from 'piscina';
import { SolverError } from '../../core/math/index.ts';
import { mergeChunk, partitionRows } from '../../core/search/index.ts';
import { createGrid, type PorkchopGrid } from '../../core/search/index.ts';
import type { PorkchopRequest } from '../../core/search/index.ts';
import type { StarSystem } from '../../core/system/index.ts';
import type { ChunkResult, ChunkTask } from './workers/porkchopWorker.ts';
import { workerUrl } from './workers/entry.ts';

/** The worker entry: built JavaScript when running built, else a .mjs bootstrap that registers tsx (workers/entry.ts). */
export const PORKCHOP_WORKER_URL = workerUrl('porkchopWorker');

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
    const signal = options.signal;
    let done = 0;
    let next = 0;
    let failure: unknown = null;
    const cancelled = (): boolean => signal?.aborted === true;
    const worker = async (): Promise<void> => {
      while (next < chunks.length && failure === null && !cancelled()) {
        const c = chunks[next++];
        const task: ChunkTask = { system, request: grid.request, rowStart: c.rowStart, rowEnd: c.rowEnd };
        try {
          const r: ChunkResult = await this.pool.run(task);
          if (cancelled()) return;
          mergeChunk(grid.planes, r.planes);
          grid.unsolved += r.unsolved;
          done += r.planes.nRows * nCols;
          options.onProgress?.(done, total);
        } catch (err) {
          if (failure === null) failure = err;
        }
      }
    };
    const all = Promise.all(Array.from({ length: Math.min(this.workers, chunks.length) }, worker));
    // Reject as soon as the caller aborts, without waiting for the chunks in flight.
    const aborted = new Promise<void>((resolve) => {
      if (!signal) return;
      if (signal.aborted) resolve();
      else signal.addEventListener('abort', () => resolve(), { once: true });
    });
    await Promise.race([all, aborted]);
    if (failure !== null) throw failure;
    if (cancelled()) {
      all.catch(() => undefined);
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
