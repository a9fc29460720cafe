/**
 * Builds the command line and the library as plain JavaScript (`npm run build:cli`, also run by
 * `prepack` and `prepare`), so the installed `waymark` and `import 'waymark'` run on plain node:
 *
 * - dist/cli/waymark.js: the command line (app/cli/cli.ts) with every run-time dependency
 *   bundled in (commander, cli-progress, piscina, ajv's run-time helpers);
 * - dist/cli/workers/{porkchop,disperse}Worker.js: the worker-thread bodies, started from these
 *   built files (app/cli/workers/entry.ts picks them when running built);
 * - dist/cli/worker.js: piscina's own worker bootstrap, which piscina loads from beside its
 *   bundled code (built with the bodies, sharing one copy of piscina's worker-side modules);
 * - dist/lib/index.js: the library front door (app/lib/index.ts), and its types under
 *   dist/lib/types/ (tsc declarations).
 *
 * The ajv schema compiler is swapped for validators generated now from assets/schema/ by the
 * renderer's plugin source (app/renderer/build/ajvStandalone.ts `standaloneModuleSource`), so
 * nothing is compiled when a file is read.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build, type BuildOptions, type Plugin } from 'esbuild';
import { standaloneModuleSource } from '../renderer/build/ajvStandalone.ts';

const repo = fileURLToPath(new URL('../..', import.meta.url));
const dist = `${repo}dist`;

/** esbuild plugin: `ajv/dist/2020.js` becomes the precompiled validators of assets/schema/. */
function ajvPrecompiled(): Plugin {
  return {
    name: 'waymark-ajv-precompiled',
    setup(b) {
      b.onResolve({ filter: /^ajv\/dist\/2020(\.js)?$/ }, (args) => {
        // The generated module imports ajv's run-time helpers: resolve them from ajv itself.
        if (args.namespace === 'waymark-ajv') return null;
        return { path: 'ajv-precompiled', namespace: 'waymark-ajv' };
      });
      b.onLoad({ filter: /.*/, namespace: 'waymark-ajv' }, () => ({
        contents: standaloneModuleSource(`${repo}assets/schema`),
        resolveDir: repo,
        loader: 'js',
      }));
    },
  };
}

/**
 * esbuild plugin: in the bundle the program runs from app/cli/cli.ts, so main.ts's own
 * "am I the script node was given" test is turned off (in a bundle every module shares the
 * bundle's import.meta.url, and that test would run the program a second time).
 */
function mainRunsOnce(): Plugin {
  return {
    name: 'waymark-main-runs-once',
    setup(b) {
      b.onLoad({ filter: /app[\\/]cli[\\/]main\.ts$/ }, (args) => {
        const source = readFileSync(args.path, 'utf8');
        const marker = /^const isMain = /m;
        if (!marker.test(source)) throw new Error(`${args.path}: no "const isMain = " line to turn off in the bundle`);
        return { contents: source.replace(marker, 'const isMain = false && '), loader: 'ts' };
      });
    },
  };
}

// Bundled CommonJS (piscina, commander) calls require() and reads __dirname: give ESM both.
const nodeGlobals = [
  "import { createRequire as __waymarkCreateRequire } from 'node:module';",
  "import { fileURLToPath as __waymarkFileURLToPath } from 'node:url';",
  "import { dirname as __waymarkDirname } from 'node:path';",
  'const require = __waymarkCreateRequire(import.meta.url);',
  'const __filename = __waymarkFileURLToPath(import.meta.url);',
  'const __dirname = __waymarkDirname(__filename);',
].join('\n');

const common: BuildOptions = {
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  logLevel: 'warning',
  legalComments: 'none',
  // minified: less for node to parse at every start (WAYMARK_BUILD_PLAIN=1 keeps names, for profiling)
  minify: process.env.WAYMARK_BUILD_PLAIN !== '1',
  // piscina's optional niceness helper (a native module) is looked up at run time and may be absent.
  external: ['@napi-rs/nice'],
  plugins: [ajvPrecompiled(), mainRunsOnce()],
  banner: { js: nodeGlobals },
};

export async function buildCommandLine(): Promise<void> {
  rmSync(`${dist}/cli`, { recursive: true, force: true });
  await build({
    ...common,
    entryPoints: { waymark: `${repo}app/cli/cli.ts` },
    outdir: `${dist}/cli`,
    banner: { js: `#!/usr/bin/env node\n${nodeGlobals}` },
  });
  await build({
    ...common,
    entryPoints: {
      'workers/porkchopWorker': `${repo}app/cli/workers/porkchopWorker.ts`,
      'workers/disperseWorker': `${repo}app/cli/workers/disperseWorker.ts`,
      'workers/calendarWorker': `${repo}app/cli/workers/calendarWorker.ts`,
      worker: join(dirname(createRequire(import.meta.url).resolve('piscina')), 'worker.js'),
    },
    outdir: `${dist}/cli`,
    // One copy of piscina's worker-side modules shared by its bootstrap and the bodies: `move()`
    // marks a result with a symbol private to that copy, which the bootstrap must recognise.
    splitting: true,
    chunkNames: 'workers/shared-[hash]',
  });
}

export async function buildLibrary(): Promise<void> {
  rmSync(`${dist}/lib`, { recursive: true, force: true });
  await build({ ...common, entryPoints: { index: `${repo}app/lib/index.ts` }, outdir: `${dist}/lib` });
  // Types: declarations of the front door and what it names, with import paths ending in .js.
  const tsc = createRequire(import.meta.url).resolve('typescript/bin/tsc');
  execFileSync(process.execPath, [tsc, '-p', `${repo}app/lib/tsconfig.json`], { cwd: repo, stdio: 'inherit' });
  writeFileSync(`${dist}/lib/index.d.ts`, "export * from './types/app/lib/index.js';\n");
}

const isMain = process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1];
if (isMain) {
  const which = process.argv[2] ?? 'all';
  if (which === 'cli' || which === 'all') await buildCommandLine();
  if (which === 'lib' || which === 'all') await buildLibrary();
}
