/**
 * The sequence chart (d3, SVG): the best solutions of a multi-leg search as points of total Δv
 * (y, km/s) against departure date (x, system calendar), each a stacked bar of its parts
 * (departure, flyby burns, capture) under a numbered mark, and the best direct transfer over the
 * same departures as a dashed line. Clicking a solution picks it (the table beside shows its legs).
 */
import * as d3 from 'd3';
import type { SequenceResult } from '../../../core/search/index.ts';
import type { SystemCalendar } from '../../../core/system/index.ts';
import { calendarTicks } from '../timeline/ticks.ts';

const MARGIN = { left: 52, right: 16, top: 14, bottom: 40 } as const;
/** The parts of a solution's Δv, bottom to top, with their colours (departure in burn amber, flybys in path mint, capture in chalk). */
const PARTS = [
  { key: 'dvDepart', label: 'departure', colour: '#ff9b45' },
  { key: 'dvFlybys', label: 'flybys', colour: '#6fdcae' },
  { key: 'dvCapture', label: 'capture', colour: '#dfe6e1' },
] as const;

export class SequenceChart {
  private svg: d3.Selection<SVGSVGElement, unknown, null, undefined>;
  private width = 600;
  private height = 320;
  private result: SequenceResult | null = null;
  private range: [number, number] = [0, 1];
  private cal: SystemCalendar | null = null;
  private picked = 0;

  constructor(
    private readonly container: HTMLElement,
    private readonly onPick: (k: number) => void,
  ) {
    this.svg = d3.select(container).append('svg').attr('class', 'porkchop-svg sequence-svg').attr('data-testid', 'sequence-svg');
    this.resize();
  }

  /** Shows a search's solutions over its departure range [t0, t1]. */
  setResult(result: SequenceResult | null, range: [number, number], cal: SystemCalendar): void {
    this.result = result;
    this.range = range;
    this.cal = cal;
    this.picked = 0;
    this.draw();
  }

  pick(k: number): void {
    this.picked = k;
    this.draw();
  }

  resize(): void {
    this.width = Math.max(300, this.container.clientWidth);
    this.height = Math.max(200, this.container.clientHeight);
    this.svg.attr('width', this.width).attr('height', this.height);
    this.draw();
  }

  dispose(): void {
    this.svg.remove();
  }

  private draw(): void {
    const svg = this.svg;
    svg.selectAll('*').remove();
    const r = this.result;
    const cal = this.cal;
    if (!r || !cal) return;
    const x0 = MARGIN.left;
    const x1 = this.width - MARGIN.right;
    const y0 = MARGIN.top;
    const y1 = this.height - MARGIN.bottom;
    const [t0, t1] = this.range;
    const x = d3.scaleLinear().domain([t0, t1]).range([x0, x1]);
    const top = Math.max(r.direct?.dvTotal ?? 0, ...r.solutions.map((s) => s.dvTotal), 1);
    const y = d3
      .scaleLinear()
      .domain([0, (top * 1.12) / 1e3])
      .nice()
      .range([y1, y0]);

    // axes: calendar dates below, km/s at the left, faint rules across
    const ax = svg.append('g').attr('class', 'axis').attr('transform', `translate(0,${y1})`);
    for (const t of calendarTicks(cal, t0, t1, Math.max(3, Math.floor((x1 - x0) / 70)))) {
      const g = ax.append('g').attr('transform', `translate(${x(t.t)},0)`);
      g.append('line').attr('y2', 5);
      g.append('text').attr('y', 16).attr('text-anchor', 'middle').text(t.label);
    }
    ax.append('line').attr('x1', x0).attr('x2', x1);
    ax.append('text')
      .attr('class', 'axis-title')
      .attr('x', (x0 + x1) / 2)
      .attr('y', 33)
      .attr('text-anchor', 'middle')
      .text('departure');
    const ay = svg.append('g').attr('class', 'axis');
    for (const v of y.ticks(5)) {
      ay.append('line').attr('x1', x0).attr('x2', x1).attr('y1', y(v)).attr('y2', y(v)).attr('stroke-opacity', 0.35);
      ay.append('text')
        .attr('x', x0 - 6)
        .attr('y', y(v) + 3)
        .attr('text-anchor', 'end')
        .text(v.toFixed(1));
    }
    ay.append('text')
      .attr('class', 'axis-title')
      .attr('transform', `translate(14,${(y0 + y1) / 2}) rotate(-90)`)
      .attr('text-anchor', 'middle')
      .text('total Δv km/s');

    // the best direct transfer over the same departures, for comparison
    if (r.direct) {
      const yd = y(r.direct.dvTotal / 1e3);
      const g = svg.append('g').attr('class', 'direct').attr('data-testid', 'sequence-direct');
      g.append('line').attr('x1', x0).attr('x2', x1).attr('y1', yd).attr('y2', yd).attr('stroke', '#e9b949').attr('stroke-dasharray', '5 4');
      g.append('circle').attr('cx', x(r.direct.depart)).attr('cy', yd).attr('r', 3).attr('fill', '#e9b949');
      g.append('text')
        .attr('x', x1 - 4)
        .attr('y', yd - 5)
        .attr('text-anchor', 'end')
        .attr('fill', '#e9b949')
        .text(`direct ${(r.direct.dvTotal / 1e3).toFixed(2)} km/s`);
    }

    // each solution: a slim stacked bar of its parts, a numbered mark at its total
    const w = Math.max(4, Math.min(10, (x1 - x0) / Math.max(8, r.solutions.length * 3)));
    const marks = svg.append('g').attr('class', 'solutions');
    r.solutions.forEach((s, k) => {
      const g = marks
        .append('g')
        .attr('class', 'solution')
        .attr('data-solution', k)
        .attr('data-depart', s.depart)
        .attr('data-dv', s.dvTotal)
        .style('cursor', 'pointer')
        .on('click', () => this.onPick(k));
      let base = 0;
      for (const p of PARTS) {
        const v = s[p.key];
        if (!(v > 0)) continue;
        g.append('rect')
          .attr('x', x(s.depart) - w / 2)
          .attr('width', w)
          .attr('y', y((base + v) / 1e3))
          .attr('height', Math.max(0, y(base / 1e3) - y((base + v) / 1e3)))
          .attr('fill', p.colour)
          .attr('fill-opacity', k === this.picked ? 0.9 : 0.45);
        base += v;
      }
      const cy = y(s.dvTotal / 1e3);
      g.append('circle')
        .attr('cx', x(s.depart))
        .attr('cy', cy - 9)
        .attr('r', 7.5)
        .attr('fill', k === this.picked ? '#dfe6e1' : '#151c1f')
        .attr('stroke', '#dfe6e1');
      g.append('text')
        .attr('x', x(s.depart))
        .attr('y', cy - 5.5)
        .attr('text-anchor', 'middle')
        .attr('fill', k === this.picked ? '#151c1f' : '#dfe6e1')
        .style('font', '9.5px var(--mono)')
        .text(String(k + 1));
    });

    // legend of the parts
    const lg = svg
      .append('g')
      .attr('class', 'legend')
      .attr('transform', `translate(${x0 + 8},${y0 + 4})`);
    PARTS.forEach((p, k) => {
      lg.append('rect')
        .attr('x', k * 82)
        .attr('width', 9)
        .attr('height', 9)
        .attr('fill', p.colour)
        .attr('fill-opacity', 0.8);
      lg.append('text')
        .attr('x', k * 82 + 13)
        .attr('y', 8.5)
        .attr('fill', '#8c9b95')
        .text(p.label);
    });
  }
}
