/**
 * The recovery copy restores unsaved edits after a crash, through both hosts end to end:
 * - the browser host over one localStorage (a reload of the tab);
 * - the Electron host over the real main-process handlers and recovery file on disk (the
 *   bridge calls createIpcHandlers as the preload would, with Electron's error wrapping).
 * Each case: edits, autosave writes the copy (the session's own timer), the session is dropped
 * without closing or saving (the "crash"), a new session starts over the same storage, offers
 * the copy, and recovering gives the edits back intact; declining discards it for good.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, afterEach, describe, expect, it, vi } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { createDiskFiles } from '../../../../app/main/diskFiles.ts';
import { createIpcHandlers, createRecoveryStore, type Handler } from '../../../../app/main/ipcHandlers.ts';
import { createRecentStore } from '../../../../app/main/recentFiles.ts';
import { atomicWriteFile } from '../../../../app/node/files.ts';
import { IPC, type WaymarkBridge } from '../../../../app/preload/api.ts';
import { createBrowserHost, STORAGE_KEYS, type BrowserEnv } from '../../../../app/renderer/host/browserHost.ts';
import { createElectronHost } from '../../../../app/renderer/host/electronHost.ts';
import type { Host } from '../../../../app/renderer/host/host.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';
import { Session } from '../../../../app/renderer/state/session.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const demoText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');
const work = mkdtempSync(join(tmpdir(), 'waymark-recovery-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const live: Session[] = [];
afterEach(() => {
  for (const s of live.splice(0)) s.stopAutosave();
});

async function start(host: Host, autosaveMs = 0): Promise<Session> {
  const s = await Session.create({
    host,
    evaluate: (sys, plan) => evaluate(sys, plan),
    bundledSystems: { 'ilmar.system.json': systemText },
    demo: { name: 'tessel-to-ochre.plan.json', text: demoText },
    ask: async () => 'cancel',
    autosaveMs,
  });
  live.push(s);
  return s;
}

/** The process dies: its timer stops with it; nothing is saved, closed or cleared. */
function crash(s: Session): void {
  s.stopAutosave();
}

/** Edits a designer might make: rename, add a burn, change the reserve. */
function makeEdits(s: Session): void {
  s.doc.edit('Rename', (p) => edits.setPlanInfo(p, { name: 'Unsaved <work> & edits' }));
  s.doc.edit('Add burn', (p) => edits.addEvent(p, 'burn'));
  s.doc.edit('Reserve', (p) => edits.setReserve(p, { percent: 7.5 }));
}

const offerOf = (s: Session) => s.notices.get().find((n) => n.title === 'Unsaved work was found');
async function choose(s: Session, label: string): Promise<void> {
  const offer = offerOf(s)!;
  s.dismiss(offer.id); // as the notice does before running the action
  await offer.actions!.find((a) => a.label === label)!.run();
}

// ---------------------------------------------------------------- browser host

function memoryStorage() {
  const m = new Map<string, string>();
  return { m, getItem: (k: string) => m.get(k) ?? null, setItem: (k: string, v: string) => void m.set(k, v), removeItem: (k: string) => void m.delete(k) };
}

function browserHost(storage: ReturnType<typeof memoryStorage>): Host {
  const env: BrowserEnv = {
    storage,
    pickFile: async () => null,
    download: () => undefined,
    fsAccess: null,
    setTitle: () => undefined,
    onBeforeUnload: () => undefined,
    now: () => 1_700_000_000_000,
  };
  return createBrowserHost(env);
}

describe('recovery after a crash — browser host (localStorage)', () => {
  it('autosave writes the copy on its timer; a reload offers it; Recover gives the edits back intact', async () => {
    vi.useFakeTimers();
    try {
      const storage = memoryStorage();
      const s1 = await start(browserHost(storage), 4000);
      makeEdits(s1);
      const edited = structuredClone(s1.doc.get().plan);
      expect(storage.m.has(STORAGE_KEYS.recovery)).toBe(false);
      await vi.advanceTimersByTimeAsync(4000);
      expect(JSON.parse(storage.m.get(STORAGE_KEYS.recovery)!).name).toBe('tessel-to-ochre.plan.json');
      crash(s1);

      const s2 = await start(browserHost(storage), 4000);
      expect(s2.doc.get().plan.name).toBe('Long Patience to Ochre'); // the demo, until the user chooses
      const offer = offerOf(s2)!;
      expect(offer.sticky).toBe(true);
      expect(offer.actions!.map((a) => a.label)).toEqual(['Recover it', 'Discard it']);
      await choose(s2, 'Recover it');
      expect(s2.doc.get().plan).toEqual(edited);
      expect(s2.doc.get().dirty).toBe(true);
      expect(s2.doc.get().name).toBe('tessel-to-ochre.plan.json');
    } finally {
      vi.useRealTimers();
    }
  });

  it('Discard removes the copy: the next start offers nothing', async () => {
    const storage = memoryStorage();
    const s1 = await start(browserHost(storage));
    makeEdits(s1);
    await s1.autosave();
    crash(s1);
    const s2 = await start(browserHost(storage));
    await choose(s2, 'Discard it');
    expect(storage.m.has(STORAGE_KEYS.recovery)).toBe(false);
    expect(s2.doc.get().plan.name).toBe('Long Patience to Ochre');
    const s3 = await start(browserHost(storage));
    expect(offerOf(s3)).toBeUndefined();
  });

  it('until the offer is answered, new edits, New and Save do not replace or remove the older copy', async () => {
    const storage = memoryStorage();
    const s1 = await start(browserHost(storage));
    makeEdits(s1);
    await s1.autosave();
    const copy = storage.m.get(STORAGE_KEYS.recovery);
    crash(s1);
    const s2 = await start(browserHost(storage));
    expect(s2.recoveryPending).toBe(true);
    s2.doc.edit('Other edit', (p) => edits.setPlanInfo(p, { name: 'Something else' }));
    await s2.autosave();
    expect(storage.m.get(STORAGE_KEYS.recovery)).toBe(copy);
    await s2.save(); // the demo has no file: a download
    expect(storage.m.get(STORAGE_KEYS.recovery)).toBe(copy);
    await s2.newPlan();
    expect(storage.m.get(STORAGE_KEYS.recovery)).toBe(copy);
    await choose(s2, 'Recover it');
    expect(s2.recoveryPending).toBe(false);
    expect(s2.doc.get().plan.name).toBe('Unsaved <work> & edits');
    // Answered: autosave works again (the recovered, still unsaved plan).
    s2.doc.edit('More', (p) => edits.setReserve(p, { percent: 9 }));
    await s2.autosave();
    expect(storage.m.get(STORAGE_KEYS.recovery)).not.toBe(copy);
  });
});

// ---------------------------------------------------------------- Electron host over the main process

const APP = 'waymark://app/index.html';

/** A fresh main process (its handlers) over the user-data folder `userData`. */
function mainProcess(userData: string): Record<string, Handler> {
  const files = createDiskFiles(); // the main process's own file access
  return createIpcHandlers({
    dialogs: { showOpen: async () => null, showSave: async () => null },
    files,
    recent: createRecentStore(join(userData, 'recent.json'), files),
    recovery: createRecoveryStore(join(userData, 'recovery.json'), files),
    window: { setDocumentState: () => undefined, closeConfirmed: () => undefined },
    isTrustedSender: (url) => url === APP,
  });
}

/** The preload's bridge over the handlers, with Electron's wrapping of errors thrown in main. */
function bridgeTo(h: Record<string, Handler>): WaymarkBridge {
  const invoke = async (channel: string, ...args: unknown[]): Promise<never> => {
    try {
      return (await h[channel]({ url: APP, topFrame: true }, ...structuredClone(args))) as never;
    } catch (err) {
      const e = err as Error;
      throw new Error(`Error invoking remote method '${channel}': ${e.name}: ${e.message}`);
    }
  };
  return {
    kind: 'electron',
    openDialog: () => invoke(IPC.openDialog),
    openRecent: (p) => invoke(IPC.openRecent, p),
    openSystemDialog: () => invoke(IPC.openSystemDialog),
    readSystemBeside: (p, r) => invoke(IPC.readSystemBeside, p, r),
    save: (p, t) => invoke(IPC.save, p, t),
    saveAs: (n, t) => invoke(IPC.saveAs, n, t),
    exportFile: (k, n, t) => invoke(IPC.exportFile, k, n, t),
    recentList: () => invoke(IPC.recentList),
    recoveryRead: () => invoke(IPC.recoveryRead),
    recoveryWrite: (s) => invoke(IPC.recoveryWrite, s),
    recoveryClear: () => invoke(IPC.recoveryClear),
    setDocumentState: (s) => invoke(IPC.documentState, s),
    closeConfirmed: () => invoke(IPC.closeConfirmed),
    onMenu: () => () => undefined,
  };
}

let n = 0;
const userDataDir = () => mkdtempSync(join(work, `user-${n++}-`));

describe('recovery after a crash — Electron host, main process, recovery file on disk', () => {
  it('autosave writes <userData>/recovery.json; a restarted app offers it; Recover gives the edits back intact', async () => {
    const userData = userDataDir();
    const file = join(userData, 'recovery.json');
    const s1 = await start(createElectronHost(bridgeTo(mainProcess(userData))), 20);
    makeEdits(s1);
    const edited = structuredClone(s1.doc.get().plan);
    // the timeout is a hang guard: the autosave is due after 20 ms of idle
    await vi.waitFor(() => expect(existsSync(file)).toBe(true), { timeout: 240_000, interval: 10 });
    crash(s1);
    const onDisk = JSON.parse(readFileSync(file, 'utf8'));
    expect(onDisk).toMatchObject({ name: 'tessel-to-ochre.plan.json', path: null });
    expect(onDisk.text).toContain('Unsaved <work> & edits');

    // A new main process and a new page over the same user-data folder.
    const s2 = await start(createElectronHost(bridgeTo(mainProcess(userData))));
    expect(offerOf(s2)?.detail).toMatch(/tessel-to-ochre\.plan\.json, autosaved .*, was not saved before the app closed/);
    await choose(s2, 'Recover it');
    expect(s2.doc.get().plan).toEqual(edited);
    expect(s2.doc.get().dirty).toBe(true);
    // The recovered copy has no path: saving it asks where (Save As), it never writes blindly.
    expect(s2.doc.get().file?.path ?? null).toBeNull();
  });

  it('Discard deletes the recovery file: the next start offers nothing', async () => {
    const userData = userDataDir();
    const file = join(userData, 'recovery.json');
    const s1 = await start(createElectronHost(bridgeTo(mainProcess(userData))));
    makeEdits(s1);
    await s1.autosave();
    expect(existsSync(file)).toBe(true);
    crash(s1);
    const s2 = await start(createElectronHost(bridgeTo(mainProcess(userData))));
    await choose(s2, 'Discard it');
    expect(existsSync(file)).toBe(false);
    const s3 = await start(createElectronHost(bridgeTo(mainProcess(userData))));
    expect(offerOf(s3)).toBeUndefined();
  });

  it('a recovery file damaged on disk is not offered (and does not stop the app)', async () => {
    const userData = userDataDir();
    const s1 = await start(createElectronHost(bridgeTo(mainProcess(userData))));
    makeEdits(s1);
    await s1.autosave();
    crash(s1);
    const file = join(userData, 'recovery.json');
    const text = readFileSync(file, 'utf8');
    await atomicWriteFile(file, text.slice(0, Math.floor(text.length / 2)), { backup: false });
    const s2 = await start(createElectronHost(bridgeTo(mainProcess(userData))));
    expect(offerOf(s2)).toBeUndefined();
    expect(s2.doc.get().plan.name).toBe('Long Patience to Ochre');
  });
});
