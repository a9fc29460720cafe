/**
 * Preload script (sandboxed): exposes the narrow `window.waymark` API through contextBridge.
 * Each method forwards to one IPC channel; nothing else of Electron or Node reaches the page.
 * The build bundles this file (with api.ts) into one CommonJS file, as sandboxed preloads need.
 */
import { contextBridge, ipcRenderer, type IpcRendererEvent } from 'electron';
import { IPC, type MenuCommand, type WaymarkBridge } from './api.ts';

const bridge: WaymarkBridge = {
  kind: 'electron',
  openDialog: () => ipcRenderer.invoke(IPC.openDialog),
  openRecent: (path) => ipcRenderer.invoke(IPC.openRecent, path),
  openSystemDialog: () => ipcRenderer.invoke(IPC.openSystemDialog),
  readSystemBeside: (planPath, relativePath) => ipcRenderer.invoke(IPC.readSystemBeside, planPath, relativePath),
  save: (path, text) => ipcRenderer.invoke(IPC.save, path, text),
  saveAs: (suggestedName, text) => ipcRenderer.invoke(IPC.saveAs, suggestedName, text),
  exportFile: (kind, suggestedName, text) => ipcRenderer.invoke(IPC.exportFile, kind, suggestedName, text),
  recentList: () => ipcRenderer.invoke(IPC.recentList),
  recoveryRead: () => ipcRenderer.invoke(IPC.recoveryRead),
  recoveryWrite: (snapshot) => ipcRenderer.invoke(IPC.recoveryWrite, snapshot),
  recoveryClear: () => ipcRenderer.invoke(IPC.recoveryClear),
  setDocumentState: (state) => ipcRenderer.invoke(IPC.documentState, state),
  closeConfirmed: () => ipcRenderer.invoke(IPC.closeConfirmed),
  onMenu(listener) {
    // The page never sees the IpcRendererEvent (it would carry the sender).
    const wrapped = (_event: IpcRendererEvent, command: MenuCommand) => listener(command);
    ipcRenderer.on(IPC.menu, wrapped);
    return () => {
      ipcRenderer.removeListener(IPC.menu, wrapped);
    };
  },
};

contextBridge.exposeInMainWorld('waymark', bridge);
