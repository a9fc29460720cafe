/**
 * The stability check's element histories (imperative d3 code): small multiples, one row per
 * body (in its own colour) with a, e and i against time in years, and a last row with the
 * run's relative energy error. Every panel has its own y axis with numbers; the year axis is
 * shared by each column and labelled under the last row. Data come from historySeries.ts.
 */
import * as d3 from 'd3';
import { PALETTE } from '../scene/palette.ts';
import { PANEL_TITLES, YEAR_LABEL_PX, yearTicks, type Histories, type HistoryPanel, type Tick } from './historySeries.ts';

export const HISTORY_LAYOUT = {
  name: 100,
  right: 12,
  header: 24,
  plot: 46,
  rowGap: 14,
  /** Room left of each plot for its y-axis numbers. */
  gutter: 58,
  colGap: 12,
  axis: 30,
} as const;

export interface ChartRow {
  name: string;
  about: string;
  note: string;
  colour: string;
  panels: HistoryPanel[];
}

/** Total height for n body rows (plus the energy block). */
export function historyHeight(rows: number): number {
  const L = HISTORY_LAYOUT;
  return L.header + rows * (L.plot + L.rowGap) - L.rowGap + L.axis + L.header - 6 + L.plot + 22;
}

export class HistoryChart {
  private svg: d3.Selection<SVGSVGElement, unknown, null, undefined>;
  private data: { h: Histories; rows: ChartRow[] } | null = null;
  private width = 600;

  constructor(private readonly container: HTMLElement) {
    this.svg = d3.select(container).append('svg').attr('class', 'history-svg').attr('data-testid', 'stability-charts');
    this.svg.style('display', 'block').style('font', '10.5px var(--sans)');
  }

  /** `colours`: per body (by position in h.bodies). */
  setData(h: Histories | null, colours: string[] = []): void {
    this.data = h
      ? {
          h,
          rows: [
            ...h.bodies.map((b, k) => ({
              name: b.name,
              about: b.about,
              note: b.merged.length ? `with ${b.merged.join(', ')}` : '',
              colour: colours[k] ?? PALETTE.path,
              panels: b.panels,
            })),
            { name: 'Whole system', about: 'energy of the run', note: '', colour: PALETTE.chalk, panels: [h.energy] },
          ],
        }
      : null;
    this.redraw();
  }

  resize(): void {
    this.redraw();
  }

  private redraw(): void {
    const L = HISTORY_LAYOUT;
    this.width = Math.max(480, this.container.clientWidth);
    this.svg.selectAll('*').remove();
    if (!this.data) {
      this.svg.attr('width', this.width).attr('height', 0);
      return;
    }
    const { h, rows } = this.data;
    const bodyRows = rows.slice(0, -1);
    const energyRow = rows[rows.length - 1];
    const height = historyHeight(bodyRows.length);
    this.svg.attr('width', this.width).attr('height', height).attr('viewBox', `0 0 ${this.width} ${height}`);
    const colW = (this.width - L.name - L.right - 2 * L.colGap) / 3;
    const plotW = Math.max(40, colW - L.gutter);
    const colX = (c: number) => L.name + c * (colW + L.colGap) + L.gutter;
    const wideW = 3 * colW + 2 * L.colGap - L.gutter;
    const x = (w: number) =>
      d3
        .scaleLinear()
        .domain([0, h.span > 0 ? h.span : 1])
        .range([0, w]);

    // column titles
    (['a', 'e', 'i'] as const).forEach((k, c) => this.title(colX(c), 15, PANEL_TITLES[k]));
    bodyRows.forEach((row, r) => this.row(row, L.header + r * (L.plot + L.rowGap), (c) => colX(c), plotW, x(plotW)));
    // year axis under the body rows, per column
    let y = L.header + bodyRows.length * (L.plot + L.rowGap) - L.rowGap;
    for (let c = 0; c < 3; c++) this.yearAxis(colX(c), y, x(plotW));
    // the whole system's energy error, one wide panel with its own year axis
    y += L.axis;
    this.title(colX(0), y + 11, PANEL_TITLES.energy);
    y += L.header - 6;
    this.row(energyRow, y, () => colX(0), wideW, x(wideW));
    this.yearAxis(colX(0), y + L.plot, x(wideW));
    this.svg
      .append('text')
      .attr('x', 8)
      .attr('y', y + L.plot + 14)
      .attr('fill', PALETTE.muted)
      .style('font-size', '10px')
      .text('years from the epoch');
  }

  private title(x: number, y: number, text: string): void {
    this.svg
      .append('text')
      .attr('x', x)
      .attr('y', y)
      .attr('fill', PALETTE.muted)
      .style('font-size', '10px')
      .style('letter-spacing', '0.06em')
      .style('text-transform', 'uppercase')
      .text(text);
  }

  private row(row: ChartRow, y0: number, colX: (c: number) => number, w: number, xs: d3.ScaleLinear<number, number>): void {
    const L = HISTORY_LAYOUT;
    const h = this.data!.h;
    const years = this.ticksFor(w);
    const g = this.svg.append('g').attr('class', 'history-row').attr('transform', `translate(0,${y0})`);
    g.append('text').attr('x', 8).attr('y', 13).attr('fill', row.colour).style('font-weight', '600').text(row.name);
    g.append('text').attr('x', 8).attr('y', 26).attr('fill', PALETTE.muted).style('font-size', '10px').text(row.about);
    if (row.note) g.append('text').attr('x', 8).attr('y', 38).attr('fill', PALETTE.muted).style('font-size', '10px').text(row.note);
    row.panels.forEach((p, c) => {
      const ys = d3
        .scaleLinear()
        .domain(p.domain)
        .range([L.plot - 2, 2]);
      const pg = g
        .append('g')
        .attr('class', `history-panel panel-${p.key}`)
        .attr('transform', `translate(${colX(c)},0)`);
      pg.append('rect').attr('width', w).attr('height', L.plot).attr('fill', '#121a1c');
      for (const t of years) pg.append('line').attr('x1', xs(t.v)).attr('x2', xs(t.v)).attr('y1', 0).attr('y2', L.plot).attr('stroke', '#1c2624');
      for (const t of p.ticks) {
        const yy = ys(t.v);
        pg.append('line').attr('x1', 0).attr('x2', w).attr('y1', yy).attr('y2', yy).attr('stroke', '#223030');
        pg.append('text')
          .attr('class', 'history-tick')
          .attr('x', -5)
          .attr('y', yy + 3.5)
          .attr('text-anchor', 'end')
          .attr('fill', PALETTE.muted)
          .style('font', '9.5px var(--mono)')
          .text(t.label);
      }
      const line = d3
        .line<number>()
        .defined((k) => Number.isFinite(p.values[k]))
        .x((k) => xs(h.years[k]))
        .y((k) => ys(p.values[k]));
      pg.append('path')
        .attr('class', 'history-line')
        .attr('fill', 'none')
        .attr('stroke', row.colour)
        .attr('stroke-width', 1.2)
        .attr('d', line(d3.range(p.values.length)));
    });
  }

  private yearAxis(x0: number, y: number, xs: d3.ScaleLinear<number, number>): void {
    const w = xs.range()[1];
    for (const t of this.ticksFor(w)) {
      const px = xs(t.v);
      this.svg
        .append('text')
        .attr('class', 'history-year')
        .attr('x', x0 + px)
        .attr('y', y + 13)
        .attr('text-anchor', px < 8 ? 'start' : px > w - 8 ? 'end' : 'middle')
        .attr('fill', PALETTE.muted)
        .style('font', '9.5px var(--mono)')
        .text(t.label);
    }
  }

  /** Year ticks for an axis `w` px wide. */
  private ticksFor(w: number): Tick[] {
    return yearTicks(this.data!.h.span, Math.floor(w / YEAR_LABEL_PX));
  }

  dispose(): void {
    this.svg.remove();
  }
}
