/**
 * One analysis job as the worker runs it: n-body verification (core/nbody/verify.ts),
 * differential correction (core/nbody/correct.ts), a dispersion run (core/nbody/disperse.ts),
 * targeting the plan in a model (core/target targetPlan), the plan read in its truth model
 * (core/target truthReport), a route for an intent (core/route planRoute), a multi-leg sequence
 * search (core/search searchSequence), the system's Δv map (core/survey deltaVMap) or one of the checks
 * (analysis/checkJobs.ts), with progress as a fraction and a note (a targeting job adds the
 * targeter's own report). Plain code, tested without a Worker.
 */
import { correctPlan } from '../../../core/nbody/index.ts';
import { disperse } from '../../../core/nbody/index.ts';
import { verifyNBody } from '../../../core/nbody/index.ts';
import { targetPlan, truthReport, type TargetProgress } from '../../../core/target/index.ts';
import { truthModelLabel } from '../../../core/plan/index.ts';
import type { AnalysisJob, AnalysisOutput } from './protocol.ts';
import { runCheckJob } from './checkJobs.ts';
import { targetFraction } from '../target/progress.ts';
import { planRoute } from '../route/routeCore.ts';
import { searchSequence } from '../../../core/search/index.ts';
import { deltaVMap } from '../../../core/survey/index.ts';

export function runAnalysisJob(job: AnalysisJob, onProgress: (fraction: number, note: string, detail?: TargetProgress) => void): AnalysisOutput {
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
    case 'target': {
      // each leg's first residual: where its progress starts
      const starts = new Map<number, number>();
      return {
        kind: 'target',
        target: targetPlan(job.system, job.plan, {
          model: job.model,
          onProgress: (p) => {
            if (!starts.has(p.leg) && Number.isFinite(p.residual)) starts.set(p.leg, p.residual);
            const note = `leg ${p.leg} of ${p.legs} (${p.legName}): ${p.flights} flights, residual ${p.residual.toPrecision(3)}`;
            onProgress(targetFraction(p, starts.get(p.leg) ?? Number.NaN), note, p);
          },
        }),
      };
    }
    case 'truth':
      return {
        kind: 'truth',
        truth: truthReport(job.system, job.plan, {
          model: job.model,
          onProgress: (done, total) => onProgress(total > 0 ? done / total : 0, `flying the plan in ${truthModelLabel(job.model)}`),
        }),
      };
    case 'route':
      return { kind: 'route', route: planRoute(job.system, job.intent, { onProgress: (fraction, words) => onProgress(fraction, words) }) };
    case 'sequence':
      return {
        kind: 'sequence',
        sequence: searchSequence(job.system, job.request, (fraction) => onProgress(fraction, `searching ${job.request.bodies.length - 1} legs`)),
      };
    case 'dv-map':
      return {
        kind: 'dv-map',
        map: deltaVMap(job.system, {
          samples: job.samples,
          onProgress: (done, total) => onProgress(total > 0 ? done / total : 0, `${done} of ${total} transfers`),
        }),
      };
    default:
      return runCheckJob(job, onProgress);
  }
}
