/**
 * The narrow API the preload script exposes to the renderer as `window.waymark`, and the IPC
 * channel names behind it. Types only plus constants: main, preload and renderer all import
 * this file, and nothing in it touches Electron.
 */

/** IPC channels (renderer → main are `invoke` handlers; `menu` is main → renderer). */
export const IPC = {
  openDialog: 'waymark:file-open-dialog',
  openRecent: 'waymark:file-open-recent',
  openSystemDialog: 'waymark:system-open-dialog',
  readSystemBeside: 'waymark:system-read-beside',
  save: 'waymark:file-save',
  saveAs: 'waymark:file-save-as',
  exportFile: 'waymark:file-export',
  recentList: 'waymark:recent-list',
  recoveryRead: 'waymark:recovery-read',
  recoveryWrite: 'waymark:recovery-write',
  recoveryClear: 'waymark:recovery-clear',
  documentState: 'waymark:document-state',
  closeConfirmed: 'waymark:close-confirmed',
  menu: 'waymark:menu',
} as const;

/**
 * The payload limit of the IPC boundary, 32 Mi (33,554,432): the most characters of text the
 * renderer may hand main to write (plans, exports, the recovery copy), and the most bytes of a
 * file main reads for it. A plan is kilobytes; the limit only stops absurd or hostile payloads.
 */
export const MAX_FILE_CHARS = 32 * 1024 * 1024;

/** A file the user opened: its path, display name and text. */
export interface OpenedFile {
  path: string;
  name: string;
  text: string;
}

/** Where a save went. */
export interface SavedFile {
  path: string;
  name: string;
}

export interface RecentEntry {
  path: string;
  name: string;
  /** ms since 1970 of the last open or save. */
  at: number;
}

/** The autosaved copy of unsaved work. */
export interface RecoverySnapshot {
  /** Display name of the document ("Untitled plan" when never saved). */
  name: string;
  /** Path of the file it came from, or null. */
  path: string | null;
  text: string;
  /** ms since 1970. */
  savedAt: number;
}

/** The plan's exports (File → Export): oem: CCSDS OEM ephemeris; csv: ephemeris CSV; burns-csv: the burn table as CSV; report: Markdown budget report. */
export type PlanExportKind = 'oem' | 'csv' | 'burns-csv' | 'report';
/**
 * The game hand-off's exports ("Retarget for my game"): the burn schedule for a game as JSON or
 * CSV (core/io gameSchedule.ts) and the runtime ephemeris as JSON or binary (core/runtime format.ts).
 */
export type HandoffExportKind = 'schedule-json' | 'schedule-csv' | 'runtime-json' | 'runtime-bin';
/** The Survey screen's Δv map (core/io deltaVMapSvg.ts; core/survey deltaVMap): the diagram as SVG or PNG, the map as JSON, its table as CSV. */
export type MapExportKind = 'map-svg' | 'map-png' | 'map-json' | 'map-csv';
/** The Survey screen's window calendar (core/survey calendar.ts): its windows as CSV (core/io calendarCsv.ts), the Calendar as JSON. */
export type CalendarExportKind = 'calendar-csv' | 'calendar-json';
export type ExportKind = PlanExportKind | HandoffExportKind | MapExportKind | CalendarExportKind;

/** The exports whose data is bytes (a Uint8Array), not text. */
export const BINARY_EXPORTS: readonly ExportKind[] = ['runtime-bin', 'map-png'];

/** What a menu item asks the renderer to do. */
export type MenuCommand =
  | { command: 'new' }
  /** Open "Plan a route": the route builder proposes a plan that replaces this one as one undoable edit. */
  | { command: 'new-from-route' }
  | { command: 'open' }
  | { command: 'open-recent'; path: string }
  | { command: 'save' }
  | { command: 'save-as' }
  | { command: 'export'; kind: PlanExportKind }
  | { command: 'undo' }
  | { command: 'redo' }
  /** The user chose "Save" when closing with unsaved changes: save, then call closeConfirmed. */
  | { command: 'save-and-close' };

export interface DocumentState {
  /** Window title, e.g. "demo.plan.json — Waymark". */
  title: string;
  /** True when there are unsaved changes (the close asks first). */
  dirty: boolean;
}

/** `window.waymark` in Electron. Every call is validated again in main. */
export interface WaymarkBridge {
  readonly kind: 'electron';
  openDialog(): Promise<OpenedFile | null>;
  openRecent(path: string): Promise<OpenedFile>;
  /** Open dialog for a system file (a plan names one main could not find). */
  openSystemDialog(): Promise<OpenedFile | null>;
  /** Reads the system file a plan opened this session names, relative to the plan's folder. */
  readSystemBeside(planPath: string, relativePath: string): Promise<OpenedFile>;
  save(path: string, text: string): Promise<SavedFile>;
  saveAs(suggestedName: string, text: string): Promise<SavedFile | null>;
  /** `data` is text, or bytes for the BINARY_EXPORTS. */
  exportFile(kind: ExportKind, suggestedName: string, data: string | Uint8Array): Promise<SavedFile | null>;
  recentList(): Promise<RecentEntry[]>;
  recoveryRead(): Promise<RecoverySnapshot | null>;
  recoveryWrite(snapshot: RecoverySnapshot): Promise<void>;
  recoveryClear(): Promise<void>;
  setDocumentState(state: DocumentState): Promise<void>;
  closeConfirmed(): Promise<void>;
  /** Subscribes to menu commands; returns the unsubscribe function. */
  onMenu(listener: (command: MenuCommand) => void): () => void;
}
