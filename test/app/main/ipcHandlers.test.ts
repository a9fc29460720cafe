/**
 * The IPC handlers of the main process, called as plain functions (Electron mocked away): what
 * each channel does, and — table-driven — that each rejects arguments outside its schema before
 * acting (no dialog shown, nothing written): wrong types, empty / overlong / relative paths,
 * control characters, wrong extensions, texts that are not plans, oversized payloads, extra
 * and missing arguments, paths the user did not choose, calls from other pages or frames.
 */
import { describe, expect, it, vi } from 'vitest';
import { IPC, MAX_FILE_CHARS, type RecoverySnapshot } from '../../../app/preload/api.ts';
import { NEWER_VERSION_RULE } from '../../../app/preload/fileHeader.ts';
import { BESIDE_REFUSAL, createIpcHandlers, createRecoveryStore, type HandlerDeps, type Sender } from '../../../app/main/ipcHandlers.ts';
import { createRecentStore } from '../../../app/main/recentFiles.ts';

const APP = 'waymark://app/index.html';
const PLAN = '{"format":"waymark-plan","version":1,"name":"a"}';
const PLAN_B = '{"format":"waymark-plan","version":1,"name":"b"}';
const SYSTEM = '{"format":"waymark-system","version":1,"name":"s"}';
const NEWER_PLAN = '{"format":"waymark-plan","version":2,"name":"from the future"}';
/** Markers for files on the fake disk that are there but cannot be read (the fake's readText throws as the real one does). */
const UNREADABLE = '<unreadable>';
const OVERSIZED = '<over the size limit>';

function setup(over: Partial<HandlerDeps> = {}) {
  const disk = new Map<string, string>([
    ['/plans/a.plan.json', PLAN],
    ['/systems/s.system.json', SYSTEM],
    ['/plans/s.system.json', SYSTEM],
    ['/plans/sys/deep.system.json', SYSTEM],
    ['/plans/notes.json', '{"token":"secret"}'],
    ['/plans/garbage.plan.json', 'not json at all'],
    ['/plans/array.plan.json', '[1,2,3]'],
    ['/plans/system.plan.json', SYSTEM],
    ['/plans/newer.plan.json', NEWER_PLAN],
  ]);
  const writeAtomic = vi.fn(async (p: string, t: string, _kind?: string) => void disk.set(p, t));
  const files = {
    readText: vi.fn(async (p: string) => {
      const t = disk.get(p);
      if (t === undefined) throw Object.assign(new Error(`ENOENT ${p}`), { code: 'ENOENT' });
      if (t === UNREADABLE) throw Object.assign(new Error(`cannot read ${p}: permission denied (EACCES)`), { code: 'EACCES' });
      if (t === OVERSIZED) throw new Error(`cannot read ${p}: it is larger than the 32 MiB limit`);
      return t;
    }),
    // No links on this disk: a path is its own real path when a file or a folder is there.
    realpath: vi.fn(async (p: string) => {
      if (disk.has(p) || [...disk.keys()].some((k) => k.startsWith(`${p}/`))) return p;
      throw new Error(`ENOENT ${p}`);
    }),
    writeAtomic,
  };
  const recent = createRecentStore('/user/recent.json', { readText: files.readText, writeAtomic: async (p, t) => void disk.set(p, t) });
  const dialogs = { showOpen: vi.fn(async () => '/plans/a.plan.json' as string | null), showSave: vi.fn(async () => '/plans/b.plan.json' as string | null) };
  const win = { setDocumentState: vi.fn(), closeConfirmed: vi.fn() };
  const deps: HandlerDeps = {
    dialogs,
    files,
    recent,
    recovery: createRecoveryStore('/user/recovery.json', {
      readText: files.readText,
      writeAtomic: async (p, t) => void disk.set(p, t),
      remove: async (p) => void disk.delete(p),
    }),
    window: win,
    isTrustedSender: (url) => url === APP,
    ...over,
  };
  return { h: createIpcHandlers(deps), disk, dialogs, files, win, writeAtomic };
}

const me: Sender = { url: APP, topFrame: true };
const snap: RecoverySnapshot = { name: 'x.plan.json', path: null, text: PLAN, savedAt: 1700000000000 };

/** Valid arguments of every renderer → main channel (the tables below break one at a time). */
const VALID: Record<string, unknown[]> = {
  [IPC.openDialog]: [],
  [IPC.openRecent]: ['/plans/a.plan.json'],
  [IPC.openSystemDialog]: [],
  [IPC.readSystemBeside]: ['/plans/a.plan.json', 's.system.json'],
  [IPC.save]: ['/plans/a.plan.json', PLAN],
  [IPC.saveAs]: ['b.plan.json', PLAN],
  [IPC.exportFile]: ['oem', 'x.oem', 'CCSDS_OEM_VERS = 2.0'],
  [IPC.recentList]: [],
  [IPC.recoveryRead]: [],
  [IPC.recoveryWrite]: [snap],
  [IPC.recoveryClear]: [],
  [IPC.documentState]: [{ title: 'a — Waymark', dirty: false }],
  [IPC.closeConfirmed]: [],
};
const CHANNELS = Object.keys(VALID);

/** A handler set where /plans/a.plan.json was opened through the dialog (so it is writable and recent). */
async function opened() {
  const s = setup();
  await s.h[IPC.openDialog](me);
  s.dialogs.showOpen.mockClear();
  s.writeAtomic.mockClear();
  return s;
}

const OVERLONG_PATH = `/${'a'.repeat(4096)}.plan.json`;
/** Path arguments outside the schema, and the rule each breaks. */
const BAD_PATHS: [string, unknown, RegExp][] = [
  ['a number', 42, /must be a string/],
  ['null', null, /must be a string/],
  ['undefined', undefined, /must be a string/],
  ['an object', { path: '/plans/a.plan.json' }, /must be a string/],
  ['an array', ['/plans/a.plan.json'], /must be a string/],
  ['empty', '', /must be a non-empty path/],
  ['overlong (4097+ characters)', OVERLONG_PATH, /must be at most 4096 characters/],
  ['relative', 'plans/a.plan.json', /must be an absolute path/],
  ['with a NUL', '/plans/a\u0000.plan.json', /without control characters/],
  ['with a newline', '/plans/a\n.plan.json', /without control characters/],
  ['of another type', '/plans/a.exe', /must end in \.json/],
];

/** Plan texts outside the schema (what save, Save As and the recovery copy carry). */
const BAD_PLAN_TEXTS: [string, unknown, RegExp][] = [
  ['a number', 42, /must be a string/],
  ['an object', { format: 'waymark-plan' }, /must be a string/],
  ['oversized (over 32 Mi characters)', ' '.repeat(MAX_FILE_CHARS + 1), /must be at most 33554432 characters/],
  ['not JSON', 'not json', /is not a Waymark plan file \(not a JSON object\)/],
  ['a JSON array', '[]', /not a JSON object/],
  ['a system file', SYSTEM, /its "format" is "waymark-system", not "waymark-plan"/],
  ['without a format', '{"version":1}', /its "format" is missing/],
  ['without a version', '{"format":"waymark-plan"}', /has no valid "version"/],
  ['with a fractional version', '{"format":"waymark-plan","version":1.5}', /has no valid "version"/],
  ['of a newer version', NEWER_PLAN, new RegExp(`${NEWER_VERSION_RULE} \\(version 2; this one reads up to 1\\)`)],
];

function row(channel: string, index: number, value: unknown): unknown[] {
  const args = [...VALID[channel]];
  args[index] = value;
  return args;
}

/** Every (channel, arguments, rule) that must be refused before the handler acts. */
const REFUSED: [string, string, unknown[], RegExp][] = [
  ...BAD_PATHS.flatMap(([what, v, rule]): [string, string, unknown[], RegExp][] => [
    [IPC.openRecent, `path ${what}`, row(IPC.openRecent, 0, v), rule],
    [IPC.save, `path ${what}`, row(IPC.save, 0, v), rule],
    [IPC.readSystemBeside, `planPath ${what}`, row(IPC.readSystemBeside, 0, v), rule],
  ]),
  ...BAD_PLAN_TEXTS.flatMap(([what, v, rule]): [string, string, unknown[], RegExp][] => [
    [IPC.save, `text ${what}`, row(IPC.save, 1, v), rule],
    [IPC.saveAs, `text ${what}`, row(IPC.saveAs, 1, v), rule],
    [IPC.recoveryWrite, `snapshot text ${what}`, [{ ...snap, text: v }], rule],
  ]),
  [IPC.exportFile, 'text oversized', row(IPC.exportFile, 2, 'x'.repeat(MAX_FILE_CHARS + 1)), /text must be at most/],
  [IPC.exportFile, 'text not a string', row(IPC.exportFile, 2, 7), /text must be a string/],
  [
    IPC.exportFile,
    'an unknown kind',
    row(IPC.exportFile, 0, 'exe'),
    /kind must be one of oem, csv, burns-csv, report, schedule-json, schedule-csv, runtime-json, runtime-bin/,
  ],
  [IPC.exportFile, 'a kind that is not a string', row(IPC.exportFile, 0, { kind: 'oem' }), /kind must be one of/],
  [IPC.exportFile, 'bytes for a text export', row(IPC.exportFile, 2, new Uint8Array(4)), /text must be a string/],
  [IPC.exportFile, 'text for a binary export (runtime-bin)', ['runtime-bin', 'r.bin', 'WMRE'], /text must be bytes/],
  [IPC.exportFile, 'oversized bytes', ['runtime-bin', 'r.bin', new Uint8Array(MAX_FILE_CHARS + 1)], /text must be at most \d+ bytes/],
  ...[IPC.saveAs, IPC.exportFile].flatMap((ch): [string, string, unknown[], RegExp][] => {
    const k = ch === IPC.saveAs ? 0 : 1;
    return [
      [ch, 'a suggested name with a folder', row(ch, k, '../escape/x.json'), /suggestedName must be a file name without a directory part/],
      [ch, 'a suggested name that is blank', row(ch, k, '   '), /suggestedName must be a file name/],
      [ch, 'a suggested name of 201 characters', row(ch, k, `${'n'.repeat(196)}.json`), /suggestedName must be at most 200 characters/],
      [ch, 'a suggested name that is not a string', row(ch, k, 3), /suggestedName must be a string/],
    ];
  }),
  [IPC.readSystemBeside, 'an absolute relativePath', row(IPC.readSystemBeside, 1, '/etc/passwd.json'), /relativePath must be a relative path to a \.json file/],
  [IPC.readSystemBeside, 'a relativePath to another type', row(IPC.readSystemBeside, 1, '../x.txt'), /relativePath must be a relative path/],
  [IPC.readSystemBeside, 'an empty relativePath', row(IPC.readSystemBeside, 1, ''), /relativePath must be a relative path/],
  [IPC.readSystemBeside, 'a relativePath with a control character', row(IPC.readSystemBeside, 1, '../s\u0007.json'), /relativePath must be a relative path/],
  [IPC.readSystemBeside, 'a relativePath that is not a string', row(IPC.readSystemBeside, 1, ['../s.json']), /relativePath must be a string/],
  [IPC.recoveryWrite, 'a snapshot with an extra field', [{ ...snap, extra: 1 }], /must have exactly the fields/],
  [IPC.recoveryWrite, 'a snapshot that is an array', [[snap]], /snapshot must be an object/],
  [IPC.recoveryWrite, 'a snapshot time that is NaN', [{ ...snap, savedAt: Number.NaN }], /savedAt must be a finite number/],
  [IPC.recoveryWrite, 'a snapshot path that is a number', [{ ...snap, path: 5 }], /snapshot\.path must be a string/],
  [IPC.documentState, 'a dirty flag that is a string', [{ title: 'x', dirty: 'yes' }], /state\.dirty must be true or false/],
  [IPC.documentState, 'an overlong title', [{ title: 't'.repeat(301), dirty: true }], /state\.title must be at most 300 characters/],
  [IPC.documentState, 'a state that is null', [null], /state must be an object/],
  // Extra and missing arguments, for every channel.
  ...CHANNELS.map((ch): [string, string, unknown[], RegExp] => [ch, 'one argument too many', [...VALID[ch], 'extra'], /arguments must be/]),
  ...CHANNELS.filter((ch) => VALID[ch].length > 0).map((ch): [string, string, unknown[], RegExp] => [
    ch,
    'one argument too few',
    VALID[ch].slice(0, -1),
    /arguments must be/,
  ]),
];

describe('IPC handlers (main process, Electron mocked away)', () => {
  it('registers one handler per renderer → main channel', () => {
    const { h } = setup();
    const channels = Object.values(IPC).filter((c) => c !== IPC.menu);
    expect(Object.keys(h).sort()).toEqual([...channels].sort());
    expect([...CHANNELS].sort()).toEqual([...channels].sort());
  });

  it('accepts every valid call of the tables (so each refusal below is the broken argument)', async () => {
    for (const ch of CHANNELS) {
      const { h, dialogs } = await opened();
      if (ch === IPC.openSystemDialog) dialogs.showOpen.mockResolvedValueOnce('/systems/s.system.json');
      if (ch === IPC.exportFile) dialogs.showSave.mockResolvedValueOnce('/out/x.oem');
      await expect(h[ch](me, ...VALID[ch]), ch).resolves.not.toThrow();
    }
  });

  it.each(REFUSED.map(([ch, what, args, rule]) => ({ ch, what, args, rule })))('$ch refuses $what', async ({ ch, args, rule }) => {
    const { h, writeAtomic, dialogs, files, win } = await opened();
    const reads = files.readText.mock.calls.length;
    await expect(h[ch](me, ...args)).rejects.toThrow(rule);
    // Refused before acting: no dialog, no write, no read, no window change.
    expect(writeAtomic).not.toHaveBeenCalled();
    expect(dialogs.showOpen).not.toHaveBeenCalled();
    expect(dialogs.showSave).not.toHaveBeenCalled();
    expect(files.readText.mock.calls.length).toBe(reads);
    expect(win.setDocumentState).not.toHaveBeenCalled();
    expect(win.closeConfirmed).not.toHaveBeenCalled();
  });

  it.each(CHANNELS)('%s refuses calls from any page but the app, and from frames inside it', async (ch) => {
    const { h, writeAtomic, dialogs } = await opened();
    await expect(h[ch]({ url: 'https://example.invalid/', topFrame: true }, ...VALID[ch])).rejects.toThrow(/sender is not the app's page/);
    await expect(h[ch]({ url: 'waymark://app/other.html', topFrame: true }, ...VALID[ch])).rejects.toThrow(/sender is not the app's page/);
    await expect(h[ch]({ url: APP, topFrame: false }, ...VALID[ch])).rejects.toThrow(/sender is not the top frame/);
    expect(writeAtomic).not.toHaveBeenCalled();
    expect(dialogs.showOpen).not.toHaveBeenCalled();
    expect(dialogs.showSave).not.toHaveBeenCalled();
  });

  it('opens the file the user picked and lists it as recent', async () => {
    const { h } = setup();
    await expect(h[IPC.openDialog](me)).resolves.toEqual({ path: '/plans/a.plan.json', name: 'a.plan.json', text: PLAN });
    const recent = (await h[IPC.recentList](me)) as { path: string }[];
    expect(recent.map((r) => r.path)).toEqual(['/plans/a.plan.json']);
  });

  it('returns null when the open dialog is cancelled', async () => {
    const { h, dialogs } = setup();
    dialogs.showOpen.mockResolvedValueOnce(null);
    await expect(h[IPC.openDialog](me)).resolves.toBeNull();
  });

  it.each([
    ['/plans/garbage.plan.json', /garbage\.plan\.json is not a Waymark plan file \(not a JSON object\)/],
    ['/plans/array.plan.json', /array\.plan\.json is not a Waymark plan file/],
    ['/plans/system.plan.json', /system\.plan\.json is not a Waymark plan file \(its "format" is "waymark-system"/],
    ['/plans/newer.plan.json', /newer\.plan\.json was written by a newer version of Waymark \(version 2; this one reads up to 1\)/],
  ])('refuses to open %s (not a plan this program reads), and neither lists it nor lets it be saved to', async (path, rule) => {
    const { h, dialogs } = setup();
    dialogs.showOpen.mockResolvedValueOnce(path);
    await expect(h[IPC.openDialog](me)).rejects.toThrow(rule);
    expect(await h[IPC.recentList](me)).toEqual([]);
    await expect(h[IPC.save](me, path, PLAN)).rejects.toThrow(/was not chosen by the user/);
  });

  it('opens a system file through its dialog only when it is one', async () => {
    const { h, dialogs } = setup();
    dialogs.showOpen.mockResolvedValueOnce('/systems/s.system.json');
    await expect(h[IPC.openSystemDialog](me)).resolves.toMatchObject({ text: SYSTEM });
    dialogs.showOpen.mockResolvedValueOnce('/plans/a.plan.json');
    await expect(h[IPC.openSystemDialog](me)).rejects.toThrow(/a\.plan\.json is not a Waymark system file/);
  });

  it('saves atomically only to a path the user chose this session', async () => {
    const { h, writeAtomic } = setup();
    await expect(h[IPC.save](me, '/plans/a.plan.json', PLAN_B)).rejects.toThrow(/path was not chosen by the user/);
    await expect(h[IPC.save](me, '/plans/other.plan.json', PLAN_B)).rejects.toThrow(/path was not chosen by the user/);
    expect(writeAtomic).not.toHaveBeenCalled();
    await h[IPC.openDialog](me);
    await expect(h[IPC.save](me, '/plans/a.plan.json', PLAN_B)).resolves.toEqual({ path: '/plans/a.plan.json', name: 'a.plan.json' });
    expect(writeAtomic).toHaveBeenCalledWith('/plans/a.plan.json', PLAN_B, 'plan');
  });

  it('refuses to overwrite a plan a newer Waymark wrote since it was opened; Save As elsewhere works', async () => {
    const { h, disk, writeAtomic } = await opened();
    disk.set('/plans/a.plan.json', NEWER_PLAN); // another (newer) program saved over it
    await expect(h[IPC.save](me, '/plans/a.plan.json', PLAN_B)).rejects.toThrow(
      /a\.plan\.json was written by a newer version of Waymark \(version 2; this one reads up to 1\): it is not overwritten; use Save As/,
    );
    expect(disk.get('/plans/a.plan.json')).toBe(NEWER_PLAN);
    expect(writeAtomic).not.toHaveBeenCalled();
    await expect(h[IPC.saveAs](me, 'a.plan.json', PLAN_B)).resolves.toEqual({ path: '/plans/b.plan.json', name: 'b.plan.json' });
    expect(disk.get('/plans/b.plan.json')).toBe(PLAN_B);
  });

  it.each([
    ['unreadable', UNREADABLE, /permission denied \(EACCES\)/],
    ['over the size limit', OVERSIZED, /larger than the 32 MiB limit/],
  ])('refuses to overwrite an existing plan that cannot be read (%s), saying why and what to do', async (_what, marker, reason) => {
    const { h, disk, writeAtomic, dialogs } = await opened();
    disk.set('/plans/a.plan.json', marker);
    const err = await h[IPC.save](me, '/plans/a.plan.json', PLAN_B).catch((e: Error) => e);
    expect(err).toBeInstanceOf(Error);
    expect((err as Error).message).toMatch(/a\.plan\.json is there but could not be read/);
    expect((err as Error).message).toMatch(reason);
    expect((err as Error).message).toMatch(/it is not overwritten; make it readable or remove it, or use Save As/);
    // Save As onto it is refused the same way.
    dialogs.showSave.mockResolvedValueOnce('/plans/a.plan.json');
    await expect(h[IPC.saveAs](me, 'a.plan.json', PLAN_B)).rejects.toThrow(/could not be read/);
    expect(disk.get('/plans/a.plan.json')).toBe(marker);
    expect(writeAtomic).not.toHaveBeenCalled();
  });

  it('Save As does not overwrite a newer-version plan either, even when the dialog picked it', async () => {
    const { h, disk, dialogs, writeAtomic } = setup();
    dialogs.showSave.mockResolvedValueOnce('/plans/newer.plan.json');
    await expect(h[IPC.saveAs](me, 'newer.plan.json', PLAN)).rejects.toThrow(/newer\.plan\.json was written by a newer version of Waymark/);
    expect(disk.get('/plans/newer.plan.json')).toBe(NEWER_PLAN);
    expect(writeAtomic).not.toHaveBeenCalled();
  });

  it('Save As asks for a place, writes atomically and allows later saves there', async () => {
    const { h, dialogs, writeAtomic } = setup();
    await expect(h[IPC.saveAs](me, 'plan.plan.json', PLAN)).resolves.toEqual({ path: '/plans/b.plan.json', name: 'b.plan.json' });
    expect(dialogs.showSave).toHaveBeenCalledWith('plan.plan.json', expect.any(Array));
    expect(writeAtomic).toHaveBeenCalledWith('/plans/b.plan.json', PLAN, 'plan');
    await expect(h[IPC.save](me, '/plans/b.plan.json', PLAN_B)).resolves.toBeTruthy();
    dialogs.showSave.mockResolvedValueOnce('relative.plan.json');
    await expect(h[IPC.saveAs](me, 'plan.plan.json', PLAN)).rejects.toThrow(/path must be an absolute path/);
  });

  it('opens a recent file only when it is on the list', async () => {
    const { h } = setup();
    await expect(h[IPC.openRecent](me, '/plans/a.plan.json')).rejects.toThrow(/not on the recent-files list/);
    await h[IPC.openDialog](me);
    await expect(h[IPC.openRecent](me, '/plans/a.plan.json')).resolves.toMatchObject({ text: PLAN });
    await expect(h[IPC.openRecent](me, '/plans/notes.json')).rejects.toThrow(/not on the recent-files list/);
  });

  it('reads a system file beside an opened plan (in its folder or below), and nothing else', async () => {
    const { h } = setup();
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', 's.system.json')).rejects.toThrow(/planPath is not a plan opened/);
    await h[IPC.openDialog](me);
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', 's.system.json')).resolves.toMatchObject({ text: SYSTEM });
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', 'sys/deep.system.json')).resolves.toMatchObject({ text: SYSTEM });
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', './sys/../s.system.json')).resolves.toMatchObject({ text: SYSTEM });
    // A crafted plan naming another JSON file as its "system": main does not hand it over, and
    // says nothing about it (not its "format", not whether it exists).
    const refusals = await Promise.all(
      ['notes.json', 'a.plan.json', 'missing.json', '../systems/s.system.json', '../../systems/s.system.json', 'sys/../../systems/s.system.json'].map((rel) =>
        h[IPC.readSystemBeside](me, '/plans/a.plan.json', rel).then(
          () => 'read',
          (e: Error) => e.message,
        ),
      ),
    );
    expect(new Set(refusals)).toEqual(new Set([`relativePath ${BESIDE_REFUSAL}`]));
  });

  it("reads a system in a folder outside the plan's only once the user chose a system file there", async () => {
    const { h, dialogs } = await opened();
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', '../systems/s.system.json')).rejects.toThrow(BESIDE_REFUSAL);
    dialogs.showOpen.mockResolvedValueOnce('/systems/s.system.json');
    await h[IPC.openSystemDialog](me);
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', '../systems/s.system.json')).resolves.toMatchObject({ text: SYSTEM });
    // The folder, not the whole disk: a file that is not a system there is still refused.
    await expect(h[IPC.readSystemBeside](me, '/plans/a.plan.json', '../user/recent.json')).rejects.toThrow(BESIDE_REFUSAL);
  });

  it('exports through a save dialog with the kind checked', async () => {
    const { h, dialogs, writeAtomic } = setup();
    dialogs.showSave.mockResolvedValueOnce('/out/plan.oem');
    await expect(h[IPC.exportFile](me, 'oem', 'plan.oem', 'CCSDS_OEM_VERS = 2.0')).resolves.toEqual({ path: '/out/plan.oem', name: 'plan.oem' });
    expect(writeAtomic).toHaveBeenCalledWith('/out/plan.oem', 'CCSDS_OEM_VERS = 2.0', 'oem');
    dialogs.showSave.mockResolvedValueOnce('/out/plan.exe');
    await expect(h[IPC.exportFile](me, 'csv', 'plan.csv', 'a,b')).rejects.toThrow(/path must end in \.csv/);
    // the runtime ephemeris in binary form crosses as bytes and is written as bytes
    const bytes = new Uint8Array([0x57, 0x4d, 0x52, 0x45, 1, 0]);
    dialogs.showSave.mockResolvedValueOnce('/out/plan.runtime.bin');
    await expect(h[IPC.exportFile](me, 'runtime-bin', 'plan.runtime.bin', bytes)).resolves.toEqual({ path: '/out/plan.runtime.bin', name: 'plan.runtime.bin' });
    expect(writeAtomic).toHaveBeenLastCalledWith('/out/plan.runtime.bin', bytes, 'runtime-bin');
  });

  it('keeps a recovery snapshot and validates its shape', async () => {
    const { h, disk } = setup();
    await expect(h[IPC.recoveryRead](me)).resolves.toBeNull();
    await h[IPC.recoveryWrite](me, snap);
    await expect(h[IPC.recoveryRead](me)).resolves.toEqual(snap);
    await h[IPC.recoveryClear](me);
    await expect(h[IPC.recoveryRead](me)).resolves.toBeNull();
    // A recovery file changed on disk into something else reads as none.
    disk.set('/user/recovery.json', JSON.stringify({ ...snap, text: 'not a plan' }));
    await expect(h[IPC.recoveryRead](me)).resolves.toBeNull();
  });

  it('passes the document state to the window and confirms a close', async () => {
    const { h, win } = setup();
    await h[IPC.documentState](me, { title: '• a.plan.json — Waymark', dirty: true });
    expect(win.setDocumentState).toHaveBeenCalledWith({ title: '• a.plan.json — Waymark', dirty: true });
    await h[IPC.closeConfirmed](me);
    expect(win.closeConfirmed).toHaveBeenCalledOnce();
  });
});
