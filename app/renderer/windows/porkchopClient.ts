/**
 * Runs porkchop jobs on one or two Web Workers (one per core, up to two), kept between jobs and
 * warmed before the first one. With two, the first leads and the second helps from the grid's
 * far end, the two sharing the rows as fast as each gets processor time (windows/porkchopJob.ts);
 * the page receives the windows as soon as they are found (`onListed`), then one message with
 * the grid and the picture, typed arrays transferred. One job at a time (a new run
 * cancels the previous one), progress, cancel. The worker factory and the pool size are
 * injectable for tests.
 */
import type { PorkchopRequest, WindowOptions } from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { FromWorker, RasterSize, ToWorker } from './protocol.ts';

export type DoneMessage = Extract<FromWorker, { type: 'done' }>;
export type ListedMessage = Extract<FromWorker, { type: 'listed' }>;

export interface WorkerLike {
  postMessage(m: ToWorker, transfer?: Transferable[]): void;
  onmessage: ((e: MessageEvent<FromWorker>) => void) | null;
  terminate(): void;
}

export function defaultWorker(): WorkerLike {
  return new Worker(new URL('../workers/porkchop.worker.ts', import.meta.url), { type: 'module', name: 'porkchop' }) as unknown as WorkerLike;
}

/** Most workers a job is split over. */
export const MAX_WORKERS = 2;

/** One worker per core the page reports, at least one and at most MAX_WORKERS. */
export function defaultPoolSize(): number {
  const cores = typeof navigator !== 'undefined' ? navigator.hardwareConcurrency || 1 : 1;
  return Math.max(1, Math.min(MAX_WORKERS, cores));
}

interface Pending {
  resolve: (m: DoneMessage | null) => void;
  reject: (e: Error) => void;
  onProgress: (done: number, total: number) => void;
  onListed?: (m: ListedMessage) => void;
}

export class PorkchopClient {
  #workers: WorkerLike[] = [];
  #id = 0;
  #warmed = false;
  #pending = new Map<number, Pending>();

  constructor(
    private readonly factory: () => WorkerLike = defaultWorker,
    private readonly size: number = defaultPoolSize(),
  ) {}

  /** Workers in the pool (started on the first use). */
  get poolSize(): number {
    return Math.max(1, Math.floor(this.size));
  }

  #ensure(): WorkerLike[] {
    if (this.#workers.length) return this.#workers;
    const n = typeof MessageChannel === 'undefined' ? 1 : this.poolSize;
    for (let k = 0; k < n; k++) {
      const w = this.factory();
      w.onmessage = (e) => this.#onMessage(e.data);
      this.#workers.push(w);
    }
    // the leader and its helper talk over a port of their own
    if (n > 1) {
      const ch = new MessageChannel();
      this.#workers[0].postMessage({ type: 'peer', port: ch.port1 }, [ch.port1]);
      this.#workers[1].postMessage({ type: 'peer', port: ch.port2 }, [ch.port2]);
    }
    return this.#workers;
  }

  #onMessage(m: FromWorker): void {
    // the window calendar's messages go to its own client (survey/calendarClient.ts)
    if (m.type === 'calendar-progress' || m.type === 'calendar-pair-done') return;
    const p = this.#pending.get(m.id);
    if (!p) return;
    if (m.type === 'progress') {
      // the leader reports the whole grid's cells (its own and its helper's)
      p.onProgress(m.done, m.total);
      return;
    }
    if (m.type === 'listed') {
      // a job a newer one has replaced lists nothing
      if (m.id === this.#id) p.onListed?.(m);
      return;
    }
    this.#pending.delete(m.id);
    if (m.type === 'done') p.resolve(m);
    else if (m.type === 'cancelled') p.resolve(null);
    else p.reject(new Error(m.message));
  }

  /** Starts the workers and has each compile its code on a small grid of `request` (once per pool). */
  warm(system: StarSystem, request: PorkchopRequest): void {
    if (this.#warmed) return;
    this.#warmed = true;
    for (const w of this.#ensure()) w.postMessage({ type: 'warm', system, request });
  }

  /**
   * Starts a job (cancelling any running one); resolves to the result, or null when cancelled.
   * With `raster`, the result carries the picture rasterised at that size. `onListed` gets the
   * windows before the picture is rasterised.
   */
  run(
    system: StarSystem,
    request: PorkchopRequest,
    windows: WindowOptions,
    onProgress: (done: number, total: number) => void,
    raster: RasterSize | null = null,
    onListed?: (m: ListedMessage) => void,
  ): Promise<DoneMessage | null> {
    this.cancel();
    const id = ++this.#id;
    const workers = this.#ensure();
    const helped = workers.length > 1;
    return new Promise((resolve, reject) => {
      this.#pending.set(id, { resolve, reject, onProgress, onListed });
      workers[0].postMessage({ type: 'run', id, system, request, windows, helped, raster });
      if (helped) workers[1].postMessage({ type: 'help', id, system, request });
    });
  }

  cancel(): void {
    for (const id of this.#pending.keys()) for (const w of this.#workers) w.postMessage({ type: 'cancel', id });
  }

  dispose(): void {
    for (const p of this.#pending.values()) p.resolve(null);
    this.#pending.clear();
    for (const w of this.#workers) w.terminate();
    this.#workers = [];
  }
}
