/**
 * The open document: the plan being edited (with undo/redo), the star system it flies in,
 * where it lives on disk, and whether it has unsaved changes. Plain TypeScript with a Svelte
 * store contract (`subscribe`), so vitest tests it directly and components read `$doc`.
 *
 * Every edit is a pure function Plan → Plan (plan/edits.ts); the store checks the result by the
 * rules a saved file meets when it is opened again (the checker; the session's is
 * core/io planSaveIssues: serialise, then the loader's schema, semantic and system checks), and
 * refuses an edit that would make the plan invalid: it never reaches the history, the autosave
 * or a saved file, and `edit` returns the refusal (the field that made it shows why). A plan
 * already invalid (a recovered copy from an older version) takes any edit that adds no error,
 * so it can be mended step by step. The checks' issues (`events[2].dv_mps`) show beside the fields.
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

/** An edit the store did not apply: what it was and the errors its plan would have had. */
export interface EditRefusal {
  label: string;
  /** Errors of the refused plan (paths as the checker gives them). */
  issues: ValidationIssue[];
  /** Set by whoever showed the refusal to the user (the field that made the edit). */
  shown: boolean;
}

export function isRefusal(x: unknown): x is EditRefusal {
  return typeof x === 'object' && x !== null && Array.isArray((x as EditRefusal).issues) && typeof (x as EditRefusal).label === 'string';
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
  /** The issues of each plan checked (in this system), so an accepted edit is not checked twice. */
  #checked = new WeakMap<Plan, ValidationIssue[]>();
  /** The last refused edit (null until one is); the session tells the user of those no field showed. */
  readonly refused = new Observable<EditRefusal | null>(null);

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
      issues: this.#issuesOf(plan),
      loadWarnings: this.#warnings,
    };
  }

  #issuesOf(plan: Plan): ValidationIssue[] {
    let issues = this.#checked.get(plan);
    if (!issues) {
      issues = this.check(plan, this.#system, this.#ref);
      this.#checked.set(plan, issues);
    }
    return issues;
  }

  #emit(): void {
    this.#out.set(this.#snapshot());
  }

  /**
   * Applies an edit and returns null; a no-op edit (same object back) changes nothing. An edit
   * whose plan has errors (more errors than the present plan, which has none unless it was
   * loaded so) is not applied: the refusal is returned and published on `refused`.
   */
  edit(label: string, fn: (plan: Plan) => Plan): EditRefusal | null {
    const present = this.#history.present;
    const next = fn(present);
    if (next === present) return null;
    const errors = this.#issuesOf(next).filter((i) => i.severity === 'error');
    if (errors.length > 0) {
      const before = this.#issuesOf(present).filter((i) => i.severity === 'error').length;
      if (errors.length > before) {
        const refusal: EditRefusal = { label, issues: errors, shown: false };
        this.refused.set(refusal);
        return refusal;
      }
    }
    this.#history.push(next, label);
    this.#emit();
    return null;
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
    this.#checked = new WeakMap();
    this.#system = doc.system;
    this.#ref = doc.systemRef;
    this.#file = doc.file;
    this.#warnings = doc.warnings ?? [];
    this.#savedRevision = dirty ? -1 : this.#history.revision;
    this.#generation++;
    this.#emit();
  }

  /** The current plan was written to `file` (naming its system by `systemRef` when given: a Save As to another folder). */
  markSaved(file: FileRef, systemRef?: PlanSystemRef): void {
    this.#file = file;
    if (systemRef) this.#ref = systemRef;
    this.#savedRevision = this.#history.revision;
    this.#emit();
  }
}
