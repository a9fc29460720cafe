/** Picks the host: Electron when the preload exposed `window.waymark`, the browser host otherwise. */
import type { WaymarkBridge } from '../../preload/api.ts';
import { createBrowserHost, pageEnv } from './browserHost.ts';
import { createElectronHost } from './electronHost.ts';
import type { Host } from './host.ts';

export function createHost(win: Window & typeof globalThis = window): Host {
  const bridge = (win as unknown as { waymark?: WaymarkBridge }).waymark;
  return bridge && bridge.kind === 'electron' ? createElectronHost(bridge) : createBrowserHost(pageEnv(win));
}
