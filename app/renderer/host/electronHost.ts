/** The host in Electron: every call goes through the preload's narrow `window.waymark` API. */
import type { WaymarkBridge } from '../../preload/api.ts';
import type { FileRef, Host } from './host.ts';

export function createElectronHost(bridge: WaymarkBridge): Host {
  const ref = (f: { path: string; name: string }): FileRef => ({ name: f.name, path: f.path, handle: null });
  return {
    kind: 'electron',
    async openPlan() {
      const f = await bridge.openDialog();
      return f ? { ref: ref(f), text: f.text } : null;
    },
    async openSystem() {
      const f = await bridge.openSystemDialog();
      return f ? { ref: ref(f), text: f.text } : null;
    },
    async readSystemBeside(plan, relativePath) {
      if (!plan.path) return null;
      return (await bridge.readSystemBeside(plan.path, relativePath)).text;
    },
    async recentFiles() {
      return (await bridge.recentList()).map((r) => ({ key: r.path, name: r.name, at: r.at }));
    },
    async openRecent(key) {
      const f = await bridge.openRecent(key);
      return { ref: ref(f), text: f.text };
    },
    async save(target, text) {
      if (!target.path) return this.saveAs(target.name, text);
      return ref(await bridge.save(target.path, text));
    },
    async saveAs(suggestedName, text) {
      const f = await bridge.saveAs(suggestedName, text);
      return f ? ref(f) : null;
    },
    async exportFile(kind, suggestedName, text) {
      return (await bridge.exportFile(kind, suggestedName, text)) !== null;
    },
    readRecovery: () => bridge.recoveryRead(),
    writeRecovery: (s) => bridge.recoveryWrite(s),
    clearRecovery: () => bridge.recoveryClear(),
    setDocumentState(title, dirty) {
      void bridge.setDocumentState({ title, dirty });
    },
    closeConfirmed: () => bridge.closeConfirmed(),
    onCommand: (listener) => bridge.onMenu(listener),
  };
}
