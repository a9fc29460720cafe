/**
 * `waymark calendar --system FILE [--years N] [--within PCT] [--pair FROM:TO ...] [--json | --csv]
 * [--workers N|auto]` — the window calendar of a system (core/survey/calendar.ts): for each pair
 * (every ordered pair of the star's planets by default) over N calendar years from the epoch,
 * when each transfer window opens and closes (total Δv within PCT % of that window's minimum),
 * its best departure, Δv and flight time.
 *
 * Text: per pair, one line per window with the dates in the system's calendar, the best Δv and
 * the flight time in days; a window cut by the calendar's start or end is marked. `--json`: the
 * Calendar in SI (s from the epoch, m/s), curves left out. `--csv`: one row per window
 * (core/io calendarCsv). Pairs are computed over worker threads (app/cli/calendarPool.ts) when
 * --workers is above 0 ('auto': one per core, at most 8), else in this thread; progress on
 * stderr at a terminal; Ctrl-C cancels.
 * Exit codes: 0 done, 2 bad input or file, 3 numerical failure (or cancelled).
 */
import { availableParallelism } from 'node:os';
import type { Command } from 'commander';
import { calendarCsv } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { CALENDAR_WITHIN, CALENDAR_YEARS, resolveCalendarRequest, windowCalendar, type Calendar, type CalendarRequest } from '../../../core/survey/index.ts';
import { formatCompactDate, type StarSystem } from '../../../core/system/index.ts';
import { loadSystemFile } from '../../node/files.ts';
import { windowCalendarPooled } from '../calendarPool.ts';
import { bodyIndexNamed } from '../flags.ts';
import { EXIT_OK, guard, printData, printJson, printText, printWarnings } from '../output.ts';
import { createProgress, progressEnabled } from '../progress.ts';

const DAY = 86400;
const MAX_AUTO_WORKERS = 8;

export interface CalendarCliOptions {
  system: string;
  years: string;
  within: string;
  pair: string[];
  json?: boolean;
  csv?: boolean;
  workers: string;
}

/** The flags that set each core field, for errors in the user's words. */
const CALENDAR_FLAGS = { years: '--years', within: '--within', pairs: '--pair' } as const;

function parseNumber(flag: string, text: string, lo: number, hi: number, what: string): number {
  const v = Number(text);
  if (text.trim() === '' || !Number.isFinite(v) || v < lo || v > hi) throw new InputError(flag, `must be ${what}`, text);
  return v;
}

/** `--pair FROM:TO` (ids or names) → body ids. */
export function parsePair(system: StarSystem, text: string): { from: string; to: string } {
  const parts = text.split(':');
  if (parts.length !== 2 || parts[0].trim() === '' || parts[1].trim() === '') {
    throw new InputError('--pair', 'must be FROM:TO, two bodies joined by a colon (e.g. tessel:ochre)', text);
  }
  const from = system.bodies[bodyIndexNamed(system, '--pair', parts[0])].id;
  const to = system.bodies[bodyIndexNamed(system, '--pair', parts[1])].id;
  return { from, to };
}

/** The calendar request the options describe. */
export function calendarRequest(system: StarSystem, o: Pick<CalendarCliOptions, 'years' | 'within' | 'pair'>): CalendarRequest {
  const years = parseNumber('--years', o.years, Number.MIN_VALUE, 200, 'a number of calendar years above 0 and at most 200');
  const within = parseNumber('--within', o.within, 0.1, 100, 'a percentage from 0.1 to 100') / 100;
  const request: CalendarRequest = { years, within };
  if (o.pair.length > 0) request.pairs = o.pair.map((p) => parsePair(system, p));
  try {
    resolveCalendarRequest(system, request);
  } catch (e) {
    // "pair 2 to must name ..." → about --pair
    if (e instanceof InputError && /^pair \d+/.test(e.field)) {
      throw new InputError(
        '--pair',
        `${o.pair[Number(/\d+/.exec(e.field)![0]) - 1] ?? ''}: ${e.field.replace(/^pair \d+ ?/, '')} ${e.rule}`.replace(/: {2}/, ': '),
        e.value,
      );
    }
    throw e;
  }
  return request;
}

const ms = (v: number): string => `${Math.round(v).toLocaleString('en-US')} m/s`;

/** The text report of a calendar. */
export function calendarText(system: StarSystem, c: Calendar): string {
  const date = (t: number): string => formatCompactDate(system.calendar, t);
  const out: string[] = [
    `Window calendar of ${c.system}: ${date(c.start)} to ${date(c.end)}, windows open while the total Δv (low orbit to low orbit) is within ${+(c.within * 100).toFixed(3)} % of their minimum`,
  ];
  for (const p of c.pairs) {
    out.push('');
    out.push(
      `${p.fromName} → ${p.toName}: ${p.windows.length} window${p.windows.length === 1 ? '' : 's'}, synodic period ${(p.synodic / DAY).toFixed(1)} d${p.through ? ` (${p.through})` : ''}`,
    );
    out.push(['  opens', 'best departure', 'closes', 'best Δv', 'flight'].map((s, k) => (k < 3 ? s.padEnd(k === 0 ? 18 : 16) : s.padStart(12))).join(' '));
    for (const w of p.windows) {
      out.push(
        [
          `  ${w.opensCut ? `(${date(w.opens)}` : date(w.opens)}`.padEnd(18),
          date(w.best.depart).padEnd(16),
          (w.closesCut ? `${date(w.closes)})` : date(w.closes)).padEnd(16),
          ms(w.best.dv).padStart(12),
          `${(w.best.tof / DAY).toFixed(1)} d`.padStart(12),
        ].join(' '),
      );
    }
  }
  if (c.pairs.some((p) => p.windows.some((w) => w.opensCut || w.closesCut))) {
    out.push('');
    out.push('( or ) marks a window already open at the start or still open at the end of the calendar: its true opening or closing lies outside it.');
  }
  return out.join('\n');
}

function workerCount(text: string, pairs: number): number {
  if (text === 'auto') return Math.min(MAX_AUTO_WORKERS, pairs, Math.max(1, availableParallelism()));
  const v = Number(text);
  if (!/^\s*\d+\s*$/.test(text) || !Number.isInteger(v)) throw new InputError('--workers', "must be a whole number >= 0 or 'auto'", text);
  return v;
}

export function addCalendarCommand(program: Command): void {
  program
    .command('calendar')
    .description('the window calendar: when transfer windows between bodies open and close over N years, with the best Δv and flight time')
    .requiredOption('--system <file>', 'system file (.system.json)')
    .option('--years <n>', 'calendar years of the system to cover, from the epoch', String(CALENDAR_YEARS))
    .option('--within <pct>', 'a window is open while the total Δv is within this percentage of its minimum', String(CALENDAR_WITHIN * 100))
    .option(
      '--pair <from:to>',
      'a pair of bodies (ids or names; repeat for more; default every ordered pair of planets)',
      (v: string, prev: string[]) => [...prev, v],
      [] as string[],
    )
    .option('--json', 'machine-readable output (the calendar in SI units)')
    .option('--csv', 'one CSV row per window')
    .option('--workers <n>', "worker threads (0 = in this thread; 'auto' one per core)", 'auto')
    .action((o: CalendarCliOptions) =>
      guard({ json: !!o.json, flags: CALENDAR_FLAGS }, async () => {
        if (o.json && o.csv) throw new InputError('--csv', 'cannot be combined with --json');
        const { system, warnings } = await loadSystemFile(o.system);
        const request = calendarRequest(system, o);
        const nPairs = resolveCalendarRequest(system, request).pairs.length;
        const workers = workerCount(o.workers, nPairs);
        const bar = createProgress('calendar', 'departures', progressEnabled(!!o.json || !!o.csv));
        const abort = new AbortController();
        const onSigint = (): void => abort.abort();
        process.once('SIGINT', onSigint);
        let cal: Calendar;
        try {
          const onProgress = (done: number, total: number): void => bar.update(done, total);
          cal =
            workers === 0
              ? windowCalendar(system, request, { onProgress, signal: abort.signal, curve: false })
              : await windowCalendarPooled(system, request, workers, { onProgress, signal: abort.signal });
        } finally {
          bar.stop();
          process.removeListener('SIGINT', onSigint);
        }
        if (o.json) printJson({ ...cal, pairs: cal.pairs.map(({ curve: _curve, ...p }) => p), workers, warnings });
        else if (o.csv) printData(calendarCsv(system, cal));
        else {
          printWarnings(warnings);
          printText(calendarText(system, cal));
        }
        return EXIT_OK;
      }),
    );
}
