/**
 * The host in Electron: every call goes through the preload's narrow `window.waymark` API.
 * Errors from the main process arrive as "Error invoking remote method '<channel>': <Name>:
 * <message>"; the host keeps the message alone, and turns main's refusal to overwrite a file a
 * newer Waymark wrote into a NewerVersionError (so the session can offer Save As).
 */
import type { WaymarkBridge } from '../../preload/api.ts';
import { NEWER_VERSION_RULE } from '../../preload/fileHeader.ts';
import { NewerVersionError, type FileRef, type Host } from './host.ts';

const IPC_PREFIX = /^Error invoking remote method '[^']*': (?:[A-Za-z]*Error: )?/;

/** The error main threw, as the page should show it. */
export function fromMain(err: unknown, fileName: string): Error {
  if (!(err instanceof Error)) return new Error(String(err));
  const message = err.message.replace(IPC_PREFIX, '');
  if (message.includes(NEWER_VERSION_RULE)) return new NewerVersionError(fileName, message);
  if (message === err.message) return err;
  const out = new Error(message);
  out.name = err.name;
  return out;
}

export function createElectronHost(bridge: WaymarkBridge): Host {
  const ref = (f: { path: string; name: string }): FileRef => ({ name: f.name, path: f.path, handle: null });
  const call = async <T>(fileName: string, fn: () => Promise<T>): Promise<T> => {
    try {
      return await fn();
    } catch (err) {
      throw fromMain(err, fileName);
    }
  };
  return {
    kind: 'electron',
    async openPlan() {
      const f = await call('the plan', () => bridge.openDialog());
      return f ? { ref: ref(f), text: f.text } : null;
    },
    async openSystem() {
      const f = await call('the system file', () => bridge.openSystemDialog());
      return f ? { ref: ref(f), text: f.text } : null;
    },
    async readSystemBeside(plan, relativePath) {
      if (!plan.path) return null;
      return (await call(relativePath, () => bridge.readSystemBeside(plan.path!, relativePath))).text;
    },
    async recentFiles() {
      return (await call('the recent list', () => bridge.recentList())).map((r) => ({ key: r.path, name: r.name, at: r.at }));
    },
    async openRecent(key) {
      const f = await call(key, () => bridge.openRecent(key));
      return { ref: ref(f), text: f.text };
    },
    async save(target, text) {
      if (!target.path) return this.saveAs(target.name, text);
      return ref(await call(target.name, () => bridge.save(target.path!, text)));
    },
    async saveAs(suggestedName, text) {
      const f = await call(suggestedName, () => bridge.saveAs(suggestedName, text));
      return f ? ref(f) : null;
    },
    async exportFile(kind, suggestedName, text) {
      return (await call(suggestedName, () => bridge.exportFile(kind, suggestedName, text))) !== null;
    },
    readRecovery: () => call('the recovery copy', () => bridge.recoveryRead()),
    writeRecovery: (s) => call('the recovery copy', () => bridge.recoveryWrite(s)),
    clearRecovery: () => call('the recovery copy', () => bridge.recoveryClear()),
    setDocumentState(title, dirty) {
      void bridge.setDocumentState({ title, dirty }).catch(() => undefined);
    },
    closeConfirmed: () => bridge.closeConfirmed(),
    onCommand: (listener) => bridge.onMenu(listener),
  };
}
