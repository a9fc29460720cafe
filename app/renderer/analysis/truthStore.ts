/**
 * The open plan read in its truth model (core/target truthReport) for the readouts: Budget,
 * target and System view. In patched conics the plan's evaluation is the truth and nothing runs
 * here. In the other models a report is computed in its own analysis worker a short while after
 * the last edit (debounced: typing a number does not start a flight per keystroke); an edit while
 * one runs cancels it. Until the new report arrives the previous one stays, marked stale.
 */
import type { TruthModel } from '../../../core/plan/index.ts';
import { planTruthModel } from '../../../core/plan/index.ts';
import type { TruthReport } from '../../../core/target/index.ts';
import type { DocumentSnapshot } from '../state/document.ts';
import { Observable, type Readable } from '../state/observable.ts';
import type { AnalysisClient } from './client.ts';

export interface TruthState {
  /** The plan's truth model now. */
  model: TruthModel;
  /** The last report (possibly of an earlier revision; null in patched conics or before the first). */
  report: TruthReport | null;
  /** Document revision and generation the report belongs to. */
  revision: number;
  generation: number;
  /** A report is being computed (or waits for the edits to settle). */
  pending: boolean;
  progress: number;
  /** Worker time of the last report, ms. */
  ms: number;
  /** From the edit to the report on screen (debounce, worker start, flight), ms. */
  refreshMs: number;
  /** Why the last report failed (the core's words), or null. */
  error: string | null;
  docRevision: number;
  docGeneration: number;
}

/** The report belongs to the plan as it is now. */
export function truthIsCurrent(s: TruthState): boolean {
  return s.report !== null && s.revision === s.docRevision && s.generation === s.docGeneration && s.report.model === s.model;
}

/** Wait after the last edit before a report is computed, ms. */
export const TRUTH_DEBOUNCE_MS = 250;

export class TruthStore implements Readable<TruthState> {
  #seq = 0;
  #timer: ReturnType<typeof setTimeout> | null = null;
  #editedAt = 0;
  #out = new Observable<TruthState>({
    model: 'conic',
    report: null,
    revision: -1,
    generation: -1,
    pending: false,
    progress: 0,
    ms: 0,
    refreshMs: 0,
    error: null,
    docRevision: -1,
    docGeneration: -1,
  });
  #unsubscribe: () => void;

  constructor(
    private readonly doc: Readable<DocumentSnapshot>,
    private readonly client: AnalysisClient,
    private readonly debounceMs = TRUTH_DEBOUNCE_MS,
    private readonly now: () => number = () => performance.now(),
  ) {
    this.#unsubscribe = doc.subscribe((d) => this.changed(d));
  }

  subscribe(l: (s: TruthState) => void): () => void {
    return this.#out.subscribe(l);
  }

  get(): TruthState {
    return this.#out.get();
  }

  private changed(d: DocumentSnapshot): void {
    const s = this.#out.get();
    if (s.docRevision === d.revision && s.docGeneration === d.generation) return;
    const model = planTruthModel(d.plan);
    // a report of another document or another model says nothing about this one
    const keep = s.generation === d.generation && s.report?.model === model;
    this.#seq++;
    this.client.cancel();
    if (this.#timer) clearTimeout(this.#timer);
    this.#timer = null;
    const next: TruthState = {
      ...s,
      model,
      docRevision: d.revision,
      docGeneration: d.generation,
      error: null,
      progress: 0,
      pending: model !== 'conic',
      ...(keep ? {} : { report: null, revision: -1, generation: -1 }),
    };
    this.#out.set(next);
    if (model === 'conic') return;
    this.#editedAt = this.now();
    this.#timer = setTimeout(() => {
      this.#timer = null;
      void this.run();
    }, this.debounceMs);
  }

  /** Computes the report of the plan as it is now (the debounce timer calls it; tests may too). */
  async run(): Promise<void> {
    const d = this.doc.get();
    const model = planTruthModel(d.plan);
    if (model === 'conic') return;
    const seq = ++this.#seq;
    this.#out.set({ ...this.#out.get(), pending: true, progress: 0 });
    try {
      const done = await this.client.run({ kind: 'truth', system: d.system, plan: d.plan, model }, (progress) => {
        if (seq === this.#seq) this.#out.set({ ...this.#out.get(), progress });
      });
      if (seq !== this.#seq || !done) return; // overtaken by an edit (which cancelled it)
      if (done.output.kind !== 'truth') throw new Error(`the worker answered a ${done.output.kind} job`);
      this.#out.set({
        ...this.#out.get(),
        report: done.output.truth,
        revision: d.revision,
        generation: d.generation,
        pending: false,
        progress: 1,
        ms: done.ms,
        refreshMs: this.now() - this.#editedAt,
        error: null,
      });
    } catch (err) {
      if (seq !== this.#seq) return;
      this.#out.set({ ...this.#out.get(), pending: false, error: err instanceof Error ? err.message : String(err) });
    }
  }

  dispose(): void {
    if (this.#timer) clearTimeout(this.#timer);
    this.#timer = null;
    this.#unsubscribe();
    this.client.dispose();
  }
}
