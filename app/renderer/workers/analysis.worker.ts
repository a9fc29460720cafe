/// <reference lib="webworker" />
/**
 * The analysis worker: n-body verification, correction and dispersion runs off the UI thread.
 * The core runs each job synchronously; cancelling terminates the worker (analysis/client.ts).
 */
import { runAnalysisJob } from '../analysis/runJob.ts';
import type { FromAnalysisWorker, ToAnalysisWorker } from '../analysis/protocol.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<ToAnalysisWorker>) => {
  const { id, job } = e.data;
  const post = (m: FromAnalysisWorker) => scope.postMessage(m);
  let last = 0;
  const t0 = performance.now();
  try {
    const output = runAnalysisJob(job, (fraction, note) => {
      const now = performance.now();
      if (now - last > 40 || fraction >= 1) {
        last = now;
        post({ type: 'progress', id, fraction, note });
      }
    });
    post({ type: 'done', id, output, ms: performance.now() - t0 });
  } catch (err) {
    post({ type: 'error', id, message: err instanceof Error ? err.message : String(err) });
  }
};
