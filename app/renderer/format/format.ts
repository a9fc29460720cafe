/**
 * Numbers for people: SI values from the core turned into the units the screens show.
 * Digits are grouped in threes with a narrow no-break space (ISO 80000-1 style, no locale
 * ambiguity); a true minus sign (U+2212) is used for negatives. Times use the system calendar
 * (core/system/calendar.ts).
 */
import { formatCompactDate, formatDate, formatDayLength, formatElapsed } from '../../../core/system/index.ts';
import type { StarSystem, SystemCalendar } from '../../../core/system/index.ts';
import { displayCalendar, type DayMode } from './dayMode.ts';

const NNBSP = '\u202f';
const MINUS = '\u2212';

/** `x` with `decimals` decimals, digits grouped in threes, true minus sign. Non-finite → "—". */
export function grouped(x: number, decimals = 0): string {
  if (!Number.isFinite(x)) return '—';
  const neg = x < 0 && Math.abs(x) >= 0.5 * 10 ** -decimals;
  const fixed = Math.abs(x).toFixed(decimals);
  const [int, frac] = fixed.split('.');
  let g = '';
  for (let i = 0; i < int.length; i++) {
    if (i > 0 && (int.length - i) % 3 === 0) g += NNBSP;
    g += int[i];
  }
  return (neg ? MINUS : '') + g + (frac !== undefined ? `.${frac}` : '');
}

/** Δv or speed: "1 234.5 m/s" below 100 km/s. */
export function speed(mps: number, decimals = 1): string {
  return `${grouped(mps, decimals)} m/s`;
}

/** Mass: kilograms below 10 t, tonnes above. */
export function mass(kg: number): string {
  if (!Number.isFinite(kg)) return '—';
  return Math.abs(kg) < 10_000 ? `${grouped(kg, 0)} kg` : `${grouped(kg / 1000, 2)} t`;
}

/** Distance: km below a million km, Gm (10⁹ m) above. */
export function distance(m: number): string {
  if (!Number.isFinite(m)) return '—';
  const a = Math.abs(m);
  if (a < 1e4) return `${grouped(m / 1000, 2)} km`;
  if (a < 1e9) return `${grouped(m / 1000, 0)} km`;
  return `${grouped(m / 1e9, 3)} Gm`;
}

/** A duration: "12.4 s", "3 min 12 s", "2 h 05 min", "4 d 06 h" (days of `dayLength`, default 86 400 s). */
export function duration(s: number, dayLength = 86400): string {
  if (!Number.isFinite(s)) return '—';
  const sign = s < 0 ? MINUS : '';
  const a = Math.abs(s);
  if (a < 60) return `${sign}${a.toFixed(a < 10 ? 2 : 1)} s`;
  if (a < 3600) {
    const m = Math.floor(a / 60);
    return `${sign}${m} min ${String(Math.floor(a - m * 60)).padStart(2, '0')} s`;
  }
  if (a < dayLength) {
    const h = Math.floor(a / 3600);
    return `${sign}${h} h ${String(Math.floor((a - h * 3600) / 60)).padStart(2, '0')} min`;
  }
  const d = Math.floor(a / dayLength);
  return `${sign}${d} d ${String(Math.floor((a - d * dayLength) / 3600)).padStart(2, '0')} h`;
}

export function degrees(rad: number, decimals = 2): string {
  return `${grouped((rad * 180) / Math.PI, decimals)}°`;
}

export function percent(fraction: number, decimals = 1): string {
  return `${grouped(fraction * 100, decimals)} %`;
}

/** Calendar date "Year 412 TR, day 37, 06:12". */
export function date(cal: SystemCalendar, t: number, seconds = false): string {
  return Number.isFinite(t) ? formatDate(cal, t, { seconds }) : '—';
}

/** Compact calendar date "412-037T06:12:30", the form date fields accept. */
export function compactDate(cal: SystemCalendar, t: number, seconds = true): string {
  return Number.isFinite(t) ? formatCompactDate(cal, t, { seconds }) : '—';
}

/** Mission elapsed time "T+ 12 d 04 h 33 min 10 s" (standard days of 86 400 s) from the plan start t0. */
export function elapsed(cal: SystemCalendar, t: number, t0: number): string {
  return Number.isFinite(t) && Number.isFinite(t0) ? formatElapsed(cal, t - t0) : '—';
}

/**
 * Whose day the dates count and how long it is: "days of Tessel: 26 h 06 min" (or
 * "calendar day: 25 h 00 min" when the system file gives the lengths itself), or with the
 * standard-day option (dayMode.ts) "standard days: 24 h 00 min". Dates count these days and
 * their clock runs past 24 h when the day is longer; elapsed times count 86 400 s days.
 */
export function calendarDay(system: Pick<StarSystem, 'calendar' | 'bodies'>, mode: DayMode = 'home'): string {
  if (mode === 'standard') return `standard days: ${formatDayLength(displayCalendar(system.calendar, mode))}`;
  const cal = system.calendar;
  const home = cal.homeIndex >= 0 ? system.bodies[cal.homeIndex]?.name : undefined;
  return `${home ? `days of ${home}` : 'calendar day'}: ${formatDayLength(cal)}`;
}
