/**
 * Multi-leg sequence search (core/search/sequence.ts) on the demo system: Tessel → Moravel →
 * Fennick over one Tessel–Moravel synodic period of departures (goal: under 5 s on 2 cores).
 *
 * Figures: wall and CPU time of the search, Lambert solves, the best flyby sequence (dates, leg
 * times, v∞, flyby periapsis, Δv split) against the best direct Tessel → Fennick transfer over
 * the same departures (the search's `direct`). References measured in the same run: a bare loop
 * of the same number of lambertSingleRev solves on the demo geometry (the floor the search's
 * overhead is compared with), and the same search on a grid twice as dense in every axis (how
 * far the default grid's best is from a finer one).
 */
import { readFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { lambertSingleRev } from '../../core/orbit/index.ts';
import { searchSequence, type SequenceRequest, type SequenceResult } from '../../core/search/index.ts';
import { conicState, formatDate } from '../../core/system/index.ts';
import { printTable } from './table.ts';

const DAY = 86400;

function timed(fn: () => SequenceResult): { r: SequenceResult; wall: number; cpu: number } {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const r = fn();
  const wall = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return { r, wall, cpu: (c.user + c.system) / 1000 };
}

export async function run(): Promise<void> {
  const system = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
  const tessel = system.bodies[system.indexById.tessel];
  const moravel = system.bodies[system.indexById.moravel];
  const synodic = 1 / Math.abs(1 / tessel.derived.period - 1 / moravel.derived.period);
  const base: SequenceRequest = {
    bodies: ['tessel', 'moravel', 'fennick'],
    departFrom: 0,
    departTo: synodic,
    departAltitude: 300e3,
    arriveAltitude: 100e3,
    arriveE: 0,
  };
  console.log(
    `  load average at start: ${loadavg()
      .map((x) => x.toFixed(2))
      .join(' ')} (${cpus().length} cores)`,
  );
  console.log(`  departures: one Tessel–Moravel synodic period, ${(synodic / DAY).toFixed(1)} days from the epoch`);
  // warm-up (JIT), not timed
  searchSequence(system, { ...base, departSteps: 16, tofSteps: 12 });

  const rows: (string | number)[][] = [];
  const runs: [string, SequenceRequest][] = [
    ['powered, default grid 64 × 40 × 40', base],
    ['unpowered, default grid', { ...base, powered: false }],
    ['powered, grid 128 × 80 × 80 (reference)', { ...base, departSteps: 128, tofSteps: 80 }],
  ];
  let first: SequenceResult | null = null;
  for (const [name, req] of runs) {
    const { r, wall, cpu } = timed(() => searchSequence(system, req));
    first ??= r;
    const best = r.solutions[0];
    rows.push([
      name,
      wall.toFixed(0),
      cpu.toFixed(0),
      r.lambertSolves,
      ((wall * 1e6) / r.lambertSolves).toFixed(0),
      best ? best.dvTotal.toFixed(1) : '—',
      r.direct ? r.direct.dvTotal.toFixed(1) : '—',
    ]);
  }

  // Reference floor: the same number of bare single-revolution Lambert solves, Tessel → Moravel.
  const n = (first as SequenceResult).lambertSolves;
  const a6 = new Float64Array(6);
  const b6 = new Float64Array(6);
  const v1 = new Float64Array(3);
  const v2 = new Float64Array(3);
  const t0 = performance.now();
  let sink = 0;
  for (let k = 0; k < n; k++) {
    const t = (synodic * (k % 97)) / 97;
    const tof = (600 + (k % 89) * 20) * DAY;
    conicState(system.ephemeris, tessel.index, t, a6);
    conicState(system.ephemeris, moravel.index, t + tof, b6);
    sink += lambertSingleRev(system.bodies[0].mu, a6[0], a6[1], a6[2], b6[0], b6[1], b6[2], tof, false, v1, v2);
  }
  const bare = performance.now() - t0;
  rows.push([`bare loop: ${n} Lambert solves + 2 ephemeris states each`, bare.toFixed(0), '', n, ((bare * 1e6) / n).toFixed(0), '', '']);
  printTable(['run', 'wall ms', 'cpu ms', 'Lambert solves', 'ns/solve', 'best flyby Δv m/s', 'best direct Δv m/s'], rows);
  if (sink === -1) console.log('  (sink)');

  const r = first as SequenceResult;
  const date = (t: number): string => formatDate(system.calendar, t);
  console.log(`\n  method: ${r.method}`);
  for (const [k, s] of r.solutions.slice(0, 3).entries()) {
    console.log(
      `  #${k + 1}: depart ${date(s.depart)}, arrive ${date(s.arrive)}; total ${(s.dvTotal / 1000).toFixed(3)} km/s = departure ${(s.dvDepart / 1000).toFixed(3)} + flyby ${(s.dvFlybys / 1000).toFixed(3)} + capture ${(s.dvCapture / 1000).toFixed(3)}`,
    );
    for (const l of s.legs) {
      console.log(
        `      ${l.from} → ${l.to}: ${(l.tof / DAY).toFixed(1)} d, v∞ ${(l.vInfDepart / 1000).toFixed(3)} → ${(l.vInfArrive / 1000).toFixed(3)} km/s`,
      );
    }
    for (const f of s.flybys) {
      console.log(
        `      flyby ${f.body} ${date(f.t)}: periapsis altitude ${(f.periapsisAltitude / 1e3).toFixed(0)} km, turn ${((f.turn * 180) / Math.PI).toFixed(2)}°, v∞ ${(f.vInfIn / 1000).toFixed(3)} → ${(f.vInfOut / 1000).toFixed(3)} km/s, Δv ${f.dv.toFixed(2)} m/s${f.limited ? ' (limited)' : ''}, free |Δv∞| ${(f.freeDv / 1000).toFixed(3)} km/s`,
      );
    }
  }
  if (r.direct) {
    console.log(
      `  direct tessel → fennick: depart ${date(r.direct.depart)}, arrive ${date(r.direct.arrive)}, total ${(r.direct.dvTotal / 1000).toFixed(3)} km/s`,
    );
    if (r.solutions[0])
      console.log(`  saving of the best flyby sequence over the direct: ${((r.direct.dvTotal - r.solutions[0].dvTotal) / 1000).toFixed(3)} km/s`);
  }
}
