/**
 * `npm run package`: the desktop app as a folder ready to run, per platform, under release/
 * (@electron/packager): builds main, preload and renderer into dist/, then packs dist/, the
 * package.json (its `main` names dist/main/main.js) into an asar archive beside the Electron
 * runtime. The package has no production dependencies (the main process bundles ajv:
 * app/main/build.ts), so packager's pruning leaves no node_modules.
 * The packaged app has no DevTools (app.isPackaged; app/main/security.ts).
 *
 * Packager downloads the Electron runtime for the target platform when it runs (from electron's
 * release host, or ELECTRON_MIRROR): packaging needs the network and is not part of CI;
 * installing packager downloads nothing. Options: `--platform linux|darwin|win32`, `--arch x64|arm64`
 * (default: this machine's).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { Options } from '@electron/packager';
import config from '../electron.config.ts';

const repo = fileURLToPath(new URL('..', import.meta.url));

/**
 * Whether a path of the repository (relative, with a leading '/'; '' for the root) goes into
 * the package: the built app, its package.json and node_modules (which packager prunes to the
 * production dependencies). Sources, tests, assets and release/ stay out.
 */
export function inPackage(path: string): boolean {
  return path === '' || path === '/package.json' || /^\/dist(\/(main|preload|renderer)(\/.*)?)?$/.test(path) || /^\/node_modules(\/.*)?$/.test(path);
}

/** The packager's options for this repository (`pkg`: its package.json). */
export function packagerOptions(
  root: string,
  pkg: { version: string; main?: string; devDependencies: Record<string, string> },
  target: { platform?: string; arch?: string } = {},
): Options {
  if (pkg.main !== config.build.main)
    throw new Error(`package.json "main" must be "${config.build.main}" (the built main process), not ${JSON.stringify(pkg.main)}`);
  return {
    dir: root,
    out: join(root, 'release'),
    name: config.window.title,
    executableName: 'waymark',
    appVersion: pkg.version,
    electronVersion: pkg.devDependencies.electron,
    ...(target.platform ? { platform: target.platform as Options['platform'] } : {}),
    ...(target.arch ? { arch: target.arch as Options['arch'] } : {}),
    asar: true,
    prune: true,
    overwrite: true,
    ignore: (path: string) => !inPackage(path),
  };
}

function flag(args: string[], name: string): string | undefined {
  const k = args.indexOf(name);
  return k >= 0 ? args[k + 1] : undefined;
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const pkg = JSON.parse(readFileSync(join(repo, 'package.json'), 'utf8')) as Parameters<typeof packagerOptions>[1];
  const options = packagerOptions(repo, pkg, { platform: flag(args, '--platform'), arch: flag(args, '--arch') });
  const { buildMainAndPreload } = await import('./main/build.ts');
  const { buildRenderer } = await import('./renderer/build/buildRenderer.ts');
  await buildRenderer();
  await buildMainAndPreload();
  const { packager } = await import('@electron/packager');
  const paths = await packager(options);
  for (const p of paths) console.log(`packaged ${p}`);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  main().catch((err: unknown) => {
    console.error(`packaging failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  });
}
