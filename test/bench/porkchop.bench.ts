/**
 * Porkchop grid throughput: cells per second in the calling thread and on 1 and 2 worker
 * threads, and the wall time of a 1000 × 1000 grid (departure and arrival Δv per cell) on two
 * workers against the 1 s target of the Windows view. Reference measured in the same run: the
 * same cells through the allocating library calls (bodyState into fresh arrays, solveLambert,
 * hyperbolic.ts departure/arrival) on a subsample. C reference, in the same run when gcc is
 * present: the same per-cell work written plainly in C (test/bench/c/porkchopCell.c, gcc -O2)
 * on the same grid, with its answers compared cell by cell; both fill planes allocated before
 * the timing (computePorkchopRows on the TypeScript side), timed alternately, with the load
 * average printed beside the ratio.
 */
import { readFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { arrival, departure } from '../../core/orbit/hyperbolic.ts';
import { solveLambert } from '../../core/orbit/lambert.ts';
import { createPlanes } from '../../core/search/planes.ts';
import { cellTimes, computePorkchop, computePorkchopRows, type PorkchopGrid } from '../../core/search/porkchop.ts';
import { CELL_DV_ARRIVE, CELL_DV_DEPART, lastCell, prepareTransfer, transferMetric } from '../../core/search/transfer.ts';
import { EPHEMERIS_STRIDE } from '../../core/system/ephemeris.ts';
import { buildC, runC } from './cref.ts';
import type { PorkchopRequest } from '../../core/search/request.ts';
import { bodyState } from '../../core/system/ephemeris.ts';
import { PorkchopPool } from '../../app/cli/pool.ts';
import { printTable } from './table.ts';

const DAY = 86400;

async function median(fn: () => Promise<unknown> | unknown, repeats: number): Promise<number> {
  const all: number[] = [];
  for (let k = 0; k < repeats; k++) {
    const t0 = performance.now();
    await fn();
    all.push(performance.now() - t0);
  }
  all.sort((a, b) => a - b);
  return all[Math.floor(all.length / 2)];
}

export async function run(): Promise<void> {
  const { system } = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8'));
  const from = system.indexById.tessel;
  const to = system.indexById.ochre;
  const request: PorkchopRequest = {
    from,
    to,
    depart: { start: 0, end: 830 * DAY, n: 1000 },
    secondAxis: 'tof',
    second: { start: 95 * DAY, end: 380 * DAY, n: 1000 },
    parkingAltitude: 190e3,
    arrivalAltitude: 140e3,
  };
  const cells = request.depart.n * request.second.n;

  // in the calling thread
  computePorkchop(system, { ...request, depart: { ...request.depart, n: 50 } }); // warm-up
  let grid: PorkchopGrid | null = null;
  const tInThread = await median(() => {
    grid = computePorkchop(system, request);
  }, 3);

  // allocating reference on a subsample of the same cells
  const A = system.bodies[from];
  const B = system.bodies[to];
  const muStar = system.bodies[0].mu;
  const sample: [number, number][] = [];
  for (let i = 0; i < 1000; i += 25) for (let j = 0; j < 1000; j += 10) sample.push([i, j]);
  let worst = 0;
  const g = grid as unknown as PorkchopGrid;
  const reference = (check: boolean): void => {
    for (const [i, j] of sample) {
      const { departure: t, tof } = cellTimes(g, i, j);
      const s1 = bodyState(system, from, t, new Float64Array(6));
      const s2 = bodyState(system, to, t + tof, new Float64Array(6));
      const [sol] = solveLambert(muStar, s1.subarray(0, 3), s2.subarray(0, 3), tof);
      const d = departure({ mu: A.mu, rPark: A.radius + request.parkingAltitude, vInf: [sol.v1[0] - s1[3], sol.v1[1] - s1[4], sol.v1[2] - s1[5]] });
      const a = arrival({
        mu: B.mu,
        vInf: [sol.v2[0] - s2[3], sol.v2[1] - s2[4], sol.v2[2] - s2[5]],
        rPeriapsis: B.radius + request.arrivalAltitude,
        eTarget: 0,
      });
      if (check) {
        const k = i * 1000 + j;
        worst = Math.max(worst, Math.abs(g.planes.dvDepart[k] - d.dv) / d.dv, Math.abs(g.planes.dvArrive[k] - a.dv) / a.dv);
      }
    }
  };
  reference(true);
  const tRef = await median(() => reference(false), 3);
  const refRate = sample.length / (tRef / 1e3);
  const rate = (ms: number): number => cells / (ms / 1e3);

  // The same per-cell work in C (-O2) on the same grid.
  let cRate: number | string = '—';
  let cRatio: number | string = '—';
  let cDiff: number | string = '—';
  let tsAlt: number | string = '—';
  let loadNote = '';
  let tsCpu: number | string = '—';
  let cCpuRate: number | string = '—';
  let cCpuRatio: number | string = '—';
  const bin = buildC('porkchopCell');
  const setup = prepareTransfer(system, request);
  if (bin && setup.kind === 0 && setup.maxRevs === 0 && !setup.retrograde && setup.central === 0) {
    const k = system.ephemeris.k;
    const input = new Float64Array(14 + 2 * EPHEMERIS_STRIDE);
    const r = setup.request;
    input.set([setup.mu, setup.muFrom, setup.rPark, setup.vPark, setup.muTo, setup.rArrive, setup.vTarget, setup.flyby ? 1 : 0]);
    input.set([r.depart.start, r.depart.end, r.depart.n, r.second.start, r.second.end, r.second.n], 8);
    input.set(k.subarray(from * EPHEMERIS_STRIDE, (from + 1) * EPHEMERIS_STRIDE), 14);
    input.set(k.subarray(to * EPHEMERIS_STRIDE, (to + 1) * EPHEMERIS_STRIDE), 14 + EPHEMERIS_STRIDE);
    // TypeScript and C timed alternately (medians of 5 each), so a busy machine weighs on both
    // alike, and on equal terms: each fills planes it allocated before the timing after one
    // untimed grid (the C warms up on one grid and reuses its planes; allocating and first
    // touching 26 MB of fresh planes is the grid's cost, not the cells', and is in the
    // computePorkchop row below).
    const planes = createPlanes(0, r.depart.n, r.second.n);
    computePorkchopRows(system, setup, 0, r.depart.n, planes);
    // Wall clock and CPU time (process.cpuUsage, the C's CLOCK_PROCESS_CPUTIME_ID): on a busy
    // machine the wall clock counts time spent waiting for a core, the CPU time does not.
    const tsRates: number[] = [];
    const tsCpuRates: number[] = [];
    const cRates: number[] = [];
    const cCpuRates: number[] = [];
    const load: number[] = [];
    let c: ReturnType<typeof runC> = null;
    for (let k = 0; k < 5; k++) {
      load.push(loadavg()[0]);
      const c0 = process.cpuUsage();
      const t0 = performance.now();
      computePorkchopRows(system, setup, 0, r.depart.n, planes);
      tsRates.push(rate(performance.now() - t0));
      const used = process.cpuUsage(c0);
      tsCpuRates.push(rate((used.user + used.system) / 1e3));
      c = runC(bin, input, 1);
      if (!c) break;
      cRates.push(c.figures[0]);
      cCpuRates.push(c.figures[1]);
    }
    if (c) {
      const mid = (v: number[]): number => [...v].sort((a, b) => a - b)[v.length >> 1];
      loadNote = `load ${mid(load).toFixed(1)} on ${cpus().length} cores`;
      cRate = mid(cRates);
      cRatio = mid(cRates) / mid(tsRates);
      tsAlt = mid(tsRates);
      cCpuRate = mid(cCpuRates);
      cCpuRatio = mid(cCpuRates) / mid(tsCpuRates);
      tsCpu = mid(tsCpuRates);
      // the grid stores float32; compare the C doubles with the TypeScript cell in double precision
      let w = 0;
      for (const [i, j] of sample) {
        const { departure: t, tof } = cellTimes(g, i, j);
        transferMetric(system, setup, t, tof);
        const q = 2 * (i * r.second.n + j);
        w = Math.max(w, Math.abs(lastCell[CELL_DV_DEPART] - c.out[q]) / c.out[q], Math.abs(lastCell[CELL_DV_ARRIVE] - c.out[q + 1]) / c.out[q + 1]);
      }
      cDiff = w;
    }
  } else if (bin) {
    console.log('  (C reference skipped: it covers sibling bodies, single revolution, prograde only)');
  }

  // worker pools: cold (pool start + first grid), then warm medians
  const t0 = performance.now();
  const pool2 = new PorkchopPool(2);
  await pool2.compute(system, request);
  const tCold2 = performance.now() - t0;
  const t2 = await median(() => pool2.compute(system, request), 5);
  await pool2.close();
  const pool1 = new PorkchopPool(1);
  await pool1.compute(system, { ...request, depart: { ...request.depart, n: 50 } });
  const t1 = await median(() => pool1.compute(system, request), 3);
  await pool1.close();

  printTable(
    ['figure', 'value', 'reference', 'ref value', 'ratio'],
    [
      [`cells/s, calling thread, rows into allocated planes, wall clock (${loadNote})`, tsAlt, 'C -O2, same per-cell work', cRate, cRatio],
      ['the same, CPU time', tsCpu, 'C -O2, CPU time', cCpuRate, cCpuRatio],
      ['max rel. Δv diff TS (double) vs C', cDiff, `${sample.length} cells`, '', ''],
      ['cells/s, calling thread (computePorkchop: new planes each grid)', rate(tInThread), 'allocating path, same cells', refRate, rate(tInThread) / refRate],
      ['cells/s, 1 worker', rate(t1), 'calling thread', rate(tInThread), t1 > 0 ? tInThread / t1 : 0],
      ['cells/s, 2 workers', rate(t2), 'calling thread', rate(tInThread), tInThread / t2],
      ['1000x1000 ms, 2 workers (warm pool)', t2, 'target (ms)', 1000, t2 / 1000],
      ['1000x1000 ms, 2 workers (cold: pool start + grid)', tCold2, 'target (ms)', 1000, tCold2 / 1000],
      ['1000x1000 ms, calling thread', tInThread, 'target (ms)', 1000, tInThread / 1000],
      ['max rel. diff grid vs allocating path', worst, `${sample.length} cells`, '', ''],
    ],
  );
}
