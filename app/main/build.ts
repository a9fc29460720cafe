/**
 * Builds the Electron main process (ESM, Node target) and the preload script (one CommonJS
 * file, as sandboxed preloads require) with vite's library mode, into the paths named in
 * electron.config.ts. `electron` and Node built-ins stay external.
 */
import { builtinModules } from 'node:module';
import { fileURLToPath } from 'node:url';
import { build } from 'vite';
import config from '../../electron.config.ts';

const repo = fileURLToPath(new URL('../..', import.meta.url));
const external = ['electron', ...builtinModules, ...builtinModules.map((m) => `node:${m}`)];

export async function buildMainAndPreload(): Promise<void> {
  const common = { configFile: false as const, logLevel: 'warn' as const, root: repo };
  await build({
    ...common,
    build: {
      outDir: `${repo}${config.build.main.replace(/\/[^/]+$/, '')}`,
      emptyOutDir: true,
      ssr: true,
      target: 'node20',
      sourcemap: true,
      lib: { entry: `${repo}${config.entries.main}`, formats: ['es'], fileName: () => 'main.js' },
      rollupOptions: { external },
    },
    // ajv (the file validators) is bundled in: the package has no run-time dependencies.
    ssr: { noExternal: true },
  });
  await build({
    ...common,
    build: {
      outDir: `${repo}${config.build.preload.replace(/\/[^/]+$/, '')}`,
      emptyOutDir: true,
      ssr: true,
      target: 'node20',
      sourcemap: true,
      lib: { entry: `${repo}${config.entries.preload}`, formats: ['cjs'], fileName: () => 'preload.cjs' },
      rollupOptions: { external },
    },
  });
}
