/** Builds the renderer with vite's JS API into dist/renderer (used by `npm run build`, `npm start` and the e2e tests). */
import { build } from 'vite';
import { rendererConfig, rendererOutDir } from '../vite.config.ts';

export async function buildRenderer(): Promise<string> {
  await build(rendererConfig());
  return rendererOutDir;
}
