/**
 * The window calendar panel's words and files: the table rows (pair, opens, best departure,
 * closes, best Δv, flight time, each with its unit and a cut window marked), the exports (the
 * windows as CSV by core/io calendarCsv, the Calendar as JSON with its curves as plain arrays),
 * named `<system>.calendar.<ext>`, and the colour scale of the chart (best Δv, low to high:
 * mint, amber, red — the screen's own path and burn colours).
 */
import * as d3 from 'd3';
import { calendarCsv } from '../../../core/io/index.ts';
import type { Calendar, CalendarPair, CalendarWindow } from '../../../core/survey/index.ts';
import type { StarSystem, SystemCalendar } from '../../../core/system/index.ts';
import type { CalendarExportKind } from '../../preload/api.ts';
import { compactDate, speed } from '../format/format.ts';
import { mapFileBase } from './mapView.ts';

const DAY = 86400;

/** "Tessel → Ochre". */
export function pairLabel(p: Pick<CalendarPair, 'fromName' | 'toName'>): string {
  return `${p.fromName} → ${p.toName}`;
}

export interface CalendarRow {
  pair: string;
  opens: string;
  best: string;
  closes: string;
  dv: string;
  tof: string;
  /** Pair index and window index, for hover links. */
  p: number;
  w: number;
}

/** Flight time in days of 86 400 s: "238.4 d". */
export function flightDays(tof: number): string {
  return `${(tof / DAY).toFixed(1)} d`;
}

/** One row per window, pairs in order; a cut end reads "from the start (…)" / "(…) past the end". */
export function calendarRows(cal: Calendar, sc: SystemCalendar): CalendarRow[] {
  const rows: CalendarRow[] = [];
  cal.pairs.forEach((p, pi) =>
    p.windows.forEach((w, wi) =>
      rows.push({
        pair: pairLabel(p),
        opens: w.opensCut ? `≤ ${compactDate(sc, w.opens, false)}` : compactDate(sc, w.opens, false),
        best: compactDate(sc, w.best.depart, false),
        closes: w.closesCut ? `≥ ${compactDate(sc, w.closes, false)}` : compactDate(sc, w.closes, false),
        dv: speed(w.best.dv, 0),
        tof: flightDays(w.best.tof),
        p: pi,
        w: wi,
      }),
    ),
  );
  return rows;
}

export interface CalendarFile {
  kind: CalendarExportKind;
  name: string;
  data: string;
}

/** The Calendar as JSON: typed arrays as plain arrays. */
export function calendarJson(cal: Calendar): string {
  return `${JSON.stringify(cal, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as unknown as ArrayLike<number>) : v), 2)}\n`;
}

/** An export of the calendar, named `<system>.calendar.csv` / `.json`. */
export function calendarFile(kind: CalendarExportKind, cal: Calendar, system: StarSystem): CalendarFile {
  const base = `${mapFileBase(cal.system)}.calendar`;
  if (kind === 'calendar-json') return { kind, name: `${base}.json`, data: calendarJson(cal) };
  return { kind, name: `${base}.csv`, data: calendarCsv(system, cal) };
}

/** Every window of the calendar. */
export function allWindows(cal: Calendar): CalendarWindow[] {
  return cal.pairs.flatMap((p) => p.windows);
}

/**
 * The colour of a best Δv: mint at the calendar's lowest, amber at the middle, red at the 95th
 * percentile and above (a few very dear windows do not wash out the rest), on a log scale (Δv
 * spans an order of magnitude between the pairs).
 */
export function dvColourScale(cal: Calendar): { colour: (dv: number) => string; domain: [number, number] } {
  const dvs = allWindows(cal)
    .map((w) => w.best.dv)
    .filter((v) => v > 0 && Number.isFinite(v))
    .sort((a, b) => a - b);
  const lo = dvs.length ? dvs[0] : 1000;
  const hiRaw = dvs.length ? dvs[Math.min(dvs.length - 1, Math.floor(0.95 * (dvs.length - 1)))] : 2000;
  const hi = hiRaw > lo * 1.01 ? hiRaw : lo * 1.5;
  const t = d3.scaleLog().domain([lo, hi]).range([0, 1]).clamp(true);
  const ramp = d3.interpolateRgbBasis(['#6fdcae', '#e9b949', '#ff6b5a']);
  return { colour: (dv) => ramp(t(dv)), domain: [lo, hi] };
}
