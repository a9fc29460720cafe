/**
 * The preload script (app/preload/preload.ts) with Electron mocked: what it hands the page
 * through contextBridge is exactly the named API — each entry a function forwarding its own
 * arguments (and no others) to one IPC channel — and nothing of Electron itself (no
 * ipcRenderer, no generic invoke/send/on). (Kept beside the main-process tests: the preload is
 * the other half of the same IPC boundary.)
 */
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { IPC, type MenuCommand } from '../../../app/preload/api.ts';

const m = vi.hoisted(() => ({
  exposed: [] as [string, unknown][],
  listeners: new Map<string, Set<(...a: unknown[]) => void>>(),
}));

vi.mock('electron', () => ({
  contextBridge: { exposeInMainWorld: (name: string, api: unknown) => void m.exposed.push([name, api]) },
  ipcRenderer: {
    invoke: vi.fn(async (channel: string, ...args: unknown[]) => ({ channel, args })),
    on: vi.fn((channel: string, fn: (...a: unknown[]) => void) => {
      if (!m.listeners.has(channel)) m.listeners.set(channel, new Set());
      m.listeners.get(channel)!.add(fn);
    }),
    removeListener: vi.fn((channel: string, fn: (...a: unknown[]) => void) => void m.listeners.get(channel)?.delete(fn)),
    send: vi.fn(),
    sendSync: vi.fn(),
  },
}));

/** Every entry of the bridge and what it must do: [key, arguments, channel]. */
const FORWARDS: [string, unknown[], string][] = [
  ['openDialog', [], IPC.openDialog],
  ['openRecent', ['/p/a.plan.json'], IPC.openRecent],
  ['openSystemDialog', [], IPC.openSystemDialog],
  ['readSystemBeside', ['/p/a.plan.json', '../s.system.json'], IPC.readSystemBeside],
  ['save', ['/p/a.plan.json', 'TEXT'], IPC.save],
  ['saveAs', ['a.plan.json', 'TEXT'], IPC.saveAs],
  ['exportFile', ['oem', 'a.oem', 'TEXT'], IPC.exportFile],
  ['recentList', [], IPC.recentList],
  ['recoveryRead', [], IPC.recoveryRead],
  ['recoveryWrite', [{ name: 'n', path: null, text: 'T', savedAt: 1 }], IPC.recoveryWrite],
  ['recoveryClear', [], IPC.recoveryClear],
  ['setDocumentState', [{ title: 't', dirty: true }], IPC.documentState],
  ['closeConfirmed', [], IPC.closeConfirmed],
];

let api: Record<string, unknown>;
let electron: {
  ipcRenderer: { invoke: ReturnType<typeof vi.fn>; on: ReturnType<typeof vi.fn>; send: ReturnType<typeof vi.fn>; sendSync: ReturnType<typeof vi.fn> };
};

beforeAll(async () => {
  await import('../../../app/preload/preload.ts');
  electron = (await import('electron')) as never;
  api = m.exposed[0]?.[1] as Record<string, unknown>;
});

describe('preload: the narrow window.waymark API', () => {
  it('exposes one object, as window.waymark, once', () => {
    expect(m.exposed.map(([name]) => name)).toEqual(['waymark']);
    expect(typeof api).toBe('object');
  });

  it('has exactly the named keys: the kind marker and one function per IPC call plus onMenu', () => {
    const expected = ['kind', ...FORWARDS.map(([k]) => k), 'onMenu'].sort();
    expect(Object.keys(api).sort()).toEqual(expected);
    // Nothing hidden either: no symbols, no non-enumerable extras, no prototype but Object's.
    expect(Reflect.ownKeys(api).map(String).sort()).toEqual(expected);
    expect(Object.getPrototypeOf(api)).toBe(Object.prototype);
    expect(api.kind).toBe('electron');
    for (const key of expected.filter((k) => k !== 'kind')) expect(typeof api[key], key).toBe('function');
  });

  it('gives the page nothing of Electron: no ipcRenderer, no generic invoke, send or on', () => {
    for (const forbidden of ['ipcRenderer', 'invoke', 'send', 'sendSync', 'on', 'once', 'removeListener', 'postMessage', 'require', 'process']) {
      expect(api, forbidden).not.toHaveProperty(forbidden);
    }
    for (const v of Object.values(api)) expect(v).not.toBe(electron.ipcRenderer);
  });

  it.each(FORWARDS)('%s forwards its own arguments, and no others, to its one channel', async (key, args, channel) => {
    electron.ipcRenderer.invoke.mockClear();
    const fn = api[key] as (...a: unknown[]) => Promise<unknown>;
    // An extra argument from the page is not passed on.
    await expect(fn(...args, 'extra', { evil: true })).resolves.toEqual({ channel, args });
    expect(electron.ipcRenderer.invoke).toHaveBeenCalledOnce();
    expect(electron.ipcRenderer.invoke).toHaveBeenCalledWith(channel, ...args);
    expect(electron.ipcRenderer.send).not.toHaveBeenCalled();
    expect(electron.ipcRenderer.sendSync).not.toHaveBeenCalled();
  });

  it('onMenu hands the listener the command only (never the IPC event), and unsubscribes', () => {
    const got: unknown[][] = [];
    const off = (api.onMenu as (l: (c: MenuCommand) => void) => () => void)((...a: unknown[]) => void got.push(a));
    expect(electron.ipcRenderer.on).toHaveBeenCalledWith(IPC.menu, expect.any(Function));
    const [listener] = [...m.listeners.get(IPC.menu)!];
    listener({ sender: 'the IpcRendererEvent', ports: [] }, { command: 'save' });
    expect(got).toEqual([[{ command: 'save' }]]);
    off();
    expect(m.listeners.get(IPC.menu)!.size).toBe(0);
  });
});
