/**
 * Targeting the open plan in a model (core/target targetPlan), on demand, in its own analysis
 * worker: progress with the residual falling leg by leg, cancel, the result for the revision of
 * the plan it was run on, and "apply": the targeted plan replaces the plan as one undoable edit
 * (its truth model set to the model targeted). After any other edit the result is stale: shown,
 * not applicable.
 */
import type { TruthModel } from '../../../core/plan/index.ts';
import { truthModelLabel } from '../../../core/plan/index.ts';
import type { TargetProgress, TargetResult } from '../../../core/target/index.ts';
import type { PlanDocumentStore } from '../state/document.ts';
import { Observable, type Readable } from '../state/observable.ts';
import { addResidual, type ResidualPoint } from '../target/progress.ts';
import type { AnalysisClient } from './client.ts';

export interface TargetState {
  /** The model of the running job, or null when none runs. */
  running: TruthModel | null;
  progress: number;
  note: string;
  /** The targeter's last report (leg, flights, residual) of the running or last run. */
  last: TargetProgress | null;
  /** Residual falls of the running or last run, for the chart. */
  series: readonly ResidualPoint[];
  result: TargetResult | null;
  /** Document revision and generation the result belongs to. */
  revision: number;
  generation: number;
  /** Worker time of the last run, ms. */
  ms: number;
  error: string | null;
  /** The last run was cancelled. */
  cancelled: boolean;
  /** Document revision made by applying the result (null: not applied). */
  appliedRevision: number | null;
  /** The document's current revision and generation. */
  docRevision: number;
  docGeneration: number;
}

/** The result belongs to the plan as it is now (so it may be applied). */
export function targetIsCurrent(s: TargetState): boolean {
  return s.result !== null && s.revision === s.docRevision && s.generation === s.docGeneration;
}

/** The plan on screen is the result, applied. */
export function targetIsApplied(s: TargetState): boolean {
  return s.result !== null && s.appliedRevision === s.docRevision && s.generation === s.docGeneration;
}

export class TargetStore implements Readable<TargetState> {
  #seq = 0;
  #out = new Observable<TargetState>({
    running: null,
    progress: 0,
    note: '',
    last: null,
    series: [],
    result: null,
    revision: -1,
    generation: -1,
    ms: 0,
    error: null,
    cancelled: false,
    appliedRevision: null,
    docRevision: -1,
    docGeneration: -1,
  });
  #unsubscribe: () => void;

  constructor(
    private readonly doc: PlanDocumentStore,
    private readonly client: AnalysisClient,
  ) {
    this.#unsubscribe = doc.subscribe((d) => {
      const s = this.#out.get();
      const other = s.docGeneration !== d.generation;
      if (other && s.running) this.cancel();
      const now = this.#out.get();
      this.#out.set({
        ...now,
        docRevision: d.revision,
        docGeneration: d.generation,
        // another document: nothing of this one's targeting applies
        ...(other ? { result: null, series: [], last: null, error: null, appliedRevision: null, note: '' } : {}),
      });
    });
  }

  subscribe(l: (s: TargetState) => void): () => void {
    return this.#out.subscribe(l);
  }

  get(): TargetState {
    return this.#out.get();
  }

  /** Targets the plan as it is now in `model`; resolves when done, failed or cancelled. */
  async run(model: TruthModel): Promise<void> {
    const d = this.doc.get();
    const { revision, generation } = d;
    const seq = ++this.#seq;
    this.#out.set({ ...this.#out.get(), running: model, progress: 0, note: '', last: null, series: [], error: null, cancelled: false });
    try {
      const done = await this.client.run({ kind: 'target', system: d.system, plan: d.plan, model }, (progress, note, detail) => {
        if (seq !== this.#seq) return;
        const s = this.#out.get();
        this.#out.set({ ...s, progress, note, last: detail ?? s.last, series: detail ? addResidual(s.series, detail) : s.series });
      });
      if (seq !== this.#seq) return;
      const s = this.#out.get();
      if (!done) {
        this.#out.set({ ...s, running: null, note: 'cancelled', cancelled: true });
        return;
      }
      if (done.output.kind !== 'target') throw new Error(`the worker answered a ${done.output.kind} job`);
      this.#out.set({ ...s, running: null, result: done.output.target, revision, generation, ms: done.ms, appliedRevision: null, progress: 1 });
    } catch (err) {
      if (seq !== this.#seq) return;
      this.#out.set({ ...this.#out.get(), running: null, error: err instanceof Error ? err.message : String(err) });
    }
  }

  cancel(): void {
    this.client.cancel();
  }

  /** Replaces the plan by the targeted one as one undoable edit; false when the result is not for the plan as it is. */
  apply(): boolean {
    const s = this.#out.get();
    if (!targetIsCurrent(s) || !s.result) return false;
    const plan = structuredClone(s.result.plan);
    this.doc.edit(`Target the plan (${truthModelLabel(s.result.model)})`, () => plan);
    this.#out.set({ ...this.#out.get(), appliedRevision: this.doc.get().revision });
    return true;
  }

  dispose(): void {
    this.#unsubscribe();
    this.client.dispose();
  }
}
