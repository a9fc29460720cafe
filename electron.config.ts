/**
 * Run and build settings of the Waymark desktop app: entry points, window defaults and the
 * security switches the main process applies. The build and the main process read this file;
 * it has no Electron import so it can be checked and tested where the Electron runtime is absent.
 */
export interface WaymarkElectronConfig {
  entries: { main: string; preload: string; renderer: string };
  window: { width: number; height: number; minWidth: number; minHeight: number; backgroundColor: string; title: string };
  security: {
    contextIsolation: true;
    nodeIntegration: false;
    sandbox: true;
    webSecurity: true;
    allowNavigation: false;
    allowNewWindows: false;
    contentSecurityPolicy: string;
  };
  /** Host and port of browser mode, used where the Electron runtime is not installed. */
  browserMode: { host: string; port: number };
  /** Build outputs, relative to the repository root (all under the gitignored dist/). */
  build: { outDir: string; main: string; preload: string; rendererDir: string };
  /** Files and safety of work. */
  files: {
    /** Autosave of unsaved work to the recovery file, every this many ms. */
    autosaveIntervalMs: number;
    /** Length of the recent-files list. */
    recentLimit: number;
    /** The demo the app opens on first start (relative to the repository root). */
    demoSystem: string;
    demoPlan: string;
  };
}

const config: WaymarkElectronConfig = {
  entries: {
    main: 'app/main/main.ts',
    preload: 'app/preload/preload.ts',
    renderer: 'app/renderer/index.html',
  },
  window: { width: 1440, height: 900, minWidth: 1024, minHeight: 640, backgroundColor: '#0f1416', title: 'Waymark' },
  security: {
    contextIsolation: true,
    nodeIntegration: false,
    sandbox: true,
    webSecurity: true,
    allowNavigation: false,
    allowNewWindows: false,
    contentSecurityPolicy:
      "default-src 'self'; script-src 'self'; style-src 'self' 'unsafe-inline'; img-src 'self' data: blob:; worker-src 'self' blob:; connect-src 'self'; object-src 'none'; frame-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'",
  },
  browserMode: { host: '127.0.0.1', port: 5317 },
  build: { outDir: 'dist', main: 'dist/main/main.js', preload: 'dist/preload/preload.cjs', rendererDir: 'dist/renderer' },
  files: {
    autosaveIntervalMs: 4000,
    recentLimit: 10,
    demoSystem: 'assets/systems/ilmar.system.json',
    demoPlan: 'assets/plans/tessel-to-ochre.plan.json',
  },
};

export default config;
