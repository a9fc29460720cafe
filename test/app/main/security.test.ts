import { describe, expect, it } from 'vitest';
import config from '../../../electron.config.ts';
import { join, sep } from 'node:path';
import { APP_INDEX_URL, isAllowedRequest, resolveAppPath, trustedSender, webPreferences, withCsp } from '../../../app/main/security.ts';

describe('main-process security settings', () => {
  it('turns on isolation and the sandbox, off Node integration (Electron security checklist, common practice)', () => {
    const w = webPreferences(config, '/x/preload.cjs');
    expect(w).toMatchObject({ contextIsolation: true, nodeIntegration: false, sandbox: true, webSecurity: true, webviewTag: false, nodeIntegrationInWorker: false, allowRunningInsecureContent: false });
    expect(w.preload).toBe('/x/preload.cjs');
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
    const h = withCsp({ 'content-security-policy': ["default-src *"], 'X-Other': 'y' }, config.security.contentSecurityPolicy);
    expect(h['Content-Security-Policy']).toEqual([config.security.contentSecurityPolicy]);
    expect(h['content-security-policy']).toBeUndefined();
    expect(h['X-Other']).toEqual(['y']);
  });

  it('has a strict policy: no eval, no inline scripts, no remote origins', () => {
    const csp = config.security.contentSecurityPolicy;
    expect(csp).toMatch(/script-src 'self'(;|$)/);
    expect(csp).not.toMatch(/unsafe-eval/);
    expect(csp).not.toMatch(/https?:/);
    expect(csp).toMatch(/object-src 'none'/);
  });
});
