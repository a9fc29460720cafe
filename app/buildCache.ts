/**
 * Reusing a build whose sources have not changed: a SHA-256 over the build's inputs (every file
 * under the named folders, plus single files, by path and content) is stored beside the build; the
 * next start rebuilds only when it differs or the build is missing. Loads no build tools.
 */
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';

/** What to do with a build: make it (none yet), make it again (inputs changed) or use it as is. */
export type BuildDecision = 'build' | 'rebuild' | 'reuse';

/** The decision from what is on disk: the build's entry file, the stored hash and the current one. */
export function decideBuild(built: boolean, storedHash: string | null, currentHash: string): BuildDecision {
  if (!built || storedHash === null) return 'build';
  return storedHash === currentHash ? 'reuse' : 'rebuild';
}

const SKIP = new Set(['node_modules', '.git', 'dist']);

function collect(path: string, out: string[]): void {
  if (!existsSync(path)) return;
  if (!statSync(path).isDirectory()) {
    out.push(path);
    return;
  }
  for (const name of readdirSync(path).sort()) {
    if (SKIP.has(name)) continue;
    collect(join(path, name), out);
  }
}

/** SHA-256 (hex) of the inputs (paths relative to `repo`, folders walked recursively in name order). */
export function inputsHash(repo: string, inputs: readonly string[]): string {
  const files: string[] = [];
  for (const p of inputs) collect(join(repo, p), files);
  const h = createHash('sha256');
  for (const f of files) {
    h.update(relative(repo, f));
    h.update('\0');
    h.update(readFileSync(f));
    h.update('\0');
  }
  return h.digest('hex');
}

/** Name of the stamp file written beside a build (inside its output folder). */
export const STAMP = '.inputs-sha256';

export function readStamp(outDir: string): string | null {
  try {
    return readFileSync(join(outDir, STAMP), 'utf8').trim();
  } catch {
    return null;
  }
}

export function writeStamp(outDir: string, hash: string): void {
  writeFileSync(join(outDir, STAMP), `${hash}\n`);
}

/** Inputs of the renderer build: its sources, the core it bundles, the assets and config it reads, the locked dependencies. */
export const RENDERER_INPUTS = ['app/renderer', 'core', 'assets', 'electron.config.ts', 'package-lock.json', 'tsconfig.json'] as const;
/** Inputs of the main-process and preload builds. */
export const MAIN_INPUTS = ['app/main', 'app/preload', 'app/node', 'core', 'assets', 'electron.config.ts', 'package-lock.json', 'tsconfig.json'] as const;
