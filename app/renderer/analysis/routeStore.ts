/**
 * "Plan a route": whether the route panel is open, the route builder (core/route planRoute) run
 * on the form's intent in its own analysis worker with progress and cancel, its result, and "use
 * this plan", as the way in chose: from the Plan screen ('replace') the route's plan replaces the
 * open plan as one undoable edit; from File › New plan from a route ('new') it opens as a new
 * untitled document, as File › New does (the session asks about unsaved changes first). A refusal
 * of the intent comes back at the form's field (route/routeForm.ts routeErrorAtField). Loading
 * another document cancels a run and drops its result.
 */
import type { Plan } from '../../../core/plan/index.ts';
import type { RouteField } from '../route/routeForm.ts';
import { routeErrorAtField } from '../route/routeForm.ts';
import type { RouteIntent, RouteResult } from '../route/routeCore.ts';
import type { PlanDocumentStore } from '../state/document.ts';
import { Observable, type Readable } from '../state/observable.ts';
import type { AnalysisClient } from './client.ts';

/** What "use" does with the route's plan: a new document ('new'), or an edit of the open plan ('replace'). */
export type RouteUse = 'new' | 'replace';

/**
 * Opens a plan as a new untitled document (the session's: asks about unsaved changes first):
 * 'opened'; 'cancelled' when the user kept the open document; or the reason it was refused.
 */
export type OpenAsNew = (plan: Plan) => Promise<'opened' | 'cancelled' | { refused: string }>;

export interface RouteState {
  /** The route panel is shown. */
  open: boolean;
  /** What "use" does (set by the way the panel was opened). */
  use: RouteUse;
  /** "Use" is waiting for the user's answer about unsaved changes. */
  using: boolean;
  running: boolean;
  progress: number;
  /** The route builder's own words of what it is doing. */
  note: string;
  /** The intent of the running or last run. */
  intent: RouteIntent | null;
  result: RouteResult | null;
  /** Worker time of the last run, ms. */
  ms: number;
  /** Why the last run failed: at a field of the form, or (field null) about the route as a whole. */
  error: { field: RouteField | null; message: string } | null;
  cancelled: boolean;
  /** The document generation the result was made in. */
  generation: number;
  /** Changes when the form starts afresh (after Use, Discard or another document): the panel then offers its defaults again. */
  form: number;
}

const CLOSED: RouteState = {
  open: false,
  use: 'replace',
  using: false,
  running: false,
  progress: 0,
  note: '',
  intent: null,
  result: null,
  ms: 0,
  error: null,
  cancelled: false,
  generation: -1,
  form: 0,
};

export class RouteStore implements Readable<RouteState> {
  #seq = 0;
  #out = new Observable<RouteState>({ ...CLOSED });
  #unsubscribe: () => void;

  constructor(
    private readonly doc: PlanDocumentStore,
    private readonly client: AnalysisClient,
    private readonly openAsNew: OpenAsNew | null = null,
  ) {
    this.#unsubscribe = doc.subscribe((d) => {
      const s = this.#out.get();
      if (s.generation === -1 || s.generation === d.generation) return;
      // another document: a route made for the previous one is not offered for this one
      if (s.running) this.cancel();
      const now = this.#out.get();
      this.#out.set({ ...now, result: null, error: null, note: '', generation: -1, form: now.form + 1 });
    });
  }

  subscribe(l: (s: RouteState) => void): () => void {
    return this.#out.subscribe(l);
  }

  get(): RouteState {
    return this.#out.get();
  }

  /** Opens the route panel (a result not yet used or discarded stays shown); `use` says what "use" will do (default: as before). */
  show(use?: RouteUse): void {
    const s = this.#out.get();
    this.#out.set({ ...s, open: true, use: use ?? s.use });
  }

  /** Puts the panel aside (to look at the vehicle, say): the form, a run and its result stay. */
  hide(): void {
    this.#out.set({ ...this.#out.get(), open: false });
  }

  /** Proposes a route for `intent`; resolves when done, refused, failed or cancelled. */
  async propose(intent: RouteIntent): Promise<void> {
    const d = this.doc.get();
    const seq = ++this.#seq;
    this.#out.set({
      ...this.#out.get(),
      open: true,
      running: true,
      progress: 0,
      note: '',
      intent,
      result: null,
      error: null,
      cancelled: false,
      generation: d.generation,
    });
    try {
      const done = await this.client.run({ kind: 'route', system: d.system, intent }, (progress, note) => {
        if (seq !== this.#seq) return;
        this.#out.set({ ...this.#out.get(), progress, note });
      });
      if (seq !== this.#seq) return;
      const s = this.#out.get();
      if (!done) {
        this.#out.set({ ...s, running: false, note: '', cancelled: true });
        return;
      }
      if (done.output.kind !== 'route') throw new Error(`the worker answered a ${done.output.kind} job`);
      this.#out.set({ ...s, running: false, progress: 1, result: done.output.route, ms: done.ms });
    } catch (err) {
      if (seq !== this.#seq) return;
      const now = this.doc.get();
      this.#out.set({ ...this.#out.get(), running: false, error: routeErrorAtField(err, now.system, now.plan) });
    }
  }

  cancel(): void {
    this.client.cancel();
  }

  /**
   * Uses the route's plan as the panel's `use` says: 'replace' puts it in the open document as
   * one undoable edit; 'new' opens it as a new untitled document (after the unsaved-changes
   * question). The panel then closes. False (the panel stays; with the reason as its error when
   * there is one) when there is no result, the user cancelled, or the plan was refused.
   */
  async use(): Promise<boolean> {
    const s = this.#out.get();
    if (!s.result || s.running || s.using || s.generation !== this.doc.get().generation) return false;
    const plan = structuredClone(s.result.plan);
    const refused = (message: string): false => {
      this.#out.set({ ...this.#out.get(), using: false, error: { field: null, message } });
      return false;
    };
    if (s.use === 'new' && this.openAsNew) {
      this.#out.set({ ...s, using: true, error: null });
      const seq = this.#seq;
      const done = await this.openAsNew(plan);
      if (done === 'cancelled') {
        // the open document stays, and with it the route on offer
        if (seq === this.#seq) this.#out.set({ ...this.#out.get(), using: false });
        return false;
      }
      if (done !== 'opened') return refused(`The route's plan was not opened: ${done.refused}`);
      ++this.#seq;
      this.#out.set({ ...CLOSED, form: this.#out.get().form + 1 });
      return true;
    }
    const refusal = this.doc.edit(`Plan a route (${plan.name})`, () => plan);
    if (refusal) {
      refusal.shown = true;
      return refused(`The route's plan was not used: ${refusal.issues.map((i) => (i as { words?: string }).words ?? `${i.path} ${i.rule}`).join('; ')}`);
    }
    this.#out.set({ ...CLOSED, form: s.form + 1 });
    return true;
  }

  /** Closes the panel, cancelling a run and dropping its result. */
  discard(): void {
    ++this.#seq;
    const s = this.#out.get();
    if (s.running) this.client.cancel();
    this.#out.set({ ...CLOSED, use: s.use, form: s.form + 1 });
  }

  dispose(): void {
    this.#unsubscribe();
    this.client.dispose();
  }
}
