/**
 * The window calendar chart (d3, SVG): one row per pair ("Tessel → Ochre"), time across in the
 * system's calendar (ticks "Year 413"), each window a bar from its opening to its closing,
 * coloured by its best Δv (legend above, calendarView.ts dvColourScale), a chalk mark at its best
 * departure, and the best Δv written beside the bar where it fits before the next window. A
 * window cut by the calendar's start or end is drawn paler with a dashed outline on the cut
 * side. Hovering a window reports it (the panel shows its dates, Δv and flight time). The chart
 * is as wide as its container and as tall as its rows; the panel scrolls it vertically.
 */
import * as d3 from 'd3';
import type { Calendar, CalendarPair, CalendarWindow } from '../../../core/survey/index.ts';
import type { SystemCalendar } from '../../../core/system/index.ts';
import { calendarTicks } from '../timeline/ticks.ts';
import { dvColourScale, pairLabel } from './calendarView.ts';

export const ROW_HEIGHT = 22;
const MARGIN = { right: 14, top: 34, bottom: 38 } as const;
const LABEL_FONT = '11px var(--mono, monospace)';

export interface CalendarHover {
  pair: CalendarPair;
  window: CalendarWindow;
  /** Pair and window indices. */
  p: number;
  w: number;
  /** Pointer position in client pixels. */
  x: number;
  y: number;
}

/** Width of a text in the chart's label font (canvas metrics; an estimate where there is no canvas). */
function textWidth(text: string): number {
  const ctx = typeof document !== 'undefined' ? document.createElement('canvas').getContext('2d') : null;
  if (!ctx) return 7 * text.length;
  ctx.font = '11px monospace';
  return ctx.measureText(text).width;
}

export class CalendarChart {
  private svg: d3.Selection<SVGSVGElement, unknown, null, undefined>;
  private width = 600;
  private calendar: Calendar | null = null;
  private sc: SystemCalendar | null = null;

  constructor(
    private readonly container: HTMLElement,
    private readonly onHover: (h: CalendarHover | null) => void,
  ) {
    this.svg = d3.select(container).append('svg').attr('class', 'calendar-svg').attr('data-testid', 'calendar-svg');
    this.resize();
  }

  set(calendar: Calendar | null, sc: SystemCalendar): void {
    this.calendar = calendar;
    this.sc = sc;
    this.draw();
  }

  /** Follows the container's width (a redraw only when it changed: the chart's own height must not loop back). */
  resize(): void {
    const w = Math.max(320, this.container.clientWidth);
    if (w === this.width && this.svg.attr('width') !== null) return;
    this.width = w;
    this.draw();
  }

  dispose(): void {
    this.svg.remove();
  }

  private draw(): void {
    const svg = this.svg;
    svg.selectAll('*').remove();
    const c = this.calendar;
    const sc = this.sc;
    if (!c || !sc) {
      svg.attr('width', this.width).attr('height', 0);
      return;
    }
    const labels = c.pairs.map((p) => pairLabel(p));
    const left = Math.ceil(Math.min(200, Math.max(90, ...labels.map(textWidth))) + 16);
    // the key (left) and the colour legend (right) share the line above the rows when both fit,
    // else the key takes a line of its own below the legend
    const keyText = `bar: Δv ≤ best + ${+(c.within * 100).toFixed(2)} % · mark: best departure`;
    const legendW = Math.min(220, Math.max(170, (this.width - left - MARGIN.right) / 3));
    const keyW = 28 + textWidth(keyText);
    const stacked = left + keyW + 70 + legendW > this.width - MARGIN.right;
    const top = stacked ? MARGIN.top + 18 : MARGIN.top;
    const height = top + c.pairs.length * ROW_HEIGHT + MARGIN.bottom;
    svg.attr('width', this.width).attr('height', height).attr('viewBox', `0 0 ${this.width} ${height}`);
    const x0 = left;
    const x1 = this.width - MARGIN.right;
    const y0 = top;
    const y1 = y0 + c.pairs.length * ROW_HEIGHT;
    const x = d3.scaleLinear().domain([c.start, c.end]).range([x0, x1]);
    const { colour, domain } = dvColourScale(c);

    // rows: alternate bands, the pair's name at the left
    const rows = svg.append('g').attr('class', 'rows');
    c.pairs.forEach((p, k) => {
      const y = y0 + k * ROW_HEIGHT;
      if (k % 2 === 0)
        rows.append('rect').attr('x', 0).attr('y', y).attr('width', x1).attr('height', ROW_HEIGHT).attr('fill', '#ffffff').attr('fill-opacity', 0.025);
      rows
        .append('text')
        .attr('x', 8)
        .attr('y', y + ROW_HEIGHT / 2 + 4)
        .attr('fill', p.through ? '#8c9b95' : '#dfe6e1')
        .style('font', LABEL_FONT)
        .text(labels[k])
        .append('title')
        .text(p.through ?? `${labels[k]}: ${p.windows.length} window${p.windows.length === 1 ? '' : 's'}`);
    });

    // time axis: calendar ticks below, faint rules through the rows
    const ax = svg.append('g').attr('class', 'axis');
    for (const t of calendarTicks(sc, c.start, c.end, Math.max(2, Math.floor((x1 - x0) / 90)))) {
      const xt = x(t.t);
      // a label that would run past the chart's right edge is left out (its rule stays)
      const half = textWidth(t.label) / 2;
      ax.append('line').attr('x1', xt).attr('x2', xt).attr('y1', y0).attr('y2', y1).attr('stroke', '#8c9b95').attr('stroke-opacity', 0.18);
      ax.append('line')
        .attr('x1', xt)
        .attr('x2', xt)
        .attr('y1', y1)
        .attr('y2', y1 + 5)
        .attr('stroke', '#8c9b95');
      if (xt + half > this.width - 2) continue;
      ax.append('text')
        .attr('x', xt)
        .attr('y', y1 + 17)
        .attr('text-anchor', 'middle')
        .attr('fill', '#8c9b95')
        .style('font', LABEL_FONT)
        .text(t.label);
    }
    ax.append('line').attr('x1', x0).attr('x2', x1).attr('y1', y1).attr('y2', y1).attr('stroke', '#8c9b95');
    ax.append('text')
      .attr('x', (x0 + x1) / 2)
      .attr('y', y1 + 32)
      .attr('text-anchor', 'middle')
      .attr('fill', '#8c9b95')
      .style('font', LABEL_FONT)
      .text('departure date (system calendar)');

    // the windows
    const bars = svg.append('g').attr('class', 'windows');
    const hBar = ROW_HEIGHT - 8;
    c.pairs.forEach((p, pi) => {
      const yTop = y0 + pi * ROW_HEIGHT + 4;
      p.windows.forEach((w, wi) => {
        const xa = x(w.opens);
        const xb = Math.max(xa + 2, x(w.closes));
        const g = bars
          .append('g')
          .attr('class', 'window')
          .attr('data-pair', `${p.from}:${p.to}`)
          .attr('data-window', wi)
          .attr('data-opens', w.opens)
          .attr('data-closes', w.closes)
          .attr('data-best', w.best.depart)
          .attr('data-dv', w.best.dv)
          .on('mouseenter mousemove', (e: MouseEvent) => this.onHover({ pair: p, window: w, p: pi, w: wi, x: e.clientX, y: e.clientY }))
          .on('mouseleave', () => this.onHover(null));
        const cut = w.opensCut || w.closesCut;
        g.append('rect')
          .attr('x', xa)
          .attr('y', yTop)
          .attr('width', xb - xa)
          .attr('height', hBar)
          .attr('rx', 2)
          .attr('fill', colour(w.best.dv))
          .attr('fill-opacity', cut ? 0.45 : 0.85);
        if (w.opensCut)
          g.append('line')
            .attr('x1', xa)
            .attr('x2', xa)
            .attr('y1', yTop)
            .attr('y2', yTop + hBar)
            .attr('stroke', '#dfe6e1')
            .attr('stroke-dasharray', '2 2');
        if (w.closesCut)
          g.append('line')
            .attr('x1', xb)
            .attr('x2', xb)
            .attr('y1', yTop)
            .attr('y2', yTop + hBar)
            .attr('stroke', '#dfe6e1')
            .attr('stroke-dasharray', '2 2');
        const xm = x(w.best.depart);
        g.append('line')
          .attr('x1', xm)
          .attr('x2', xm)
          .attr('y1', yTop - 2)
          .attr('y2', yTop + hBar + 2)
          .attr('stroke', '#dfe6e1')
          .attr('stroke-width', 1.5);
        // the best Δv beside the bar, when it fits before the next window (or the chart's end)
        const label = `${(w.best.dv / 1e3).toFixed(1)} km/s`;
        const room = (wi + 1 < p.windows.length ? x(p.windows[wi + 1].opens) : x1) - xb - 8;
        if (room >= textWidth(label)) {
          g.append('text')
            .attr('x', xb + 4)
            .attr('y', yTop + hBar / 2 + 4)
            .attr('fill', '#dfe6e1')
            .attr('fill-opacity', 0.85)
            .style('font', LABEL_FONT)
            .style('pointer-events', 'none')
            .text(label);
        }
      });
    });

    // legend: the colour of the best Δv, above the chart at the right
    const lw = legendW;
    const lx = x1 - lw;
    const grad = svg.append('defs').append('linearGradient').attr('id', 'calendar-dv-ramp');
    for (let k = 0; k <= 10; k++) {
      const dv = domain[0] * (domain[1] / domain[0]) ** (k / 10);
      grad
        .append('stop')
        .attr('offset', `${k * 10}%`)
        .attr('stop-color', colour(dv));
    }
    const lg = svg.append('g').attr('class', 'legend').attr('data-testid', 'calendar-legend');
    lg.append('rect').attr('x', lx).attr('y', 8).attr('width', lw).attr('height', 8).attr('fill', 'url(#calendar-dv-ramp)');
    lg.append('text')
      .attr('x', lx - 8)
      .attr('y', 16)
      .attr('text-anchor', 'end')
      .attr('fill', '#8c9b95')
      .style('font', LABEL_FONT)
      .text('best Δv');
    lg.append('text')
      .attr('x', lx)
      .attr('y', 28)
      .attr('fill', '#8c9b95')
      .style('font', LABEL_FONT)
      .text(`${(domain[0] / 1e3).toFixed(1)} km/s`);
    lg.append('text')
      .attr('x', x1)
      .attr('y', 28)
      .attr('text-anchor', 'end')
      .attr('fill', '#8c9b95')
      .style('font', LABEL_FONT)
      .text(`≥ ${(domain[1] / 1e3).toFixed(1)} km/s`);
    // what the marks mean, at the left above the rows
    const key = svg
      .append('g')
      .attr('class', 'key')
      .attr('transform', `translate(${stacked ? 8 : x0},${stacked ? 34 : 8})`);
    key.append('rect').attr('width', 22).attr('height', 8).attr('fill', '#8c9b95').attr('fill-opacity', 0.6);
    key.append('line').attr('x1', 14).attr('x2', 14).attr('y1', -2).attr('y2', 10).attr('stroke', '#dfe6e1').attr('stroke-width', 1.5);
    key.append('text').attr('x', 28).attr('y', 8).attr('fill', '#8c9b95').style('font', LABEL_FONT).text(keyText);
  }
}
