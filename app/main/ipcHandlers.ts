/**
 * The main process's IPC handlers as plain functions over injected dependencies (dialogs, file
 * access, recent list, recovery file, the window), so tests can call them without Electron.
 *
 * Rules at the boundary:
 * - every handler checks that the call comes from the app's own page (`isTrustedSender`);
 * - every argument is validated (validate.ts) before use;
 * - the renderer can only read files the user picked in a dialog or that are on the recent list,
 *   and only write paths the user picked or opened in this session;
 * - saves are atomic (atomicWrite.ts) and keep the previous version as a backup.
 */
import { basename, dirname, isAbsolute, resolve } from 'node:path';
import { IPC, MAX_FILE_CHARS, type DocumentState, type ExportKind, type OpenedFile, type RecentEntry, type RecoverySnapshot, type SavedFile } from '../preload/api.ts';
import type { RecentStore } from './recentFiles.ts';
import {
  ArgumentError,
  requireDocumentState,
  requireExportKind,
  requireFileName,
  requireFilePath,
  requireNoArguments,
  requireRecoverySnapshot,
  requireText,
} from './validate.ts';

export interface FileFilter {
  name: string;
  extensions: string[];
}

/** File types the plan dialogs offer; a plan path must end in one of PLAN_EXTENSIONS. */
export const PLAN_FILTERS: FileFilter[] = [{ name: 'Waymark plan', extensions: ['plan.json', 'json'] }];
export const PLAN_EXTENSIONS = ['.json'] as const;
export const SYSTEM_FILTERS: FileFilter[] = [{ name: 'Waymark star system', extensions: ['system.json', 'json'] }];

export const EXPORT_FILTERS: Record<ExportKind, FileFilter> = {
  oem: { name: 'CCSDS OEM ephemeris', extensions: ['oem', 'txt'] },
  csv: { name: 'CSV ephemeris', extensions: ['csv'] },
  'burns-csv': { name: 'CSV burn table', extensions: ['csv'] },
  report: { name: 'Markdown report', extensions: ['md'] },
};
const EXPORT_EXTENSIONS: Record<ExportKind, string[]> = { oem: ['.oem', '.txt'], csv: ['.csv'], 'burns-csv': ['.csv'], report: ['.md'] };

export interface HandlerDeps {
  dialogs: {
    /** Shows the open dialog; resolves to the chosen path or null when cancelled. */
    showOpen(filters: FileFilter[]): Promise<string | null>;
    showSave(defaultName: string, filters: FileFilter[]): Promise<string | null>;
  };
  files: {
    readText(path: string): Promise<string>;
    /** File size in bytes (to refuse oversized files before reading). */
    size(path: string): Promise<number>;
    writeAtomic(path: string, text: string): Promise<void>;
  };
  recent: RecentStore;
  recovery: {
    read(): Promise<RecoverySnapshot | null>;
    write(snapshot: RecoverySnapshot): Promise<void>;
    clear(): Promise<void>;
  };
  window: {
    setDocumentState(state: DocumentState): void;
    /** Closes the window without asking again. */
    closeConfirmed(): void;
  };
  /** True when an IPC call comes from the app's own page. */
  isTrustedSender(url: string): boolean;
}

/** Who called: the URL of the sending frame. */
export interface Sender {
  url: string;
}

export type Handler = (sender: Sender, ...args: unknown[]) => Promise<unknown>;

export function createIpcHandlers(deps: HandlerDeps): Record<string, Handler> {
  /** Paths the user chose in a dialog or opened this session; the only ones `save` writes. */
  const writable = new Set<string>();

  const guard =
    <A extends unknown[]>(fn: (...args: A) => Promise<unknown>, check: (args: unknown[]) => A): Handler =>
    async (sender, ...args) => {
      if (!deps.isTrustedSender(sender.url)) throw new ArgumentError('sender', `is not the app's page (${sender.url})`);
      return fn(...check(args));
    };

  async function readOnly(path: string): Promise<OpenedFile> {
    const size = await deps.files.size(path);
    if (size > MAX_FILE_CHARS) throw new ArgumentError('path', `names a file of ${size} bytes, over the limit of ${MAX_FILE_CHARS}`);
    return { path, name: basename(path), text: await deps.files.readText(path) };
  }

  async function read(path: string): Promise<OpenedFile> {
    const opened = await readOnly(path);
    writable.add(path);
    await deps.recent.add(path);
    return opened;
  }

  async function write(path: string, text: string): Promise<SavedFile> {
    await deps.files.writeAtomic(path, text);
    writable.add(path);
    await deps.recent.add(path);
    return { path, name: basename(path) };
  }

  const none = (args: unknown[]): [] => {
    requireNoArguments(args);
    return [];
  };

  return {
    [IPC.openDialog]: guard(async (): Promise<OpenedFile | null> => {
      const path = await deps.dialogs.showOpen(PLAN_FILTERS);
      return path === null ? null : read(requireFilePath('path', path, PLAN_EXTENSIONS));
    }, none),

    [IPC.openRecent]: guard(
      async (path: string): Promise<OpenedFile> => {
        if (!(await deps.recent.has(path))) throw new ArgumentError('path', 'is not on the recent-files list');
        return read(path);
      },
      (args): [string] => [requireFilePath('path', args[0], PLAN_EXTENSIONS)],
    ),

    [IPC.openSystemDialog]: guard(async (): Promise<OpenedFile | null> => {
      const path = await deps.dialogs.showOpen(SYSTEM_FILTERS);
      return path === null ? null : readOnly(requireFilePath('path', path, PLAN_EXTENSIONS));
    }, none),

    [IPC.readSystemBeside]: guard(
      async (planPath: string, relativePath: string): Promise<OpenedFile> => {
        if (!writable.has(planPath)) throw new ArgumentError('planPath', 'is not a plan opened or saved in this session');
        return readOnly(resolve(dirname(planPath), relativePath));
      },
      (args): [string, string] => {
        if (args.length !== 2) throw new ArgumentError('arguments', 'must be (planPath, relativePath)');
        const planPath = requireFilePath('planPath', args[0], PLAN_EXTENSIONS);
        const rel = requireText('relativePath', args[1], 4096);
        if (rel === '' || isAbsolute(rel) || /[\u0000-\u001f]/.test(rel) || !rel.toLowerCase().endsWith('.json')) {
          throw new ArgumentError('relativePath', 'must be a relative path to a .json file');
        }
        return [planPath, rel];
      },
    ),

    [IPC.save]: guard(
      async (path: string, text: string): Promise<SavedFile> => {
        if (!writable.has(path)) throw new ArgumentError('path', 'was not chosen by the user in this session (use Save As)');
        return write(path, text);
      },
      (args): [string, string] => {
        if (args.length !== 2) throw new ArgumentError('arguments', 'must be (path, text)');
        return [requireFilePath('path', args[0], PLAN_EXTENSIONS), requireText('text', args[1])];
      },
    ),

    [IPC.saveAs]: guard(
      async (suggestedName: string, text: string): Promise<SavedFile | null> => {
        const path = await deps.dialogs.showSave(suggestedName, PLAN_FILTERS);
        return path === null ? null : write(requireFilePath('path', path, PLAN_EXTENSIONS), text);
      },
      (args): [string, string] => {
        if (args.length !== 2) throw new ArgumentError('arguments', 'must be (suggestedName, text)');
        return [requireFileName('suggestedName', args[0]), requireText('text', args[1])];
      },
    ),

    [IPC.exportFile]: guard(
      async (kind: ExportKind, suggestedName: string, text: string): Promise<SavedFile | null> => {
        const path = await deps.dialogs.showSave(suggestedName, [EXPORT_FILTERS[kind]]);
        if (path === null) return null;
        requireFilePath('path', path, EXPORT_EXTENSIONS[kind]);
        await deps.files.writeAtomic(path, text);
        return { path, name: basename(path) };
      },
      (args): [ExportKind, string, string] => {
        if (args.length !== 3) throw new ArgumentError('arguments', 'must be (kind, suggestedName, text)');
        return [requireExportKind('kind', args[0]), requireFileName('suggestedName', args[1]), requireText('text', args[2])];
      },
    ),

    [IPC.recentList]: guard(async (): Promise<RecentEntry[]> => deps.recent.list(), none),

    [IPC.recoveryRead]: guard(async () => deps.recovery.read(), none),

    [IPC.recoveryWrite]: guard(
      async (snapshot: RecoverySnapshot) => deps.recovery.write(snapshot),
      (args): [RecoverySnapshot] => {
        if (args.length !== 1) throw new ArgumentError('arguments', 'must be (snapshot)');
        return [requireRecoverySnapshot('snapshot', args[0])];
      },
    ),

    [IPC.recoveryClear]: guard(async () => deps.recovery.clear(), none),

    [IPC.documentState]: guard(
      async (state: DocumentState) => deps.window.setDocumentState(state),
      (args): [DocumentState] => {
        if (args.length !== 1) throw new ArgumentError('arguments', 'must be (state)');
        return [requireDocumentState('state', args[0])];
      },
    ),

    [IPC.closeConfirmed]: guard(async () => deps.window.closeConfirmed(), none),
  };
}

/** The recovery file: one JSON snapshot, written atomically; unreadable or malformed reads as none. */
export function createRecoveryStore(
  file: string,
  fs: { readText(path: string): Promise<string>; writeAtomic(path: string, text: string): Promise<void>; remove(path: string): Promise<void> },
): HandlerDeps['recovery'] {
  return {
    async read() {
      try {
        return requireRecoverySnapshot('recovery', JSON.parse(await fs.readText(file)));
      } catch {
        return null;
      }
    },
    write: (snapshot) => fs.writeAtomic(file, JSON.stringify(snapshot)),
    clear: () => fs.remove(file).catch(() => undefined),
  };
}
