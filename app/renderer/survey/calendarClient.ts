/**
 * Runs the window calendar on Web Workers (the porkchop workers' script, one per core up to
 * two, like windows/porkchopClient.ts; kept between jobs): the pairs are handed out one per free
 * worker, costliest first (departure samples × flight-time samples), so two workers share them
 * as fast as each gets processor time; each pair is core/survey calendarPair, the very function
 * the command line and the core's tests run, and the calendar is assembled in the request's pair
 * order. Progress sums the departure samples done over the pairs. Cancel: no further pair is
 * handed out and the job resolves to null at once; a pair already running finishes in its
 * worker and is dropped. One job at a time (a new run cancels the previous one). The worker
 * factory and the pool size are injectable for tests.
 */
import { assembleCalendar, resolveCalendarRequest, type Calendar, type CalendarPair, type CalendarRequest } from '../../../core/survey/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { defaultPoolSize, defaultWorker, type WorkerLike } from '../windows/porkchopClient.ts';
import type { FromWorker } from '../windows/protocol.ts';

export interface CalendarRun {
  calendar: Calendar;
  /** Wall time of the job, ms, and the workers it ran on. */
  ms: number;
  workers: number;
}

interface Job {
  id: number;
  system: StarSystem;
  request: CalendarRequest;
  order: number[];
  next: number;
  rows: number[];
  total: number;
  /** Departure samples done per pair (finished pairs count whole). */
  done: number[];
  results: (CalendarPair | undefined)[];
  left: number;
  t0: number;
  onProgress: (fraction: number) => void;
  resolve: (r: CalendarRun | null) => void;
  reject: (e: Error) => void;
}

export class CalendarClient {
  #workers: WorkerLike[] = [];
  #id = 0;
  #job: Job | null = null;
  /** Workers computing a pair (of this job or of one cancelled). */
  #busy = new Set<WorkerLike>();

  constructor(
    private readonly factory: () => WorkerLike = defaultWorker,
    private readonly size: number = defaultPoolSize(),
  ) {}

  get poolSize(): number {
    return Math.max(1, Math.floor(this.size));
  }

  #ensure(): WorkerLike[] {
    if (this.#workers.length) return this.#workers;
    for (let k = 0; k < this.poolSize; k++) {
      const w = this.factory();
      w.onmessage = (e) => this.#onMessage(w, e.data);
      this.#workers.push(w);
    }
    return this.#workers;
  }

  #send(w: WorkerLike, job: Job): void {
    if (job.next >= job.order.length) return;
    const pairIndex = job.order[job.next++];
    this.#busy.add(w);
    w.postMessage({ type: 'calendar-pair', id: job.id, system: job.system, request: job.request, pairIndex });
  }

  #onMessage(w: WorkerLike, m: FromWorker): void {
    if (m.type === 'calendar-pair-done' || m.type === 'error') this.#busy.delete(w);
    const job = this.#job;
    if (!job || m.id !== job.id) {
      // a pair of a cancelled or replaced job: the worker is free again
      if (m.type === 'calendar-pair-done' || m.type === 'error') this.#freed(w);
      return;
    }
    if (m.type === 'calendar-progress') {
      job.done[m.pairIndex] = m.done;
      job.onProgress(job.done.reduce((s, v) => s + v, 0) / job.total);
      return;
    }
    if (m.type === 'error') {
      this.#job = null;
      job.reject(new Error(m.message));
      this.#freed(w);
      return;
    }
    if (m.type !== 'calendar-pair-done') return;
    job.results[m.pairIndex] = m.pair;
    job.done[m.pairIndex] = job.rows[m.pairIndex];
    job.left--;
    job.onProgress(job.done.reduce((s, v) => s + v, 0) / job.total);
    if (job.left === 0) {
      this.#job = null;
      const calendar = assembleCalendar(job.system, job.request, job.results as CalendarPair[]);
      job.resolve({ calendar, ms: performance.now() - job.t0, workers: this.#workers.length });
      this.#freed(w);
      return;
    }
    this.#send(w, job);
  }

  /** A worker finished something that is no longer wanted: give it the current job's next pair. */
  #freed(w: WorkerLike): void {
    if (this.#job) this.#send(w, this.#job);
  }

  /**
   * Computes a calendar (cancelling any running one); resolves to it, or null when cancelled.
   * The request is checked here first (an InputError rejects before any work is sent).
   */
  run(system: StarSystem, request: CalendarRequest, onProgress: (fraction: number) => void): Promise<CalendarRun | null> {
    this.cancel();
    const resolved = resolveCalendarRequest(system, request);
    const n = resolved.pairs.length;
    const rows = resolved.pairs.map((p) => p.rows);
    const order = resolved.pairs
      .map((_, k) => k)
      .sort((a, b) => resolved.pairs[b].rows * resolved.pairs[b].tofSamples - resolved.pairs[a].rows * resolved.pairs[a].tofSamples || a - b);
    const workers = this.#ensure();
    return new Promise((resolve, reject) => {
      const job: Job = {
        id: ++this.#id,
        system,
        request,
        order,
        next: 0,
        rows,
        total: rows.reduce((s, v) => s + v, 0),
        done: new Array<number>(n).fill(0),
        results: new Array(n),
        left: n,
        t0: performance.now(),
        onProgress,
        resolve,
        reject,
      };
      this.#job = job;
      // busy workers (still finishing a cancelled job's pair) take theirs when they report
      for (const w of workers) if (!this.#busy.has(w)) this.#send(w, job);
    });
  }

  cancel(): void {
    const job = this.#job;
    if (!job) return;
    this.#job = null;
    job.resolve(null);
  }

  dispose(): void {
    this.cancel();
    for (const w of this.#workers) w.terminate();
    this.#workers = [];
  }
}
