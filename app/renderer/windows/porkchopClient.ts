/**
 * Runs porkchop jobs in a Web Worker: one job at a time (a new run cancels the previous one),
 * progress callbacks, cancel. The worker factory is injectable for tests.
 */
import type { PorkchopRequest } from '../../../core/search/index.ts';
import type { WindowOptions } from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { FromWorker, ToWorker } from './protocol.ts';

export type DoneMessage = Extract<FromWorker, { type: 'done' }>;

export interface WorkerLike {
  postMessage(m: ToWorker): void;
  onmessage: ((e: MessageEvent<FromWorker>) => void) | null;
  terminate(): void;
}

export function defaultWorker(): WorkerLike {
  return new Worker(new URL('../workers/porkchop.worker.ts', import.meta.url), { type: 'module', name: 'porkchop' }) as unknown as WorkerLike;
}

export class PorkchopClient {
  #worker: WorkerLike | null = null;
  #id = 0;
  #pending = new Map<number, { resolve: (m: DoneMessage | null) => void; reject: (e: Error) => void; onProgress: (done: number, total: number) => void }>();

  constructor(private readonly factory: () => WorkerLike = defaultWorker) {}

  #ensure(): WorkerLike {
    if (this.#worker) return this.#worker;
    const w = this.factory();
    w.onmessage = (e) => {
      const m = e.data;
      const p = this.#pending.get(m.id);
      if (!p) return;
      if (m.type === 'progress') p.onProgress(m.done, m.total);
      else {
        this.#pending.delete(m.id);
        if (m.type === 'done') p.resolve(m);
        else if (m.type === 'cancelled') p.resolve(null);
        else p.reject(new Error(m.message));
      }
    };
    this.#worker = w;
    return w;
  }

  /** Starts a job (cancelling any running one); resolves to the result, or null when cancelled. */
  run(system: StarSystem, request: PorkchopRequest, windows: WindowOptions, onProgress: (done: number, total: number) => void): Promise<DoneMessage | null> {
    this.cancel();
    const id = ++this.#id;
    const w = this.#ensure();
    return new Promise((resolve, reject) => {
      this.#pending.set(id, { resolve, reject, onProgress });
      w.postMessage({ type: 'run', id, system, request, windows });
    });
  }

  cancel(): void {
    for (const id of this.#pending.keys()) this.#worker?.postMessage({ type: 'cancel', id });
  }

  dispose(): void {
    for (const p of this.#pending.values()) p.resolve(null);
    this.#pending.clear();
    this.#worker?.terminate();
    this.#worker = null;
  }
}
