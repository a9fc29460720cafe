import { describe, expect, it, vi } from 'vitest';
import { IPC, MAX_FILE_CHARS, type RecoverySnapshot } from '../../../app/preload/api.ts';
import { createIpcHandlers, createRecoveryStore, type HandlerDeps } from '../../../app/main/ipcHandlers.ts';
import { createRecentStore } from '../../../app/main/recentFiles.ts';

const APP = 'file:///opt/waymark/dist/renderer/index.html';

function setup(over: Partial<HandlerDeps> = {}) {
  const disk = new Map<string, string>([['/plans/a.plan.json', '{"plan":1}'], ['/systems/s.system.json', '{"sys":1}']]);
  const writeAtomic = vi.fn(async (p: string, t: string) => void disk.set(p, t));
  const files = {
    readText: vi.fn(async (p: string) => {
      const t = disk.get(p);
      if (t === undefined) throw new Error(`ENOENT ${p}`);
      return t;
    }),
    size: vi.fn(async (p: string) => (disk.get(p) ?? '').length),
    writeAtomic,
  };
  const recent = createRecentStore('/user/recent.json', { readText: files.readText, writeAtomic: async (p, t) => void disk.set(p, t) });
  const dialogs = { showOpen: vi.fn(async () => '/plans/a.plan.json' as string | null), showSave: vi.fn(async () => '/plans/b.plan.json' as string | null) };
  const win = { setDocumentState: vi.fn(), closeConfirmed: vi.fn() };
  const deps: HandlerDeps = {
    dialogs,
    files,
    recent,
    recovery: createRecoveryStore('/user/recovery.json', { readText: files.readText, writeAtomic: async (p, t) => void disk.set(p, t), remove: async (p) => void disk.delete(p) }),
    window: win,
    isTrustedSender: (url) => url === APP,
    ...over,
  };
  return { h: createIpcHandlers(deps), disk, dialogs, files, win, writeAtomic };
}

const me = { url: APP };

describe('IPC handlers (main process, Electron mocked away)', () => {
  it('registers one handler per renderer → main channel', () => {
    const { h } = setup();
    const channels = Object.values(IPC).filter((c) => c !== IPC.menu);
    expect(Object.keys(h).sort()).toEqual([...channels].sort());
  });

  it('refuses calls from any page but the app', async () => {
    const { h } = setup();
    await expect(h[IPC.recentList]({ url: 'https://example.invalid/' })).rejects.toThrow(/sender is not the app's page/);
  });

  it('opens the file the user picked and lists it as recent', async () => {
    const { h } = setup();
    await expect(h[IPC.openDialog](me)).resolves.toEqual({ path: '/plans/a.plan.json', name: 'a.plan.json', text: '{"plan":1}' });
    const recent = (await h[IPC.recentList](me)) as { path: string }[];
    expect(recent.map((r) => r.path)).toEqual(['/plans/a.plan.json']);
  });

  it('returns null when the open dialog is cancelled', async () => {
    const { h, dialogs } = setup();
    dialogs.showOpen.mockResolvedValueOnce(null);
    await expect(h[IPC.openDialog](me)).resolves.toBeNull();
  });

  it('saves atomically only to a path the user chose this session', async () => {
    const { h, writeAtomic } = setup();
    await expect(h[IPC.save](me, '/plans/a.plan.json', 'new')).rejects.toThrow(/path was not chosen by the user/);
    expect(writeAtomic).not.toHaveBeenCalled();
    await h[IPC.openDialog](me);
    await expect(h[IPC.save](me, '/plans/a.plan.json', 'new text')).resolves.toEqual({ path: '/plans/a.plan.json', name: 'a.plan.json' });
    expect(writeAtomic).toHaveBeenCalledWith('/plans/a.plan.json', 'new text');
  });

  it('validates the arguments of save', async () => {
    const { h, writeAtomic } = setup();
    await h[IPC.openDialog](me);
    await expect(h[IPC.save](me, 'relative.plan.json', 'x')).rejects.toThrow(/path must be an absolute path/);
    await expect(h[IPC.save](me, '/plans/a.exe', 'x')).rejects.toThrow(/path must end in \.json/);
    await expect(h[IPC.save](me, '/plans/a.plan.json', 42)).rejects.toThrow(/text must be a string/);
    await expect(h[IPC.save](me, '/plans/a.plan.json')).rejects.toThrow(/arguments must be \(path, text\)/);
    await expect(h[IPC.save](me, '/plans/a.plan.json', 'x'.repeat(MAX_FILE_CHARS + 1))).rejects.toThrow(/text must be at most/);
    await expect(h[IPC.save](me, '/plans/a\u0000.plan.json', 'x')).rejects.toThrow(/without control characters/);
    expect(writeAtomic).not.toHaveBeenCalled();
  });

  it('Save As asks for a place, writes atomically and allows later saves there', async () => {
    const { h, dialogs, writeAtomic } = setup();
    await expect(h[IPC.saveAs](me, 'plan.plan.json', 'body')).resolves.toEqual({ path: '/plans/b.plan.json', name: 'b.plan.json' });
    expect(dialogs.showSave).toHaveBeenCalledWith('plan.plan.json', expect.any(Array));
    expect(writeAtomic).toHaveBeenCalledWith('/plans/b.plan.json', 'body');
    await expect(h[IPC.save](me, '/plans/b.plan.json', 'again')).resolves.toBeTruthy();
    await expect(h[IPC.saveAs](me, '../escape/x.json', 'body')).rejects.toThrow(/suggestedName must be a file name without a directory part/);
  });

  it('opens a recent file only when it is on the list', async () => {
    const { h } = setup();
    await expect(h[IPC.openRecent](me, '/plans/a.plan.json')).rejects.toThrow(/not on the recent-files list/);
    await h[IPC.openDialog](me);
    await expect(h[IPC.openRecent](me, '/plans/a.plan.json')).resolves.toMatchObject({ text: '{"plan":1}' });
  });

  it('reads a system file beside an opened plan, and nothing else', async () => {
    const { h } = setup();
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', '../systems/s.system.json')).rejects.toThrow(/planPath is not a plan opened/);
    await h[IPC.openDialog](me);
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', '../systems/s.system.json')).resolves.toMatchObject({ text: '{"sys":1}' });
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', '/etc/passwd')).rejects.toThrow(/relativePath must be a relative path to a \.json file/);
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', '../x.txt')).rejects.toThrow(/relativePath/);
  });

  it('refuses to read files over the size limit', async () => {
    const { h, files } = setup();
    files.size.mockResolvedValueOnce(MAX_FILE_CHARS + 1);
    await expect(h[IPC.openDialog](me)).rejects.toThrow(/over the limit/);
  });

  it('exports through a save dialog with the kind checked', async () => {
    const { h, dialogs, writeAtomic } = setup();
    dialogs.showSave.mockResolvedValueOnce('/out/plan.oem');
    await expect(h[IPC.exportFile](me, 'oem', 'plan.oem', 'CCSDS_OEM_VERS = 2.0')).resolves.toEqual({ path: '/out/plan.oem', name: 'plan.oem' });
    expect(writeAtomic).toHaveBeenCalledWith('/out/plan.oem', 'CCSDS_OEM_VERS = 2.0');
    await expect(h[IPC.exportFile](me, 'exe', 'x.exe', '')).rejects.toThrow(/kind must be one of oem, csv, burns-csv, report/);
    dialogs.showSave.mockResolvedValueOnce('/out/plan.exe');
    await expect(h[IPC.exportFile](me, 'csv', 'plan.csv', 'a,b')).rejects.toThrow(/path must end in \.csv/);
  });

  it('keeps a recovery snapshot and validates its shape', async () => {
    const { h } = setup();
    const snap: RecoverySnapshot = { name: 'x.plan.json', path: null, text: '{}', savedAt: 1700000000000 };
    await expect(h[IPC.recoveryRead](me)).resolves.toBeNull();
    await h[IPC.recoveryWrite](me, snap);
    await expect(h[IPC.recoveryRead](me)).resolves.toEqual(snap);
    await expect(h[IPC.recoveryWrite](me, { ...snap, extra: 1 })).rejects.toThrow(/must have exactly the fields/);
    await expect(h[IPC.recoveryWrite](me, { ...snap, savedAt: Number.NaN })).rejects.toThrow(/savedAt must be a finite number/);
    await h[IPC.recoveryClear](me);
    await expect(h[IPC.recoveryRead](me)).resolves.toBeNull();
  });

  it('passes the document state to the window and confirms a close', async () => {
    const { h, win } = setup();
    await h[IPC.documentState](me, { title: '• a.plan.json — Waymark', dirty: true });
    expect(win.setDocumentState).toHaveBeenCalledWith({ title: '• a.plan.json — Waymark', dirty: true });
    await expect(h[IPC.documentState](me, { title: 'x', dirty: 'yes' })).rejects.toThrow(/state.dirty must be true or false/);
    await h[IPC.closeConfirmed](me);
    expect(win.closeConfirmed).toHaveBeenCalledOnce();
    await expect(h[IPC.closeConfirmed](me, 'extra')).rejects.toThrow(/arguments must be empty/);
  });
});
