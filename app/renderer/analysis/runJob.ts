/**
 * One analysis job as the worker runs it: n-body verification (core/nbody/verify.ts),
 * differential correction (core/nbody/correct.ts), a dispersion run (core/nbody/disperse.ts)
 * or one of the checks (analysis/checkJobs.ts), with progress as a fraction and a note. Plain code, tested without a Worker.
 */
import { correctPlan } from '../../../core/nbody/index.ts';
import { disperse } from '../../../core/nbody/index.ts';
import { verifyNBody } from '../../../core/nbody/index.ts';
import type { AnalysisJob, AnalysisOutput } from './protocol.ts';
import { runCheckJob } from './checkJobs.ts';

export function runAnalysisJob(job: AnalysisJob, onProgress: (fraction: number, note: string) => void): AnalysisOutput {
  switch (job.kind) {
    case 'verify':
      return {
        kind: 'verify',
        nbody: verifyNBody(job.system, job.plan, job.result, {
          onProgress: (done, total) => onProgress(total > 0 ? done / total : 0, 'flying the plan in n-body gravity'),
        }),
      };
    case 'correct':
      return {
        kind: 'correct',
        correction: correctPlan(job.system, job.plan, {
          onProgress: (it, max, norm) => onProgress(it / max, `iteration ${it}: residual ${norm.toPrecision(3)}`),
        }),
      };
    case 'disperse':
      return {
        kind: 'disperse',
        dispersion: disperse(job.system, job.plan, {
          ...job.options,
          onProgress: (done, total) => onProgress(total > 0 ? done / total : 0, `${done} of ${total} samples`),
        }),
      };
    default:
      return runCheckJob(job, onProgress);
  }
}
