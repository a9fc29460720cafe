/**
 * The Electron main process wired up with Electron mocked (its runtime cannot run here): the
 * window's web preferences, navigation and window.open denied, permissions refused, remote
 * requests cancelled, the CSP header set, every IPC channel handled, and a save going through
 * the atomic writer to disk.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { IPC } from '../../../app/preload/api.ts';

const m = vi.hoisted(() => {
  const userData = `${process.env.TMPDIR ?? '/tmp'}/waymark-main-test-${process.pid}`;
  const handlers = new Map<string, (event: unknown, ...args: unknown[]) => Promise<unknown>>();
  const appHandlers = new Map<string, (...args: unknown[]) => void>();
  const windows: { options: Record<string, unknown>; handlers: Map<string, (e: { preventDefault(): void }) => void>; loaded: string | null }[] = [];
  const session = {
    permission: null as null | ((wc: unknown, p: string, cb: (ok: boolean) => void) => void),
    beforeRequest: null as null | ((d: { url: string }, cb: (r: { cancel: boolean }) => void) => void),
    headers: null as null | ((d: { responseHeaders: Record<string, string[]> }, cb: (r: { responseHeaders: Record<string, string[]> }) => void) => void),
  };
  const dialogPaths = { open: null as string | null, save: null as string | null };
  const protocol = { privileged: [] as unknown[], handlers: new Map<string, (r: { url: string }) => Promise<Response>>() };
  return { userData, handlers, appHandlers, windows, session, dialogPaths, protocol };
});

vi.mock('electron', () => {
  class BrowserWindow {
    static getAllWindows = () => m.windows;
    handlers = new Map<string, (e: { preventDefault(): void }) => void>();
    loaded: string | null = null;
    webContents = { send: vi.fn() };
    constructor(public options: Record<string, unknown>) {
      m.windows.push(this as never);
    }
    once(ev: string, fn: () => void) {
      this.handlers.set(ev, fn as never);
    }
    on(ev: string, fn: (e: { preventDefault(): void }) => void) {
      this.handlers.set(ev, fn);
    }
    loadURL(p: string) {
      this.loaded = p;
      return Promise.resolve();
    }
    setTitle = vi.fn();
    setDocumentEdited = vi.fn();
    show = vi.fn();
    close = vi.fn();
  }
  return {
    app: {
      enableSandbox: vi.fn(),
      getPath: () => m.userData,
      whenReady: () => Promise.resolve(),
      on: (ev: string, fn: (...a: unknown[]) => void) => void m.appHandlers.set(ev, fn),
      quit: vi.fn(),
    },
    BrowserWindow,
    dialog: {
      showOpenDialog: async () => ({ canceled: m.dialogPaths.open === null, filePaths: m.dialogPaths.open ? [m.dialogPaths.open] : [] }),
      showSaveDialog: async () => ({ canceled: m.dialogPaths.save === null, filePath: m.dialogPaths.save ?? undefined }),
      showMessageBoxSync: vi.fn(() => 2),
    },
    ipcMain: { handle: (ch: string, fn: (event: unknown, ...args: unknown[]) => Promise<unknown>) => void m.handlers.set(ch, fn) },
    Menu: { buildFromTemplate: (t: unknown) => t, setApplicationMenu: vi.fn() },
    protocol: {
      registerSchemesAsPrivileged: (s: unknown[]) => void m.protocol.privileged.push(...s),
      handle: (scheme: string, fn: (r: { url: string }) => Promise<Response>) => void m.protocol.handlers.set(scheme, fn),
    },
    session: {
      defaultSession: {
        setPermissionRequestHandler: (fn: never) => void (m.session.permission = fn),
        webRequest: {
          onBeforeRequest: (fn: never) => void (m.session.beforeRequest = fn),
          onHeadersReceived: (fn: never) => void (m.session.headers = fn),
        },
      },
    },
  };
});

beforeAll(async () => {
  await import('../../../app/main/main.ts');
  await new Promise((r) => setTimeout(r, 20));
});

describe('Electron main process (electron mocked)', () => {
  it('creates the window with isolation, sandbox and no Node integration', () => {
    expect(m.windows).toHaveLength(1);
    const w = m.windows[0];
    expect(w.options.webPreferences).toMatchObject({ contextIsolation: true, nodeIntegration: false, sandbox: true, webSecurity: true });
    expect(String((w.options.webPreferences as { preload: string }).preload)).toMatch(/preload[\\/]preload\.cjs$/);
    expect(w.loaded).toBe('waymark://app/index.html');
  });

  it('serves the renderer from a privileged app scheme with the CSP on every response', async () => {
    expect(m.protocol.privileged).toEqual([{ scheme: 'waymark', privileges: expect.objectContaining({ standard: true, secure: true }) }]);
    const handler = m.protocol.handlers.get('waymark')!;
    const missing = await handler({ url: 'waymark://app/no-such-file.js' });
    expect(missing.status).toBe(404);
    expect(missing.headers.get('content-security-policy')).toMatch(/script-src 'self'/);
    expect((await handler({ url: 'waymark://app/..%2f..%2fpackage.json' })).status).toBe(404);
  });

  it('denies navigation, redirects, webviews and new windows', () => {
    const onCreated = m.appHandlers.get('web-contents-created')!;
    const events = new Map<string, (e: { preventDefault(): void }) => void>();
    let openHandler: (() => { action: string }) | null = null;
    onCreated({}, { on: (ev: string, fn: never) => events.set(ev, fn), setWindowOpenHandler: (fn: never) => (openHandler = fn) });
    for (const ev of ['will-navigate', 'will-redirect', 'will-attach-webview']) {
      const e = { preventDefault: vi.fn() };
      events.get(ev)!(e);
      expect(e.preventDefault, ev).toHaveBeenCalled();
    }
    expect(openHandler!()).toEqual({ action: 'deny' });
  });

  it('refuses every permission and cancels remote requests', () => {
    const perm = vi.fn();
    m.session.permission!({}, 'geolocation', perm);
    expect(perm).toHaveBeenCalledWith(false);
    const r1 = vi.fn();
    m.session.beforeRequest!({ url: 'https://example.invalid/a.js' }, r1);
    expect(r1).toHaveBeenCalledWith({ cancel: true });
    const r2 = vi.fn();
    m.session.beforeRequest!({ url: 'waymark://app/index.html' }, r2);
    expect(r2).toHaveBeenCalledWith({ cancel: false });
    const r3 = vi.fn();
    m.session.headers!({ responseHeaders: {} }, r3);
    expect(r3.mock.calls[0][0].responseHeaders['Content-Security-Policy'][0]).toMatch(/script-src 'self'/);
  });

  it('handles every IPC channel', () => {
    const channels = Object.values(IPC).filter((c) => c !== IPC.menu);
    expect([...m.handlers.keys()].sort()).toEqual([...channels].sort());
  });

  it('saves through a dialog to disk, atomically, with a backup of the previous version', async () => {
    const w = m.windows[0] as unknown as { loaded: string };
    const sender = { senderFrame: { url: w.loaded } };
    const dir = mkdtempSync(join(tmpdir(), 'waymark-main-'));
    m.dialogPaths.save = join(dir, 'out.plan.json');
    await m.handlers.get(IPC.saveAs)!(sender, 'out.plan.json', 'first');
    await m.handlers.get(IPC.save)!(sender, m.dialogPaths.save, 'second');
    expect(readFileSync(m.dialogPaths.save, 'utf8')).toBe('second');
    expect(readFileSync(`${m.dialogPaths.save}.bak`, 'utf8')).toBe('first');
    await expect(m.handlers.get(IPC.save)!({ senderFrame: { url: 'https://evil.invalid/' } }, m.dialogPaths.save, 'x')).rejects.toThrow(/sender/);
  });

  it('asks before closing a window with unsaved changes', async () => {
    const w = m.windows[0] as unknown as { loaded: string; handlers: Map<string, (e: { preventDefault(): void }) => void> };
    const sender = { senderFrame: { url: w.loaded } };
    await m.handlers.get(IPC.documentState)!(sender, { title: '• a — Waymark', dirty: true });
    const e = { preventDefault: vi.fn() };
    w.handlers.get('close')!(e);
    expect(e.preventDefault).toHaveBeenCalled(); // the mocked dialog answers Cancel
  });
});
