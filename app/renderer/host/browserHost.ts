/**
 * The host in a plain browser (browser mode of `npm start`).
 * - Open: the File System Access API's picker where present (Save then writes back to the same
 *   file), otherwise an <input type="file"> picker.
 * - Save: writes through the file handle when there is one; otherwise downloads the file. A file
 *   a newer Waymark wrote is not overwritten through a handle (NewerVersionError: the session
 *   offers Save As); a download never replaces a file by itself.
 * - Recent files: names and a copy of the text in localStorage (a browser cannot reopen a file
 *   by path), newest first, at most RECENT_LIMIT; reopening one gives a copy that saves as a download.
 * - Recovery copy of unsaved work: localStorage.
 * - Closing the tab with unsaved changes: the browser's "leave site?" prompt (beforeunload).
 * - A file that is not valid UTF-8 is refused with the offset of its first bad byte (core/io
 *   decodeUtf8), not opened with the bad bytes replaced.
 * Everything that touches the page comes in through `BrowserEnv`, so tests pass fakes.
 */
import config from '../../../electron.config.ts';
import { decodeUtf8 } from '../../../core/io/index.ts';
import type { ExportKind, RecoverySnapshot } from '../../preload/api.ts';
import { headerProblem } from '../../preload/fileHeader.ts';
import { NewerVersionError, type FileRef, type Host, type OpenedFile, type RecentFile } from './host.ts';

export const RECENT_LIMIT = config.files.recentLimit;
export const STORAGE_KEYS = { recent: 'waymark.recent', recentText: 'waymark.recent.', recovery: 'waymark.recovery' } as const;

/** The subset of the File System Access API the host uses. */
export interface WritableHandle {
  name: string;
  getFile(): Promise<{ text(): Promise<string>; arrayBuffer(): Promise<ArrayBuffer> }>;
  createWritable(): Promise<{ write(data: string): Promise<void>; close(): Promise<void> }>;
}

export interface FilePickerType {
  description: string;
  accept: Record<string, string[]>;
}

export interface BrowserEnv {
  storage: Pick<Storage, 'getItem' | 'setItem' | 'removeItem'>;
  /** <input type="file"> picker: name and bytes of the chosen file, or null when cancelled. */
  pickFile(accept: string): Promise<{ name: string; bytes: Uint8Array } | null>;
  /** Saves text (or bytes) as a download. */
  download(name: string, text: string | Uint8Array, mime: string): void;
  /** File System Access API pickers, when the browser has them. */
  fsAccess: {
    showOpenFilePicker(o: { types: FilePickerType[]; multiple: false }): Promise<WritableHandle[]>;
    showSaveFilePicker(o: { suggestedName: string; types: FilePickerType[] }): Promise<WritableHandle>;
  } | null;
  setTitle(title: string): void;
  /** Registers the before-unload check: `dirty()` true asks the user before leaving. */
  onBeforeUnload(dirty: () => boolean): void;
  now(): number;
}

const PLAN_TYPES: FilePickerType[] = [{ description: 'Waymark plan', accept: { 'application/json': ['.json'] } }];
const SYSTEM_TYPES: FilePickerType[] = [{ description: 'Waymark star system', accept: { 'application/json': ['.json'] } }];
const EXPORT_MIME: Record<ExportKind, string> = {
  oem: 'text/plain',
  csv: 'text/csv',
  'burns-csv': 'text/csv',
  report: 'text/markdown',
  'schedule-json': 'application/json',
  'schedule-csv': 'text/csv',
  'runtime-json': 'application/json',
  'runtime-bin': 'application/octet-stream',
  'map-svg': 'image/svg+xml',
  'map-png': 'image/png',
  'map-json': 'application/json',
  'map-csv': 'text/csv',
  'calendar-csv': 'text/csv',
  'calendar-json': 'application/json',
};

function isAbort(err: unknown): boolean {
  return err instanceof Error && err.name === 'AbortError';
}

function readJson<T>(storage: BrowserEnv['storage'], key: string, fallback: T): T {
  try {
    const s = storage.getItem(key);
    return s === null ? fallback : (JSON.parse(s) as T);
  } catch {
    return fallback;
  }
}

export function createBrowserHost(env: BrowserEnv): Host {
  let dirty = false;
  env.onBeforeUnload(() => dirty);

  function remember(name: string, text: string): void {
    const list = readJson<RecentFile[]>(env.storage, STORAGE_KEYS.recent, []).filter((r) => r.name !== name);
    const key = `${name}`;
    const next = [{ key, name, at: env.now() }, ...list].slice(0, RECENT_LIMIT);
    try {
      env.storage.setItem(STORAGE_KEYS.recentText + key, text);
      for (const old of list.slice(RECENT_LIMIT - 1)) env.storage.removeItem(STORAGE_KEYS.recentText + old.key);
      env.storage.setItem(STORAGE_KEYS.recent, JSON.stringify(next));
    } catch {
      /* storage full: the recent list is a convenience */
    }
  }

  async function open(types: FilePickerType[], record: boolean): Promise<OpenedFile | null> {
    if (env.fsAccess) {
      try {
        const [handle] = await env.fsAccess.showOpenFilePicker({ types, multiple: false });
        const text = decodeUtf8(new Uint8Array(await (await handle.getFile()).arrayBuffer()), handle.name);
        if (record) remember(handle.name, text);
        return { ref: { name: handle.name, path: null, handle }, text };
      } catch (err) {
        if (isAbort(err)) return null;
        throw err;
      }
    }
    const f = await env.pickFile('.json,application/json');
    if (!f) return null;
    const text = decodeUtf8(f.bytes, f.name);
    if (record) remember(f.name, text);
    return { ref: { name: f.name, path: null, handle: null }, text };
  }

  async function writeHandle(handle: WritableHandle, text: string): Promise<void> {
    let current: string;
    try {
      current = await (await handle.getFile()).text(); // a new file from the save picker reads as ''
    } catch (err) {
      // What is there is unknown: it is not overwritten silently.
      const reason = err instanceof Error ? err.message : String(err);
      throw new Error(
        `${handle.name} is there but could not be read (${reason}), so what it holds is unknown and it is not overwritten; use Save As to save under another name`,
      );
    }
    const problem = headerProblem(current, 'plan');
    if (problem?.newer)
      throw new NewerVersionError(handle.name, `${handle.name} ${problem.rule}: it is not overwritten; use Save As to save under another name`);
    const w = await handle.createWritable();
    await w.write(text);
    await w.close();
  }

  const host: Host = {
    kind: 'browser',
    openPlan: () => open(PLAN_TYPES, true),
    openSystem: () => open(SYSTEM_TYPES, false),
    readSystemBeside: async () => null,
    recentFiles: async () => readJson<RecentFile[]>(env.storage, STORAGE_KEYS.recent, []),
    async openRecent(key) {
      const text = env.storage.getItem(STORAGE_KEYS.recentText + key);
      if (text === null) throw new Error(`the copy of ${key} is no longer in this browser's storage`);
      const entry = readJson<RecentFile[]>(env.storage, STORAGE_KEYS.recent, []).find((r) => r.key === key);
      remember(entry?.name ?? key, text);
      return { ref: { name: entry?.name ?? key, path: null, handle: null }, text };
    },
    async save(ref, text) {
      const handle = ref.handle as WritableHandle | null;
      if (handle && typeof handle.createWritable === 'function') {
        await writeHandle(handle, text);
        remember(ref.name, text);
        return ref;
      }
      env.download(ref.name, text, 'application/json');
      remember(ref.name, text);
      return { name: ref.name, path: null, handle: null };
    },
    async saveAs(suggestedName, text) {
      if (env.fsAccess) {
        try {
          const handle = await env.fsAccess.showSaveFilePicker({ suggestedName, types: PLAN_TYPES });
          await writeHandle(handle, text);
          remember(handle.name, text);
          return { name: handle.name, path: null, handle } satisfies FileRef;
        } catch (err) {
          if (isAbort(err)) return null;
          throw err;
        }
      }
      env.download(suggestedName, text, 'application/json');
      remember(suggestedName, text);
      return { name: suggestedName, path: null, handle: null };
    },
    async exportFile(kind, suggestedName, text) {
      env.download(suggestedName, text, EXPORT_MIME[kind]);
      return true;
    },
    readRecovery: async () => readJson<RecoverySnapshot | null>(env.storage, STORAGE_KEYS.recovery, null),
    async writeRecovery(snapshot) {
      env.storage.setItem(STORAGE_KEYS.recovery, JSON.stringify(snapshot));
    },
    async clearRecovery() {
      env.storage.removeItem(STORAGE_KEYS.recovery);
    },
    setDocumentState(title, d) {
      dirty = d;
      env.setTitle(title);
    },
    closeConfirmed: async () => undefined,
    onCommand: () => () => undefined,
  };
  return host;
}

/** The real page's environment. */
/** Delay of a title change: past the next frame at 60 Hz, too short to notice. */
const TITLE_DELAY_MS = 40;

export function pageEnv(win: Window & typeof globalThis): BrowserEnv {
  /** The title waiting to be shown (setTitle below), or null. */
  let pendingTitle: string | null = null;
  const w = win as unknown as {
    showOpenFilePicker?: NonNullable<BrowserEnv['fsAccess']>['showOpenFilePicker'];
    showSaveFilePicker?: NonNullable<BrowserEnv['fsAccess']>['showSaveFilePicker'];
  };
  return {
    storage: win.localStorage,
    pickFile(accept) {
      return new Promise((resolve, reject) => {
        const input = win.document.createElement('input');
        input.type = 'file';
        input.accept = accept;
        input.style.display = 'none';
        input.dataset.role = 'file-picker';
        input.addEventListener('change', () => {
          const file = input.files?.[0];
          input.remove();
          if (!file) return resolve(null);
          file.arrayBuffer().then((buf) => resolve({ name: file.name, bytes: new Uint8Array(buf) }), reject);
        });
        input.addEventListener('cancel', () => {
          input.remove();
          resolve(null);
        });
        win.document.body.append(input);
        input.click();
      });
    },
    download(name, text, mime) {
      const url = URL.createObjectURL(new Blob([text as BlobPart], { type: mime }));
      const a = win.document.createElement('a');
      a.href = url;
      a.download = name;
      a.style.display = 'none';
      win.document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
    },
    fsAccess:
      typeof w.showOpenFilePicker === 'function' && typeof w.showSaveFilePicker === 'function'
        ? { showOpenFilePicker: w.showOpenFilePicker.bind(win), showSaveFilePicker: w.showSaveFilePicker.bind(win) }
        : null,
    setTitle(title) {
      // after the frame that shows the edit (a title change costs a round trip to the browser),
      // the last one of a burst only
      const first = pendingTitle === null;
      pendingTitle = title;
      if (first)
        setTimeout(() => {
          if (pendingTitle !== null) win.document.title = pendingTitle;
          pendingTitle = null;
        }, TITLE_DELAY_MS);
    },
    onBeforeUnload(isDirty) {
      win.addEventListener('beforeunload', (e) => {
        if (isDirty()) {
          e.preventDefault();
          e.returnValue = '';
        }
      });
    },
    now: () => Date.now(),
  };
}
