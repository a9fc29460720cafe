/**
 * Runs every benchmark under test/bench/ (files named *.bench.ts exporting `run()`), or only
 * those whose names contain one of the command-line arguments: `npm run bench -- kepler lambert`.
 * Each benchmark prints its own table with a reference measured in the same run and the ratio.
 */
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { cpus } from 'node:os';

const here = dirname(fileURLToPath(import.meta.url));
const filters = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => filters.length === 0 || filters.some((x) => f.includes(x)))
  .sort();

console.log(`Waymark benchmarks — node ${process.version}, ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown cpu'})`);
for (const f of files) {
  console.log(`\n## ${f.replace('.bench.ts', '')}`);
  const mod = (await import(pathToFileURL(join(here, f)).href)) as { run?: () => Promise<void> | void };
  if (typeof mod.run !== 'function') {
    console.log(`  (skipped: ${f} exports no run())`);
    continue;
  }
  await mod.run();
}
