/**
 * Builds the renderer with vite's JS API into dist/renderer (used by `npm run build`, `npm start`
 * and the e2e tests), and stamps the build with its inputs' hash so `npm start` reuses it (app/buildCache.ts).
 */
import { fileURLToPath } from 'node:url';
import { build } from 'vite';
import { inputsHash, RENDERER_INPUTS, writeStamp } from '../../buildCache.ts';
import { rendererConfig, rendererOutDir } from '../vite.config.ts';

const repo = fileURLToPath(new URL('../../..', import.meta.url));

export async function buildRenderer(): Promise<string> {
  // hashed before building: a source edited during the build makes the next start rebuild
  const hash = inputsHash(repo, RENDERER_INPUTS);
  await build(rendererConfig());
  writeStamp(rendererOutDir, hash);
  return rendererOutDir;
}
