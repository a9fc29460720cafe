/**
 * Text ↔ value for the Plan editor's fields. A field shows its value in a display unit
 * (km, t, m/s, °, calendar date) and reads back what the user typed: a plain number in the
 * display unit, or a number with any unit suffix core/io/units.ts knows ("5000km", "2.5d").
 * A parse failure is a message that names the field, shown beside it; nothing is committed.
 */
import { parseQuantity, type Dimension } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { formatCompactDate, parseDate } from '../../../core/system/index.ts';
import type { SystemCalendar } from '../../../core/system/index.ts';

export type Parsed<T> = { ok: true; value: T } | { ok: false; message: string };

export interface NumberUnit {
  /** Shown after the field: "km". */
  label: string;
  /** SI value of one display unit: 1000 for km. */
  scale: number;
  /** Dimension for unit suffixes typed by the user. */
  dim: Dimension;
  decimals: number;
}

export const UNITS = {
  km: { label: 'km', scale: 1000, dim: 'length', decimals: 3 },
  m: { label: 'm', scale: 1, dim: 'length', decimals: 1 },
  mps: { label: 'm/s', scale: 1, dim: 'speed', decimals: 3 },
  kg: { label: 'kg', scale: 1, dim: 'mass', decimals: 1 },
  t: { label: 't', scale: 1000, dim: 'mass', decimals: 3 },
  kN: { label: 'kN', scale: 1000, dim: 'force', decimals: 3 },
  s: { label: 's', scale: 1, dim: 'time', decimals: 2 },
  h: { label: 'h', scale: 3600, dim: 'time', decimals: 4 },
  deg: { label: '°', scale: Math.PI / 180, dim: 'angle', decimals: 4 },
  isp: { label: 's', scale: 1, dim: 'none', decimals: 1 },
  percent: { label: '%', scale: 1, dim: 'none', decimals: 2 },
  none: { label: '', scale: 1, dim: 'none', decimals: 6 },
  count: { label: '', scale: 1, dim: 'none', decimals: 0 },
} as const satisfies Record<string, NumberUnit>;

/** Shortest text of `x` in the unit, at most `decimals` decimals (no trailing zeros). */
export function formatNumber(si: number | null, unit: NumberUnit): string {
  if (si === null || si === undefined) return '';
  if (!Number.isFinite(si)) return String(si);
  const v = si / unit.scale;
  const fixed = v.toFixed(unit.decimals);
  const short = fixed.includes('.') ? fixed.replace(/\.?0+$/, '') : fixed;
  // a tiny negative rounds to "-0", which reads as a bug: it is 0 at the field's precision
  return short === '-0' ? '0' : short;
}

const PLAIN = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

export function parseNumber(label: string, text: string, unit: NumberUnit, opts: { nullable?: boolean; integer?: boolean } = {}): Parsed<number | null> {
  const s = text
    .trim()
    .replace(/\u2212/g, '-')
    .replace(/[\s\u202f]/g, '');
  if (s === '') return opts.nullable ? { ok: true, value: null } : { ok: false, message: `${label} is required` };
  let si: number;
  if (PLAIN.test(s)) si = Number(s) * unit.scale;
  else if (unit.dim !== 'none') {
    try {
      si = parseQuantity(label, s, unit.dim);
    } catch (err) {
      return { ok: false, message: err instanceof InputError ? `${label}: ${err.rule}` : `${label} must be a number` };
    }
  } else return { ok: false, message: `${label} must be a number (got "${text.trim()}")` };
  if (!Number.isFinite(si)) return { ok: false, message: `${label} must be a finite number` };
  if (opts.integer && !Number.isInteger(si)) return { ok: false, message: `${label} must be a whole number` };
  return { ok: true, value: si };
}

/** A date field: compact calendar date "412-149T23:01:00". */
export function formatTime(cal: SystemCalendar, t: number | null): string {
  if (t === null || !Number.isFinite(t)) return '';
  return formatCompactDate(cal, t, { seconds: true });
}

/**
 * Reads a date ("412-149", "412-149T23:01", "Year 412 TR, day 149, 23:01") or seconds from the
 * epoch written with a unit ("12960000s", "150d"). Empty is null when the field allows it.
 */
export function parseTime(label: string, text: string, cal: SystemCalendar, opts: { nullable?: boolean } = {}): Parsed<number | null> {
  const s = text.trim();
  if (s === '') return opts.nullable ? { ok: true, value: null } : { ok: false, message: `${label} is required` };
  if (/^[+-]?[\d.]+(?:e[+-]?\d+)?\s*(s|min|h|d)$/i.test(s)) {
    try {
      return { ok: true, value: parseQuantity(label, s.replace(/\s+/g, ''), 'time') };
    } catch (err) {
      return { ok: false, message: err instanceof InputError ? `${label}: ${err.rule}` : `${label} is not a time` };
    }
  }
  try {
    return { ok: true, value: parseDate(cal, s, label) };
  } catch (err) {
    return { ok: false, message: err instanceof InputError ? `${label} ${err.rule}` : `${label} is not a date` };
  }
}
