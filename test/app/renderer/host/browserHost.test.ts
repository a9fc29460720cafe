import { describe, expect, it, vi } from 'vitest';
import { RECENT_LIMIT, STORAGE_KEYS, createBrowserHost, type BrowserEnv, type WritableHandle } from '../../../../app/renderer/host/browserHost.ts';
import { NewerVersionError } from '../../../../app/renderer/host/host.ts';

const utf8 = (s: string): Uint8Array => new TextEncoder().encode(s);

function memoryStorage() {
  const m = new Map<string, string>();
  return { m, getItem: (k: string) => m.get(k) ?? null, setItem: (k: string, v: string) => void m.set(k, v), removeItem: (k: string) => void m.delete(k) };
}

function env(over: Partial<BrowserEnv> = {}) {
  const storage = memoryStorage();
  let beforeUnload: (() => boolean) | null = null;
  const e: BrowserEnv & { storage: ReturnType<typeof memoryStorage> } = {
    storage,
    pickFile: vi.fn(async () => ({ name: 'a.plan.json', bytes: utf8('A') })),
    download: vi.fn(),
    fsAccess: null,
    setTitle: vi.fn(),
    onBeforeUnload: (f: () => boolean) => {
      beforeUnload = f;
    },
    now: () => 1000,
    ...over,
  } as never;
  return { e, dirty: () => beforeUnload!() };
}

function handle(name: string, text: string) {
  const written: string[] = [];
  const h: WritableHandle = {
    name,
    getFile: async () => ({ text: async () => text, arrayBuffer: async () => utf8(text).buffer as ArrayBuffer }),
    createWritable: async () => ({ write: async (d: string) => void written.push(d), close: async () => undefined }),
  };
  return { h, written };
}

describe('browser host', () => {
  it('opens through the file picker and remembers the file as recent', async () => {
    const { e } = env();
    const host = createBrowserHost(e);
    const f = await host.openPlan();
    expect(f).toEqual({ ref: { name: 'a.plan.json', path: null, handle: null }, text: 'A' });
    expect((await host.recentFiles()).map((r) => r.name)).toEqual(['a.plan.json']);
    await expect(host.openRecent('a.plan.json')).resolves.toMatchObject({ text: 'A' });
  });

  it('returns null when the picker is cancelled', async () => {
    const { e } = env({ pickFile: async () => null });
    await expect(createBrowserHost(e).openPlan()).resolves.toBeNull();
  });

  it('saves a file without a handle as a download', async () => {
    const { e } = env();
    const host = createBrowserHost(e);
    const ref = await host.save({ name: 'x.plan.json', path: null, handle: null }, 'TEXT');
    expect(e.download).toHaveBeenCalledWith('x.plan.json', 'TEXT', 'application/json');
    expect(ref).toEqual({ name: 'x.plan.json', path: null, handle: null });
  });

  it('writes back through the File System Access API when it has a handle', async () => {
    const { h, written } = handle('y.plan.json', 'old');
    const { e } = env({
      fsAccess: { showOpenFilePicker: async () => [h], showSaveFilePicker: async () => h },
    });
    const host = createBrowserHost(e);
    const f = await host.openPlan();
    expect(f?.text).toBe('old');
    await host.save(f!.ref, 'new');
    expect(written).toEqual(['new']);
    expect(e.download).not.toHaveBeenCalled();
  });

  it('does not write over a file a newer version wrote (Save and Save As), and says so', async () => {
    const newer = '{"format":"waymark-plan","version":2,"name":"future"}';
    const { h, written } = handle('f.plan.json', newer);
    const { e } = env({ fsAccess: { showOpenFilePicker: async () => [h], showSaveFilePicker: async () => h } });
    const host = createBrowserHost(e);
    const ref = { name: 'f.plan.json', path: null, handle: h };
    await expect(host.save(ref, 'new')).rejects.toThrow(NewerVersionError);
    await expect(host.save(ref, 'new')).rejects.toThrow(
      /f\.plan\.json was written by a newer version of Waymark \(version 2; this one reads up to 1\): it is not overwritten; use Save As/,
    );
    await expect(host.saveAs('f.plan.json', 'new')).rejects.toThrow(NewerVersionError);
    expect(written).toEqual([]);
    // A current-version file (or an empty new one) is written as usual.
    const ok = handle('g.plan.json', '{"format":"waymark-plan","version":1}');
    await host.save({ name: 'g.plan.json', path: null, handle: ok.h }, 'new');
    expect(ok.written).toEqual(['new']);
  });

  it('does not write over a file it cannot read (Save and Save As), and says why', async () => {
    const written: string[] = [];
    const h: WritableHandle = {
      name: 'locked.plan.json',
      getFile: async () => Promise.reject(Object.assign(new Error('The requested file could not be read'), { name: 'NotReadableError' })),
      createWritable: async () => ({ write: async (d: string) => void written.push(d), close: async () => undefined }),
    };
    const { e } = env({ fsAccess: { showOpenFilePicker: async () => [h], showSaveFilePicker: async () => h } });
    const host = createBrowserHost(e);
    await expect(host.save({ name: 'locked.plan.json', path: null, handle: h }, 'new')).rejects.toThrow(
      /locked\.plan\.json is there but could not be read \(The requested file could not be read\), so what it holds is unknown and it is not overwritten; use Save As/,
    );
    await expect(host.saveAs('locked.plan.json', 'new')).rejects.toThrow(/could not be read/);
    expect(written).toEqual([]);
  });

  it('treats an aborted picker as cancelled', async () => {
    const abort = Object.assign(new Error('user aborted'), { name: 'AbortError' });
    const { e } = env({
      fsAccess: { showOpenFilePicker: async () => Promise.reject(abort), showSaveFilePicker: async () => Promise.reject(abort) },
    });
    const host = createBrowserHost(e);
    await expect(host.openPlan()).resolves.toBeNull();
    await expect(host.saveAs('z.plan.json', 'x')).resolves.toBeNull();
  });

  it(`keeps at most ${RECENT_LIMIT} recent files, newest first, and drops the old copies`, async () => {
    let k = 0;
    const { e } = env({ pickFile: async () => ({ name: `p${++k}.plan.json`, bytes: utf8(`T${k}`) }) });
    const host = createBrowserHost(e);
    for (let i = 0; i < RECENT_LIMIT + 3; i++) await host.openPlan();
    const list = await host.recentFiles();
    expect(list).toHaveLength(RECENT_LIMIT);
    expect(list[0].name).toBe(`p${RECENT_LIMIT + 3}.plan.json`);
    expect(e.storage.m.has(`${STORAGE_KEYS.recentText}p1.plan.json`)).toBe(false);
  });

  it('keeps the recovery copy in storage', async () => {
    const { e } = env();
    const host = createBrowserHost(e);
    expect(await host.readRecovery()).toBeNull();
    await host.writeRecovery({ name: 'n', path: null, text: 'T', savedAt: 5 });
    expect(await host.readRecovery()).toEqual({ name: 'n', path: null, text: 'T', savedAt: 5 });
    await host.clearRecovery();
    expect(await host.readRecovery()).toBeNull();
  });

  it('asks before leaving only with unsaved changes, and sets the title', () => {
    const { e, dirty } = env();
    const host = createBrowserHost(e);
    expect(dirty()).toBe(false);
    host.setDocumentState('• a — Waymark', true);
    expect(dirty()).toBe(true);
    expect(e.setTitle).toHaveBeenCalledWith('• a — Waymark');
  });

  it('refuses a file that is not valid UTF-8 with its name and the offset of the bad byte, and does not remember it', async () => {
    const bad = Uint8Array.from([0x7b, 0x22, 0x6e, 0xc3, 0x28, 0x22, 0x7d]); // {"n\xC3("} : 0xC3 must be followed by 0x80..0xBF
    const { e } = env({ pickFile: async () => ({ name: 'bad.plan.json', bytes: bad }) });
    const host = createBrowserHost(e);
    await expect(host.openPlan()).rejects.toThrow('bad.plan.json is not valid UTF-8 at byte 3');
    const h: WritableHandle = {
      name: 'bad2.plan.json',
      getFile: async () => ({ text: async () => '', arrayBuffer: async () => bad.buffer as ArrayBuffer }),
      createWritable: async () => ({ write: async () => undefined, close: async () => undefined }),
    };
    const { e: e2 } = env({ fsAccess: { showOpenFilePicker: async () => [h], showSaveFilePicker: async () => h } });
    await expect(createBrowserHost(e2).openPlan()).rejects.toThrow('bad2.plan.json is not valid UTF-8 at byte 3');
    expect(await host.recentFiles()).toEqual([]);
  });

  it('reads no system beside a plan (a browser has no paths)', async () => {
    const { e } = env();
    await expect(createBrowserHost(e).readSystemBeside({ name: 'a', path: null, handle: null }, '../s.json')).resolves.toBeNull();
  });
});
