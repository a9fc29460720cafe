/** An in-memory Host for the session tests: files by name, a recovery slot, scripted pickers. */
import { vi } from 'vitest';
import type { FileRef, Host, OpenedFile, RecentFile, RecoverySnapshot } from '../../../../app/renderer/host/host.ts';

export interface FakeHost extends Host {
  files: Map<string, string>;
  recovery: RecoverySnapshot | null;
  /** What the next openPlan / openSystem returns. */
  nextOpen: OpenedFile | null;
  nextSystem: OpenedFile | null;
  exported: { kind: string; name: string; text: string }[];
  titles: string[];
}

export function fakeHost(): FakeHost {
  const recent: RecentFile[] = [];
  const h: FakeHost = {
    kind: 'browser',
    files: new Map(),
    recovery: null,
    nextOpen: null,
    nextSystem: null,
    exported: [],
    titles: [],
    openPlan: vi.fn(async () => h.nextOpen),
    openSystem: vi.fn(async () => h.nextSystem),
    readSystemBeside: vi.fn(async () => null),
    recentFiles: vi.fn(async () => [...recent]),
    openRecent: vi.fn(async (key: string) => {
      const text = h.files.get(key);
      if (text === undefined) throw new Error(`no ${key}`);
      return { ref: { name: key, path: null, handle: null }, text };
    }),
    save: vi.fn(async (ref: FileRef, text: string) => {
      h.files.set(ref.name, text);
      recent.unshift({ key: ref.name, name: ref.name, at: 0 });
      return ref;
    }),
    saveAs: vi.fn(async (name: string, text: string) => {
      h.files.set(name, text);
      recent.unshift({ key: name, name, at: 0 });
      return { name, path: `/plans/${name}`, handle: null };
    }),
    exportFile: vi.fn(async (kind, name, text) => {
      h.exported.push({ kind, name, text });
      return true;
    }),
    readRecovery: vi.fn(async () => h.recovery),
    writeRecovery: vi.fn(async (s: RecoverySnapshot) => {
      h.recovery = s;
    }),
    clearRecovery: vi.fn(async () => {
      h.recovery = null;
    }),
    setDocumentState: vi.fn((title: string) => void h.titles.push(title)),
    closeConfirmed: vi.fn(async () => undefined),
    onCommand: () => () => undefined,
  };
  return h;
}
