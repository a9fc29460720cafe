/**
 * `waymark sequence` — the cheapest way through a sequence of sibling bodies with flybys between
 * (Tessel → Moravel → Fennick): the multi-leg search of core/search (searchSequence) over a
 * departure range, every leg's flight time free, flybys powered (a burn at periapsis) or
 * unpowered (a mismatch in |v∞| paid as an extra burn), each flyby's periapsis no lower than the
 * body's minimum safe altitude. A body may come twice (a resonant return).
 *
 * Times: calendar dates of the system ("412-037") or times from the epoch ("120d"); flight times
 * are durations. Defaults: departures from the epoch over one synodic period of the first two
 * bodies, flight times from the Hohmann time of each pair (core/search), parking and capture
 * periapses 100 km above each body's minimum safe altitude (core/io/defaults.ts).
 *
 * Output: a text table of the best solutions (dates, flight days per leg, Δv breakdown, v∞ and
 * flyby periapses) and the best direct transfer beside them; `--json`: { request, method,
 * lambertSolves, evaluations, direct, solutions } in SI with calendar dates added. Exit code 1
 * when no solution is found.
 */
import type { Command } from 'commander';
import { ALTITUDE_MARGIN, orbitAltitude, parseQuantity, parseRange, requireSafeAltitude } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { synodicPeriod } from '../../../core/orbit/index.ts';
import { searchSequence, type SequenceRequest, type SequenceResult, type SequenceSolution } from '../../../core/search/index.ts';
import { formatCompactDate } from '../../../core/system/index.ts';
import type { StarSystem, SystemCalendar } from '../../../core/system/index.ts';
import { loadSystemFile } from '../../node/files.ts';
import type { FlagNames } from '../flags.ts';
import { bodyIndexNamed } from '../flags.ts';
import { EXIT_NO, guard, num, printJson, printText } from '../output.ts';
import { createProgress, progressEnabled } from '../progress.ts';
import { parseTime } from './windows.ts';

const DAY = 86400;
/** Solutions listed unless --keep says otherwise (the core's default). */
export const SEQUENCE_KEEP = 5;

/** `sequence`: which flag sets which field of the sequence request (core/search/sequence.ts). */
export const SEQUENCE_FLAGS: FlagNames = {
  bodies: 'BODIES',
  departFrom: ['--depart', 'START'],
  departTo: ['--depart', 'END'],
  legTof: '--tof',
  departAltitude: '--parking',
  arriveAltitude: '--capture',
  arriveE: '--capture-e',
  powered: '--unpowered',
  keep: '--keep',
};

export interface SequenceOptions {
  system: string;
  depart?: string;
  tof?: string;
  parking?: string;
  capture?: string;
  captureE: string;
  flyby?: boolean;
  powered?: boolean;
  unpowered?: boolean;
  keep: string;
  json?: boolean;
}

function parseCount(field: string, text: string, min: number): number {
  const v = Number(text);
  if (!/^\s*\d+\s*$/.test(text) || !Number.isInteger(v) || v < min) throw new InputError(field, `must be a whole number >= ${min}`, text);
  return v;
}

/**
 * The request the command line describes: body names in order (ids or names, any case), the
 * departure range, per-leg flight-time ranges (`--tof 100d..300d,200d..500d`, one per leg), the
 * parking and capture orbits and the flyby kind. Errors name the flag or the body argument.
 */
export function sequenceRequest(system: StarSystem, names: readonly string[], o: SequenceOptions): SequenceRequest {
  if (names.length < 2) throw new InputError('BODIES', 'must name at least two bodies in order (e.g. tessel moravel fennick)', names.join(' '));
  const idx = names.map((n, k) => bodyIndexNamed(system, `BODIES[${k + 1}]`, n));
  const bodies = idx.map((k) => system.bodies[k]);
  for (let k = 1; k < bodies.length; k++) {
    if (bodies[k].parentIndex !== bodies[0].parentIndex || bodies[0].parentIndex < 0) {
      throw new InputError(
        `BODIES[${k + 1}]`,
        `must orbit the same body as ${bodies[0].name} (a sequence runs between sister bodies; ${bodies[k].name} does not)`,
        names[k],
      );
    }
    if (idx[k] === idx[k - 1]) throw new InputError(`BODIES[${k + 1}]`, `must differ from the body before it (${bodies[k].name} twice in a row)`, names[k]);
  }
  if (o.powered && o.unpowered) throw new InputError('--unpowered', 'cannot be combined with --powered');
  if (o.flyby && o.captureE !== '0') throw new InputError('--capture-e', 'cannot be combined with --flyby');
  const first = bodies[0];
  const last = bodies[bodies.length - 1];
  const cal = system.calendar;
  const time = (field: string, text: string): number => parseTime(cal, field, text);
  let departFrom = 0;
  let departTo: number;
  if (o.depart !== undefined) {
    [departFrom, departTo] = parseRange('--depart', o.depart, time);
  } else {
    const p1 = first.derived.period;
    const p2 = bodies[1].derived.period;
    departTo = p1 === p2 ? p1 : synodicPeriod(p1, p2);
  }
  let legTof: [number, number][] | undefined;
  if (o.tof !== undefined) {
    const parts = o.tof.split(',');
    if (parts.length !== bodies.length - 1) {
      throw new InputError(
        '--tof',
        `must give one flight-time range per leg (${bodies.length - 1} here), separated by commas, e.g. 100d..300d,200d..600d`,
        o.tof,
      );
    }
    legTof = parts.map((p) => {
      const [a, b] = parseRange('--tof', p, 'time');
      if (!(a > 0)) throw new InputError('--tof', 'must start above zero', p);
      return [a, b];
    });
  }
  const departAltitude = o.parking !== undefined ? parseQuantity('--parking', o.parking, 'length') : orbitAltitude(first);
  requireSafeAltitude('--parking', first, departAltitude);
  const arriveAltitude = o.capture !== undefined ? parseQuantity('--capture', o.capture, 'length') : orbitAltitude(last);
  let arriveE: number | null = null;
  if (!o.flyby) {
    requireSafeAltitude('--capture', last, arriveAltitude);
    arriveE = parseQuantity('--capture-e', o.captureE, 'none');
    if (!(arriveE >= 0 && arriveE < 1))
      throw new InputError('--capture-e', 'must be from 0 up to (not including) 1 for a capture; use --flyby for no capture', o.captureE);
  }
  const req: SequenceRequest = {
    bodies: bodies.map((b) => b.id),
    departFrom,
    departTo,
    departAltitude,
    arriveAltitude,
    arriveE,
    powered: !o.unpowered,
    keep: parseCount('--keep', o.keep, 1),
  };
  if (legTof) req.legTof = legTof;
  return req;
}

/** A solution with calendar dates beside the seconds (the --json form). */
export function solutionJson(cal: SystemCalendar, s: SequenceSolution): Record<string, unknown> {
  const date = (t: number): string => formatCompactDate(cal, t, { seconds: true });
  return {
    ...s,
    departDate: date(s.depart),
    arriveDate: date(s.arrive),
    legs: s.legs.map((l) => ({ ...l, departDate: date(l.depart), arriveDate: date(l.arrive) })),
    flybys: s.flybys.map((f) => ({ ...f, date: date(f.t) })),
  };
}

/** Δv in m/s to 0.1 m/s (a powered flyby that needs no burn comes out as round-off, printed 0.0). */
function dvText(x: number): string {
  return num(Math.abs(x) < 0.05 ? 0 : x, 1);
}

function pad(s: string, w: number, left = false): string {
  return left ? s.padEnd(w) : s.padStart(w);
}

function table(head: string[], rows: string[][], leftCols: number[]): string[] {
  const widths = head.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const fmt = (r: string[]): string => r.map((cell, c) => pad(cell, widths[c], leftCols.includes(c))).join('  ');
  return [fmt(head), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(fmt)];
}

/** The text report: the request in one line, the solutions' table, then each solution's legs and flybys. */
export function sequenceText(system: StarSystem, req: SequenceRequest, result: SequenceResult): string {
  const cal = system.calendar;
  const date = (t: number): string => formatCompactDate(cal, t);
  const name = (id: string): string => system.bodies.find((b) => b.id === id)?.name ?? id;
  const capture = req.arriveE === null ? 'no capture (flyby)' : `capture ${num(req.arriveAltitude / 1e3, 0)} km (e ${req.arriveE})`;
  const lines = [
    `${req.bodies.map(name).join(' -> ')}: departures ${date(req.departFrom)} .. ${date(req.departTo)}, ${req.powered === false ? 'unpowered' : 'powered'} flybys`,
    `parking ${num(req.departAltitude / 1e3, 0)} km, ${capture}; ${result.method}; ${result.lambertSolves} Lambert solves, ${result.evaluations} evaluations`,
    result.direct
      ? `direct ${name(req.bodies[0])} -> ${name(req.bodies[req.bodies.length - 1])}: ${num(result.direct.dvTotal, 1)} m/s, departing ${date(result.direct.depart)}, arriving ${date(result.direct.arrive)}`
      : 'direct transfer: none found over these departures',
    '',
  ];
  if (result.solutions.length === 0) {
    lines.push('no sequence solution found in the searched ranges');
    return lines.join('\n');
  }
  const head = ['#', 'departure', 'arrival', 'legs d', 'dv dep m/s', 'dv flybys m/s', 'dv capture m/s', 'dv total m/s'];
  const rows = result.solutions.map((s, k) => [
    String(k + 1),
    date(s.depart),
    date(s.arrive),
    s.legs.map((l) => num(l.tof / DAY, 0)).join('+'),
    dvText(s.dvDepart),
    dvText(s.dvFlybys),
    dvText(s.dvCapture),
    dvText(s.dvTotal),
  ]);
  lines.push(...table(head, rows, [1, 2, 3]));
  result.solutions.forEach((s, k) => {
    lines.push('', `#${k + 1}`);
    lines.push(
      ...table(
        ['leg', 'departure', 'arrival', 'flight d', 'vinf dep km/s', 'vinf arr km/s'],
        s.legs.map((l) => [
          `${name(l.from)} -> ${name(l.to)}`,
          date(l.depart),
          date(l.arrive),
          num(l.tof / DAY, 1),
          num(l.vInfDepart / 1e3, 3),
          num(l.vInfArrive / 1e3, 3),
        ]),
        [0, 1, 2],
      ).map((l) => `  ${l}`),
    );
    if (s.flybys.length > 0) {
      lines.push(
        ...table(
          ['flyby', 'date', 'periapsis km', 'vinf in km/s', 'vinf out km/s', 'turn deg', 'B-plane deg', 'dv m/s', 'free dv m/s'],
          s.flybys.map((f) => [
            `${name(f.body)}${f.limited ? '*' : ''}`,
            date(f.t),
            num(f.periapsisAltitude / 1e3, 0),
            num(f.vInfIn / 1e3, 3),
            num(f.vInfOut / 1e3, 3),
            num((f.turn * 180) / Math.PI, 2),
            num((f.bAngle * 180) / Math.PI, 1),
            dvText(f.dv),
            dvText(f.freeDv),
          ]),
          [0, 1],
        ).map((l) => `  ${l}`),
      );
    }
  });
  if (result.solutions.some((s) => s.flybys.some((f) => f.limited))) {
    lines.push('', '* periapsis held at the minimum safe altitude: the rest of the turn is paid as a burn (in dv)');
  }
  return lines.join('\n');
}

export function addSequenceCommand(program: Command): void {
  program
    .command('sequence')
    .description('cheapest route through bodies in order with flybys between: multi-leg search, Δv breakdown, v∞ and flyby periapses')
    .argument('<bodies...>', 'bodies in order, at least two sister bodies (e.g. tessel moravel fennick); a body may return (resonant return)')
    .requiredOption('--system <file>', 'system file')
    .option(
      '--depart <start..end>',
      'departure range: calendar dates (412-037) or times from the epoch (0d..800d); default: from the epoch over one synodic period of the first two bodies',
    )
    .option('--tof <ranges>', 'flight-time range of each leg, separated by commas (e.g. 100d..300d,200d..600d); default: from the Hohmann time of each pair')
    .option('--parking <alt>', `parking-orbit periapsis altitude at the first body (default: its minimum safe altitude + ${ALTITUDE_MARGIN / 1e3} km)`)
    .option('--capture <alt>', `capture periapsis altitude at the last body (default: its minimum safe altitude + ${ALTITUDE_MARGIN / 1e3} km)`)
    .option('--capture-e <e>', 'target-orbit eccentricity at the last body', '0')
    .option('--flyby', 'no capture at the last body (capture Δv = 0)')
    .option('--powered', 'flybys may burn at periapsis (the default)')
    .option('--unpowered', 'flybys without a burn: a mismatch in |v∞| is paid as an extra burn')
    .option('--keep <n>', 'number of solutions to list', String(SEQUENCE_KEEP))
    .option('--json', 'machine-readable output')
    .action((names: string[], o: SequenceOptions) =>
      guard({ json: !!o.json, flags: SEQUENCE_FLAGS }, async () => {
        const { system } = await loadSystemFile(o.system);
        const req = sequenceRequest(system, names, o);
        const bar = createProgress('sequence', 'permille', progressEnabled(!!o.json));
        let result: SequenceResult;
        try {
          result = searchSequence(system, req, (f) => bar.update(Math.round(f * 1000), 1000));
        } finally {
          bar.stop();
        }
        const cal = system.calendar;
        if (o.json) {
          printJson({
            request: { ...req, departFromDate: formatCompactDate(cal, req.departFrom), departToDate: formatCompactDate(cal, req.departTo) },
            method: result.method,
            lambertSolves: result.lambertSolves,
            evaluations: result.evaluations,
            direct: result.direct
              ? { ...result.direct, departDate: formatCompactDate(cal, result.direct.depart), arriveDate: formatCompactDate(cal, result.direct.arrive) }
              : null,
            solutions: result.solutions.map((s) => solutionJson(cal, s)),
          });
        } else {
          printText(sequenceText(system, req, result));
        }
        return result.solutions.length === 0 ? EXIT_NO : undefined;
      }),
    );
}
