/**
 * The Electron main process wired up with Electron mocked (its runtime cannot run here; the
 * mock records every option and handler main hands to Electron): the window's web preferences,
 * switch by switch; the sandbox for every renderer; navigation, redirects, webviews and
 * window.open denied for every web contents; permissions (requests, checks, devices) refused;
 * downloads cancelled; remote requests cancelled; the CSP on every response (app scheme and
 * header); IPC only through validated `handle` channels that check the sending frame; a save
 * going through the atomic writer to disk.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { IPC } from '../../../app/preload/api.ts';
import config from '../../../electron.config.ts';

const m = vi.hoisted(() => {
  const userData = `${process.env.TMPDIR ?? '/tmp'}/waymark-main-test-${process.pid}`;
  const handlers = new Map<string, (event: unknown, ...args: unknown[]) => Promise<unknown>>();
  const appHandlers = new Map<string, (...args: unknown[]) => void>();
  const windows: { options: Record<string, unknown>; handlers: Map<string, (e: { preventDefault(): void }) => void>; loaded: string | null }[] = [];
  const session = {
    permission: null as null | ((wc: unknown, p: string, cb: (ok: boolean) => void) => void),
    permissionCheck: null as null | ((wc: unknown, p: string) => boolean),
    devicePermission: null as null | ((d: unknown) => boolean),
    events: new Map<string, (e: { preventDefault(): void }) => void>(),
    beforeRequest: null as null | ((d: { url: string }, cb: (r: { cancel: boolean }) => void) => void),
    headers: null as null | ((d: { responseHeaders: Record<string, string[]> }, cb: (r: { responseHeaders: Record<string, string[]> }) => void) => void),
  };
  const dialogPaths = { open: null as string | null, save: null as string | null };
  const protocol = { privileged: [] as unknown[], handlers: new Map<string, (r: { url: string }) => Promise<Response>>() };
  const calls = { enableSandbox: 0, ipcOn: 0 };
  return { userData, handlers, appHandlers, windows, session, dialogPaths, protocol, calls };
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
      isPackaged: false, // a run from a checkout, as `npm start` makes it
      enableSandbox: () => void m.calls.enableSandbox++,
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
    ipcMain: {
      handle: (ch: string, fn: (event: unknown, ...args: unknown[]) => Promise<unknown>) => void m.handlers.set(ch, fn),
      on: () => void m.calls.ipcOn++,
      once: () => void m.calls.ipcOn++,
    },
    Menu: { buildFromTemplate: (t: unknown) => t, setApplicationMenu: vi.fn() },
    protocol: {
      registerSchemesAsPrivileged: (s: unknown[]) => void m.protocol.privileged.push(...s),
      handle: (scheme: string, fn: (r: { url: string }) => Promise<Response>) => void m.protocol.handlers.set(scheme, fn),
    },
    session: {
      defaultSession: {
        setPermissionRequestHandler: (fn: never) => {
          m.session.permission = fn;
        },
        setPermissionCheckHandler: (fn: never) => {
          m.session.permissionCheck = fn;
        },
        setDevicePermissionHandler: (fn: never) => {
          m.session.devicePermission = fn;
        },
        on: (ev: string, fn: never) => void m.session.events.set(ev, fn),
        webRequest: {
          onBeforeRequest: (fn: never) => {
            m.session.beforeRequest = fn;
          },
          onHeadersReceived: (fn: never) => {
            m.session.headers = fn;
          },
        },
      },
    },
  };
});

beforeAll(async () => {
  await import('../../../app/main/main.ts');
  await new Promise((r) => setTimeout(r, 20));
});

/** An IPC event from the app's top frame (Electron's senderFrame.parent is null there). */
const fromApp = () => ({ senderFrame: { url: (m.windows[0] as unknown as { loaded: string }).loaded, parent: null } });
const PLAN = (name: string) => JSON.stringify({ format: 'waymark-plan', version: 1, name });

describe('Electron main process (electron mocked)', () => {
  it('creates the window with every security switch of its web preferences set (Electron security checklist, common practice)', () => {
    expect(m.windows).toHaveLength(1);
    const w = m.windows[0];
    const prefs = w.options.webPreferences as Record<string, unknown>;
    expect(prefs).toEqual({
      preload: expect.stringMatching(/preload[\\/]preload\.cjs$/),
      contextIsolation: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      sandbox: true,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
      navigateOnDragDrop: false,
      spellcheck: false,
      experimentalFeatures: false,
      devTools: false, // a normal run (no --devtools, no WAYMARK_DEVTOOLS=1): no devtools
    });
    // Nothing that loosens them rides along (enableBlinkFeatures, additional arguments, a partition ...).
    expect(Object.keys(w.options).sort()).toEqual(['backgroundColor', 'height', 'minHeight', 'minWidth', 'show', 'title', 'webPreferences', 'width']);
    expect(w.loaded).toBe('waymark://app/index.html');
  });

  it('turns the sandbox on for every renderer before any window exists', () => {
    expect(m.calls.enableSandbox).toBe(1);
  });

  it('serves the renderer from a privileged app scheme with the CSP on every response', async () => {
    expect(m.protocol.privileged).toEqual([{ scheme: 'waymark', privileges: expect.objectContaining({ standard: true, secure: true }) }]);
    const handler = m.protocol.handlers.get('waymark')!;
    // main.ts runs from app/main here, so the "renderer folder" is app/renderer (it has an index.html).
    const found = await handler({ url: 'waymark://app/index.html' });
    expect(found.status).toBe(200);
    expect(found.headers.get('content-type')).toMatch(/^text\/html/);
    expect(found.headers.get('content-security-policy')).toBe(config.security.contentSecurityPolicy);
    expect(found.headers.get('x-content-type-options')).toBe('nosniff');
    const missing = await handler({ url: 'waymark://app/no-such-file.js' });
    expect(missing.status).toBe(404);
    expect(missing.headers.get('content-security-policy')).toBe(config.security.contentSecurityPolicy);
    const outside = await handler({ url: 'waymark://app/..%2f..%2fpackage.json' });
    expect(outside.status).toBe(404);
    expect(outside.headers.get('content-security-policy')).toBe(config.security.contentSecurityPolicy);
  });

  it('denies navigation (main frame and sub-frames), redirects, webviews and new windows for every web contents', () => {
    const onCreated = m.appHandlers.get('web-contents-created')!;
    const events = new Map<string, (e: { preventDefault(): void }) => void>();
    let openHandler: ((d: { url: string }) => { action: string }) | null = null;
    onCreated({}, { on: (ev: string, fn: never) => events.set(ev, fn), setWindowOpenHandler: (fn: never) => (openHandler = fn) });
    expect([...events.keys()].sort()).toEqual(['will-attach-webview', 'will-frame-navigate', 'will-navigate', 'will-redirect']);
    for (const ev of events.keys()) {
      const e = { preventDefault: vi.fn(), url: 'https://example.invalid/' };
      events.get(ev)!(e);
      expect(e.preventDefault, ev).toHaveBeenCalled();
    }
    for (const url of ['https://example.invalid/', 'waymark://app/index.html', 'file:///etc/passwd', 'javascript:alert(1)']) {
      expect(openHandler!({ url })).toEqual({ action: 'deny' });
    }
  });

  it.each([
    'geolocation',
    'media',
    'notifications',
    'clipboard-read',
    'clipboard-sanitized-write',
    'openExternal',
    'fileSystem',
    'hid',
    'serial',
    'usb',
    'pointerLock',
    'fullscreen',
  ])('refuses the permission %s (request and check)', (permission) => {
    const cb = vi.fn();
    m.session.permission!({}, permission, cb);
    expect(cb).toHaveBeenCalledWith(false);
    expect(m.session.permissionCheck!({}, permission)).toBe(false);
  });

  it('refuses device access and cancels downloads', () => {
    expect(m.session.devicePermission!({ deviceType: 'usb', device: {} })).toBe(false);
    const e = { preventDefault: vi.fn() };
    m.session.events.get('will-download')!(e);
    expect(e.preventDefault).toHaveBeenCalled();
  });

  it.each([
    ['https://example.invalid/a.js', true],
    ['http://127.0.0.1:5317/', true],
    ['ws://localhost/', true],
    ['wss://example.invalid/', true],
    ['ftp://example.invalid/x', true],
    ['file:///etc/passwd', true],
    ['chrome-extension://abc/x.js', true],
    ['waymark://app/index.html', false],
    ['waymark://app/assets/index.js', false],
    ['data:image/png;base64,AAAA', false],
    ['blob:waymark://app/123', false],
  ])('request to %s: cancelled = %s', (url, cancel) => {
    const cb = vi.fn();
    m.session.beforeRequest!({ url }, cb);
    expect(cb).toHaveBeenCalledWith({ cancel });
  });

  it('puts the CSP on every response, replacing one the response brought', () => {
    const cases: Record<string, string[]>[] = [
      {},
      { 'content-security-policy': ["default-src *; script-src 'unsafe-eval'"] },
      { 'Content-Security-Policy': ['default-src *'], 'X-A': ['1'] },
    ];
    for (const responseHeaders of cases) {
      const cb = vi.fn();
      m.session.headers!({ responseHeaders }, cb);
      const out = cb.mock.calls[0][0].responseHeaders as Record<string, string[]>;
      const csp = Object.entries(out).filter(([k]) => k.toLowerCase() === 'content-security-policy');
      expect(csp).toEqual([['Content-Security-Policy', [config.security.contentSecurityPolicy]]]);
    }
  });

  it('handles every IPC channel with invoke handlers only (no fire-and-forget listeners)', () => {
    const channels = Object.values(IPC).filter((c) => c !== IPC.menu);
    expect([...m.handlers.keys()].sort()).toEqual([...channels].sort());
    expect(m.calls.ipcOn).toBe(0);
  });

  it('refuses IPC from a frame inside the page, from a destroyed frame, and from other pages', async () => {
    const list = m.handlers.get(IPC.recentList)!;
    await expect(list(fromApp())).resolves.toEqual(expect.any(Array));
    await expect(list({ senderFrame: { url: 'waymark://app/index.html', parent: { url: 'waymark://app/index.html' } } })).rejects.toThrow(/not the top frame/);
    await expect(list({ senderFrame: null })).rejects.toThrow(/sender/);
    await expect(list({ senderFrame: { url: 'https://evil.invalid/', parent: null } })).rejects.toThrow(/not the app's page/);
  });

  it('saves through a dialog to disk, atomically, with a backup of the previous version', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'waymark-main-'));
    m.dialogPaths.save = join(dir, 'out.plan.json');
    await m.handlers.get(IPC.saveAs)!(fromApp(), 'out.plan.json', PLAN('first'));
    await m.handlers.get(IPC.save)!(fromApp(), m.dialogPaths.save, PLAN('second'));
    expect(readFileSync(m.dialogPaths.save, 'utf8')).toBe(PLAN('second'));
    expect(readFileSync(`${m.dialogPaths.save}.bak`, 'utf8')).toBe(PLAN('first'));
    await expect(m.handlers.get(IPC.save)!({ senderFrame: { url: 'https://evil.invalid/', parent: null } }, m.dialogPaths.save, PLAN('x'))).rejects.toThrow(
      /sender/,
    );
  });

  it('opens a plan through the dialog, and refuses one that is not valid UTF-8 with the offset of the bad byte', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'waymark-main-'));
    m.dialogPaths.open = join(dir, 'in.plan.json');
    writeFileSync(m.dialogPaths.open, PLAN('Fénix Δ'));
    await expect(m.handlers.get(IPC.openDialog)!(fromApp())).resolves.toMatchObject({ text: PLAN('Fénix Δ') });
    const bad = Buffer.from(PLAN('Ilmar'));
    bad[bad.indexOf('Ilmar')] = 0xff;
    writeFileSync(m.dialogPaths.open, bad);
    await expect(m.handlers.get(IPC.openDialog)!(fromApp())).rejects.toThrow(`in.plan.json is not valid UTF-8 at byte ${bad.indexOf(0xff)}`);
    m.dialogPaths.open = null;
  });

  it('keeps the recovery copy in the user-data folder', async () => {
    const snap = { name: 'a.plan.json', path: null, text: PLAN('unsaved'), savedAt: 5 };
    await m.handlers.get(IPC.recoveryWrite)!(fromApp(), snap);
    expect(JSON.parse(readFileSync(join(m.userData, 'recovery.json'), 'utf8'))).toEqual(snap);
    await expect(m.handlers.get(IPC.recoveryRead)!(fromApp())).resolves.toEqual(snap);
    await m.handlers.get(IPC.recoveryClear)!(fromApp());
    await expect(m.handlers.get(IPC.recoveryRead)!(fromApp())).resolves.toBeNull();
  });

  it('asks before closing a window with unsaved changes', async () => {
    const w = m.windows[0] as unknown as { handlers: Map<string, (e: { preventDefault(): void }) => void> };
    await m.handlers.get(IPC.documentState)!(fromApp(), { title: '• a — Waymark', dirty: true });
    const e = { preventDefault: vi.fn() };
    w.handlers.get('close')!(e);
    expect(e.preventDefault).toHaveBeenCalled(); // the mocked dialog answers Cancel
  });
});
