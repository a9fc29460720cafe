/**
 * Shared setup of the end-to-end suites: the built renderer served in browser mode (with the
 * app's Content-Security-Policy as a header, as Electron's app scheme sends it) and driven in
 * Debian's headless chromium (software WebGL) through playwright-core.
 *
 * Each suite may build into its own folder (`outDir`), so suites running in parallel never
 * build over each other's files; the default is the renderer's own dist/renderer.
 */
import { existsSync, mkdirSync } from 'node:fs';
import { chromium, type Browser, type BrowserContext, type BrowserContextOptions, type Page } from 'playwright-core';
import { build } from 'vite';
import config from '../../electron.config.ts';
import { buildRenderer } from '../../app/renderer/build/buildRenderer.ts';
import { serveStatic, type Served } from '../../app/renderer/build/serve.ts';
import { rendererConfig } from '../../app/renderer/vite.config.ts';

export const CHROMIUM = '/usr/bin/chromium';
export const ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];
/** Screenshots and files the suites write. */
export const OUT = new URL('../output/e2e/', import.meta.url).pathname;
export const haveChromium = existsSync(CHROMIUM);
/**
 * How long a wait for the page may last before the test gives up: a hang guard only, never a
 * speed check (the work each wait covers is fixed by the test), so it is far above what any
 * machine needs and below the test runner's own timeout (test/vitest.config.ts).
 */
export const HANG_GUARD_MS = 240_000;

/** True when chromium is there; in CI a missing chromium is an error, elsewhere the suite is skipped with a warning. */
export function requireChromium(): boolean {
  if (!haveChromium && process.env.CI) throw new Error(`${CHROMIUM} is missing: CI must install Debian chromium (apt-get install -y chromium)`);
  if (!haveChromium) console.warn(`e2e skipped: ${CHROMIUM} not found (apt-get install -y chromium); in CI this fails instead`);
  return haveChromium;
}

/** Builds the renderer: into dist/renderer (no `outDir`) or into `outDir`. Returns the folder. */
export async function buildApp(outDir?: string): Promise<string> {
  if (!outDir) return buildRenderer();
  const c = rendererConfig();
  await build({ ...c, build: { ...c.build, outDir, emptyOutDir: true } });
  return outDir;
}

export interface E2eApp {
  served: Served;
  browser: Browser;
  /** Page errors and console errors seen so far, over every page opened. */
  pageErrors: string[];
  /** A new context and page on the app, loaded and ready (the budget table shown), with the page's own errors. */
  openPage(options?: BrowserContextOptions): Promise<{ context: BrowserContext; page: Page; errors: string[] }>;
  close(): Promise<void>;
}

/** Serves `root`, launches chromium; `openPage` gives ready pages. */
export async function startApp(root: string): Promise<E2eApp> {
  mkdirSync(OUT, { recursive: true });
  const served = await serveStatic({ root, host: '127.0.0.1', port: 0, contentSecurityPolicy: config.security.contentSecurityPolicy });
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ARGS });
  const pageErrors: string[] = [];
  return {
    served,
    browser,
    pageErrors,
    async openPage(options = {}) {
      const context = await browser.newContext({ viewport: { width: 1440, height: 900 }, acceptDownloads: true, ...options });
      // Use the <input type=file> picker and downloads (the File System Access pickers are native dialogs).
      await context.addInitScript('delete window.showOpenFilePicker; delete window.showSaveFilePicker;');
      const page = await context.newPage();
      const errors: string[] = [];
      const record = (text: string) => {
        errors.push(text);
        pageErrors.push(text);
      };
      page.on('pageerror', (e) => record(e.message));
      page.on('console', (m) => {
        if (m.type() === 'error') record(m.text());
      });
      await page.goto(served.url);
      await page.waitForSelector('[data-testid=budget-table] tbody tr.row', { timeout: HANG_GUARD_MS });
      return { context, page, errors };
    },
    async close() {
      await browser.close();
      await served.close();
    },
  };
}

/** Opens a plan file through File → Open and the page's file picker. */
export async function openFile(page: Page, path: string): Promise<void> {
  await page.click('[data-testid=menu-file]');
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.click('[data-action=open]')]);
  await chooser.setFiles(path);
}
