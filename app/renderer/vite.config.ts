/**
 * Vite build of the renderer (Svelte 5). Root is app/renderer; output goes to dist/renderer at
 * the repository root. `base: './'` keeps asset URLs relative so Electron can load the build
 * from disk and browser mode can serve it from any path.
 */
import { fileURLToPath } from 'node:url';
import { defineConfig, type InlineConfig } from 'vite';
import { svelte } from '@sveltejs/vite-plugin-svelte';
import electronConfig from '../../electron.config.ts';
import { ajvStandalone } from './build/ajvStandalone.ts';
import { cspMeta } from './build/csp.ts';

const here = fileURLToPath(new URL('.', import.meta.url));
const repo = fileURLToPath(new URL('../..', import.meta.url));

export const rendererOutDir = `${repo}dist/renderer`;

export function rendererConfig(): InlineConfig {
  const schemaDir = `${repo}assets/schema`;
  return {
    root: here,
    base: './',
    configFile: false,
    logLevel: 'warn',
    clearScreen: false,
    plugins: [ajvStandalone(schemaDir), svelte({ configFile: false }), cspMeta(electronConfig.security.contentSecurityPolicy)],
    worker: { format: 'es', plugins: () => [ajvStandalone(schemaDir)] },
    build: {
      outDir: rendererOutDir,
      emptyOutDir: true,
      target: 'es2022',
      sourcemap: true,
      chunkSizeWarningLimit: 2000,
      assetsInlineLimit: 0,
    },
    server: { fs: { allow: [repo] } },
  };
}

export default defineConfig(rendererConfig());
