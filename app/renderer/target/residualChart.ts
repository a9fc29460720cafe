/**
 * The targeting panel's residual chart as plain data: one path per leg of the best residual
 * norm (log scale) against the flights flown, the line where the goals are met (a residual of
 * 1: every goal within its tolerance), and the decades labelled. d3 scales and line; the
 * component only draws the strings.
 */
import * as d3 from 'd3';
import type { ResidualPoint } from './progress.ts';

export interface ResidualChart {
  width: number;
  height: number;
  /** Plot area inside the labels. */
  left: number;
  right: number;
  top: number;
  bottom: number;
  legs: { leg: number; d: string; lastX: number; lastY: number }[];
  /** y of the residual 1 ("met") line, or null when it lies outside the plot. */
  metY: number | null;
  yTicks: { y: number; label: string }[];
  /** Flights at the right end of the axis. */
  flights: number;
}

const SUPERSCRIPT = '⁰¹²³⁴⁵⁶⁷⁸⁹';

/** 10 to the power n as "10³", "10⁻²", "1". */
export function decade(n: number): string {
  if (n === 0) return '1';
  if (n === 1) return '10';
  const digits = String(Math.abs(n))
    .split('')
    .map((c) => SUPERSCRIPT[Number(c)])
    .join('');
  return `10${n < 0 ? '⁻' : ''}${digits}`;
}

/** The chart of `series` in a width × height box (null with fewer than one point). */
export function residualChart(series: readonly ResidualPoint[], width: number, height: number): ResidualChart | null {
  const pts = series.filter((p) => p.residual > 0 && Number.isFinite(p.residual));
  if (pts.length === 0) return null;
  const left = 30;
  const right = width - 6;
  const top = 4;
  const bottom = height - 14;
  const hi = Math.max(10, d3.max(pts, (p) => p.residual) ?? 10);
  const lo = Math.min(0.1, d3.min(pts, (p) => p.residual) ?? 0.1);
  const y0 = Math.floor(Math.log10(lo));
  const y1 = Math.ceil(Math.log10(hi));
  const y = d3
    .scaleLog()
    .domain([10 ** y0, 10 ** y1])
    .range([bottom, top]);
  const fmax = Math.max(1, d3.max(pts, (p) => p.flights) ?? 1);
  const fmin = Math.min(fmax - 1, d3.min(pts, (p) => p.flights) ?? 0);
  const x = d3.scaleLinear().domain([fmin, fmax]).range([left, right]);
  const line = d3
    .line<ResidualPoint>()
    .x((p) => x(p.flights))
    .y((p) => y(p.residual))
    .curve(d3.curveStepAfter);
  const legs: ResidualChart['legs'] = [];
  for (const leg of [...new Set(pts.map((p) => p.leg))]) {
    const ps = pts.filter((p) => p.leg === leg);
    const last = ps[ps.length - 1];
    // a leg of one point still shows as a short step
    const drawn = ps.length === 1 ? [...ps, { ...last, flights: last.flights + Math.max(0.5, (fmax - fmin) * 0.01) }] : ps;
    legs.push({ leg, d: line(drawn) ?? '', lastX: x(last.flights), lastY: y(last.residual) });
  }
  // label every decade, or every other/third one counted from 1 (always labelled) when there are many
  const span = y1 - y0;
  const every = span > 8 ? 3 : span > 4 ? 2 : 1;
  const yTicks: ResidualChart['yTicks'] = [];
  for (let n = y0; n <= y1; n++) if (n % every === 0) yTicks.push({ y: y(10 ** n), label: decade(n) });
  return { width, height, left, right, top, bottom, legs, metY: y0 <= 0 && y1 >= 0 ? y(1) : null, yTicks, flights: fmax };
}
