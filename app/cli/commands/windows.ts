/**
 * `waymark windows` — transfer windows between two bodies of a system file: a porkchop grid
 * over departure time × time of flight (or arrival time), its local minima refined, the next
 * K windows listed with their Δv breakdown.
 *
 * Times: a calendar date of the system ("412-037", "412-037T06:12", "Year 412 TR, day 37") or
 * a duration from the epoch with a unit ("120d", "3.5e7s"); flight times are durations.
 * `d` is 86 400 s here (core/io/units.ts), and flight times are printed in those days.
 * Defaults (core/io/defaults.ts, shared with the app's Windows screen): departures over 1.5
 * synodic periods from the epoch (1.5 moon periods for a planet–moon pair), flight times from
 * 0.5 to 2 Hohmann flight times, a 200×200 grid, parking and capture periapses 100 km above each
 * body's minimum safe altitude (never below it). Any pair of bodies: a pair no single transfer
 * covers (Tessel → Skerry) searches the leg that has the window (Tessel → Moravel) and says so.
 *
 * Output: text table (calendar dates, flight days, Δv in m/s, C3 in km²/s², v∞ in km/s);
 * `--json`: { request, grid: { min, nDepart, nTof, secondAxis, unsolved }, windows } in SI;
 * `--csv`: the windows as CSV. `--grid-out FILE` writes the whole grid (JSON, or CSV when FILE
 * ends in .csv), saved atomically with a backup through the output guard of app/node/files.ts
 * (never over the system file read, a folder, FIFO or device, or a file that is not a previous
 * grid of the same format; checked before the grid is computed); `--grid-out -` writes the
 * JSON grid to standard output instead (not with `--json` or `--csv`; standard output then
 * carries the grid alone). Exit code 1 when no window is found.
 */
import { availableParallelism } from 'node:os';
import type { Command } from 'commander';
import { parseQuantity, parseRange } from '../../../core/io/index.ts';
import {
  ALTITUDE_MARGIN,
  DEPARTURE_SPAN_RECURRENCES,
  PORKCHOP_GRID,
  TOF_SPAN_HOHMANN,
  WINDOW_COUNT,
  porkchopRanges,
  requireSafeAltitude,
  type PorkchopRanges,
} from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { computePorkchopAsync, gridCell, gridMinimum, type PorkchopGrid } from '../../../core/search/index.ts';
import { FLOAT_PLANES, INT_PLANES } from '../../../core/search/index.ts';
import { PORKCHOP_METRICS, type PorkchopMetric, type PorkchopRequest } from '../../../core/search/index.ts';
import { prepareTransfer, type TransferCell } from '../../../core/search/index.ts';
import { findWindows, type TransferWindow } from '../../../core/search/index.ts';
import { formatCompactDate, parseDate } from '../../../core/system/index.ts';
import type { StarSystem, SystemCalendar } from '../../../core/system/index.ts';
import { checkOutputs, loadSystemFile, STDOUT, writeOutput, type OutputRules, type OutputTarget } from '../../node/files.ts';
import { EXIT_NO, guard, jsonReplacer, num, printData, printJson, printText, termSafe } from '../output.ts';
import { bodyIndexNamed, windowsFlags } from '../flags.ts';
import { computePorkchopPooled } from '../pool.ts';
import { createProgress, progressEnabled } from '../progress.ts';

const DAY = 86400;
/** Grids of fewer cells than this run in the calling thread when --workers is 'auto'. */
export const AUTO_WORKER_CELLS = 250_000;
const MAX_AUTO_WORKERS = 8;

/** A time of the system: calendar date, or a duration from the epoch with a unit. */
export function parseTime(cal: SystemCalendar, field: string, text: string): number {
  const s = text.trim();
  try {
    return parseQuantity(field, s, 'time');
  } catch {
    // written like a date: the calendar's own message says what is wrong with it
    if (/^-?\d+-\d|^year\s/i.test(s)) return parseDate(cal, s, field);
    throw new InputError(field, 'must be a calendar date like "412-037" / "412-037T06:12" or a time from the epoch like "120d"', text);
  }
}

function parseGrid(text: string): [number, number] {
  const m = /^\s*(\d+)\s*[x×]\s*(\d+)\s*$/i.exec(text);
  if (!m) throw new InputError('--grid', 'must be written NxM (departures x flight times), e.g. 200x200', text);
  const n = Number(m[1]);
  const k = Number(m[2]);
  if (n < 2 || k < 2) throw new InputError('--grid', 'must have at least 2 samples on each axis', text);
  return [n, k];
}

function parseCount(field: string, text: string, min: number): number {
  const v = Number(text);
  if (!/^\s*\d+\s*$/.test(text) || !Number.isInteger(v) || v < min) throw new InputError(field, `must be a whole number >= ${min}`, text);
  return v;
}

function bodyIndex(system: StarSystem, field: string, id: string): number {
  return bodyIndexNamed(system, field, id);
}

interface WindowsOptions {
  system: string;
  from: string;
  to: string;
  depart?: string;
  tof?: string;
  arrive?: string;
  grid: string;
  parking?: string;
  parkingE: string;
  capture?: string;
  captureE: string;
  flyby?: boolean;
  revs: string;
  retrograde?: boolean;
  metric: string;
  workers: string;
  top: string;
  json?: boolean;
  csv?: boolean;
  gridOut?: string;
}

/** Turns the options into a porkchop request (defaults from core/io/defaults.ts and the system). */
export function buildRequest(system: StarSystem, o: WindowsOptions): PorkchopRequest {
  return resolveRequest(system, o).request;
}

/** The request and, for a pair no single transfer covers, why another leg is searched (in words). */
export function resolveRequest(system: StarSystem, o: WindowsOptions): { request: PorkchopRequest; through: string | null } {
  const cal = system.calendar;
  const askedFrom = bodyIndex(system, '--from', o.from);
  const askedTo = bodyIndex(system, '--to', o.to);
  const [nDepart, nSecond] = parseGrid(o.grid);
  if (o.flyby && o.captureE !== '0') throw new InputError('--capture-e', 'cannot be combined with --flyby');
  const metric = o.metric as PorkchopMetric;
  if (!PORKCHOP_METRICS.includes(metric)) throw new InputError('--metric', `must be one of ${PORKCHOP_METRICS.join(', ')}`, o.metric);
  if (o.tof !== undefined && o.arrive !== undefined) throw new InputError('--arrive', 'cannot be combined with --tof');
  const parkingWanted = o.parking !== undefined ? parseQuantity('--parking', o.parking, 'length') : undefined;
  // The leg with the window and its default ranges (typed error for an unusable pair).
  let ranges: PorkchopRanges;
  try {
    ranges = porkchopRanges(system, askedFrom, askedTo, 0, parkingWanted);
  } catch (e) {
    if (e instanceof InputError && (e.field === 'from' || e.field === 'to')) throw new InputError(`--${e.field}`, e.rule, e.value);
    throw e;
  }
  const { from, to } = ranges.pair;
  const A = system.bodies[from];
  const B = system.bodies[to];
  const parkingAltitude = parkingWanted ?? ranges.parkingAltitude;
  const arrivalAltitude = o.capture !== undefined ? parseQuantity('--capture', o.capture, 'length') : ranges.captureAltitude;
  requireSafeAltitude('--parking', A, parkingAltitude);
  if (!o.flyby) requireSafeAltitude('--capture', B, arrivalAltitude);
  const base: PorkchopRequest = {
    from,
    to,
    depart: { start: ranges.depart.start, end: ranges.depart.end, n: nDepart },
    secondAxis: 'tof',
    second: { start: ranges.tof.min, end: ranges.tof.max, n: nSecond },
    parkingAltitude,
    parkingEccentricity: parseQuantity('--parking-e', o.parkingE, 'none'),
    arrivalAltitude,
    arrivalEccentricity: o.flyby ? 'flyby' : parseQuantity('--capture-e', o.captureE, 'none'),
    maxRevs: parseCount('--revs', o.revs, 0),
    retrograde: !!o.retrograde,
    metric,
  };
  prepareTransfer(system, base); // the orbits are usable (typed error otherwise)
  const time = (field: string, text: string): number => parseTime(cal, field, text);
  if (o.depart !== undefined) {
    const [t0, t1] = parseRange('--depart', o.depart, time);
    base.depart = { start: t0, end: t1, n: nDepart };
  }
  if (o.arrive !== undefined) {
    const [t0, t1] = parseRange('--arrive', o.arrive, time);
    base.secondAxis = 'arrival';
    base.second = { start: t0, end: t1, n: nSecond };
  } else if (o.tof !== undefined) {
    const [t0, t1] = parseRange('--tof', o.tof, 'time');
    if (!(t0 > 0)) throw new InputError('--tof', 'must start above zero', o.tof);
    base.second = { start: t0, end: t1, n: nSecond };
  }
  return { request: base, through: ranges.pair.through };
}

function workerCount(text: string, cells: number): number {
  if (text === 'auto') return cells < AUTO_WORKER_CELLS ? 0 : Math.min(MAX_AUTO_WORKERS, Math.max(1, availableParallelism()));
  return parseCount('--workers', text, 0);
}

function cellJson(cal: SystemCalendar, c: TransferCell): Record<string, unknown> {
  return {
    departure: c.departure,
    departureDate: formatCompactDate(cal, c.departure, { seconds: true }),
    arrival: c.arrival,
    arrivalDate: formatCompactDate(cal, c.arrival, { seconds: true }),
    tof: c.tof,
    dvDepart: c.dvDepart,
    dvArrive: c.dvArrive,
    dvTotal: c.dvTotal,
    c3: c.c3,
    vInfDepart: c.vInfDepart,
    vInfArrive: c.vInfArrive,
    revs: c.revs,
    branch: c.branch,
  };
}

function windowJson(cal: SystemCalendar, w: TransferWindow): Record<string, unknown> {
  return { ...cellJson(cal, w), metric: w.metric, grid: w.grid, evaluations: w.evaluations, converged: w.converged, atEdge: w.atEdge };
}

const CSV_HEADER = [
  'departure_s',
  'departure_date',
  'arrival_s',
  'arrival_date',
  'tof_s',
  'tof_d',
  'dv_depart_m_s',
  'dv_arrive_m_s',
  'dv_total_m_s',
  'c3_km2_s2',
  'vinf_depart_m_s',
  'vinf_arrive_m_s',
  'revs',
  'branch',
  'at_edge',
];

function windowsCsv(cal: SystemCalendar, ws: TransferWindow[]): string {
  const rows = ws.map((w) =>
    [
      w.departure,
      formatCompactDate(cal, w.departure, { seconds: true }),
      w.arrival,
      formatCompactDate(cal, w.arrival, { seconds: true }),
      w.tof,
      w.tof / DAY,
      w.dvDepart,
      w.dvArrive,
      w.dvTotal,
      w.c3 / 1e6,
      w.vInfDepart,
      w.vInfArrive,
      w.revs,
      w.branch,
      w.atEdge,
    ].join(','),
  );
  return `${[CSV_HEADER.join(','), ...rows].join('\n')}\n`;
}

/** The `--grid-out` output: CSV for a .csv name, else JSON (also on standard output). */
function gridTarget(path: string): OutputTarget {
  return { flag: '--grid-out', path, kind: path !== STDOUT && path.toLowerCase().endsWith('.csv') ? 'grid-csv' : 'grid-json' };
}

/** Writes the whole grid to its output (a file atomically, like every file the command line writes, or standard output). */
async function gridFile(target: OutputTarget, grid: PorkchopGrid, rules: OutputRules): Promise<void> {
  if (target.kind === 'grid-csv') {
    const { nRows, nCols } = grid.planes;
    const lines = [['i', 'j', 'departure_s', grid.request.secondAxis === 'arrival' ? 'arrival_s' : 'tof_s', ...FLOAT_PLANES, ...INT_PLANES].join(',')];
    for (let i = 0; i < nRows; i++) {
      for (let j = 0; j < nCols; j++) {
        const k = i * nCols + j;
        lines.push(
          [i, j, grid.departTimes[i], grid.secondValues[j], ...FLOAT_PLANES.map((p) => grid.planes[p][k]), ...INT_PLANES.map((p) => grid.planes[p][k])].join(
            ',',
          ),
        );
      }
    }
    await writeOutput(target, `${lines.join('\n')}\n`, rules, { forTerminal: termSafe });
  } else {
    const doc = {
      request: grid.request,
      order: 'row-major [departure][second axis]; unsolved cells are null',
      departTimes: grid.departTimes,
      secondValues: grid.secondValues,
      unsolved: grid.unsolved,
      planes: Object.fromEntries([...FLOAT_PLANES, ...INT_PLANES].map((p) => [p, grid.planes[p]])),
    };
    await writeOutput(target, `${JSON.stringify(doc, jsonReplacer)}\n`, rules, { forTerminal: termSafe });
  }
}

function pad(s: string, w: number, left = false): string {
  return left ? s.padEnd(w) : s.padStart(w);
}

function textReport(system: StarSystem, grid: PorkchopGrid, min: TransferCell | null, windows: TransferWindow[]): string {
  const cal = system.calendar;
  const r = grid.request;
  const A = system.bodies[r.from];
  const B = system.bodies[r.to];
  const date = (t: number): string => formatCompactDate(cal, t);
  const second =
    r.secondAxis === 'arrival'
      ? `arrivals ${date(r.second.start)} .. ${date(r.second.end)}`
      : `flight ${num(r.second.start / DAY, 1)} .. ${num(r.second.end / DAY, 1)} d`;
  const capture =
    r.arrivalEccentricity === 'flyby'
      ? `flyby at ${num(r.arrivalAltitude / 1e3, 0)} km`
      : `capture ${num(r.arrivalAltitude / 1e3, 0)} km (e ${r.arrivalEccentricity})`;
  const lines = [
    `${A.name} -> ${B.name}: departures ${date(r.depart.start)} .. ${date(r.depart.end)}, ${second}`,
    `grid ${r.depart.n} x ${r.second.n}, parking ${num(r.parkingAltitude / 1e3, 0)} km, ${capture}, revs <= ${r.maxRevs}${r.retrograde ? ', retrograde' : ''}, metric ${r.metric}`,
    min
      ? `grid minimum: ${num(min.dvTotal, 1)} m/s total (${num(min.dvDepart, 1)} + ${num(min.dvArrive, 1)}), departing ${date(min.departure)}, flight ${num(min.tof / DAY, 1)} d; unsolved cells: ${grid.unsolved}`
      : `grid minimum: none (every cell unsolved)`,
    '',
  ];
  if (windows.length === 0) {
    lines.push('no transfer windows found in the searched ranges');
    return lines.join('\n');
  }
  const head = ['#', 'departure', 'arrival', 'flight d', 'dv dep m/s', 'dv arr m/s', 'dv total m/s', 'C3 km2/s2', 'vinf dep km/s', 'vinf arr km/s', 'revs'];
  const rows = windows.map((w, k) => [
    `${k + 1}${w.atEdge ? '*' : ''}`,
    date(w.departure),
    date(w.arrival),
    num(w.tof / DAY, 1),
    num(w.dvDepart, 1),
    num(w.dvArrive, 1),
    num(w.dvTotal, 1),
    num(w.c3 / 1e6, 3),
    num(w.vInfDepart / 1e3, 3),
    num(w.vInfArrive / 1e3, 3),
    w.revs === 0 ? '0' : `${w.revs} ${w.branch}`,
  ]);
  const widths = head.map((h, c) => Math.max(h.length, ...rows.map((row) => row[c].length)));
  const fmtRow = (row: string[]): string => row.map((cell, c) => pad(cell, widths[c], c === 1 || c === 2)).join('  ');
  lines.push(fmtRow(head), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(fmtRow));
  if (windows.some((w) => w.atEdge)) lines.push('', '* at the edge of the searched ranges: the true minimum may lie outside; widen --depart/--tof');
  return lines.join('\n');
}

export function addWindowsCommand(program: Command): void {
  program
    .command('windows')
    .description('transfer windows between two bodies: porkchop grid, refined minima, Δv breakdown')
    .requiredOption('--system <file>', 'system file')
    .requiredOption('--from <body>', 'departure body id')
    .requiredOption('--to <body>', 'arrival body id')
    .option(
      '--depart <start..end>',
      `departure range: calendar dates (412-037) or times from the epoch (0d..800d); default: from the epoch over ${DEPARTURE_SPAN_RECURRENCES} synodic periods`,
    )
    .option('--tof <min..max>', `flight-time range (e.g. 100d..400d); default: ${TOF_SPAN_HOHMANN[0]} to ${TOF_SPAN_HOHMANN[1]} Hohmann flight times`)
    .option('--arrive <start..end>', 'arrival-time range instead of --tof (grid over departure x arrival)')
    .option('--grid <NxM>', 'samples: departures x flight times', `${PORKCHOP_GRID}x${PORKCHOP_GRID}`)
    .option('--parking <alt>', `parking-orbit periapsis altitude, at least the body's minimum safe altitude (default: that + ${ALTITUDE_MARGIN / 1e3} km)`)
    .option('--parking-e <e>', 'parking-orbit eccentricity', '0')
    .option('--capture <alt>', `capture periapsis altitude, at least the body's minimum safe altitude (default: that + ${ALTITUDE_MARGIN / 1e3} km)`)
    .option('--capture-e <e>', 'target-orbit eccentricity', '0')
    .option('--flyby', 'no capture burn (arrival Δv = 0)')
    .option('--revs <n>', 'largest number of complete revolutions on the arc', '0')
    .option('--retrograde', 'retrograde transfer arcs')
    .option('--metric <m>', `what "best" means: ${PORKCHOP_METRICS.join(', ')}`, 'total')
    .option('--workers <n>', "worker threads for the grid (0 = in this thread; 'auto' by grid size)", 'auto')
    .option('--top <k>', 'number of windows to list', String(WINDOW_COUNT))
    .option('--grid-out <file>', 'also write the whole grid (JSON, or CSV for a .csv name)')
    .option('--json', 'machine-readable output')
    .option('--csv', 'the windows as CSV')
    .action((o: WindowsOptions) =>
      guard({ json: !!o.json, flags: windowsFlags(o.arrive !== undefined ? 'arrival' : 'tof') }, async () => {
        if (o.json && o.csv) throw new InputError('--csv', 'cannot be combined with --json');
        const gridOut = o.gridOut === undefined ? null : gridTarget(o.gridOut);
        if (gridOut?.path === STDOUT && (o.json || o.csv)) {
          const other = o.json ? '--json' : '--csv';
          throw new InputError('--grid-out', `cannot be - (standard output) together with ${other}: both would go to standard output`, STDOUT);
        }
        const { system } = await loadSystemFile(o.system);
        const outputRules: OutputRules = { inputs: [{ path: o.system, what: 'the system file read (--system)' }] };
        if (gridOut) await checkOutputs([gridOut], outputRules);
        const { request, through } = resolveRequest(system, o);
        const top = parseCount('--top', o.top, 1);
        const cells = request.depart.n * request.second.n;
        const workers = workerCount(o.workers, cells);
        const bar = createProgress('porkchop', 'cells', progressEnabled(!!o.json || !!o.csv));
        const abort = new AbortController();
        const onSigint = (): void => abort.abort();
        process.once('SIGINT', onSigint);
        let grid: PorkchopGrid;
        try {
          const onProgress = (done: number, total: number): void => bar.update(done, total);
          grid =
            workers === 0
              ? await computePorkchopAsync(system, request, { signal: abort.signal, onProgress })
              : await computePorkchopPooled(system, request, workers, { signal: abort.signal, onProgress });
        } finally {
          bar.stop();
          process.removeListener('SIGINT', onSigint);
        }
        if (gridOut) await gridFile(gridOut, grid, outputRules);
        const m = gridMinimum(grid);
        const min = m ? gridCell(system, grid, m.i, m.j) : null;
        const windows = findWindows(system, grid, { count: top });
        const cal = system.calendar;
        if (o.json) {
          printJson({
            request: { ...grid.request, fromId: system.bodies[request.from].id, toId: system.bodies[request.to].id },
            through,
            grid: {
              min: min ? { ...cellJson(cal, min), i: m!.i, j: m!.j } : null,
              nDepart: grid.request.depart.n,
              nTof: grid.request.second.n,
              secondAxis: grid.request.secondAxis,
              unsolved: grid.unsolved,
              workers,
            },
            windows: windows.map((w) => windowJson(cal, w)),
          });
        } else if (o.csv) {
          printData(windowsCsv(cal, windows));
        } else if (gridOut?.path !== STDOUT) {
          printText(`${through === null ? '' : `${through}\n`}${textReport(system, grid, min, windows)}`);
        }
        return windows.length === 0 ? EXIT_NO : undefined;
      }),
    );
}
