/**
 * The security settings the main process applies, as pure functions of electron.config.ts so
 * they can be tested without Electron: web preferences of every window, which requests may
 * load (local files only: no remote content), and which page may call the IPC handlers.
 */
import type { WebPreferences } from 'electron';
import type { WaymarkElectronConfig } from '../../electron.config.ts';

export function webPreferences(config: WaymarkElectronConfig, preloadPath: string): WebPreferences {
  const s = config.security;
  return {
    preload: preloadPath,
    contextIsolation: s.contextIsolation,
    nodeIntegration: s.nodeIntegration,
    nodeIntegrationInWorker: false,
    nodeIntegrationInSubFrames: false,
    sandbox: s.sandbox,
    webSecurity: s.webSecurity,
    allowRunningInsecureContent: false,
    webviewTag: false,
    navigateOnDragDrop: false,
    spellcheck: false,
    devTools: true,
  };
}

/** The privileged scheme the renderer is served from (`waymark://app/index.html`). */
export const APP_SCHEME = 'waymark';
export const APP_HOST = 'app';
export const APP_INDEX_URL = `${APP_SCHEME}://${APP_HOST}/index.html`;

/** Schemes the app's own page uses; every other request (http, https, ws, ftp, file ...) is cancelled. */
const LOCAL_SCHEMES = new Set([`${APP_SCHEME}:`, 'data:', 'blob:', 'devtools:']);

export function isAllowedRequest(url: string): boolean {
  try {
    return LOCAL_SCHEMES.has(new URL(url).protocol);
  } catch {
    return false;
  }
}

/** A predicate: is `url` the app's page (the renderer index, any hash or query)? */
export function trustedSender(indexUrl: string): (url: string) => boolean {
  const base = new URL(indexUrl);
  return (url) => {
    try {
      const u = new URL(url);
      return u.protocol === base.protocol && u.host === base.host && u.pathname === base.pathname;
    } catch {
      return false;
    }
  };
}

/**
 * The file under `root` an app-scheme URL names, or null when the URL is not the app's or
 * would leave `root` (`waymark://app/assets/x.js` → `<root>/assets/x.js`).
 */
export function resolveAppPath(root: string, url: string, join: (...p: string[]) => string, sep: string): string | null {
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    return null;
  }
  if (u.protocol !== `${APP_SCHEME}:` || u.host !== APP_HOST) return null;
  let path: string;
  try {
    path = decodeURIComponent(u.pathname);
  } catch {
    return null;
  }
  if (path.includes('\0')) return null;
  const base = root.endsWith(sep) ? root : root + sep;
  const file = join(base, path === '/' ? 'index.html' : path);
  return file.startsWith(base) ? file : null;
}

/** Response headers with the app's Content-Security-Policy set (replacing any page-sent one). */
export function withCsp(headers: Record<string, string[] | string> | undefined, policy: string): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const [k, v] of Object.entries(headers ?? {})) {
    if (k.toLowerCase() !== 'content-security-policy') out[k] = Array.isArray(v) ? v : [v];
  }
  out['Content-Security-Policy'] = [policy];
  return out;
}
