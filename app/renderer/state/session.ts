/**
 * The app's session: the open document, its evaluation, the time cursor, and the file actions
 * (New, Open, Open Recent, Save, Save As, Export, Undo, Redo, recovery of unsaved work).
 *
 * Loading a plan is all-or-nothing: the file is parsed and checked (core/io/planFile.ts), its
 * system resolved and checked against it; any problem becomes one notice listing every issue
 * with its field path, and the open document stays as it was.
 *
 * A system named by path is read from where the plan names it (beside the plan file, desktop)
 * and nowhere else without asking: when it cannot be, the user is told which file and why and
 * asked to choose it (or to use the bundled copy of that name, explicitly). The bundled systems
 * serve the bundled demo plan. A system not read from beside the plan is embedded in the
 * document, and every browser save embeds it (see loadPlanText, planText).
 *
 * A plan file written by a newer Waymark is refused on open (core/io/planFile.ts says which
 * version), and Save never overwrites one: the host refuses (NewerVersionError) and the session
 * offers Save As instead.
 *
 * Recovery: while there are unsaved changes, autosave writes a copy through the host (a file in
 * the user-data folder on the desktop, localStorage in a browser). On start, a copy left by a
 * session that ended without saving (a crash, a killed process) is offered back; until the
 * user recovers or discards it, autosave does not write, so new edits cannot replace the older
 * copy, and the offer cannot be dismissed without a choice.
 */
import {
  parsePlanFile,
  requirePlanFitsSystem,
  resolveBurnsForSave,
  serializePlanFile,
  staleResolvedIssues,
  type PlanSystemRef,
} from '../../../core/io/index.ts';
import { parseSystemFile } from '../../../core/io/index.ts';
import { ValidationError, type ValidationIssue } from '../../../core/math/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import { issueInWords, issuesInWords, planSaveIssues } from '../../../core/io/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import {
  NewerVersionError,
  type PlanExportKind,
  type ExportKind,
  type FileRef,
  type Host,
  type MenuCommand,
  type OpenedFile,
  type RecentFile,
  type RecoverySnapshot,
} from '../host/host.ts';
import { fileToMemoryPath } from '../plan/paths.ts';
import { rebaseSystemPath, relativeFrom } from './systemPath.ts';
import { CursorStore } from './cursor.ts';
import { PlanDocumentStore, UNTITLED, type LoadedDocument } from './document.ts';
import { EvaluationStore, describeError, type Evaluate } from './evaluation.ts';
import { exportFile } from './exports.ts';
import { Observable } from './observable.ts';
import { AnalysisClient, type AnalysisWorkerLike } from '../analysis/client.ts';
import { AnalysisStore } from '../analysis/store.ts';
import { TargetStore } from '../analysis/targetStore.ts';
import { TruthStore } from '../analysis/truthStore.ts';
import { RouteStore } from '../analysis/routeStore.ts';

export interface Notice {
  id: number;
  kind: 'error' | 'warning' | 'info';
  title: string;
  detail?: string;
  issues?: ValidationIssue[];
  /** Buttons; the notice closes after one is chosen. */
  actions?: { label: string; run: () => void | Promise<void> }[];
  /** True when the notice can only be closed by one of its actions (no dismiss button). */
  sticky?: boolean;
}

export interface Question {
  title: string;
  message: string;
  choices: { id: string; label: string; primary?: boolean }[];
}

export interface SessionDeps {
  host: Host;
  evaluate: Evaluate;
  /** System files bundled with the app, by file name ("ilmar.system.json" → text). */
  bundledSystems: Record<string, string>;
  /** The demo plan the app opens on first start, or null. */
  demo: { name: string; text: string } | null;
  /** Asks the user (an in-app dialog); resolves to the chosen id. */
  ask(q: Question): Promise<string>;
  autosaveMs: number;
  now?: () => number;
  /** Worker for n-body verification, correction, dispersion, targeting and truth reports (default: the bundled analysis worker). */
  analysisWorker?: () => AnalysisWorkerLike;
  /** Wait after the last edit before the plan is read again in its truth model, ms (default TRUTH_DEBOUNCE_MS). */
  truthDebounceMs?: number;
}

/**
 * Field-precise issues of a plan in memory: every issue it would meet saved and opened again
 * (core/io planSaveIssues: the file's schema, semantic and system checks), paths in memory names.
 * The document store refuses an edit whose plan this finds errors in.
 */
export function planIssues(plan: Plan, system: StarSystem, _ref: PlanSystemRef): ValidationIssue[] {
  let issues: ValidationIssue[];
  try {
    issues = planSaveIssues(plan, system);
  } catch (err) {
    issues = [{ path: '', rule: describeError(err).message, severity: 'error' }];
  }
  return issuesInWords(issues, plan, system).map((i) => ({ ...i, path: fileToMemoryPath(i.path) }));
}

function baseNameOf(path: string): string {
  return path.split(/[\\/]/).pop() ?? path;
}

/** A new plan in `system`: a circular parking orbit 300 km above the home world, one stage, no events. */
export function blankPlan(system: StarSystem): Plan {
  const home = system.calendar.homeIndex > 0 ? system.calendar.homeIndex : system.bodies.length > 1 ? 1 : 0;
  const b = system.bodies[home];
  return {
    name: 'New plan',
    description: '',
    vehicle: { name: 'Ship', payloadMass: 2000, stages: [{ name: 'Stage 1', dryMass: 1500, propellantMass: 8000, isp: 330, thrust: 30000 }] },
    start: { kind: 'parking', body: b.id, epoch: 0, periapsisAltitude: Math.max(300_000, b.safeAlt + 50_000), e: 0, i: 0, raan: 0, argp: 0, nu: 0 },
    events: [],
    target: null,
    reserve: { percent: 5, absolute: 50 },
    end: null,
  };
}

export class Session {
  readonly doc: PlanDocumentStore;
  readonly evaluation: EvaluationStore;
  readonly analysis: AnalysisStore;
  /** Targeting the plan in a model (its own worker). */
  readonly targeting: TargetStore;
  /** The plan read in its truth model for the readouts (its own worker). */
  readonly truth: TruthStore;
  /** "Plan a route": the route panel and the route builder (its own worker). */
  readonly route: RouteStore;
  readonly cursor = new CursorStore();
  readonly notices = new Observable<Notice[]>([]);
  readonly recent = new Observable<RecentFile[]>([]);
  readonly busy = new Observable<string | null>(null);
  #noticeId = 0;
  #timer: ReturnType<typeof setInterval> | null = null;
  #autosavedRevision = -1;
  #recoveryWritten = false;
  /** A recovery copy from an earlier session is on offer and not yet answered: autosave waits. */
  #recoveryOffered = false;

  private constructor(
    private readonly deps: SessionDeps,
    initial: LoadedDocument,
  ) {
    this.doc = new PlanDocumentStore(initial, planIssues);
    this.evaluation = new EvaluationStore(this.doc, deps.evaluate);
    this.analysis = new AnalysisStore(this.doc, this.evaluation, new AnalysisClient(deps.analysisWorker));
    this.targeting = new TargetStore(this.doc, new AnalysisClient(deps.analysisWorker));
    this.truth = new TruthStore(this.doc, new AnalysisClient(deps.analysisWorker), deps.truthDebounceMs);
    this.route = new RouteStore(this.doc, new AnalysisClient(deps.analysisWorker), (plan) => this.newPlanFrom(plan));
    // A refused edit that no field showed (a button, a menu, a window pick) becomes a notice;
    // the field that made an edit marks its refusal shown as soon as the edit returns.
    this.doc.refused.subscribe((r) => {
      if (r)
        queueMicrotask(() => {
          if (!r.shown)
            this.notify({
              kind: 'warning',
              title: `Not applied: ${r.label}`,
              detail: 'The plan would not be valid (it could not be saved and opened again).',
              issues: r.issues,
            });
        });
    });
    // The cursor follows the flown span; a new document puts it at the start.
    let generation = -1;
    this.evaluation.subscribe((e) => {
      if (!e.result) return;
      if (e.generation !== generation) {
        generation = e.generation;
        this.cursor.setSpan(e.result.t0, e.result.t1, e.result.t0);
      } else this.cursor.setSpan(e.result.t0, e.result.t1);
    });
    // Title and unsaved marker: only when they change (a title change is not free in a browser).
    let shown = '';
    this.doc.subscribe((s) => {
      const title = `${s.dirty ? '• ' : ''}${s.name} — Waymark`;
      if (title + s.dirty !== shown) {
        shown = title + s.dirty;
        deps.host.setDocumentState(title, s.dirty);
      }
    });
  }

  /** Opens on the demo plan (or a blank plan when there is none), then offers any recovery copy. */
  static async create(deps: SessionDeps): Promise<Session> {
    let initial: LoadedDocument | null = null;
    let demoProblem: unknown = null;
    if (deps.demo) {
      try {
        // No path and no handle: saving the demo asks where (desktop) or downloads it (browser).
        initial = await loadPlanText(deps, deps.demo.text, { name: deps.demo.name, path: null, handle: null }, false, 'bundled');
      } catch (err) {
        demoProblem = err;
      }
    }
    if (!initial) {
      const text = Object.values(deps.bundledSystems)[0];
      if (!text) throw new Error('no star system is bundled with the app');
      const system = parseSystemFile(text).system;
      initial = { plan: blankPlan(system), system, systemRef: { kind: 'embedded', system }, file: null };
    }
    const s = new Session(deps, initial);
    if (demoProblem) s.noticeFromError('The demo plan did not load', demoProblem);
    await s.refreshRecent();
    await s.offerRecovery();
    s.startAutosave();
    return s;
  }

  // ------------------------------------------------------------------ notices

  notify(n: Omit<Notice, 'id'>): number {
    const id = ++this.#noticeId;
    this.notices.update((list) => [...list.filter((x) => x.title !== n.title), { ...n, id }]);
    return id;
  }

  dismiss(id: number): void {
    this.notices.update((list) => list.filter((n) => n.id !== id));
  }

  /** True while a recovery copy from an earlier session waits for the user's answer. */
  get recoveryPending(): boolean {
    return this.#recoveryOffered;
  }

  noticeFromError(title: string, err: unknown): void {
    const d = describeError(err);
    this.notify({ kind: 'error', title, detail: d.message, issues: err instanceof ValidationError ? err.issues : undefined });
  }

  // ------------------------------------------------------------------ edits

  undo(): void {
    this.doc.undo();
  }

  redo(): void {
    this.doc.redo();
  }

  // ------------------------------------------------------------------ files

  /** Asks to save unsaved changes first; false when the user cancelled. */
  async confirmDiscard(action: string): Promise<boolean> {
    const s = this.doc.get();
    if (!s.dirty) return true;
    const choice = await this.deps.ask({
      title: 'Unsaved changes',
      message: `${s.name} has unsaved changes. Save them before you ${action}?`,
      choices: [
        { id: 'save', label: 'Save', primary: true },
        { id: 'discard', label: 'Discard changes' },
        { id: 'cancel', label: 'Cancel' },
      ],
    });
    if (choice === 'save') return this.save();
    return choice === 'discard';
  }

  async newPlan(): Promise<void> {
    if (!(await this.confirmDiscard('start a new plan'))) return;
    const s = this.doc.get();
    this.doc.load({ plan: blankPlan(s.system), system: s.system, systemRef: s.systemRef, file: null });
    await this.clearOwnRecovery();
  }

  /**
   * `plan` (a route's) as a new untitled document, as New does: the unsaved-changes question
   * first; the plan is unsaved work (marked so, autosaved). Refused, with its issues in words,
   * when it could not be saved and opened again.
   */
  async newPlanFrom(plan: Plan): Promise<'opened' | 'cancelled' | { refused: string }> {
    const s = this.doc.get();
    const errors = planIssues(plan, s.system, s.systemRef).filter((i) => i.severity === 'error');
    if (errors.length > 0) return { refused: errors.map((i) => (i as { words?: string }).words ?? i.rule).join('; ') };
    if (!(await this.confirmDiscard('open the route as a new plan'))) return 'cancelled';
    const now = this.doc.get();
    this.doc.load({ plan, system: now.system, systemRef: now.systemRef, file: null }, true);
    await this.clearOwnRecovery();
    return 'opened';
  }

  async open(): Promise<void> {
    if (!(await this.confirmDiscard('open another plan'))) return;
    let opened: OpenedFile | null;
    try {
      opened = await this.deps.host.openPlan();
    } catch (err) {
      this.noticeFromError('The file could not be opened', err);
      return;
    }
    if (opened) await this.openText(opened.text, opened.ref);
  }

  async openRecent(key: string): Promise<void> {
    if (!(await this.confirmDiscard('open another plan'))) return;
    try {
      const opened = await this.deps.host.openRecent(key);
      await this.openText(opened.text, opened.ref);
    } catch (err) {
      this.noticeFromError(`${baseNameOf(key)} could not be opened`, err);
    }
  }

  /** Loads plan text as the open document; on any problem shows the issues and changes nothing. */
  async openText(text: string, ref: FileRef): Promise<boolean> {
    this.busy.set(`Opening ${ref.name}…`);
    try {
      const loaded = await loadPlanText(this.deps, text, ref, true);
      this.doc.load(loaded);
      const warnings = loaded.warnings ?? [];
      if (warnings.length) this.notify({ kind: 'warning', title: `${ref.name} opened with warnings`, issues: warnings });
      await this.refreshRecent();
      return true;
    } catch (err) {
      this.noticeFromError(`${ref.name} was not opened`, err);
      return false;
    } finally {
      this.busy.set(null);
    }
  }

  /**
   * The plan file's text. A browser saves by download or through a file handle, with no folder
   * to name a system file in: the system is embedded there always.
   */
  planText(): string {
    const s = this.doc.get();
    const ref: PlanSystemRef = this.deps.host.kind === 'browser' ? { kind: 'embedded', system: s.system } : s.systemRef;
    // each burn's resolved figures (derived data: the plan evaluated once in its truth model),
    // computed here rather than taken from the evaluation store so they are exactly what the check
    // on open recomputes; a plan that does not evaluate saves without them
    return serializePlanFile(s.plan, ref, resolveBurnsForSave(s.system, s.plan));
  }

  suggestedName(): string {
    const s = this.doc.get();
    if (s.file) return s.file.name;
    const slug =
      s.plan.name
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-|-$/g, '') || 'plan';
    return `${slug}.plan.json`;
  }

  /** Saves to the document's file (Save As when it has none); true when saved. */
  async save(): Promise<boolean> {
    const s = this.doc.get();
    if (!s.file) return this.saveAs();
    try {
      const ref = await this.deps.host.save(s.file, this.planText());
      if (!ref) return false;
      return this.saved(ref);
    } catch (err) {
      if (err instanceof NewerVersionError) return this.offerSaveAs(err);
      this.noticeFromError(`${s.name} was not saved`, err);
      return false;
    }
  }

  /** Save found a file a newer Waymark wrote: it stays as it is; the user may save elsewhere. */
  private async offerSaveAs(err: NewerVersionError): Promise<boolean> {
    const choice = await this.deps.ask({
      title: 'Written by a newer Waymark',
      message: `${err.fileName} was written by a newer version of Waymark. Saving over it could lose what this version cannot read, so it is not overwritten. Save this plan under another name?`,
      choices: [
        { id: 'save-as', label: 'Save As…', primary: true },
        { id: 'cancel', label: 'Cancel' },
      ],
    });
    if (choice === 'save-as') return this.saveAs();
    this.notify({ kind: 'warning', title: `${err.fileName} was not overwritten`, detail: err.message });
    return false;
  }

  async saveAs(): Promise<boolean> {
    const before = this.doc.get();
    try {
      const ref = await this.deps.host.saveAs(this.suggestedName(), this.planText());
      if (!ref) return false;
      // In another folder, the plan names the same system file from there (or embeds it when no
      // relative path reaches it), written again at once so the file on disk resolves.
      const sys = before.systemRef;
      if (this.deps.host.kind !== 'browser' && sys.kind === 'path' && ref.path && before.file?.path) {
        const rel = rebaseSystemPath(before.file.path, ref.path, sys.path);
        const moved: PlanSystemRef = rel === null ? { kind: 'embedded', system: before.system } : { kind: 'path', path: rel };
        if (rel !== sys.path) {
          const again = await this.deps.host.save(ref, serializePlanFile(before.plan, moved, resolveBurnsForSave(before.system, before.plan)));
          if (!again) return false;
          return this.saved(again, moved);
        }
      }
      return this.saved(ref);
    } catch (err) {
      this.noticeFromError('The plan was not saved', err);
      return false;
    }
  }

  private async saved(ref: FileRef, systemRef?: PlanSystemRef): Promise<boolean> {
    this.doc.markSaved(ref, systemRef);
    await this.clearOwnRecovery();
    await this.refreshRecent();
    return true;
  }

  async exportAs(kind: PlanExportKind): Promise<void> {
    const s = this.doc.get();
    const e = this.evaluation.get();
    if (!e.result || e.stale) {
      this.notify({
        kind: 'error',
        title: 'Nothing to export',
        detail: e.error
          ? `The plan does not evaluate: ${e.error.field ? issueInWords({ path: e.error.field, rule: e.error.message.slice(e.error.field.length + 1) }, s.plan, s.system).text : e.error.message}`
          : 'The plan has no result yet.',
      });
      return;
    }
    try {
      const f = exportFile(kind, s.system, s.plan, e.result, s.file?.name ?? this.suggestedName());
      await this.deps.host.exportFile(kind, f.name, f.text);
    } catch (err) {
      this.noticeFromError('The export failed', err);
    }
  }

  /** Saves data a screen made (a Survey export) through the host; false when cancelled or failed (the failure is a notice). */
  async exportData(kind: ExportKind, suggestedName: string, data: string | Uint8Array): Promise<boolean> {
    try {
      return await this.deps.host.exportFile(kind, suggestedName, data);
    } catch (err) {
      this.noticeFromError('The export failed', err);
      return false;
    }
  }

  async refreshRecent(): Promise<void> {
    try {
      this.recent.set(await this.deps.host.recentFiles());
    } catch {
      this.recent.set([]);
    }
  }

  // ------------------------------------------------------------------ recovery

  async offerRecovery(): Promise<void> {
    let snap: RecoverySnapshot | null = null;
    try {
      snap = await this.deps.host.readRecovery();
    } catch {
      return;
    }
    if (!snap) return;
    const when = new Date(snap.savedAt).toLocaleString();
    this.#recoveryOffered = true;
    this.notify({
      kind: 'info',
      title: 'Unsaved work was found',
      detail: `${snap.name}, autosaved ${when}, was not saved before the app closed.`,
      sticky: true,
      actions: [
        {
          label: 'Recover it',
          run: async () => {
            // A copy that does not load cannot be recovered by this version: either way the offer is settled.
            await this.recover(snap!);
            this.#recoveryOffered = false;
          },
        },
        {
          label: 'Discard it',
          run: async () => {
            await this.deps.host.clearRecovery();
            this.#recoveryOffered = false;
          },
        },
      ],
    });
  }

  async recover(snap: RecoverySnapshot): Promise<boolean> {
    try {
      // The recovered copy is unsaved work: no file to save back to without asking.
      const loaded = await loadPlanText(this.deps, snap.text, { name: snap.name, path: snap.path, handle: null }, true);
      loaded.file = snap.name === UNTITLED ? null : { name: snap.name, path: null, handle: null };
      this.doc.load(loaded, true);
      return true;
    } catch (err) {
      this.noticeFromError('The recovered copy could not be read', err);
      return false;
    }
  }

  /** Removes the recovery copy this session wrote; an earlier session's copy on offer is left alone. */
  private async clearOwnRecovery(): Promise<void> {
    if (this.#recoveryOffered) return;
    this.#recoveryWritten = false;
    await this.deps.host.clearRecovery();
  }

  /** One autosave step (also run by the timer): writes the recovery copy when there are unsaved changes. */
  async autosave(): Promise<void> {
    if (this.#recoveryOffered) return; // the older copy stays until the user answers its offer
    const s = this.doc.get();
    if (!s.dirty) {
      if (this.#recoveryWritten) {
        this.#recoveryWritten = false;
        await this.deps.host.clearRecovery();
      }
      return;
    }
    if (s.revision === this.#autosavedRevision) return;
    let text: string;
    try {
      // The copy carries the system it was made in: recovered later, it needs no file beside it.
      text = serializePlanFile(s.plan, { kind: 'embedded', system: s.system });
    } catch {
      return; // not writable yet (e.g. a non-finite number mid-edit)
    }
    this.#autosavedRevision = s.revision;
    await this.deps.host.writeRecovery({ name: s.name, path: s.file?.path ?? null, text, savedAt: (this.deps.now ?? Date.now)() });
    this.#recoveryWritten = true;
  }

  startAutosave(): void {
    if (this.#timer || this.deps.autosaveMs <= 0) return;
    this.#timer = setInterval(() => void this.autosave(), this.deps.autosaveMs);
  }

  stopAutosave(): void {
    if (this.#timer) clearInterval(this.#timer);
    this.#timer = null;
  }

  // ------------------------------------------------------------------ menu

  async command(c: MenuCommand): Promise<void> {
    switch (c.command) {
      case 'new':
        return this.newPlan();
      case 'new-from-route':
        this.route.show('new');
        return;
      case 'open':
        return this.open();
      case 'open-recent':
        return this.openRecent(c.path);
      case 'save':
        await this.save();
        return;
      case 'save-as':
        await this.saveAs();
        return;
      case 'export':
        return this.exportAs(c.kind);
      case 'undo':
        return this.undo();
      case 'redo':
        return this.redo();
      case 'save-and-close':
        if (await this.save()) await this.deps.host.closeConfirmed();
        return;
    }
  }
}

/** Where a plan's text came from: a file the user opened (its system is looked for as it names it) or the bundled demo. */
export type PlanOrigin = 'user' | 'bundled';

/**
 * Parses plan text and resolves its system; throws ValidationError (or the host's error) on any problem.
 *
 * A system named by path is read from where the plan names it (relative to the plan file's
 * folder) and nowhere else. When that cannot be done (the host cannot read beside the plan, as
 * in a browser; the file is missing, unreadable or not a system file) and `mayAsk`, the user is
 * told which file and why, and asked to choose it (or, when the app bundles a file of that name,
 * to use that copy: a choice, never a silent substitution). A system file that is not valid is
 * refused with its issues. Only the bundled demo plan (`origin` 'bundled') takes the bundled
 * system without asking. The system file's own warnings join the plan's.
 *
 * A system that was not read from beside the plan (chosen, or bundled) is embedded in the
 * document, so a save carries exactly the system the plan was evaluated in.
 */
export async function loadPlanText(
  deps: Pick<SessionDeps, 'host' | 'bundledSystems'> & Partial<Pick<SessionDeps, 'ask'>>,
  text: string,
  ref: FileRef,
  mayAsk: boolean,
  origin: PlanOrigin = 'user',
): Promise<LoadedDocument> {
  let parsed: ReturnType<typeof parsePlanFile>;
  try {
    parsed = parsePlanFile(text);
  } catch (err) {
    if (err instanceof ValidationError) throw new ValidationError('plan file', await refusedInWords(deps, text, ref, err.issues, origin));
    throw err;
  }
  if (parsed.system.kind === 'embedded') {
    return {
      plan: parsed.plan,
      system: parsed.system.system,
      systemRef: parsed.system,
      file: ref,
      // the burns' saved figures (derived) against the plan's evaluation now: a stale block is a warning
      warnings: issuesInWords(
        [...parsed.warnings, ...staleResolvedIssues(parsed.system.system, parsed.plan, parsed.resolved)],
        parsed.plan,
        parsed.system.system,
      ),
    };
  }
  const path = parsed.system.path;
  const fileName = baseNameOf(path);
  const bundled = deps.bundledSystems[fileName] ?? null;
  /** The system's text and where it came from. */
  let found: { text: string; from: 'beside' | 'chosen' | 'bundled'; name: string; path?: string | null } | null = null;
  /** Why the system named could not be read where the plan names it. */
  let why: string;
  if (origin === 'bundled' && bundled !== null) {
    found = { text: bundled, from: 'bundled', name: fileName };
    why = '';
  } else {
    try {
      const beside = await deps.host.readSystemBeside(ref, path);
      if (beside !== null) found = { text: beside, from: 'beside', name: fileName };
      why = ref.path
        ? `it could not be read beside ${ref.name}`
        : `this ${deps.host.kind === 'browser' ? 'browser' : 'window'} cannot read files beside ${ref.name} (it only has the plan file itself)`;
    } catch (err) {
      why = `it could not be read beside ${ref.name}: ${describeError(err).message}`;
    }
  }
  if (!found && mayAsk && deps.ask) {
    const choices = [
      { id: 'choose', label: `Choose ${fileName}…`, primary: true },
      ...(bundled !== null ? [{ id: 'bundled', label: `Use the bundled ${fileName}` }] : []),
      { id: 'cancel', label: 'Cancel' },
    ];
    const answer = await deps.ask({
      title: 'Which system file?',
      message:
        `${ref.name} names the system file "${path}" (relative to the plan's folder), and ${why}. ` +
        `Choose the system file '${fileName}' this plan was made with.` +
        (bundled !== null ? ` The copy bundled with Waymark is used only if you choose it; it may differ from the one the plan was made with.` : ''),
      choices,
    });
    if (answer === 'choose') {
      const picked = await deps.host.openSystem(`Choose the system file '${fileName}' this plan was made with.`);
      if (picked) found = { text: picked.text, from: 'chosen', name: picked.ref.name, path: picked.ref.path };
      else why += '; no file was chosen';
    } else if (answer === 'bundled' && bundled !== null) found = { text: bundled, from: 'bundled', name: `bundled ${fileName}` };
    else why += '; the question was cancelled';
  }
  if (!found) {
    throw new ValidationError('plan file', [{ path: 'system.path', rule: `names "${path}", which was not loaded: ${why}`, severity: 'error' }]);
  }
  let system: StarSystem;
  let systemWarnings: ValidationIssue[];
  const where = (p: string) => `system (${found!.name}) ${p}`.trim();
  try {
    const sys = parseSystemFile(found.text);
    system = sys.system;
    systemWarnings = sys.warnings.map((i) => ({ ...i, path: where(i.path) }));
  } catch (err) {
    if (err instanceof ValidationError) {
      throw new ValidationError(
        `plan file (its system ${found.name} is not a valid system file)`,
        err.issues.map((i) => ({ ...i, path: where(i.path) })),
      );
    }
    throw err;
  }
  let fits: ValidationIssue[];
  try {
    fits = requirePlanFitsSystem(parsed.plan, system);
  } catch (err) {
    if (err instanceof ValidationError) throw new ValidationError(err.what, issuesInWords(err.issues, parsed.plan, system));
    throw err;
  }
  const stale = staleResolvedIssues(system, parsed.plan, parsed.resolved);
  const warnings = [...issuesInWords([...parsed.warnings, ...fits, ...stale], parsed.plan, system), ...systemWarnings];
  // A system read beside the plan stays named so; a file the user chose on the desktop is named
  // from the plan's folder; any other (bundled, or chosen in a browser) travels with the plan.
  const chosenRel = found.from === 'chosen' && found.path && ref.path ? relativeFrom(ref.path, found.path) : null;
  const systemRef: PlanSystemRef =
    deps.host.kind === 'browser'
      ? { kind: 'embedded', system }
      : found.from === 'beside'
        ? parsed.system
        : chosenRel !== null
          ? { kind: 'path', path: chosenRel }
          : { kind: 'embedded', system };
  return { plan: parsed.plan, system, systemRef, file: ref, warnings };
}

/**
 * The issues of plan text the reader refused, in the user's words (core/io issueWords): events
 * and stages named from the text itself, dates in its system's calendar when that system is at
 * hand without asking (embedded, beside the plan, bundled for the bundled demo), else in seconds from the epoch.
 */
async function refusedInWords(
  deps: Pick<SessionDeps, 'host' | 'bundledSystems'>,
  text: string,
  ref: FileRef,
  issues: ValidationIssue[],
  origin: PlanOrigin,
): Promise<ValidationIssue[]> {
  let doc: unknown;
  try {
    doc = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch {
    return issues;
  }
  const sys = typeof doc === 'object' && doc !== null ? (doc as { system?: { path?: unknown; embedded?: unknown } }).system : undefined;
  let system: StarSystem | null = null;
  try {
    if (sys?.embedded !== undefined) system = parseSystemFile(JSON.stringify(sys.embedded)).system;
    else if (typeof sys?.path === 'string') {
      const path = sys.path;
      const systemText =
        (await deps.host.readSystemBeside(ref, path).catch(() => null)) ?? (origin === 'bundled' ? (deps.bundledSystems[baseNameOf(path)] ?? null) : null);
      if (systemText !== null) system = parseSystemFile(systemText).system;
      // With its system at hand, the plan's problems against it join the file's own: every problem at once.
      if (system) {
        try {
          parsePlanFile(text, { system });
        } catch (e) {
          if (e instanceof ValidationError) issues = e.issues;
        }
      }
    }
  } catch {
    system = null;
  }
  return issuesInWords(issues, doc, system);
}
