/**
 * `npm start`: opens Waymark on the demo plan.
 * - Where Electron's runtime binary is installed: builds main, preload and renderer, then runs
 *   Electron on dist/main/main.js.
 * - Otherwise (browser mode, as on build machines): builds the renderer, serves dist/renderer on
 *   127.0.0.1 (port from electron.config.ts, or a free one when it is taken), prints the URL and
 *   keeps serving until Ctrl-C.
 * `tsx app/start.ts build` only builds (`npm run build`); `tsx app/start.ts serve` forces browser mode.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';
import config from '../electron.config.ts';
import { buildMainAndPreload } from './main/build.ts';
import { buildRenderer } from './renderer/build/buildRenderer.ts';
import { serveStatic } from './renderer/build/serve.ts';

const repo = fileURLToPath(new URL('..', import.meta.url));

/** Path of the Electron runtime binary, or null when it is not installed. */
export function electronBinary(): string | null {
  try {
    const p = createRequire(import.meta.url)('electron') as unknown;
    return typeof p === 'string' && existsSync(p) ? p : null;
  } catch {
    return null;
  }
}

async function main(): Promise<void> {
  const mode = process.argv[2] ?? 'start';
  if (mode === 'build') {
    await buildRenderer();
    await buildMainAndPreload();
    console.log(`built ${config.build.rendererDir}, ${config.build.main}, ${config.build.preload}`);
    return;
  }
  const electron = mode === 'serve' ? null : electronBinary();
  if (electron) {
    await buildRenderer();
    await buildMainAndPreload();
    const child = spawn(electron, [`${repo}${config.build.main}`], { stdio: 'inherit' });
    child.on('exit', (code) => process.exit(code ?? 0));
    return;
  }
  console.log('Electron runtime not installed: running in browser mode.');
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
