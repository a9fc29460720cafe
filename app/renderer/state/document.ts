/**
 * The open document: the plan being edited (with undo/redo), the star system it flies in,
 * where it lives on disk, and whether it has unsaved changes. Plain TypeScript with a Svelte
 * store contract (`subscribe`), so vitest tests it directly and components read `$doc`.
 *
 * Every edit is a pure function Plan → Plan (plan/edits.ts); the store pushes the result on the
 * history and re-runs the field-precise checks of the plan file (planSchema.ts), whose paths
 * (`events[2].dv_mps`) the editor shows beside the fields.
 */
import type { ValidationIssue } from '../../../core/math/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { PlanSystemRef } from '../../../core/io/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { FileRef } from '../host/host.ts';
import { History } from './history.ts';
import { Observable, type Readable } from './observable.ts';

export interface LoadedDocument {
  plan: Plan;
  system: StarSystem;
  systemRef: PlanSystemRef;
  /** Where it lives, or null for a new plan never saved. */
  file: FileRef | null;
  /** Warnings from loading (the file loaded regardless). */
  warnings?: ValidationIssue[];
}

export interface DocumentSnapshot {
  plan: Plan;
  system: StarSystem;
  systemRef: PlanSystemRef;
  file: FileRef | null;
  /** File name, or "Untitled plan". */
  name: string;
  dirty: boolean;
  /** Changes with every edit, undo, redo and load. */
  revision: number;
  /** Increases with every load (a different document, not an edit). */
  generation: number;
  canUndo: boolean;
  canRedo: boolean;
  undoLabel: string | null;
  redoLabel: string | null;
  /** Field-precise issues of the current plan (errors and warnings), file field paths. */
  issues: ValidationIssue[];
  loadWarnings: ValidationIssue[];
}

export type PlanChecker = (plan: Plan, system: StarSystem, ref: PlanSystemRef) => ValidationIssue[];

export const UNTITLED = 'Untitled plan';

export class PlanDocumentStore implements Readable<DocumentSnapshot> {
  #history: History<Plan>;
  #system: StarSystem;
  #ref: PlanSystemRef;
  #file: FileRef | null;
  #savedRevision: number;
  #generation = 0;
  #warnings: ValidationIssue[];
  #out: Observable<DocumentSnapshot>;

  constructor(
    initial: LoadedDocument,
    private readonly check: PlanChecker,
    /** Whether the initial document counts as unsaved (a recovered copy). */
    initiallyDirty = false,
  ) {
    this.#history = new History(initial.plan);
    this.#system = initial.system;
    this.#ref = initial.systemRef;
    this.#file = initial.file;
    this.#warnings = initial.warnings ?? [];
    this.#savedRevision = initiallyDirty ? -1 : this.#history.revision;
    this.#out = new Observable(this.#snapshot());
  }

  subscribe(listener: (s: DocumentSnapshot) => void): () => void {
    return this.#out.subscribe(listener);
  }

  get(): DocumentSnapshot {
    return this.#out.get();
  }

  #snapshot(): DocumentSnapshot {
    const h = this.#history;
    const plan = h.present;
    return {
      plan,
      system: this.#system,
      systemRef: this.#ref,
      file: this.#file,
      name: this.#file?.name ?? UNTITLED,
      dirty: h.revision !== this.#savedRevision,
      revision: h.revision,
      generation: this.#generation,
      canUndo: h.canUndo,
      canRedo: h.canRedo,
      undoLabel: h.undoLabel,
      redoLabel: h.redoLabel,
      issues: this.check(plan, this.#system, this.#ref),
      loadWarnings: this.#warnings,
    };
  }

  #emit(): void {
    this.#out.set(this.#snapshot());
  }

  /** Applies an edit; a no-op edit (same object back) changes nothing. */
  edit(label: string, fn: (plan: Plan) => Plan): void {
    const next = fn(this.#history.present);
    if (next === this.#history.present) return;
    this.#history.push(next, label);
    this.#emit();
  }

  undo(): boolean {
    const ok = this.#history.undo();
    if (ok) this.#emit();
    return ok;
  }

  redo(): boolean {
    const ok = this.#history.redo();
    if (ok) this.#emit();
    return ok;
  }

  /** Replaces the document (open, new, recover): history starts over. */
  load(doc: LoadedDocument, dirty = false): void {
    this.#history.reset(doc.plan);
    this.#system = doc.system;
    this.#ref = doc.systemRef;
    this.#file = doc.file;
    this.#warnings = doc.warnings ?? [];
    this.#savedRevision = dirty ? -1 : this.#history.revision;
    this.#generation++;
    this.#emit();
  }

  /** The current plan was written to `file`. */
  markSaved(file: FileRef): void {
    this.#file = file;
    this.#savedRevision = this.#history.revision;
    this.#emit();
  }
}
