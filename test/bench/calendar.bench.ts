/**
 * The window calendar of the demo system (core/survey/calendar.ts): 20 calendar years, every
 * ordered pair of planets (20 pairs), default within 10 % and resolution. Goal (issue 18): "a
 * 20-year calendar for all planet pairs of the demo in seconds" — stated reference 5 s of wall
 * time. Figures: wall and CPU time in this thread (windowCalendar) and over the command line's
 * worker pool (app/cli/calendarPool.ts, 2 threads), the Lambert solves spent; and, measured in the
 * same run, the departure curves' porkchop rows alone (the same requests, rows only), the floor
 * the calendar's own work (windows, refinement, opening and closing) is compared with.
 */
import { readFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { windowCalendarPooled } from '../../app/cli/calendarPool.ts';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { computePorkchopRows, createPlanes, prepareTransfer } from '../../core/search/index.ts';
import { pairPorkchopRequest, resolveCalendarRequest, windowCalendar, type Calendar } from '../../core/survey/index.ts';
import type { StarSystem } from '../../core/system/index.ts';
import { printTable } from './table.ts';

const REFERENCE_MS = 5000;

function rowsOnly(system: StarSystem): number {
  const r = resolveCalendarRequest(system, {});
  let cells = 0;
  for (const p of r.pairs) {
    const req = pairPorkchopRequest(system, r, p);
    const setup = prepareTransfer(system, req);
    const block = createPlanes(0, 256, req.second.n);
    for (let r0 = 0; r0 < req.depart.n; r0 += 256) {
      const r1 = Math.min(req.depart.n, r0 + 256);
      block.rowStart = r0;
      computePorkchopRows(system, setup, r0, r1, block);
    }
    cells += req.depart.n * req.second.n;
  }
  return cells;
}

const solves = (c: Calendar): number => c.pairs.reduce((s, p) => s + p.solves, 0);
const windows = (c: Calendar): number => c.pairs.reduce((s, p) => s + p.windows.length, 0);

export async function run(): Promise<void> {
  const system = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
  console.log(
    `  load average at start: ${loadavg()
      .map((x) => x.toFixed(2))
      .join(' ')} (${cpus().length} cores)`,
  );
  windowCalendar(system, { years: 1 }); // warm-up (JIT), not timed
  const c0 = process.cpuUsage();
  let t0 = performance.now();
  const cal = windowCalendar(system, {});
  const wall = performance.now() - t0;
  const c = process.cpuUsage(c0);
  const cpu = (c.user + c.system) / 1000;
  t0 = performance.now();
  const cells = rowsOnly(system);
  const rowsMs = performance.now() - t0;
  t0 = performance.now();
  const pooled = await windowCalendarPooled(system, {}, 2);
  const poolMs = performance.now() - t0;
  printTable(
    ['calendar', 'pairs', 'windows', 'Lambert solves', 'wall ms', 'CPU ms', 'reference ms', 'ratio'],
    [
      ['in this thread', cal.pairs.length, windows(cal), solves(cal), wall.toFixed(0), cpu.toFixed(0), REFERENCE_MS, (wall / REFERENCE_MS).toFixed(2)],
      [
        'worker pool, 2 threads (incl. start)',
        pooled.pairs.length,
        windows(pooled),
        solves(pooled),
        poolMs.toFixed(0),
        '—',
        REFERENCE_MS,
        (poolMs / REFERENCE_MS).toFixed(2),
      ],
      ['curves’ porkchop rows alone', cal.pairs.length, '—', cells, rowsMs.toFixed(0), '—', wall.toFixed(0), (rowsMs / wall).toFixed(2)],
    ],
  );
  console.log(
    `  pooled calendar equals the in-thread one: ${JSON.stringify(pooled.pairs.map((p) => p.windows)) === JSON.stringify(cal.pairs.map((p) => p.windows))}`,
  );
}
