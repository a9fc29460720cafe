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
 * - Mission elapsed time counts calendar days of `dayLength` s, then SI hh:mm:ss.
 *
 * Written forms:
 * - long:    "Year 412 TR, day 37, 06:12"    (formatDate; era label only when the calendar has one)
 * - compact: "412-037T06:12:30"              (formatCompactDate) — the ordinal-date pattern of
 *   ISO 8601 (year-dayOfYear), with the system's own year and day. The time part and its
 *   seconds are optional ("412-037", "412-037T06:12"); seconds may carry decimals; years may
 *   be negative ("-3-100"). A range in the command line is two dates joined by "..".
 * - elapsed: "T+ 12d 04:33:10" / "T− 0d 00:05:00" (formatElapsed).
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

/** Year, day of year and second of day of time t (s from the epoch). */
export function dateParts(cal: SystemCalendar, t: number): DateParts {
  checkCalendar(cal);
  if (!Number.isFinite(t)) throw new InputError('t', 'must be a finite number', t);
  let y = Math.floor(t / cal.yearLength);
  let inYear = t - y * cal.yearLength;
  if (inYear >= cal.yearLength) {
    y += 1;
    inYear -= cal.yearLength;
  }
  if (inYear < 0) inYear = 0;
  let d = Math.floor(inYear / cal.dayLength);
  let inDay = inYear - d * cal.dayLength;
  if (inDay >= cal.dayLength) {
    d += 1;
    inDay -= cal.dayLength;
  }
  if (inDay < 0) inDay = 0;
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

/** Mission elapsed time "T+ 12d 04:33:10" with days of the calendar's dayLength. */
export function formatElapsed(cal: SystemCalendar, dt: number): string {
  checkCalendar(cal);
  if (!Number.isFinite(dt)) throw new InputError('dt', 'must be a finite number', dt);
  const sign = dt < 0 ? 'T−' : 'T+';
  const a = Math.abs(dt);
  let d = Math.floor(a / cal.dayLength);
  let rest = a - d * cal.dayLength;
  if (rest >= cal.dayLength) {
    d += 1;
    rest -= cal.dayLength;
  }
  return `${sign} ${d}d ${clock(rest, true)}`;
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
