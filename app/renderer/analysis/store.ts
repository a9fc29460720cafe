/**
 * The on-demand analyses of the open plan: n-body verification, n-body correction and a
 * dispersion run. Each remembers the document revision it was run for; after an edit it is
 * stale (shown as such, and the n-body path leaves the 3D view) until run again.
 */
import type { DispersionOptions } from '../../../core/nbody/index.ts';
import type { CorrectResult } from '../../../core/nbody/index.ts';
import type { DispersionResult } from '../../../core/nbody/index.ts';
import type { NBodyResult } from '../../../core/nbody/index.ts';
import type { DocumentSnapshot } from '../state/document.ts';
import type { EvaluationState } from '../state/evaluation.ts';
import { Observable, type Readable } from '../state/observable.ts';
import type { AnalysisClient } from './client.ts';
import type { AnalysisJob } from './protocol.ts';
import { dispersionFormDefaults, dispersionOptions } from './dispersionForm.ts';

export type AnalysisKind = 'verify' | 'correct' | 'disperse';

export interface AnalysisSlot<T> {
  value: T | null;
  /** Document revision and generation the value belongs to. */
  revision: number;
  generation: number;
  ms: number;
  error: string | null;
}

export interface AnalysisState {
  running: AnalysisKind | null;
  progress: number;
  note: string;
  verify: AnalysisSlot<NBodyResult>;
  correct: AnalysisSlot<CorrectResult>;
  disperse: AnalysisSlot<DispersionResult>;
  /** The document's current revision and generation (to tell stale slots). */
  revision: number;
  generation: number;
}

const empty = <T>(): AnalysisSlot<T> => ({ value: null, revision: -1, generation: -1, ms: 0, error: null });

export function isCurrent(s: AnalysisState, slot: AnalysisSlot<unknown>): boolean {
  return slot.value !== null && slot.revision === s.revision && slot.generation === s.generation;
}

export class AnalysisStore implements Readable<AnalysisState> {
  #seq = 0;
  #out = new Observable<AnalysisState>({
    running: null,
    progress: 0,
    note: '',
    verify: empty(),
    correct: empty(),
    disperse: empty(),
    revision: -1,
    generation: -1,
  });

  constructor(
    private readonly doc: Readable<DocumentSnapshot>,
    private readonly evaluation: Readable<EvaluationState>,
    private readonly client: AnalysisClient,
  ) {
    doc.subscribe((d) => {
      const s = this.#out.get();
      if (s.generation !== d.generation) this.client.cancel();
      this.#out.set({
        ...s,
        revision: d.revision,
        generation: d.generation,
        ...(s.generation !== d.generation ? { verify: empty(), correct: empty(), disperse: empty() } : {}),
      });
    });
  }

  subscribe(l: (s: AnalysisState) => void): () => void {
    return this.#out.subscribe(l);
  }

  get(): AnalysisState {
    return this.#out.get();
  }

  async run(kind: AnalysisKind, dispersion?: DispersionOptions): Promise<void> {
    const d = this.doc.get();
    const e = this.evaluation.get();
    let job: AnalysisJob;
    if (kind === 'verify') {
      if (!e.result || e.stale) return this.fail(kind, 'the plan does not evaluate; fix it first');
      job = { kind, system: d.system, plan: d.plan, result: e.result };
    } else if (kind === 'correct') job = { kind, system: d.system, plan: d.plan };
    else job = { kind, system: d.system, plan: d.plan, options: dispersion ?? dispersionOptions(dispersionFormDefaults()) };
    const { revision, generation } = d;
    const seq = ++this.#seq;
    this.#out.set({ ...this.#out.get(), running: kind, progress: 0, note: '' });
    try {
      const done = await this.client.run(job, (progress, note) => this.#out.set({ ...this.#out.get(), progress, note }));
      if (seq !== this.#seq) return; // a later run took over
      const s = this.#out.get();
      if (!done) {
        this.#out.set({ ...s, running: null, note: 'cancelled' });
        return;
      }
      const slot = { revision, generation, ms: done.ms, error: null };
      const o = done.output;
      if (o.kind === 'verify') this.#out.set({ ...s, running: null, verify: { ...slot, value: o.nbody } });
      else if (o.kind === 'correct') this.#out.set({ ...s, running: null, correct: { ...slot, value: o.correction } });
      else if (o.kind === 'disperse') this.#out.set({ ...s, running: null, disperse: { ...slot, value: o.dispersion } });
    } catch (err) {
      if (seq === this.#seq) this.fail(kind, err instanceof Error ? err.message : String(err));
    }
  }

  private fail(kind: AnalysisKind, message: string): void {
    const s = this.#out.get();
    this.#out.set({ ...s, running: null, [kind]: { ...empty(), error: message, revision: s.revision, generation: s.generation } });
  }

  cancel(): void {
    this.client.cancel();
  }
}
