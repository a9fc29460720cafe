import { describe, expect, it, vi } from 'vitest';
import config from '../../../electron.config.ts';
import { join, sep } from 'node:path';
import {
  APP_INDEX_URL,
  DENIED_NAVIGATION,
  devToolsWanted,
  isAllowedRequest,
  lockDownContents,
  lockDownSession,
  resolveAppPath,
  trustedSender,
  webPreferences,
  withCsp,
} from '../../../app/main/security.ts';

describe('main-process security settings', () => {
  it('turns on isolation and the sandbox, off Node integration (Electron security checklist, common practice)', () => {
    const w = webPreferences(config, '/x/preload.cjs');
    expect(w).toEqual({
      preload: '/x/preload.cjs',
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
      devTools: false,
    });
    // A run that asked for devtools gets them and nothing else changes.
    expect(webPreferences(config, '/x/preload.cjs', { devTools: true })).toEqual({ ...w, devTools: true });
  });

  it('gives DevTools only to a run from a checkout that asks for them (--devtools or WAYMARK_DEVTOOLS=1), never to the packaged app', () => {
    const argv = ['/x/electron', '/x/dist/main/main.js'];
    expect(devToolsWanted(false, argv, {})).toBe(false); // a user's normal `npm start`
    expect(devToolsWanted(false, [...argv, '--devtools'], {})).toBe(true);
    expect(devToolsWanted(false, argv, { WAYMARK_DEVTOOLS: '1' })).toBe(true);
    expect(devToolsWanted(false, argv, { WAYMARK_DEVTOOLS: '0' })).toBe(false);
    expect(devToolsWanted(false, argv, { WAYMARK_DEVTOOLS: '' })).toBe(false);
    expect(devToolsWanted(true, [...argv, '--devtools'], { WAYMARK_DEVTOOLS: '1' })).toBe(false);
  });

  it('the configuration pins every switch to its safe value', () => {
    expect(config.security).toMatchObject({
      contextIsolation: true,
      nodeIntegration: false,
      sandbox: true,
      webSecurity: true,
      allowNavigation: false,
      allowNewWindows: false,
    });
  });

  it('locks every web contents in place: navigation, redirects, webviews and new windows denied', () => {
    const on = new Map<string, (e: { preventDefault(): void }) => void>();
    let open: ((d: { url: string }) => unknown) | null = null;
    lockDownContents({ on: ((ev: string, fn: never) => on.set(ev, fn)) as never, setWindowOpenHandler: ((fn: never) => (open = fn)) as never });
    expect([...on.keys()].sort()).toEqual([...DENIED_NAVIGATION].sort());
    for (const [ev, fn] of on) {
      const e = { preventDefault: vi.fn() };
      fn(e);
      expect(e.preventDefault, ev).toHaveBeenCalledOnce();
    }
    expect(open!({ url: 'https://example.invalid/' })).toEqual({ action: 'deny' });
  });

  it('locks the session: permissions, devices and downloads refused, remote requests cancelled, CSP set', () => {
    const rec: Record<string, (...a: never[]) => unknown> = {};
    const keep = (k: string) => (fn: never) => {
      rec[k] = fn;
    };
    lockDownSession(
      {
        setPermissionRequestHandler: keep('request'),
        setPermissionCheckHandler: keep('check'),
        setDevicePermissionHandler: keep('device'),
        on: ((ev: string, fn: never) => {
          rec[`on:${ev}`] = fn;
        }) as never,
        webRequest: { onBeforeRequest: keep('before'), onHeadersReceived: keep('headers') } as never,
      },
      'default-src none-test',
    );
    const cb = vi.fn();
    (rec.request as (...a: unknown[]) => void)({}, 'media', cb);
    expect(cb).toHaveBeenCalledWith(false);
    expect((rec.check as (...a: unknown[]) => unknown)({}, 'clipboard-read')).toBe(false);
    expect((rec.device as (...a: unknown[]) => unknown)({ deviceType: 'hid' })).toBe(false);
    const dl = { preventDefault: vi.fn() };
    (rec['on:will-download'] as (...a: unknown[]) => void)(dl);
    expect(dl.preventDefault).toHaveBeenCalled();
    const r = vi.fn();
    (rec.before as (...a: unknown[]) => void)({ url: 'https://example.invalid/' }, r);
    expect(r).toHaveBeenCalledWith({ cancel: true });
    const h = vi.fn();
    (rec.headers as (...a: unknown[]) => void)({ responseHeaders: { 'content-security-policy': ['default-src *'] } }, h);
    expect(h).toHaveBeenCalledWith({ responseHeaders: { 'Content-Security-Policy': ['default-src none-test'] } });
  });

  it('allows the app scheme and inline data only', () => {
    expect(isAllowedRequest(APP_INDEX_URL)).toBe(true);
    expect(isAllowedRequest('waymark://app/assets/index.js')).toBe(true);
    expect(isAllowedRequest('file:///etc/passwd')).toBe(false);
    expect(isAllowedRequest('data:image/png;base64,AAAA')).toBe(true);
    expect(isAllowedRequest('https://example.invalid/x.js')).toBe(false);
    expect(isAllowedRequest('http://127.0.0.1:5317/')).toBe(false);
    expect(isAllowedRequest('ws://localhost/')).toBe(false);
    expect(isAllowedRequest('not a url')).toBe(false);
  });

  it('trusts the renderer index only', () => {
    const ok = trustedSender(APP_INDEX_URL);
    expect(ok(`${APP_INDEX_URL}#x`)).toBe(true);
    expect(ok('waymark://app/other.html')).toBe(false);
    expect(ok('waymark://evil/index.html')).toBe(false);
    expect(ok('https://app/index.html')).toBe(false);
    expect(ok('')).toBe(false);
  });

  it('maps app-scheme URLs into the renderer folder and nowhere else', () => {
    const root = join('/opt', 'waymark', 'dist', 'renderer');
    expect(resolveAppPath(root, 'waymark://app/index.html', join, sep)).toBe(join(root, 'index.html'));
    expect(resolveAppPath(root, 'waymark://app/', join, sep)).toBe(join(root, 'index.html'));
    expect(resolveAppPath(root, 'waymark://app/assets/a%20b.js', join, sep)).toBe(join(root, 'assets', 'a b.js'));
    expect(resolveAppPath(root, 'waymark://app/..%2f..%2fsecret.json', join, sep)).toBeNull();
    expect(resolveAppPath(root, 'waymark://other/index.html', join, sep)).toBeNull();
    expect(resolveAppPath(root, 'file:///opt/waymark/dist/renderer/index.html', join, sep)).toBeNull();
  });

  it('replaces any page-sent policy with the configured CSP', () => {
    const h = withCsp({ 'content-security-policy': ['default-src *'], 'X-Other': 'y' }, config.security.contentSecurityPolicy);
    expect(h['Content-Security-Policy']).toEqual([config.security.contentSecurityPolicy]);
    expect(h['content-security-policy']).toBeUndefined();
    expect(h['X-Other']).toEqual(['y']);
  });

  it('has a strict policy: no eval, no inline scripts, no remote origins', () => {
    const csp = config.security.contentSecurityPolicy;
    expect(csp).toMatch(/script-src 'self'(;|$)/);
    expect(csp).not.toMatch(/unsafe-eval/);
    expect(csp).not.toMatch(/wasm-unsafe-eval|unsafe-hashes|strict-dynamic/);
    expect(csp).not.toMatch(/https?:/);
    expect(csp).toMatch(/object-src 'none'/);
  });

  it('every directive of the policy allows only the app itself (and inline data for images and styles)', () => {
    const directives = new Map(
      config.security.contentSecurityPolicy
        .split(';')
        .map((d) => d.trim().split(/\s+/))
        .filter((d) => d[0])
        .map(([name, ...sources]) => [name, sources]),
    );
    // What the policy must say (CSP Level 3, W3C; common practice for a local app).
    expect(directives.get('default-src')).toEqual(["'self'"]);
    expect(directives.get('script-src')).toEqual(["'self'"]);
    expect(directives.get('connect-src')).toEqual(["'self'"]);
    expect(directives.get('object-src')).toEqual(["'none'"]);
    expect(directives.get('base-uri')).toEqual(["'none'"]);
    expect(directives.get('frame-ancestors')).toEqual(["'none'"]);
    // no form may submit anywhere (the app has no forms that post; a form injected into the page cannot send data out)
    expect(directives.get('form-action')).toEqual(["'none'"]);
    const allowed: Record<string, string[]> = {
      'style-src': ["'self'", "'unsafe-inline'"],
      'img-src': ["'self'", 'data:', 'blob:'],
      'worker-src': ["'self'", 'blob:'],
    };
    for (const [name, sources] of directives) {
      for (const src of sources) expect(["'self'", "'none'", ...(allowed[name] ?? [])], `${name} ${src}`).toContain(src);
      expect(sources, name).not.toContain('*');
    }
  });
});
