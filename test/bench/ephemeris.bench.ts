/**
 * Conic ephemeris throughput: core/system/ephemeris.ts (per-body P, Q, n, b precomputed at
 * load; Kepler's equation by core/orbit/anomaly.ts solveEllipticKepler; no allocation) for a
 * planet relative to the star (Tessel) and a moon relative to the star (Quill = Quill rel Tessel + Tessel rel star), on the
 * demo system.
 *
 * References, measured in the same run on the same times:
 *  - elements route: for each evaluation, M = M0 + n·t, ν by core/orbit/anomaly.ts meanToTrue,
 *    then core/orbit/elements.ts elementsToState (rotation built from Ω, i, ω every call,
 *    inputs checked every call), into a preallocated output;
 *  - universal-variable route: core/orbit/kepler.ts propagateKepler from the epoch state by dt.
 * The worst position difference between the routes is printed too, so the table also shows
 * they agree.
 */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { meanToTrue } from '../../core/orbit/anomaly.ts';
import { elementsToState } from '../../core/orbit/elements.ts';
import { propagateKepler } from '../../core/orbit/kepler.ts';
import { bodyState } from '../../core/system/ephemeris.ts';
import type { StarSystem } from '../../core/system/model.ts';
import { printTable, timeMedian } from './table.ts';

const N = 400_000;

function times(): Float64Array {
  const t = new Float64Array(N);
  // Spread over ~30 demo years, not commensurate with any period.
  for (let k = 0; k < N; k++) t[k] = k * 1733.7 - 3.1e8;
  return t;
}

/** Elements route: state of body j relative to its parent, no cached constants. */
function elementsRoute(system: StarSystem, j: number, t: number, out: Float64Array): void {
  const b = system.bodies[j];
  const el = b.elements!;
  const nu = meanToTrue(el.M0 + b.derived.meanMotion * t, el.e);
  elementsToState(b.derived.orbitMu, { a: el.a, e: el.e, i: el.i, raan: el.raan, argp: el.argp, nu }, out);
}

export async function run(): Promise<void> {
  const system = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
  const tessel = system.indexById.tessel;
  const quill = system.indexById.quill;
  const ts = times();
  const out = new Float64Array(6);
  const ref = new Float64Array(6);
  const tmp = new Float64Array(6);
  let sink = 0;

  const fast = (j: number) => () => {
    for (let k = 0; k < N; k++) {
      bodyState(system, j, ts[k], out, 0);
      sink += out[0];
    }
  };
  const elementsChain = (j: number) => () => {
    for (let k = 0; k < N; k++) {
      ref.fill(0);
      for (let x = j; x !== 0; x = system.bodies[x].parentIndex) {
        elementsRoute(system, x, ts[k], tmp);
        for (let c = 0; c < 6; c++) ref[c] += tmp[c];
      }
      sink += ref[0];
    }
  };
  const epoch = (j: number) => {
    const s = new Float64Array(6);
    bodyState(system, j, 0, s, system.bodies[j].parentIndex);
    return s;
  };
  const epochStates = system.bodies.map((_, j) => (j === 0 ? new Float64Array(6) : epoch(j)));
  const keplerChain = (j: number) => () => {
    for (let k = 0; k < N; k++) {
      ref.fill(0);
      for (let x = j; x !== 0; x = system.bodies[x].parentIndex) {
        propagateKepler(system.bodies[x].derived.orbitMu, epochStates[x], ts[k], tmp);
        for (let c = 0; c < 6; c++) ref[c] += tmp[c];
      }
      sink += ref[0];
    }
  };

  // Agreement (worst position difference, m).
  const agree = (j: number, route: 'elements' | 'kepler'): number => {
    let worst = 0;
    for (let k = 0; k < N; k += 97) {
      bodyState(system, j, ts[k], out, 0);
      ref.fill(0);
      for (let x = j; x !== 0; x = system.bodies[x].parentIndex) {
        if (route === 'elements') elementsRoute(system, x, ts[k], tmp);
        else propagateKepler(system.bodies[x].derived.orbitMu, epochStates[x], ts[k], tmp);
        for (let c = 0; c < 6; c++) ref[c] += tmp[c];
      }
      worst = Math.max(worst, Math.hypot(out[0] - ref[0], out[1] - ref[1], out[2] - ref[2]));
    }
    return worst;
  };

  const rows: (string | number)[][] = [];
  for (const [label, j] of [
    ['planet rel. star (Tessel)', tessel],
    ['moon rel. star (Quill)', quill],
  ] as const) {
    const f = timeMedian(fast(j), 5, 1).median;
    const e = timeMedian(elementsChain(j), 5, 1).median;
    const kp = timeMedian(keplerChain(j), 5, 1).median;
    const rate = (ms: number) => N / (ms / 1000);
    rows.push([label, rate(f), rate(e), rate(f) / rate(e), rate(kp), rate(f) / rate(kp), agree(j, 'elements'), agree(j, 'kepler')]);
  }
  printTable(['case', 'ephemeris eval/s', 'elements route eval/s', 'ratio', 'kepler route eval/s', 'ratio', 'max |Δr| elem (m)', 'max |Δr| kepler (m)'], rows);
  if (sink === 42) console.log(''); // keep the loops observable
}
