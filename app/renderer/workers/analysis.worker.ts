/// <reference lib="webworker" />
/**
 * The analysis worker: n-body verification, correction, dispersion runs, targeting and the plan
 * read in its truth model, the Survey screen's Δv map of the whole system, off the UI thread.
 * The core runs each job synchronously; cancelling terminates the worker (analysis/client.ts).
 */
import { runAnalysisJob } from '../analysis/runJob.ts';
import { errorAnswer, type FromAnalysisWorker, type ToAnalysisWorker } from '../analysis/protocol.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<ToAnalysisWorker>) => {
  const { id, job } = e.data;
  const post = (m: FromAnalysisWorker) => scope.postMessage(m);
  let last = 0;
  // A targeting job's residual: every fall is posted (the panel draws it), other progress at most every 40 ms.
  let leg = 0;
  let residual = Number.POSITIVE_INFINITY;
  const t0 = performance.now();
  try {
    const output = runAnalysisJob(job, (fraction, note, detail) => {
      const now = performance.now();
      const news = detail !== undefined && (detail.leg !== leg || detail.residual < residual);
      if (detail) {
        if (detail.leg !== leg) residual = Number.POSITIVE_INFINITY;
        leg = detail.leg;
        residual = Math.min(residual, detail.residual);
      }
      if (news || now - last > 40 || fraction >= 1) {
        last = now;
        post({ type: 'progress', id, fraction, note, detail });
      }
    });
    post({ type: 'done', id, output, ms: performance.now() - t0 });
  } catch (err) {
    post(errorAnswer(id, err));
  }
};
