/**
 * The Δv map of the demo system (core/survey/deltaVMap.ts), goal: under ~2 s on one core (the
 * app computes it in a worker). Figures: wall and CPU time of the whole map at the default
 * samples and at twice the samples per axis; the largest change of a transfer's best Δv between
 * the two (how far the default grid's refined window is from a finer one). Reference measured in
 * the same run: the map's porkchop grids alone (the same requests, rows only, no windows), the
 * floor the map's own work is compared with.
 */
import { readFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { computePorkchopRows, createGrid } from '../../core/search/index.ts';
import { DEFAULT_MAP_SAMPLES, type DeltaVMap, deltaVMap, mapTransferRequest } from '../../core/survey/index.ts';
import type { StarSystem } from '../../core/system/index.ts';
import { printTable } from './table.ts';

function timed<T>(fn: () => T): { r: T; wall: number; cpu: number } {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const r = fn();
  const wall = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return { r, wall, cpu: (c.user + c.system) / 1000 };
}

/** The map's grids alone: every transfer's porkchop request, rows computed, nothing else. */
function gridsOnly(system: StarSystem, map: DeltaVMap, samples: number): number {
  let cells = 0;
  for (const e of map.edges) {
    if (e.kind !== 'transfer') continue;
    const [from, to] = [e.from, e.to].map((id) => system.indexById[id.split(':')[0]]);
    const { grid, setup } = createGrid(system, mapTransferRequest(system, from, to, samples).request);
    computePorkchopRows(system, setup, 0, grid.planes.nRows, grid.planes);
    cells += grid.planes.nRows * grid.planes.nCols;
  }
  return cells;
}

export async function run(): Promise<void> {
  const system = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
  console.log(
    `  load average at start: ${loadavg()
      .map((x) => x.toFixed(2))
      .join(' ')} (${cpus().length} cores)`,
  );
  deltaVMap(system, { samples: 20 }); // warm-up (JIT), not timed
  const rows: (string | number)[][] = [];
  const maps: DeltaVMap[] = [];
  for (const samples of [DEFAULT_MAP_SAMPLES, 2 * DEFAULT_MAP_SAMPLES]) {
    const m = timed(() => deltaVMap(system, { samples }));
    const g = timed(() => gridsOnly(system, m.r, samples));
    maps.push(m.r);
    rows.push([
      `${samples} × ${samples}`,
      m.r.edges.filter((e) => e.kind === 'transfer').length,
      g.r,
      m.wall.toFixed(0),
      m.cpu.toFixed(0),
      g.wall.toFixed(0),
      (m.wall / g.wall).toFixed(2),
    ]);
  }
  printTable(['samples per axis', 'transfers', 'grid cells', 'map wall ms', 'map CPU ms', 'grids alone ms (ref)', 'ratio'], rows);
  let worst = 0;
  let at = '';
  for (const e of maps[0].edges) {
    if (e.kind !== 'transfer') continue;
    const f = maps[1].edges.find((x) => x.id === e.id);
    if (!f) continue;
    const d = Math.abs(e.dv - f.dv) / f.dv;
    if (d > worst) {
      worst = d;
      at = e.id;
    }
  }
  console.log(`  largest change of a transfer's best Δv, default → twice the samples: ${(worst * 100).toFixed(3)} % (${at})`);
}
