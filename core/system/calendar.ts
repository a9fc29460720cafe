/**
 * The system's display calendar: times (s from the epoch) as calendar dates and as mission
 * elapsed time, and compact dates parsed back into seconds.
 *
 * Rules:
 * - The epoch is the start of year `yearAtEpoch`, day 1, 00:00:00.
 * - A year lasts `yearLength` s and a day `dayLength` s. Days are numbered from 1 within each
 *   year; the year's last day is cut short where the year ends (year lengths need not be a
 *   whole number of days), and day numbering restarts at each new year.
 * - Clock times are SI hours, minutes and seconds since the start of the day, so a day longer
 *   than 24 h runs past 23:59 (a 26.1 h day ends at 26:06).
 * - Mission elapsed time counts standard days of 86 400 s (never the calendar's day), then SI
 *   hours, minutes and seconds, each with its unit.
 * - A time within rounding slack (a microsecond) of a whole second reads as that second, so a
 *   typed date comes back as typed.
 *
 * Written forms:
 * - long:    "Year 412 TR, day 37, 06:12"    (formatDate; era label only when the calendar has one)
 * - compact: "412-037T06:12:30"              (formatCompactDate) — the ordinal-date pattern of
 *   ISO 8601 (year-dayOfYear), with the system's own year and day. The time part and its
 *   seconds are optional ("412-037", "412-037T06:12"); seconds may carry decimals; years may
 *   be negative ("-3-100"). A range in the command line is two dates joined by "..".
 * - elapsed: "T+ 12 d 04 h 33 min 10 s" / "T− 0 d 00 h 05 min 00 s" (formatElapsed).
 * parseDate reads the compact form and the long form (with or without the era label).
 */

import { InputError } from '../math/index.ts';
import type { SystemCalendar } from './model.ts';

export interface DateParts {
  /** Calendar year number. */
  year: number;
  /** Day of the year, from 1. */
  day: number;
  /** Seconds since the start of the day, [0, dayLength). */
  secondOfDay: number;
}

function checkCalendar(cal: SystemCalendar): void {
  if (!(cal.yearLength > 0 && cal.dayLength > 0 && cal.dayLength <= cal.yearLength)) {
    throw new InputError('calendar', 'must have 0 < dayLength <= yearLength', cal);
  }
}

/** Number of (possibly partial) days in a year: ⌈yearLength / dayLength⌉. */
export function daysInYear(cal: SystemCalendar): number {
  return Math.ceil(cal.yearLength / cal.dayLength - 1e-12);
}

/**
 * Rounding slack of a calendar reading at time t: a microsecond, or a few units in the last
 * place of t when t is so large that its spacing is coarser. Dates are stored as seconds from
 * the epoch and the year and day lengths are not whole seconds, so a typed "416-062T13:00"
 * comes back from (year − epoch year)·yearLength + (day − 1)·dayLength + 46 800 a few 1e-8 s
 * short of 13:00; read without this slack it would show 12:59:59 (and a midnight as 26:06:23
 * of the previous day).
 */
function slack(t: number): number {
  return Math.max(1e-6, 8 * Number.EPSILON * Math.abs(t));
}

/** Year, day of year and second of day of time t (s from the epoch); a time within rounding slack of a whole second reads as that second. */
export function dateParts(cal: SystemCalendar, t: number): DateParts {
  checkCalendar(cal);
  if (!Number.isFinite(t)) throw new InputError('t', 'must be a finite number', t);
  const tol = slack(t);
  let y = Math.floor(t / cal.yearLength);
  let inYear = t - y * cal.yearLength;
  if (inYear >= cal.yearLength - tol) {
    y += 1;
    inYear -= cal.yearLength;
  }
  if (inYear < 0) inYear = 0;
  let d = Math.floor(inYear / cal.dayLength);
  let inDay = inYear - d * cal.dayLength;
  if (inDay >= cal.dayLength - tol) {
    d += 1;
    inDay -= cal.dayLength;
  }
  if (inDay < 0) inDay = 0;
  const whole = Math.round(inDay);
  if (Math.abs(inDay - whole) <= tol) inDay = whole;
  return { year: cal.yearAtEpoch + y, day: d + 1, secondOfDay: inDay };
}

/** Seconds from the epoch of a calendar date; InputError when the day or time lies outside the year. */
export function dateToSeconds(cal: SystemCalendar, year: number, day: number, secondOfDay = 0): number {
  checkCalendar(cal);
  if (!Number.isInteger(year)) throw new InputError('year', 'must be an integer', year);
  const nDays = daysInYear(cal);
  if (!Number.isInteger(day) || day < 1 || day > nDays) {
    throw new InputError('day', `must be a whole day number from 1 to ${nDays}`, day);
  }
  const inYear = (day - 1) * cal.dayLength + secondOfDay;
  const dayEnd = Math.min(cal.dayLength, cal.yearLength - (day - 1) * cal.dayLength);
  if (!(secondOfDay >= 0 && secondOfDay < dayEnd)) {
    throw new InputError('time', `must lie within day ${day} (before ${clock(dayEnd, true)})`, clock(secondOfDay, true));
  }
  return (year - cal.yearAtEpoch) * cal.yearLength + inYear;
}

function pad(n: number, width = 2): string {
  return String(n).padStart(width, '0');
}

// hh:mm or hh:mm:ss of a non-negative second count, truncated (never rounded up into the next unit).
function clock(s: number, seconds: boolean): string {
  const whole = Math.floor(s + 1e-9);
  const h = Math.floor(whole / 3600);
  const m = Math.floor((whole % 3600) / 60);
  const sec = whole % 60;
  return seconds ? `${pad(h)}:${pad(m)}:${pad(sec)}` : `${pad(h)}:${pad(m)}`;
}

export interface FormatOptions {
  /** Show seconds (default false). */
  seconds?: boolean;
}

/** "Year 412 TR, day 37, 06:12" (time truncated to the shown unit). */
export function formatDate(cal: SystemCalendar, t: number, options: FormatOptions = {}): string {
  const p = dateParts(cal, t);
  const era = cal.era ? ` ${cal.era}` : '';
  return `Year ${p.year}${era}, day ${p.day}, ${clock(p.secondOfDay, options.seconds ?? false)}`;
}

/** "412-037T06:12" (or with seconds "412-037T06:12:30"); parseDate reads it back. */
export function formatCompactDate(cal: SystemCalendar, t: number, options: FormatOptions = {}): string {
  const p = dateParts(cal, t);
  const width = Math.max(3, String(daysInYear(cal)).length);
  return `${p.year}-${pad(p.day, width)}T${clock(p.secondOfDay, options.seconds ?? false)}`;
}

/** Seconds in a standard day, the day that "d" means in elapsed times and durations. */
export const STANDARD_DAY = 86400;

/**
 * Mission elapsed time "T+ 12 d 04 h 33 min 10 s" in standard days of 86 400 s.
 * Why standard days: a home-world day is not 24 h (the demo's is 26 h 06 min), and counting
 * elapsed time in it gave "T+ 774d 25:03:04", whose 25th hour reads as a bug. Here "d" means
 * the same 86 400 s as in every duration on screen and on the command line, the hours stay
 * below 24, and each field carries its unit; the home world's day appears only in calendar
 * dates (formatDayLength says how long it is).
 */
export function formatElapsed(cal: SystemCalendar, dt: number): string {
  checkCalendar(cal);
  if (!Number.isFinite(dt)) throw new InputError('dt', 'must be a finite number', dt);
  const sign = dt < 0 ? 'T−' : 'T+';
  const whole = Math.floor(Math.abs(dt) + slack(dt));
  const d = Math.floor(whole / STANDARD_DAY);
  const rest = whole - d * STANDARD_DAY;
  const h = Math.floor(rest / 3600);
  const m = Math.floor((rest % 3600) / 60);
  return `${sign} ${d} d ${pad(h)} h ${pad(m)} min ${pad(rest % 60)} s`;
}

/** The calendar day's length in hours and minutes, "26 h 06 min" (a 24 h day reads "24 h 00 min"). */
export function formatDayLength(cal: SystemCalendar): string {
  checkCalendar(cal);
  const minutes = Math.round(cal.dayLength / 60);
  return `${Math.floor(minutes / 60)} h ${pad(minutes % 60)} min`;
}

const COMPACT = /^(-?\d+)-(\d{1,4})(?:T(\d{1,3}):(\d{2})(?::(\d{2}(?:\.\d+)?))?)?$/;
const LONG = /^year\s+(-?\d+)(?:\s+(.+?))?\s*,\s*day\s+(\d{1,4})(?:\s*,\s*(\d{1,3}):(\d{2})(?::(\d{2}(?:\.\d+)?))?)?$/i;

/**
 * Seconds from the epoch of a date written "412-037", "412-037T06:12", "412-037T06:12:30.5"
 * or "Year 412 TR, day 37, 06:12". InputError (field = the given `field`) on anything else.
 */
export function parseDate(cal: SystemCalendar, text: string, field = 'date'): number {
  const s = text.trim();
  let year: string;
  let day: string;
  let hh: string | undefined;
  let mm: string | undefined;
  let ss: string | undefined;
  const c = COMPACT.exec(s);
  if (c) {
    [, year, day, hh, mm, ss] = c;
  } else {
    const l = LONG.exec(s);
    if (!l) {
      throw new InputError(field, 'must be a date like "412-037", "412-037T06:12" or "Year 412, day 37, 06:12"', text);
    }
    let era: string | undefined;
    [, year, era, day, hh, mm, ss] = l;
    if (era !== undefined && era !== cal.era) {
      throw new InputError(field, cal.era ? `must use the era "${cal.era}"` : 'must not carry an era label (this calendar has none)', text);
    }
  }
  const h = hh === undefined ? 0 : Number(hh);
  const m = mm === undefined ? 0 : Number(mm);
  const sec = ss === undefined ? 0 : Number(ss);
  if (m >= 60 || sec >= 60) throw new InputError(field, 'must have minutes and seconds below 60', text);
  try {
    return dateToSeconds(cal, Number(year), Number(day), h * 3600 + m * 60 + sec);
  } catch (err) {
    if (err instanceof InputError) throw new InputError(field, `${err.field} ${err.rule}`, text);
    throw err;
  }
}
