/**
 * `npm start`: opens Waymark on the demo plan.
 * - The desktop window: builds main, preload and renderer, then runs Electron on
 *   dist/main/main.js. When the Electron runtime binary is missing (a normal `npm install` does
 *   not download it), electron's own installer is run once first (app/desktopRuntime.ts).
 * - Browser mode, where the runtime is not there and cannot be downloaded (or WAYMARK_BROWSER=1):
 *   one line says why, then the renderer is built and served on 127.0.0.1 (port from
 *   electron.config.ts, or a free one when it is taken); the URL is printed and it serves until Ctrl-C.
 * `tsx app/start.ts build` only builds (`npm run build`); `tsx app/start.ts serve` forces browser
 * mode. `npm start -- --devtools` (or WAYMARK_DEVTOOLS=1) opens the desktop window with DevTools.
 */
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import config from '../electron.config.ts';
import { chooseRuntime, nodeRuntimeEnv, type RuntimeChoice } from './desktopRuntime.ts';
import { buildMainAndPreload } from './main/build.ts';
import { buildRenderer } from './renderer/build/buildRenderer.ts';
import { serveStatic } from './renderer/build/serve.ts';

const repo = fileURLToPath(new URL('..', import.meta.url));

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const mode = args.find((a) => !a.startsWith('-')) ?? 'start';
  const flags = args.filter((a) => a.startsWith('-'));
  if (mode === 'build') {
    await buildRenderer();
    await buildMainAndPreload();
    console.log(`built ${config.build.rendererDir}, ${config.build.main}, ${config.build.preload}`);
    return;
  }
  const choice: RuntimeChoice = mode === 'serve' ? { kind: 'browser', reason: 'asked for' } : await chooseRuntime(nodeRuntimeEnv(repo));
  if (choice.kind === 'electron') {
    await buildRenderer();
    await buildMainAndPreload();
    // flags after `npm start --` (e.g. --devtools) reach the main process
    const child = spawn(choice.binary, [`${repo}${config.build.main}`, ...flags], { stdio: 'inherit' });
    child.on('exit', (code) => process.exit(code ?? 0));
    return;
  }
  console.log(`Browser mode: ${choice.reason}.`);
  const t0 = performance.now();
  const root = await buildRenderer();
  const served = await serveStatic({
    root,
    host: config.browserMode.host,
    port: config.browserMode.port,
    contentSecurityPolicy: config.security.contentSecurityPolicy,
  });
  console.log(`built the renderer in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
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
