/**
 * Where a worker thread starts. From the TypeScript sources (tsx) a worker starts from a .mjs
 * bootstrap beside this file that registers tsx in the thread before loading the worker body.
 * In the built command line (app/cli/build.ts) this module is part of dist/cli/waymark.js and
 * the bodies are built JavaScript in dist/cli/workers/, started with no loader at all.
 */
export type WorkerName = 'porkchopWorker' | 'disperseWorker' | 'calendarWorker';

const here = import.meta.url;

/** The URL piscina starts the named worker from. */
export function workerUrl(name: WorkerName): string {
  return here.endsWith('.ts') ? new URL(`./${name}.mjs`, here).href : new URL(`./workers/${name}.js`, here).href;
}
