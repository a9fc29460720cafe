/** Ready-made format/parse pairs for the editor's fields (see fieldText.ts). */
import type { SystemCalendar } from '../../../core/system/index.ts';
import { UNITS, formatNumber, formatTime, parseNumber, parseTime, type NumberUnit, type Parsed } from './fieldText.ts';

type V = number | string | null;

export interface FieldKind {
  format(v: V): string;
  parse(text: string): Parsed<V>;
  unit: string;
}

export function numberKind(label: string, unit: NumberUnit = UNITS.none, opts: { nullable?: boolean; integer?: boolean } = {}): FieldKind {
  return {
    format: (v) => formatNumber(v as number | null, unit),
    parse: (t) => parseNumber(label, t, unit, opts),
    unit: unit.label,
  };
}

export function timeKind(label: string, cal: SystemCalendar, opts: { nullable?: boolean } = {}): FieldKind {
  return {
    format: (v) => formatTime(cal, v as number | null),
    parse: (t) => parseTime(label, t, cal, opts),
    unit: '',
  };
}

export function textKind(label: string, opts: { allowEmpty?: boolean } = {}): FieldKind {
  return {
    format: (v) => (v === null ? '' : String(v)),
    parse: (t) => (t.trim() === '' && !opts.allowEmpty ? { ok: false, message: `${label} must not be empty` } : { ok: true, value: t.trim() }),
    unit: '',
  };
}
