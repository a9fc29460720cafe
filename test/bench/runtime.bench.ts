/**
 * Runtime ephemeris data (core/runtime) for the demo plan's span: evaluation speed through the
 * standalone reader, and the file's size.
 *
 * Figures, each beside a reference measured in the same run on the same times:
 * - positions per second through the reader (core/runtime/reader.ts, from the binary form) for a
 *   planet relative to the star (Tessel), a moon relative to the star (Quill: its track plus
 *   Tessel's) and relative to its planet, and velocities; the reference is the conic ephemeris
 *   (core/system bodyState / bodyStateRelativeToParent: Kepler's equation solved per call) of the
 *   same body; the worst position difference between the two is printed too;
 * - the ship's position through the reader against core/conic shipStateAt (the universal-variable
 *   Kepler propagation of the segment flown);
 * - the time to fit the whole file, the JSON and binary sizes, and per track the piece count,
 *   coefficient count, tolerance and measured maxError.
 */
import { shipStateAt } from '../../core/conic/index.ts';
import { encodeRuntimeBinary, encodeRuntimeJson, openRuntimeEphemeris, runtimeEphemeris } from '../../core/runtime/index.ts';
import { bodyState, bodyStateRelativeToParent } from '../../core/system/index.ts';
import { demoFlight, demoShipInput, ilmar } from '../core/runtime/demoShip.ts';
import { printTable, timeMedian } from './table.ts';

const N = 400_000;

export async function run(): Promise<void> {
  const system = ilmar();
  const flight = demoFlight(system);
  const t0 = flight.segments[0].t0;
  const t1 = flight.segments[flight.segments.length - 1].t1;
  const fitTime = timeMedian(() => runtimeEphemeris(system, { t0, t1, ships: [demoShipInput(flight)] }), 3, 1).median;
  const data = runtimeEphemeris(system, { t0, t1, ships: [demoShipInput(flight)] });
  const json = JSON.stringify(encodeRuntimeJson(data));
  const binary = encodeRuntimeBinary(data);
  const reader = openRuntimeEphemeris(binary);

  // Times spread over the span, not commensurate with any piece length.
  const ts = new Float64Array(N);
  for (let k = 0; k < N; k++) ts[k] = t0 + ((k * 0.6180339887498949) % 1) * (t1 - t0);
  const out = [0, 0, 0];
  const ref = new Float64Array(6);
  let sink = 0;

  const tessel = system.indexById.tessel;
  const quill = system.indexById.quill;
  const ship = data.tracks.length - 1;
  type Case = [string, () => void, () => void, (t: number) => number];
  const worst = (diff: (t: number) => number): number => {
    let w = 0;
    for (let k = 0; k < N; k += 101) w = Math.max(w, diff(ts[k]));
    return w;
  };
  const dist = (a: number[], b: Float64Array, o = 0) => Math.hypot(a[0] - b[o], a[1] - b[o + 1], a[2] - b[o + 2]);
  const cases: Case[] = [
    [
      'Tessel rel. star: position',
      () => {
        for (let k = 0; k < N; k++) sink += reader.absolutePosition(tessel - 1, ts[k], out)[0];
      },
      () => {
        for (let k = 0; k < N; k++) sink += bodyState(system, tessel, ts[k], ref, 0)[0];
      },
      (t) => dist(reader.absolutePosition(tessel - 1, t, out), bodyState(system, tessel, t, ref, 0)),
    ],
    [
      'Quill rel. star: position (2 tracks)',
      () => {
        for (let k = 0; k < N; k++) sink += reader.absolutePosition(quill - 1, ts[k], out)[0];
      },
      () => {
        for (let k = 0; k < N; k++) sink += bodyState(system, quill, ts[k], ref, 0)[0];
      },
      (t) => dist(reader.absolutePosition(quill - 1, t, out), bodyState(system, quill, t, ref, 0)),
    ],
    [
      'Quill rel. Tessel: position',
      () => {
        for (let k = 0; k < N; k++) sink += reader.position(quill - 1, ts[k], out)[0];
      },
      () => {
        for (let k = 0; k < N; k++) sink += bodyStateRelativeToParent(system, quill, ts[k], ref)[0];
      },
      (t) => dist(reader.position(quill - 1, t, out), bodyStateRelativeToParent(system, quill, t, ref)),
    ],
    [
      'Quill rel. Tessel: velocity',
      () => {
        for (let k = 0; k < N; k++) sink += reader.velocity(quill - 1, ts[k], out)[0];
      },
      () => {
        for (let k = 0; k < N; k++) sink += bodyStateRelativeToParent(system, quill, ts[k], ref)[3];
      },
      (t) => dist(reader.velocity(quill - 1, t, out), bodyStateRelativeToParent(system, quill, t, ref), 3),
    ],
    [
      'ship rel. its centre: position',
      () => {
        for (let k = 0; k < N; k++) sink += reader.position(ship, ts[k], out)[0];
      },
      () => {
        for (let k = 0; k < N; k++) {
          shipStateAt(flight, ts[k], ref);
          sink += ref[0];
        }
      },
      (t) => {
        reader.position(ship, t, out);
        shipStateAt(flight, t, ref);
        return dist(out, ref);
      },
    ],
  ];
  const rows: (string | number)[][] = [];
  for (const [label, cheb, kepler, diff] of cases) {
    const rc = N / (timeMedian(cheb, 5, 1).median / 1000);
    const rk = N / (timeMedian(kepler, 5, 1).median / 1000);
    rows.push([label, rc, rk, rc / rk, worst(diff)]);
  }
  printTable(['case', 'reader eval/s', 'Kepler eval/s', 'ratio', 'max |Δ| (m, m/s)'], rows);

  console.log('');
  printTable(
    ['file', 'bytes', 'fit time (ms)'],
    [
      ['JSON (JSON.stringify, no spaces)', json.length, fitTime],
      ['binary', binary.byteLength, ''],
    ],
  );
  console.log('');
  printTable(
    ['track', 'centre', 'pieces', 'coefficients', 'degree', 'tolerance (m)', 'maxError (m)'],
    data.tracks.map((tr) => [
      tr.name,
      [...new Set(tr.arcs.map((a) => a.center))].join(' → '),
      tr.arcs.reduce((n, a) => n + a.count, 0),
      tr.arcs.reduce((n, a) => n + a.coefficients.length, 0),
      tr.degree,
      tr.tolerance,
      tr.maxError,
    ]),
  );
  const fine = data.tracks[ship].fine;
  console.log(
    `  ship's ${fine.length} fine windows (±10 min around burns and periapses, tolerance ${fine[0]?.tolerance} m): maxError ${Math.min(...fine.map((w) => w.maxError)).toExponential(2)} to ${Math.max(...fine.map((w) => w.maxError)).toExponential(2)} m`,
  );
  if (sink === 42) console.log(''); // keep the loops observable
}
