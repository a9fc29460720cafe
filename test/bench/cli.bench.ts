/**
 * The command line as a user runs it, whole-process (start, work, exit), built as the package
 * ships it (app/cli/build.ts, built here first):
 * - `waymark check` on the demo plan against `node -e 0` measured in the same run (the ratio is
 *   what starting Waymark costs over starting node), and beside it the same command run from
 *   the sources through tsx (`npm run -s cli`);
 * - `waymark windows --grid 1000x1000` (two workers on a two-core machine, started from the
 *   built files) against the same grid computed in this process on a warm pool of two workers
 *   (the grid time alone), and the same command from the sources through tsx.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildCommandLine } from '../../app/cli/build.ts';
import { PorkchopPool } from '../../app/cli/pool.ts';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import type { PorkchopRequest } from '../../core/search/request.ts';
import { printTable } from './table.ts';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const BUILT = join(ROOT, 'dist/cli/waymark.js');
const TSX = join(ROOT, 'node_modules/tsx/dist/cli.mjs');
const PLAN = 'assets/plans/tessel-to-ochre.plan.json';
const SYSTEM = 'assets/systems/ilmar.system.json';
const WINDOWS = ['windows', '--system', SYSTEM, '--from', 'tessel', '--to', 'ochre', '--grid', '1000x1000'];

/** Wall time of one whole process, ms; fails on a non-zero exit. */
function wall(args: string[]): { ms: number; stdout: string } {
  const t0 = performance.now();
  const r = spawnSync(process.execPath, args, { cwd: ROOT, encoding: 'utf8', maxBuffer: 64 << 20 });
  const ms = performance.now() - t0;
  if (r.status !== 0) throw new Error(`${args.join(' ')} exited ${r.status}: ${r.stderr}`);
  return { ms, stdout: r.stdout };
}

/** Median of `n` whole-process runs, interleaved with the reference so both see the same machine load. */
function medians(n: number, a: string[], b: string[]): [number, number] {
  const ta: number[] = [];
  const tb: number[] = [];
  for (let k = 0; k < n; k++) {
    ta.push(wall(a).ms);
    tb.push(wall(b).ms);
  }
  const med = (x: number[]): number => [...x].sort((p, q) => p - q)[Math.floor(x.length / 2)];
  return [med(ta), med(tb)];
}

export async function run(): Promise<void> {
  await buildCommandLine();
  wall([BUILT, 'check', PLAN]); // warm the file cache

  const [tCheck, tNode] = medians(15, [BUILT, 'check', PLAN], ['-e', '0']);
  const [tCheckTsx, tNode2] = medians(3, [TSX, 'app/cli/main.ts', 'check', PLAN], ['-e', '0']);

  // windows 1000x1000: whole process (built and from the sources) against the grid alone in this process
  const first = wall([BUILT, ...WINDOWS, '--json']);
  const request = (JSON.parse(first.stdout) as { request: PorkchopRequest }).request;
  const tWin = Math.min(first.ms, wall([BUILT, ...WINDOWS]).ms);
  const tWinTsx = wall([TSX, 'app/cli/main.ts', ...WINDOWS]).ms;
  const { system } = parseSystemFile(readFileSync(join(ROOT, SYSTEM), 'utf8'));
  const pool = new PorkchopPool(2);
  await pool.compute(system, { ...request, depart: { ...request.depart, n: 20 } }); // workers started and warm
  const grid: number[] = [];
  for (let k = 0; k < 3; k++) {
    const t0 = performance.now();
    await pool.compute(system, request);
    grid.push(performance.now() - t0);
  }
  await pool.close();
  const tGrid = Math.min(...grid);

  printTable(
    ['figure', 'ms', 'reference', 'ref ms', 'ratio'],
    [
      ['waymark check (built), whole process', tCheck, 'node -e 0, same run', tNode, tCheck / tNode],
      ['waymark check (sources through tsx)', tCheckTsx, 'node -e 0, same run', tNode2, tCheckTsx / tNode2],
      ['waymark check: built vs tsx', tCheck, 'sources through tsx', tCheckTsx, tCheck / tCheckTsx],
      ['windows 1000x1000 (built), whole process', tWin, 'grid alone, warm pool of 2, in process', tGrid, tWin / tGrid],
      ['windows 1000x1000 (sources through tsx)', tWinTsx, 'grid alone, warm pool of 2, in process', tGrid, tWinTsx / tGrid],
    ],
  );
  console.log('  goals: check <= 250 ms whole-process; windows 1000x1000 within 2x of the grid alone');
}
