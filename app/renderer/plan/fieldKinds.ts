/** Ready-made format/parse pairs for the editor's fields (see fieldText.ts). */
import type { SystemCalendar } from '../../../core/system/index.ts';
import { UNITS, formatNumber, formatTime, parseNumber, parseTime, type NumberUnit, type Parsed } from './fieldText.ts';

type V = number | string | null;

export interface FieldKind {
  format(v: V): string;
  parse(text: string): Parsed<V>;
  unit: string;
  /** A rule of the plan checks about this field, in the user's words: "Stage 1 dry mass must be at least 0 t". */
  explain(rule: string): string;
}

const COMPARISON: Record<string, string> = { '>=': 'at least', '>': 'more than', '<=': 'at most', '<': 'less than' };

/**
 * The rule of a bound check ("must be >= 0", written in the file's unit: SI, angles in degrees)
 * in the field's display unit and words; any other rule is kept as it is.
 */
export function boundInUnit(rule: string, unit: NumberUnit): string {
  const m = /^must be (>=|>|<=|<) (-?[\d.]+(?:e[+-]?\d+)?)$/.exec(rule);
  if (!m) return rule;
  const fileScale = unit.dim === 'angle' ? Math.PI / 180 : 1;
  const shown = (Number(m[2]) * fileScale) / unit.scale;
  const text = shown.toLocaleString('en-US', { maximumFractionDigits: Math.max(unit.decimals, 3) });
  return `must be ${COMPARISON[m[1]]} ${text}${unit.label === '' ? '' : unit.label === '%' || unit.label === '°' ? unit.label : ` ${unit.label}`}`;
}

export function numberKind(label: string, unit: NumberUnit = UNITS.none, opts: { nullable?: boolean; integer?: boolean } = {}): FieldKind {
  return {
    format: (v) => formatNumber(v as number | null, unit),
    parse: (t) => parseNumber(label, t, unit, opts),
    unit: unit.label,
    explain: (rule) => `${label} ${boundInUnit(rule, unit)}`,
  };
}

export function timeKind(label: string, cal: SystemCalendar, opts: { nullable?: boolean } = {}): FieldKind {
  return {
    format: (v) => formatTime(cal, v as number | null),
    parse: (t) => parseTime(label, t, cal, opts),
    unit: '',
    explain: (rule) => `${label} ${rule}`,
  };
}

export function textKind(label: string, opts: { allowEmpty?: boolean } = {}): FieldKind {
  return {
    format: (v) => (v === null ? '' : String(v)),
    parse: (t) => (t.trim() === '' && !opts.allowEmpty ? { ok: false, message: `${label} must not be empty` } : { ok: true, value: t.trim() }),
    unit: '',
    explain: (rule) => `${label} ${rule}`,
  };
}
