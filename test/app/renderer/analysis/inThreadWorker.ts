/** A "worker" that runs analysis jobs in this thread, answering asynchronously as a real one would (progress with its detail, done or error). */
import type { AnalysisWorkerLike } from '../../../../app/renderer/analysis/client.ts';
import { errorAnswer, type FromAnalysisWorker, type ToAnalysisWorker } from '../../../../app/renderer/analysis/protocol.ts';
import { runAnalysisJob } from '../../../../app/renderer/analysis/runJob.ts';

export interface TestWorker extends AnalysisWorkerLike {
  terminated: number;
  jobs: ToAnalysisWorker[];
}

export function inThreadWorker(): TestWorker {
  const w: TestWorker = {
    onmessage: null,
    terminated: 0,
    jobs: [],
    postMessage(m: ToAnalysisWorker) {
      w.jobs.push(m);
      setTimeout(() => {
        const send = (x: FromAnalysisWorker) => w.onmessage?.({ data: x } as MessageEvent<FromAnalysisWorker>);
        try {
          const output = runAnalysisJob(m.job, (fraction, note, detail) => send({ type: 'progress', id: m.id, fraction, note, detail }));
          send({ type: 'done', id: m.id, output, ms: 1 });
        } catch (e) {
          send(errorAnswer(m.id, e));
        }
      }, 0);
    },
    terminate() {
      w.terminated++;
    },
  };
  return w;
}
