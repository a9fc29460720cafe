/**
 * The window calendar across a pool of Node worker threads (piscina): one task per pair
 * (core/survey calendarPair in app/cli/workers/calendarWorker.ts), the costliest pairs first
 * (departure samples × flight-time samples) so the last pair to finish is a cheap one. Pairs
 * come back in any order and are put back in the request's order (core/survey assembleCalendar),
 * so the calendar equals the in-thread one bit for bit.
 *
 * Progress is reported per finished pair, in departure samples. Cancellation as in pool.ts:
 * pairs are handed out one per free worker, and an abort rejects at once with
 * SolverError('calendar', 'cancelled'); the pairs already running finish and are dropped.
 * Validation happens in the calling thread before any work is sent.
 */
import { Piscina } from 'piscina';
import { SolverError } from '../../core/math/index.ts';
import { assembleCalendar, resolveCalendarRequest, type Calendar, type CalendarPair, type CalendarRequest } from '../../core/survey/index.ts';
import type { StarSystem } from '../../core/system/index.ts';
import type { CalendarTask } from './workers/calendarWorker.ts';
import { workerUrl } from './workers/entry.ts';

export const CALENDAR_WORKER_URL = workerUrl('calendarWorker');

export interface PooledCalendarOptions {
  /** Called after each finished pair with (departure samples done, in total). */
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
}

/** The whole calendar on a pool of `workers` threads made for the occasion (closed afterwards). */
export async function windowCalendarPooled(
  system: StarSystem,
  request: CalendarRequest,
  workers: number,
  options: PooledCalendarOptions = {},
): Promise<Calendar> {
  if (!Number.isInteger(workers) || workers < 1) throw new RangeError(`workers must be an integer >= 1 (got ${workers})`);
  const resolved = resolveCalendarRequest(system, request); // validates here, not in a worker
  const order = resolved.pairs
    .map((_, k) => k)
    .sort((a, b) => {
      const ca = resolved.pairs[a].rows * resolved.pairs[a].tofSamples;
      const cb = resolved.pairs[b].rows * resolved.pairs[b].tofSamples;
      return cb - ca || a - b;
    });
  const total = resolved.pairs.reduce((s, p) => s + p.rows, 0);
  const results: CalendarPair[] = new Array(resolved.pairs.length);
  const pool = new Piscina({ filename: CALENDAR_WORKER_URL, minThreads: Math.min(workers, order.length), maxThreads: workers, idleTimeout: 30_000 });
  const signal = options.signal;
  const cancelled = (): boolean => signal?.aborted === true;
  let next = 0;
  let done = 0;
  let failure: unknown = null;
  const worker = async (): Promise<void> => {
    while (next < order.length && failure === null && !cancelled()) {
      const k = order[next++];
      const task: CalendarTask = { system, request, pairIndex: k };
      try {
        const r: CalendarPair = await pool.run(task);
        if (cancelled()) return;
        results[k] = r;
        done += resolved.pairs[k].rows;
        options.onProgress?.(done, total);
      } catch (err) {
        if (failure === null) failure = err;
      }
    }
  };
  try {
    const all = Promise.all(Array.from({ length: Math.min(workers, order.length) }, worker));
    const aborted = new Promise<void>((resolve) => {
      if (!signal) return;
      if (signal.aborted) resolve();
      else signal.addEventListener('abort', () => resolve(), { once: true });
    });
    await Promise.race([all, aborted]);
    if (failure !== null) throw failure;
    if (cancelled()) {
      all.catch(() => undefined);
      throw new SolverError('calendar', 'cancelled', `cancelled after ${done} of ${total} departures`, { done, total });
    }
    return assembleCalendar(system, request, results);
  } finally {
    await pool.destroy();
  }
}
