/**
 * `npm start`: opens Waymark on the demo plan.
 * - The desktop window: builds main, preload and renderer, then runs Electron on
 *   dist/main/main.js. When the Electron runtime binary is missing (a normal `npm install` does
 *   not download it), electron's own installer is run once first (app/desktopRuntime.ts).
 * - Browser mode, where the runtime is not there and cannot be downloaded (or WAYMARK_BROWSER=1):
 *   one line says why, then the renderer is built and served on 127.0.0.1 (port from
 *   electron.config.ts, or a free one when it is taken); the URL is printed and it serves until Ctrl-C.
 * Builds are reused while their inputs are unchanged (app/buildCache.ts); the build tools are
 * loaded only when something must be built.
 * `tsx app/start.ts build` only builds (`npm run build`); `tsx app/start.ts serve` forces browser
 * mode. `npm start -- --devtools` (or WAYMARK_DEVTOOLS=1) opens the desktop window with DevTools.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import config from '../electron.config.ts';
import { decideBuild, inputsHash, MAIN_INPUTS, readStamp, RENDERER_INPUTS, writeStamp } from './buildCache.ts';
import { chooseRuntime, nodeRuntimeEnv, type RuntimeChoice } from './desktopRuntime.ts';
import { serveStatic } from './renderer/build/serve.ts';

const repo = fileURLToPath(new URL('..', import.meta.url));
const since = (t0: number) => `${((performance.now() - t0) / 1000).toFixed(1)} s`;

/**
 * The renderer build in dist/renderer, made only when its inputs changed (app/buildCache.ts);
 * vite is imported only then, so a reused build starts without loading the build tools.
 */
async function ensureRenderer(): Promise<string> {
  const outDir = `${repo}${config.build.rendererDir}`;
  const hash = inputsHash(repo, RENDERER_INPUTS);
  const present = existsSync(`${outDir}/index.html`);
  if (decideBuild(present, readStamp(outDir), hash) === 'reuse') return outDir;
  console.log(present ? 'Sources changed: rebuilding the app (about 10 s)…' : 'Building the app (first start, about 10 s)…');
  const t0 = performance.now();
  const { buildRenderer } = await import('./renderer/build/buildRenderer.ts');
  const root = await buildRenderer(); // stamps the build
  console.log(`built the renderer in ${since(t0)}`);
  return root;
}

/** The main-process and preload builds, made only when their inputs changed (stamp beside main.js). */
async function ensureMainAndPreload(): Promise<void> {
  const mainDir = `${repo}${config.build.main.replace(/\/[^/]+$/, '')}`;
  const hash = inputsHash(repo, MAIN_INPUTS);
  const built = existsSync(`${repo}${config.build.main}`) && existsSync(`${repo}${config.build.preload}`);
  if (decideBuild(built, readStamp(mainDir), hash) === 'reuse') return;
  const { buildMainAndPreload } = await import('./main/build.ts');
  await buildMainAndPreload();
  writeStamp(mainDir, hash);
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const mode = args.find((a) => !a.startsWith('-')) ?? 'start';
  const flags = args.filter((a) => a.startsWith('-'));
  if (mode === 'build') {
    // an explicit build always builds (and stamps, so the next start reuses it)
    const [{ buildRenderer }, { buildMainAndPreload }] = await Promise.all([import('./renderer/build/buildRenderer.ts'), import('./main/build.ts')]);
    await buildRenderer(); // stamps the build
    await buildMainAndPreload();
    writeStamp(`${repo}${config.build.main.replace(/\/[^/]+$/, '')}`, inputsHash(repo, MAIN_INPUTS));
    console.log(`built ${config.build.rendererDir}, ${config.build.main}, ${config.build.preload}`);
    return;
  }
  const choice: RuntimeChoice = mode === 'serve' ? { kind: 'browser', reason: 'asked for' } : await chooseRuntime(nodeRuntimeEnv(repo));
  if (choice.kind === 'electron') {
    await ensureRenderer();
    await ensureMainAndPreload();
    // flags after `npm start --` (e.g. --devtools) reach the main process
    const child = spawn(choice.binary, [`${repo}${config.build.main}`, ...flags], { stdio: 'inherit' });
    child.on('exit', (code) => process.exit(code ?? 0));
    return;
  }
  console.log(`Browser mode: ${choice.reason}.`);
  const root = await ensureRenderer();
  const served = await serveStatic({
    root,
    host: config.browserMode.host,
    port: config.browserMode.port,
    contentSecurityPolicy: config.security.contentSecurityPolicy,
  });
  // process.uptime(): from the start of this process (tsx included), not from the first import
  console.log(`ready in ${process.uptime().toFixed(1)} s; the page logs its first 3D frame time in its console`);
  console.log(`Waymark is at ${served.url}  (open it in a browser; Ctrl-C stops)`);
  const stop = () => {
    void served.close().then(() => process.exit(0));
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
