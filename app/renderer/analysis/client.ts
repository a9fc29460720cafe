/**
 * Runs analysis jobs in a Web Worker, one at a time. The core's jobs are synchronous, so a
 * cancel terminates the worker (a new one starts with the next job) and the job resolves null.
 */
import type { TargetProgress } from '../../../core/target/index.ts';
import { answerError, type AnalysisJob, type AnalysisOutput, type FromAnalysisWorker, type ToAnalysisWorker } from './protocol.ts';

export interface AnalysisWorkerLike {
  postMessage(m: ToAnalysisWorker): void;
  onmessage: ((e: MessageEvent<FromAnalysisWorker>) => void) | null;
  terminate(): void;
}

export function defaultAnalysisWorker(): AnalysisWorkerLike {
  return new Worker(new URL('../workers/analysis.worker.ts', import.meta.url), { type: 'module', name: 'analysis' }) as unknown as AnalysisWorkerLike;
}

export interface Done {
  output: AnalysisOutput;
  ms: number;
}

/** Progress of a job: a fraction, a note, and a targeting job's own report. */
export type Progress = (fraction: number, note: string, detail?: TargetProgress) => void;

export class AnalysisClient {
  #worker: AnalysisWorkerLike | null = null;
  #id = 0;
  #pending: { id: number; resolve: (d: Done | null) => void; reject: (e: Error) => void; onProgress: Progress } | null = null;

  constructor(private readonly factory: () => AnalysisWorkerLike = defaultAnalysisWorker) {}

  get running(): boolean {
    return this.#pending !== null;
  }

  run(job: AnalysisJob, onProgress: Progress): Promise<Done | null> {
    this.cancel();
    const id = ++this.#id;
    if (!this.#worker) {
      const w = this.factory();
      w.onmessage = (e) => {
        const m = e.data;
        const p = this.#pending;
        if (!p || p.id !== m.id) return;
        if (m.type === 'progress') p.onProgress(m.fraction, m.note, m.detail);
        else {
          this.#pending = null;
          if (m.type === 'done') p.resolve({ output: m.output, ms: m.ms });
          else p.reject(answerError(m));
        }
      };
      this.#worker = w;
    }
    const w = this.#worker;
    return new Promise((resolve, reject) => {
      this.#pending = { id, resolve, reject, onProgress };
      w.postMessage({ type: 'run', id, job });
    });
  }

  /** Stops the running job (terminates the worker); it resolves null. */
  cancel(): void {
    const p = this.#pending;
    if (!p) return;
    this.#pending = null;
    this.#worker?.terminate();
    this.#worker = null;
    p.resolve(null);
  }

  dispose(): void {
    this.cancel();
    this.#worker?.terminate();
    this.#worker = null;
  }
}
