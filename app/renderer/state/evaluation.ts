/**
 * Re-evaluates the plan after every change of the document and publishes the PlanResult every
 * view draws from. A failed evaluation keeps the last good result on screen, marked stale, with
 * the error beside it (so a half-typed edit does not blank the views).
 */
import { InputError, SolverError, ValidationError, type ValidationIssue } from '../../../core/math/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { PlanResult } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { DocumentSnapshot } from './document.ts';
import { Observable, type Readable } from './observable.ts';

export type Evaluate = (system: StarSystem, plan: Plan) => PlanResult;

export interface EvaluationError {
  message: string;
  /** In-memory field path of an InputError (`events[2].dv[0]`), or null. */
  field: string | null;
  issues: ValidationIssue[];
}

export interface EvaluationState {
  result: PlanResult | null;
  /** The result belongs to an earlier revision (the current plan failed to evaluate). */
  stale: boolean;
  error: EvaluationError | null;
  /** Wall time of the last evaluation, ms. */
  ms: number;
  /** Document revision and generation the state belongs to. */
  revision: number;
  generation: number;
}

export function describeError(err: unknown): EvaluationError {
  if (err instanceof InputError) return { message: `${err.field} ${err.rule}`, field: err.field, issues: [] };
  if (err instanceof ValidationError) return { message: err.message.split('\n')[0], field: null, issues: err.issues };
  if (err instanceof SolverError) return { message: err.message, field: null, issues: [] };
  return { message: err instanceof Error ? err.message : String(err), field: null, issues: [] };
}

export class EvaluationStore implements Readable<EvaluationState> {
  #out = new Observable<EvaluationState>({ result: null, stale: false, error: null, ms: 0, revision: -1, generation: -1 });
  #unsubscribe: () => void;

  constructor(
    doc: Readable<DocumentSnapshot>,
    private readonly evaluate: Evaluate,
    private readonly now: () => number = () => performance.now(),
  ) {
    this.#unsubscribe = doc.subscribe((s) => this.run(s));
  }

  subscribe(listener: (s: EvaluationState) => void): () => void {
    return this.#out.subscribe(listener);
  }

  get(): EvaluationState {
    return this.#out.get();
  }

  private run(s: DocumentSnapshot): void {
    const prev = this.#out.get();
    if (prev.revision === s.revision && prev.generation === s.generation) return;
    const t0 = this.now();
    try {
      const result = this.evaluate(s.system, s.plan);
      this.#out.set({ result, stale: false, error: null, ms: this.now() - t0, revision: s.revision, generation: s.generation });
    } catch (err) {
      const keep = prev.generation === s.generation ? prev.result : null;
      this.#out.set({ result: keep, stale: keep !== null, error: describeError(err), ms: this.now() - t0, revision: s.revision, generation: s.generation });
    }
  }

  dispose(): void {
    this.#unsubscribe();
  }
}
