/**
 * The one interface the renderer uses to reach the outside world: opening and saving files,
 * the recent list, the recovery copy of unsaved work, the window title, and menu commands.
 * Two implementations: electronHost.ts (through the preload's `window.waymark`) and
 * browserHost.ts (file picker / download or the File System Access API; localStorage).
 * `createHost()` (index.ts) picks the one that fits where the page runs.
 */
import type { ExportKind, HandoffExportKind, MenuCommand, PlanExportKind, RecoverySnapshot } from '../../preload/api.ts';

export type { ExportKind, HandoffExportKind, MenuCommand, PlanExportKind, RecoverySnapshot };

/**
 * A save refused because the file there was written by a newer Waymark (its format may hold
 * what this version would drop): the session offers Save As instead of overwriting it.
 */
export class NewerVersionError extends Error {
  override name = 'NewerVersionError';
  constructor(
    /** Display name of the file that was not overwritten. */
    readonly fileName: string,
    message: string,
  ) {
    super(message);
  }
}

/** Where a document lives: a path (desktop), a file handle (File System Access API), or only a name (download). */
export interface FileRef {
  name: string;
  /** Absolute path (desktop) or null. */
  path: string | null;
  /** Browser: a FileSystemFileHandle to write back to, or null (saves download a copy). */
  handle: unknown | null;
}

export interface OpenedFile {
  ref: FileRef;
  text: string;
}

export interface RecentFile {
  /** Key to reopen it with: the path (desktop) or a storage key (browser). */
  key: string;
  name: string;
  /** ms since 1970. */
  at: number;
}

export interface Host {
  readonly kind: 'electron' | 'browser';
  /** Asks the user for a plan file; null when cancelled. */
  openPlan(): Promise<OpenedFile | null>;
  /** Asks the user for a system file (a plan names one this host cannot resolve by itself); null when cancelled. */
  openSystem(hint: string): Promise<OpenedFile | null>;
  /**
   * Reads the system file a plan names by a path relative to the plan file; null when this
   * host cannot (browser mode without a directory handle).
   */
  readSystemBeside(plan: FileRef, relativePath: string): Promise<string | null>;
  recentFiles(): Promise<RecentFile[]>;
  openRecent(key: string): Promise<OpenedFile>;
  /**
   * Writes `text` back to `ref` when it can; otherwise behaves as saveAs. Null when cancelled.
   * Throws NewerVersionError, writing nothing, when the file there was written by a newer Waymark.
   */
  save(ref: FileRef, text: string): Promise<FileRef | null>;
  /** Asks where, then writes; NewerVersionError as for save. */
  saveAs(suggestedName: string, text: string): Promise<FileRef | null>;
  /** `data` is text, or bytes for a binary export (preload/api.ts BINARY_EXPORTS). */
  exportFile(kind: ExportKind, suggestedName: string, data: string | Uint8Array): Promise<boolean>;
  readRecovery(): Promise<RecoverySnapshot | null>;
  writeRecovery(snapshot: RecoverySnapshot): Promise<void>;
  clearRecovery(): Promise<void>;
  /** The window title and unsaved marker; the host asks before closing when dirty. */
  setDocumentState(title: string, dirty: boolean): void;
  /** After "save and close" completed (desktop): close the window. */
  closeConfirmed(): Promise<void>;
  /** Menu commands from the native menu (desktop); the browser host has none. Returns unsubscribe. */
  onCommand(listener: (command: MenuCommand) => void): () => void;
}
