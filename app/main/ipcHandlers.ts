/**
 * The main process's IPC handlers as plain functions over injected dependencies (dialogs, file
 * access, recent list, recovery file, the window), so tests can call them without Electron.
 *
 * Rules at the boundary:
 * - every handler checks that the call comes from the app's own page (`isTrustedSender`), from
 *   its top frame (a frame inside the page gets no access);
 * - every argument is validated (validate.ts) before use: types, the exact number of arguments,
 *   paths (absolute, no control characters, at most 4096 characters, the right extension), texts
 *   at most MAX_FILE_CHARS (32 Mi characters) long, plan texts with a plan header;
 * - the renderer can only read files the user picked in a dialog or that are on the recent list,
 *   and a system file beside a plan it opened; only write paths the user picked or opened in
 *   this session;
 * - reads are of regular files only, at most MAX_FILE_CHARS bytes, timed out (app/main/diskFiles.ts
 *   over app/node/files.ts): a FIFO, a device or a link to one is refused without blocking;
 * - what is read must be the kind of file the channel carries (a plan, a system file: its JSON
 *   header says so, in a version this program reads), else it is refused: a crafted plan cannot
 *   make main hand over an arbitrary JSON file through `readSystemBeside`;
 * - `readSystemBeside` reads only inside the plan's own folder (and below it) or a folder the user
 *   chose a system file in through the dialog this session, compared by real paths (every
 *   symbolic link resolved, so a link out of the folder is outside); whatever it refuses — a
 *   path outside, a missing file, a FIFO, a file that is not a system file — gets one and the
 *   same refusal, which says nothing of the file (not whether it exists, not what it holds);
 * - a file a newer Waymark wrote is never overwritten (the renderer offers Save As instead);
 * - saves are atomic (app/node/files.ts `atomicWriteFile`) and keep the previous version
 *   as a backup.
 */
import { basename, dirname, isAbsolute, relative, resolve, sep } from 'node:path';
import {
  BINARY_EXPORTS,
  IPC,
  type DocumentState,
  type ExportKind,
  type OpenedFile,
  type RecentEntry,
  type RecoverySnapshot,
  type SavedFile,
} from '../preload/api.ts';
import { headerProblem, type FileKind } from '../preload/fileHeader.ts';
import type { OutputKind } from '../node/files.ts';
import type { RecentStore } from './recentFiles.ts';
import {
  ArgumentError,
  requireArguments,
  requireDocumentState,
  requireBytes,
  requireExportKind,
  requireFileName,
  requireFilePath,
  requireFileText,
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
  'schedule-json': { name: 'Burn schedule for a game (JSON)', extensions: ['json'] },
  'schedule-csv': { name: 'Burn schedule for a game (CSV)', extensions: ['csv'] },
  'runtime-json': { name: 'Runtime ephemeris (JSON)', extensions: ['json'] },
  'runtime-bin': { name: 'Runtime ephemeris (binary)', extensions: ['bin'] },
  'map-svg': { name: 'Δv map (SVG)', extensions: ['svg'] },
  'map-png': { name: 'Δv map (PNG)', extensions: ['png'] },
  'map-json': { name: 'Δv map (JSON)', extensions: ['json'] },
  'map-csv': { name: 'Δv map table (CSV)', extensions: ['csv'] },
  'calendar-csv': { name: 'Window calendar (CSV)', extensions: ['csv'] },
  'calendar-json': { name: 'Window calendar (JSON)', extensions: ['json'] },
};
const EXPORT_EXTENSIONS: Record<ExportKind, string[]> = {
  oem: ['.oem', '.txt'],
  csv: ['.csv'],
  'burns-csv': ['.csv'],
  report: ['.md'],
  'schedule-json': ['.json'],
  'schedule-csv': ['.csv'],
  'runtime-json': ['.json'],
  'runtime-bin': ['.bin'],
  'map-svg': ['.svg'],
  'map-png': ['.png'],
  'map-json': ['.json'],
  'map-csv': ['.csv'],
  'calendar-csv': ['.csv'],
  'calendar-json': ['.json'],
};

export interface HandlerDeps {
  dialogs: {
    /** Shows the open dialog; resolves to the chosen path or null when cancelled. */
    showOpen(filters: FileFilter[]): Promise<string | null>;
    showSave(defaultName: string, filters: FileFilter[]): Promise<string | null>;
  };
  files: {
    /** Reads a text file: regular files only, at most MAX_FILE_CHARS bytes (refused before reading), strict UTF-8. */
    readText(path: string): Promise<string>;
    /** The path with every symbolic link resolved; rejects when nothing is there. */
    realpath(path: string): Promise<string>;
    /** Saves atomically with a backup; with a `kind`, through the output guard of app/node/files.ts first. */
    writeAtomic(path: string, text: string | Uint8Array, kind?: OutputKind): Promise<void>;
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

/** Who called: the URL of the sending frame, and whether it is the page's top frame. */
export interface Sender {
  url: string;
  topFrame: boolean;
}

export type Handler = (sender: Sender, ...args: unknown[]) => Promise<unknown>;

/** True when `path` lies inside the folder `root` (both real paths), at any depth. */
export function isInside(root: string, path: string): boolean {
  const r = relative(root, path);
  return r !== '' && r !== '..' && !r.startsWith(`..${sep}`) && !isAbsolute(r);
}

/** The one refusal of `readSystemBeside`, whatever the reason (it tells nothing about the file). */
export const BESIDE_REFUSAL =
  "names no system file this plan may read (it must be a Waymark system file in the plan's folder, or in a folder a system file was chosen from in this session)";

export function createIpcHandlers(deps: HandlerDeps): Record<string, Handler> {
  /** Paths the user chose in a dialog or opened this session; the only ones `save` writes. */
  const writable = new Set<string>();
  /** Real paths of the folders the user chose a system file in this session (readSystemBeside may read there). */
  const chosenFolders = new Set<string>();

  const guard =
    <A extends unknown[]>(fn: (...args: A) => Promise<unknown>, check: (args: unknown[]) => A): Handler =>
    async (sender, ...args) => {
      if (!deps.isTrustedSender(sender.url)) throw new ArgumentError('sender', `is not the app's page (${sender.url})`);
      if (sender.topFrame !== true) throw new ArgumentError('sender', "is not the top frame of the app's page");
      return fn(...check(args));
    };

  /** Reads a `kind` file: a regular file within the size limit whose header says it is one this program reads. */
  async function readOnly(path: string, kind: FileKind): Promise<OpenedFile> {
    const text = await deps.files.readText(path);
    const problem = headerProblem(text, kind);
    if (problem) throw new ArgumentError(basename(path), problem.rule);
    return { path, name: basename(path), text };
  }

  async function read(path: string): Promise<OpenedFile> {
    const opened = await readOnly(path, 'plan');
    writable.add(path);
    await deps.recent.add(path);
    return opened;
  }

  /**
   * Refuses to replace a plan file a newer Waymark wrote, and a file that is there but cannot be
   * read (unreadable, over the size limit, not UTF-8, not a regular file): what it holds is
   * unknown, so it is never overwritten silently. Only "nothing there" (ENOENT) lets the save go on.
   */
  async function refuseNewer(path: string): Promise<void> {
    let text: string;
    try {
      text = await deps.files.readText(path);
    } catch (err) {
      if ((err as { code?: unknown }).code === 'ENOENT') return; // no file there yet
      const reason = err instanceof Error ? err.message : String(err);
      throw new ArgumentError(
        basename(path),
        `is there but could not be read (${reason}), so what it holds is unknown and it is not overwritten; make it readable or remove it, or use Save As to save under another name`,
      );
    }
    const problem = headerProblem(text, 'plan');
    if (problem?.newer) throw new ArgumentError(basename(path), `${problem.rule}: it is not overwritten; use Save As to save under another name`);
  }

  async function write(path: string, text: string): Promise<SavedFile> {
    await refuseNewer(path);
    await deps.files.writeAtomic(path, text, 'plan');
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
      (args): [string] => {
        requireArguments(args, ['path']);
        return [requireFilePath('path', args[0], PLAN_EXTENSIONS)];
      },
    ),

    [IPC.openSystemDialog]: guard(async (): Promise<OpenedFile | null> => {
      const path = await deps.dialogs.showOpen(SYSTEM_FILTERS);
      if (path === null) return null;
      const opened = await readOnly(requireFilePath('path', path, PLAN_EXTENSIONS), 'system');
      // The user chose this folder: systems of plans may be read from it this session.
      chosenFolders.add(dirname(await deps.files.realpath(path)));
      return opened;
    }, none),

    [IPC.readSystemBeside]: guard(
      async (planPath: string, relativePath: string): Promise<OpenedFile> => {
        if (!writable.has(planPath)) throw new ArgumentError('planPath', 'is not a plan opened or saved in this session');
        const refused = new ArgumentError('relativePath', BESIDE_REFUSAL);
        let real: string;
        let roots: string[];
        try {
          real = await deps.files.realpath(resolve(dirname(planPath), relativePath));
          roots = [await deps.files.realpath(dirname(planPath)), ...chosenFolders];
        } catch {
          throw refused; // nothing there (not said)
        }
        if (!roots.some((root) => isInside(root, real))) throw refused;
        try {
          return await readOnly(real, 'system');
        } catch {
          throw refused; // not a regular file, too large, not a system file (not said which)
        }
      },
      (args): [string, string] => {
        requireArguments(args, ['planPath', 'relativePath']);
        const planPath = requireFilePath('planPath', args[0], PLAN_EXTENSIONS);
        const rel = requireText('relativePath', args[1], 4096);
        // biome-ignore lint/suspicious/noControlCharactersInRegex: a path with a control character in it is refused
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
        requireArguments(args, ['path', 'text']);
        return [requireFilePath('path', args[0], PLAN_EXTENSIONS), requireFileText('text', args[1], 'plan')];
      },
    ),

    [IPC.saveAs]: guard(
      async (suggestedName: string, text: string): Promise<SavedFile | null> => {
        const path = await deps.dialogs.showSave(suggestedName, PLAN_FILTERS);
        return path === null ? null : write(requireFilePath('path', path, PLAN_EXTENSIONS), text);
      },
      (args): [string, string] => {
        requireArguments(args, ['suggestedName', 'text']);
        return [requireFileName('suggestedName', args[0]), requireFileText('text', args[1], 'plan')];
      },
    ),

    [IPC.exportFile]: guard(
      async (kind: ExportKind, suggestedName: string, text: string | Uint8Array): Promise<SavedFile | null> => {
        const path = await deps.dialogs.showSave(suggestedName, [EXPORT_FILTERS[kind]]);
        if (path === null) return null;
        requireFilePath('path', path, EXPORT_EXTENSIONS[kind]);
        await deps.files.writeAtomic(path, text, kind);
        return { path, name: basename(path) };
      },
      (args): [ExportKind, string, string | Uint8Array] => {
        requireArguments(args, ['kind', 'suggestedName', 'text']);
        const kind = requireExportKind('kind', args[0]);
        const data = BINARY_EXPORTS.includes(kind) ? requireBytes('text', args[2]) : requireText('text', args[2]);
        return [kind, requireFileName('suggestedName', args[1]), data];
      },
    ),

    [IPC.recentList]: guard(async (): Promise<RecentEntry[]> => deps.recent.list(), none),

    [IPC.recoveryRead]: guard(async () => deps.recovery.read(), none),

    [IPC.recoveryWrite]: guard(
      async (snapshot: RecoverySnapshot) => deps.recovery.write(snapshot),
      (args): [RecoverySnapshot] => {
        requireArguments(args, ['snapshot']);
        return [requireRecoverySnapshot('snapshot', args[0])];
      },
    ),

    [IPC.recoveryClear]: guard(async () => deps.recovery.clear(), none),

    [IPC.documentState]: guard(
      async (state: DocumentState) => deps.window.setDocumentState(state),
      (args): [DocumentState] => {
        requireArguments(args, ['state']);
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
