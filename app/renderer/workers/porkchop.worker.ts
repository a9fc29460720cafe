/// <reference lib="webworker" />
/** The Windows view's worker: runs porkchop jobs (windows/porkchopJob.ts) with progress and cancel. */
import { SolverError } from '../../../core/math/index.ts';
import { planeBuffers } from '../../../core/search/index.ts';
import { runPorkchopJob } from '../windows/porkchopJob.ts';
import type { FromWorker, ToWorker } from '../windows/protocol.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const cancelled = new Set<number>();

function post(m: FromWorker, transfer: Transferable[] = []): void {
  scope.postMessage(m, transfer);
}

scope.onmessage = async (e: MessageEvent<ToWorker>) => {
  const m = e.data;
  if (m.type === 'cancel') {
    cancelled.add(m.id);
    return;
  }
  let lastPost = 0;
  try {
    const r = await runPorkchopJob(m.system, m.request, m.windows, {
      isCancelled: () => cancelled.has(m.id),
      onProgress: (done, total) => {
        const now = performance.now();
        if (now - lastPost > 50 || done === total) {
          lastPost = now;
          post({ type: 'progress', id: m.id, done, total });
        }
      },
    });
    post({ type: 'done', id: m.id, grid: r.grid, windows: r.windows, gridMs: r.gridMs, windowsMs: r.windowsMs }, planeBuffers(r.grid.planes));
  } catch (err) {
    if (err instanceof SolverError && err.reason === 'cancelled') post({ type: 'cancelled', id: m.id });
    else post({ type: 'error', id: m.id, message: err instanceof Error ? err.message : String(err) });
  } finally {
    cancelled.delete(m.id);
  }
};
