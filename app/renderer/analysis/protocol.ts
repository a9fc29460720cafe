/**
 * Messages between the renderer and the analysis worker (n-body verification, correction,
 * dispersion, targeting the plan in a model, the plan read in its truth model, and the checks of
 * analysis/checkJobs.ts: game-step check, step sweep, system stability and its run-time estimate).
 * A targeting job's progress carries the targeter's own report (leg, flights, residual).
 */
import type { CorrectResult } from '../../../core/nbody/index.ts';
import type { DispersionOptions, DispersionResult } from '../../../core/nbody/index.ts';
import type { NBodyResult } from '../../../core/nbody/index.ts';
import type { Plan, TruthModel } from '../../../core/plan/index.ts';
import type { TargetProgress, TargetResult, TruthReport } from '../../../core/target/index.ts';
import type { PlanResult } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { CheckJob, CheckOutput } from './checkJobs.ts';

export type AnalysisJob =
  | { kind: 'verify'; system: StarSystem; plan: Plan; result: PlanResult }
  | { kind: 'correct'; system: StarSystem; plan: Plan }
  | { kind: 'disperse'; system: StarSystem; plan: Plan; options: DispersionOptions }
  | { kind: 'target'; system: StarSystem; plan: Plan; model: TruthModel }
  | { kind: 'truth'; system: StarSystem; plan: Plan; model: TruthModel }
  | CheckJob;

export type AnalysisOutput =
  | { kind: 'verify'; nbody: NBodyResult }
  | { kind: 'correct'; correction: CorrectResult }
  | { kind: 'disperse'; dispersion: DispersionResult }
  | { kind: 'target'; target: TargetResult }
  | { kind: 'truth'; truth: TruthReport }
  | CheckOutput;

export type ToAnalysisWorker = { type: 'run'; id: number; job: AnalysisJob };

export type FromAnalysisWorker =
  | { type: 'progress'; id: number; fraction: number; note: string; detail?: TargetProgress }
  | { type: 'done'; id: number; output: AnalysisOutput; ms: number }
  | { type: 'error'; id: number; message: string };
