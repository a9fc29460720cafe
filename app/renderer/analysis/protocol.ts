/**
 * Messages between the renderer and the analysis worker (n-body verification, correction,
 * dispersion, targeting the plan in a model, the plan read in its truth model, a multi-leg sequence
 * search (the Windows view's sequence mode), and the checks of
 * analysis/checkJobs.ts: game-step check, step sweep, retargeting for a game, system stability and its run-time estimate).
 * A targeting job's progress carries the targeter's own report (leg, flights, residual). A job
 * refused for its input (InputError: a route's intent) keeps the field and rule across, so the
 * form can show it at that field.
 */
import { InputError } from '../../../core/math/index.ts';
import type { CorrectResult } from '../../../core/nbody/index.ts';
import type { DispersionOptions, DispersionResult } from '../../../core/nbody/index.ts';
import type { NBodyResult } from '../../../core/nbody/index.ts';
import type { Plan, TruthModel } from '../../../core/plan/index.ts';
import type { TargetProgress, TargetResult, TruthReport } from '../../../core/target/index.ts';
import type { PlanResult } from '../../../core/plan/index.ts';
import type { SequenceRequest, SequenceResult } from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { DeltaVMap } from '../../../core/survey/index.ts';
import type { CheckJob, CheckOutput } from './checkJobs.ts';
import type { RouteIntent, RouteResult } from '../route/routeCore.ts';

export type AnalysisJob =
  | { kind: 'verify'; system: StarSystem; plan: Plan; result: PlanResult }
  | { kind: 'correct'; system: StarSystem; plan: Plan }
  | { kind: 'disperse'; system: StarSystem; plan: Plan; options: DispersionOptions }
  | { kind: 'target'; system: StarSystem; plan: Plan; model: TruthModel }
  | { kind: 'truth'; system: StarSystem; plan: Plan; model: TruthModel }
  | { kind: 'route'; system: StarSystem; intent: RouteIntent }
  | { kind: 'sequence'; system: StarSystem; request: SequenceRequest }
  /** The Survey screen's Δv map of the whole system (core/survey deltaVMap); samples: porkchop samples per axis (default the core's). */
  | { kind: 'dv-map'; system: StarSystem; samples?: number }
  | CheckJob;

export type AnalysisOutput =
  | { kind: 'verify'; nbody: NBodyResult }
  | { kind: 'correct'; correction: CorrectResult }
  | { kind: 'disperse'; dispersion: DispersionResult }
  | { kind: 'target'; target: TargetResult }
  | { kind: 'truth'; truth: TruthReport }
  | { kind: 'route'; route: RouteResult }
  | { kind: 'sequence'; sequence: SequenceResult }
  | { kind: 'dv-map'; map: DeltaVMap }
  | CheckOutput;

export type ToAnalysisWorker = { type: 'run'; id: number; job: AnalysisJob };

export type FromAnalysisWorker =
  | { type: 'progress'; id: number; fraction: number; note: string; detail?: TargetProgress }
  | { type: 'done'; id: number; output: AnalysisOutput; ms: number }
  | { type: 'error'; id: number; message: string; input?: { field: string; rule: string; value?: unknown } };

/** The worker's answer to a job that threw: its message, and an InputError's field and rule. */
export function errorAnswer(id: number, err: unknown): FromAnalysisWorker {
  const message = err instanceof Error ? err.message : String(err);
  if (!(err instanceof InputError)) return { type: 'error', id, message };
  const value = typeof err.value === 'number' || typeof err.value === 'string' ? err.value : undefined;
  return { type: 'error', id, message, input: { field: err.field, rule: err.rule, value } };
}

/** The error a job's answer stands for: an InputError again when the job was refused for its input. */
export function answerError(m: Extract<FromAnalysisWorker, { type: 'error' }>): Error {
  return m.input ? new InputError(m.input.field, m.input.rule, m.input.value) : new Error(m.message);
}
