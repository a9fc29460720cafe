/**
 * Electron main process: one window, the native menu, dialogs and file IO. Thin on purpose:
 * the document, its evaluation and every view live in the renderer; main only does what a
 * sandboxed page cannot (native dialogs, disk), through the validated handlers of
 * ipcHandlers.ts. Security switches come from electron.config.ts (see security.ts).
 *
 * Built by app/main/build.ts into dist/main/main.js (ESM); the preload goes to
 * dist/preload/preload.cjs and the renderer to dist/renderer/.
 */
import { app, BrowserWindow, dialog, ipcMain, Menu, protocol, session } from 'electron';
import { mkdir, readFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import config from '../../electron.config.ts';
import { createDiskFiles } from './diskFiles.ts';
import { IPC, type MenuCommand } from '../preload/api.ts';
import { createCloseGuard } from './closeGuard.ts';
import { createIpcHandlers, createRecoveryStore } from './ipcHandlers.ts';
import { menuTemplate } from './menuTemplate.ts';
import { createRecentStore } from './recentFiles.ts';
import { createAppProtocolHandler } from './appProtocol.ts';
import { APP_INDEX_URL, APP_SCHEME, devToolsWanted, lockDownContents, lockDownSession, trustedSender, webPreferences } from './security.ts';

const here = dirname(fileURLToPath(import.meta.url)); // dist/main
const rendererDir = join(here, '..', 'renderer');
const preloadPath = join(here, '..', 'preload', 'preload.cjs');

app.enableSandbox();
// The renderer is served from a privileged app scheme rather than file:// (module workers and
// a real origin; the Electron security checklist's advice), with the CSP on every response.
protocol.registerSchemesAsPrivileged([{ scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true } }]);

let win: BrowserWindow | null = null;

// Reads of regular files only, size-capped, strict UTF-8 and timed out; guarded atomic saves (diskFiles.ts).
const files = createDiskFiles();

function send(command: MenuCommand): void {
  win?.webContents.send(IPC.menu, command);
}

async function rebuildMenu(): Promise<void> {
  const recentList = await recent.list();
  Menu.setApplicationMenu(Menu.buildFromTemplate(menuTemplate({ platform: process.platform, appName: config.window.title, recent: recentList, send })));
}

const recentStore = createRecentStore(join(app.getPath('userData'), 'recent.json'), files);
// Every change of the list rebuilds Open Recent.
const recent = {
  ...recentStore,
  add: async (path: string, at?: number) => {
    const list = await recentStore.add(path, at);
    void rebuildMenu();
    return list;
  },
};

const guard = createCloseGuard({
  ask(title) {
    if (!win) return 'discard';
    const choice = dialog.showMessageBoxSync(win, {
      type: 'question',
      buttons: ['Save', "Don't Save", 'Cancel'],
      defaultId: 0,
      cancelId: 2,
      message: `Save the changes to ${title.replace(/ — .*$/, '')} before closing?`,
      detail: 'Your changes are lost if you do not save them.',
    });
    return choice === 0 ? 'save' : choice === 1 ? 'discard' : 'cancel';
  },
  requestSaveAndClose: () => send({ command: 'save-and-close' }),
  forceClose: () => win?.close(),
});

const handlers = createIpcHandlers({
  dialogs: {
    async showOpen(filters) {
      if (!win) return null;
      const r = await dialog.showOpenDialog(win, { properties: ['openFile'], filters });
      return r.canceled || r.filePaths.length === 0 ? null : r.filePaths[0];
    },
    async showSave(defaultName, filters) {
      if (!win) return null;
      const r = await dialog.showSaveDialog(win, { defaultPath: defaultName, filters, properties: ['createDirectory', 'showOverwriteConfirmation'] });
      return r.canceled || !r.filePath ? null : r.filePath;
    },
  },
  files,
  recent,
  recovery: createRecoveryStore(join(app.getPath('userData'), 'recovery.json'), files),
  window: {
    setDocumentState(state) {
      guard.setState(state.title, state.dirty);
      win?.setTitle(state.title);
      win?.setDocumentEdited(state.dirty);
    },
    closeConfirmed: () => guard.confirm(),
  },
  isTrustedSender: trustedSender(APP_INDEX_URL),
});

function createWindow(): void {
  const w = config.window;
  win = new BrowserWindow({
    width: w.width,
    height: w.height,
    minWidth: w.minWidth,
    minHeight: w.minHeight,
    backgroundColor: w.backgroundColor,
    title: w.title,
    show: false,
    // DevTools only when asked for (--devtools or WAYMARK_DEVTOOLS=1) in a run from a checkout; never packaged.
    webPreferences: webPreferences(config, preloadPath, { devTools: devToolsWanted(app.isPackaged, process.argv, process.env) }),
  });
  win.once('ready-to-show', () => win?.show());
  win.on('close', (e) => {
    if (guard.onClose()) e.preventDefault();
  });
  win.on('closed', () => {
    win = null;
  });
  void win.loadURL(APP_INDEX_URL);
}

// No navigation away from the app, no new windows, no webviews, for every web contents.
app.on('web-contents-created', (_e, contents) => lockDownContents(contents));

void app.whenReady().then(async () => {
  await mkdir(app.getPath('userData'), { recursive: true });
  protocol.handle(
    APP_SCHEME,
    createAppProtocolHandler(rendererDir, (p) => readFile(p), config.security.contentSecurityPolicy),
  );
  lockDownSession(session.defaultSession, config.security.contentSecurityPolicy);
  for (const [channel, handler] of Object.entries(handlers)) {
    // The sending frame: its URL must be the app's page, and it must be the top frame (parent null).
    ipcMain.handle(channel, (event, ...args: unknown[]) =>
      handler({ url: event.senderFrame?.url ?? '', topFrame: event.senderFrame?.parent === null }, ...args),
    );
  }
  await rebuildMenu();
  createWindow();
  app.on('activate', () => {
    if (BrowserWindow.getAllWindows().length === 0) createWindow();
  });
});

app.on('window-all-closed', () => {
  if (process.platform !== 'darwin') app.quit();
});
