/**
 * The security settings the main process applies, as functions of electron.config.ts so they
 * can be tested without Electron: web preferences of every window, what every web contents may
 * do (no navigation, no new windows, no webviews), what the session allows (no permissions, no
 * downloads, local requests only, the CSP on every response), and which page may call the IPC
 * handlers. The Electron security checklist (electronjs.org, "Security") is the reference.
 */
import type { Session, WebContents, WebPreferences } from 'electron';
import type { WaymarkElectronConfig } from '../../electron.config.ts';

/**
 * Whether windows get DevTools: only when asked for, in a run from a checkout (`npm start --
 * --devtools`, or WAYMARK_DEVTOOLS=1); a user's normal run and the packaged app have none, so a
 * page cannot be opened up from its keyboard shortcut.
 */
export function devToolsWanted(packaged: boolean, argv: readonly string[], env: Readonly<Record<string, string | undefined>>): boolean {
  return !packaged && (argv.includes('--devtools') || env.WAYMARK_DEVTOOLS === '1');
}

/** Web preferences of every window; `devTools` as devToolsWanted decides (off by default). */
export function webPreferences(config: WaymarkElectronConfig, preloadPath: string, options: { devTools: boolean } = { devTools: false }): WebPreferences {
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
    experimentalFeatures: false,
    devTools: options.devTools,
  };
}

/** Navigation events every web contents refuses: the app is one page and stays on it. */
export const DENIED_NAVIGATION = ['will-navigate', 'will-frame-navigate', 'will-redirect', 'will-attach-webview'] as const;

/** Locks a web contents (window, frame or webview) in place: no navigation, redirects, webviews or new windows. */
export function lockDownContents(contents: Pick<WebContents, 'on' | 'setWindowOpenHandler'>): void {
  for (const ev of DENIED_NAVIGATION) {
    (contents.on as (e: string, fn: (event: { preventDefault(): void }) => void) => unknown)(ev, (event) => event.preventDefault());
  }
  contents.setWindowOpenHandler(() => ({ action: 'deny' }));
}

/**
 * Locks the session: every permission request and check is refused (camera, geolocation,
 * notifications, clipboard, HID/serial/USB devices ...), downloads are cancelled, every
 * request but the app's own (isAllowedRequest) is cancelled, and every response carries the
 * app's Content-Security-Policy (withCsp).
 */
export function lockDownSession(
  ses: Pick<Session, 'setPermissionRequestHandler' | 'setPermissionCheckHandler' | 'setDevicePermissionHandler' | 'on' | 'webRequest'>,
  contentSecurityPolicy: string,
): void {
  ses.setPermissionRequestHandler((_wc, _permission, callback) => callback(false));
  ses.setPermissionCheckHandler(() => false);
  ses.setDevicePermissionHandler(() => false);
  (ses.on as (e: string, fn: (event: { preventDefault(): void }) => void) => unknown)('will-download', (event) => event.preventDefault());
  ses.webRequest.onBeforeRequest((details, callback) => callback({ cancel: !isAllowedRequest(details.url) }));
  ses.webRequest.onHeadersReceived((details, callback) => callback({ responseHeaders: withCsp(details.responseHeaders, contentSecurityPolicy) }));
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
