/**
 * The porkchop plot: the Δv picture of a plane over departure (x, system calendar) × time of
 * flight (y, days) as one canvas image (porkchopRaster.ts: filled bands with a line on every
 * fourth level, rasterised in the Windows worker beside the grid, here only when the plot
 * changes size), and over it an SVG layer of d3 code: axes, the colour ramp, the transfer
 * windows marked and numbered, a crosshair with a hover callback, and clicks reported as
 * (departure, time of flight). Low Δv is bright, high Δv fades into the ground.
 */
import * as d3 from 'd3';
import type { PorkchopGrid } from '../../../core/search/index.ts';
import { metricPlane } from '../../../core/search/index.ts';
import type { PorkchopMetric } from '../../../core/search/index.ts';
import type { TransferWindow } from '../../../core/search/index.ts';
import type { SystemCalendar } from '../../../core/system/index.ts';
import { calendarTicks } from '../timeline/ticks.ts';
import { flightSpan, type PlotLevels, plotLevels, RAMP, rasterPorkchop } from './porkchopRaster.ts';

export const PLOT_MARGIN = { left: 58, right: 86, top: 12, bottom: 40 } as const;
/** The plot's ground (and the colour of the worst band). */
const GROUND = '#16303a';

/** A picture of a grid rasterised elsewhere (the worker): its size in device pixels, RGBA pixels and colour scale. */
export interface PlotImage {
  width: number;
  height: number;
  pixels: Uint8ClampedArray;
  levels: PlotLevels;
}

export interface HoverCell {
  i: number;
  j: number;
  departure: number;
  tof: number;
}

export interface PlotCallbacks {
  onHover(cell: HoverCell | null): void;
  onPick(departure: number, tof: number): void;
}

export class PorkchopPlot {
  private canvas: HTMLCanvasElement;
  private svg: d3.Selection<SVGSVGElement, unknown, null, undefined>;
  private gAxes: d3.Selection<SVGGElement, unknown, null, undefined>;
  private gMarks: d3.Selection<SVGGElement, unknown, null, undefined>;
  private gLegend: d3.Selection<SVGGElement, unknown, null, undefined>;
  private cross: d3.Selection<SVGGElement, unknown, null, undefined>;
  private grid: PorkchopGrid | null = null;
  private cal: SystemCalendar | null = null;
  private metric: PorkchopMetric = 'total';
  private levels: PlotLevels = { lo: Infinity, hi: 1 };
  /** The picture on the canvas (from the worker, or rasterised here after a resize). */
  private image: PlotImage | null = null;
  private windows: TransferWindow[] = [];
  private width = 600;
  private height = 400;
  private x = d3.scaleLinear();
  private y = d3.scaleLinear();

  constructor(
    private readonly container: HTMLElement,
    private readonly cb: PlotCallbacks,
  ) {
    this.canvas = document.createElement('canvas');
    this.canvas.className = 'porkchop-image';
    this.canvas.style.position = 'absolute';
    this.canvas.style.background = GROUND;
    container.append(this.canvas);
    this.svg = d3.select(container).append('svg').attr('class', 'porkchop-svg');
    this.gAxes = this.svg.append('g').attr('class', 'axes');
    this.gMarks = this.svg.append('g').attr('class', 'marks');
    this.gLegend = this.svg.append('g').attr('class', 'legend');
    this.cross = this.svg.append('g').attr('class', 'cross').attr('pointer-events', 'none').attr('display', 'none');
    this.cross.append('line').attr('class', 'cx').attr('stroke', '#dfe6e1').attr('stroke-opacity', 0.5);
    this.cross.append('line').attr('class', 'cy').attr('stroke', '#dfe6e1').attr('stroke-opacity', 0.5);
    this.svg.append('rect').attr('class', 'hit').attr('fill', 'transparent').style('cursor', 'crosshair');
    const hit = this.svg.select<SVGRectElement>('rect.hit');
    hit.on('pointermove', (ev: PointerEvent) => this.hover(ev));
    hit.on('pointerleave', () => {
      this.cross.attr('display', 'none');
      this.cb.onHover(null);
    });
    hit.on('click', (ev: MouseEvent) => {
      if (!this.grid) return;
      const [px, py] = d3.pointer(ev, this.svg.node());
      this.cb.onPick(this.x.invert(px), this.y.invert(py) * 86400);
    });
    this.resize();
  }

  /** Shows a grid; `image` is its picture when already rasterised at `rasterSize()` (else it is rasterised here). */
  setGrid(grid: PorkchopGrid | null, cal: SystemCalendar, metric: PorkchopMetric = 'total', image: PlotImage | null = null): void {
    this.grid = grid;
    this.cal = cal;
    this.metric = metric;
    this.image = grid ? image : null;
    this.levels = this.image ? this.image.levels : grid ? plotLevels(metricPlane(grid.planes, metric)) : { lo: Infinity, hi: 1 };
    this.draw();
  }

  setWindows(windows: TransferWindow[]): void {
    this.windows = windows;
    this.drawMarks();
  }

  resize(): void {
    this.width = Math.max(300, this.container.clientWidth);
    this.height = Math.max(220, this.container.clientHeight);
    this.svg.attr('width', this.width).attr('height', this.height);
    this.draw();
  }

  /** Size in device pixels of the picture the plot shows now (what a worker should rasterise). */
  rasterSize(): { width: number; height: number } {
    const L = this.layout();
    const dpr = globalThis.devicePixelRatio || 1;
    return { width: Math.max(1, Math.round((L.x1 - L.x0) * dpr)), height: Math.max(1, Math.round((L.y1 - L.y0) * dpr)) };
  }

  private layout(): { x0: number; x1: number; y0: number; y1: number } {
    const M = PLOT_MARGIN;
    return { x0: M.left, x1: this.width - M.right, y0: M.top, y1: this.height - M.bottom };
  }

  /** Puts the grid's picture on the canvas: the given image when it fits, else one rasterised now. */
  private drawImage(): void {
    const L = this.layout();
    const c = this.canvas;
    c.style.left = `${L.x0}px`;
    c.style.top = `${L.y0}px`;
    c.style.width = `${L.x1 - L.x0}px`;
    c.style.height = `${L.y1 - L.y0}px`;
    const { width, height } = this.rasterSize();
    if (c.width !== width || c.height !== height) {
      c.width = width;
      c.height = height;
    }
    const ctx = c.getContext('2d');
    if (!ctx) return;
    const g = this.grid;
    if (!g) {
      ctx.clearRect(0, 0, width, height);
      return;
    }
    let img = this.image;
    if (!img || img.width !== width || img.height !== height) {
      const plane = metricPlane(g.planes, this.metric);
      const pixels = rasterPorkchop(
        { plane, departTimes: g.departTimes, secondValues: g.secondValues, secondAxis: g.request.secondAxis },
        this.levels,
        width,
        height,
        img?.pixels,
      );
      img = { width, height, pixels, levels: this.levels };
      this.image = img;
    }
    ctx.putImageData(new ImageData(img.pixels as Uint8ClampedArray<ArrayBuffer>, width, height), 0, 0);
  }

  private draw(): void {
    const L = this.layout();
    this.svg
      .select('rect.hit')
      .attr('x', L.x0)
      .attr('y', L.y0)
      .attr('width', L.x1 - L.x0)
      .attr('height', L.y1 - L.y0);
    this.drawImage();
    const g = this.grid;
    if (!g || !this.cal) {
      this.gAxes.selectAll('*').remove();
      this.gLegend.selectAll('*').remove();
      this.gMarks.selectAll('*').remove();
      return;
    }
    const nDep = g.departTimes.length;
    const d0 = g.departTimes[0];
    const d1 = g.departTimes[nDep - 1];
    // y is the time of flight in days; an arrival-axis grid is drawn over its flight-time span.
    const span = flightSpan({ departTimes: g.departTimes, secondValues: g.secondValues, secondAxis: g.request.secondAxis });
    this.x.domain([d0, d1]).range([L.x0, L.x1]);
    this.y.domain([span.min / 86400, span.max / 86400]).range([L.y1, L.y0]);
    const { lo, hi: hiLevel } = this.levels;
    const colour = d3.scaleSequential(RAMP).domain([lo, hiLevel]);

    // Axes.
    this.gAxes.selectAll('*').remove();
    const ticks = calendarTicks(this.cal, d0, d1, Math.max(4, Math.floor((L.x1 - L.x0) / 44)));
    const ax = this.gAxes.append('g').attr('class', 'axis').attr('transform', `translate(0,${L.y1})`);
    for (const t of ticks) {
      // A label centred within 22 px of the right edge would run into the colour ramp's unit.
      if (this.x(t.t) > L.x1 - 22) continue;
      const gx = ax.append('g').attr('transform', `translate(${this.x(t.t)},0)`);
      gx.append('line').attr('y2', 5);
      gx.append('text').attr('y', 16).attr('text-anchor', 'middle').text(t.label);
    }
    ax.append('text')
      .attr('class', 'axis-title')
      .attr('x', (L.x0 + L.x1) / 2)
      .attr('y', 34)
      .attr('text-anchor', 'middle')
      .text('departure (system calendar)');
    const ay = this.gAxes.append('g').attr('class', 'axis').attr('transform', `translate(${L.x0},0)`);
    for (const d of this.y.ticks(6)) {
      const gy = ay.append('g').attr('transform', `translate(0,${this.y(d)})`);
      gy.append('line').attr('x2', -5);
      gy.append('text').attr('x', -8).attr('dy', '0.32em').attr('text-anchor', 'end').text(`${d}`);
    }
    ay.append('text')
      .attr('class', 'axis-title')
      .attr('transform', `translate(-44,${(L.y0 + L.y1) / 2}) rotate(-90)`)
      .attr('text-anchor', 'middle')
      .text('flight time, days');

    // Legend: the colour ramp with Δv labels.
    this.gLegend.selectAll('*').remove();
    const lg = this.gLegend.attr('transform', `translate(${L.x1 + 18},${L.y0})`);
    const lh = L.y1 - L.y0;
    const steps = 40;
    for (let k = 0; k < steps; k++) {
      lg.append('rect')
        .attr('x', 0)
        .attr('y', (lh * k) / steps)
        .attr('width', 12)
        .attr('height', lh / steps + 0.5)
        .attr('fill', colour(lo + ((hiLevel - lo) * k) / (steps - 1)));
    }
    const unit = this.metric === 'c3' ? 'km²/s²' : 'km/s';
    const scale = this.metric === 'c3' ? 1e-6 : 1e-3;
    for (const f of [0, 0.25, 0.5, 0.75, 1]) {
      lg.append('text')
        .attr('class', 'axis')
        .attr('x', 16)
        .attr('y', lh * f + 4)
        .attr('fill', '#8c9b95')
        .attr('font-size', 10)
        .attr('font-family', 'var(--mono)')
        .text(`${((lo + (hiLevel - lo) * f) * scale).toFixed(2)}`);
    }
    lg.append('text')
      .attr('x', 0)
      .attr('y', lh + 16)
      .attr('fill', '#8c9b95')
      .attr('font-size', 10)
      .text(`${this.metric === 'c3' ? 'C3' : 'Δv'} ${unit}`);
    this.drawMarks();
  }

  private drawMarks(): void {
    const g = this.grid;
    this.gMarks.selectAll('*').remove();
    if (!g) return;
    this.windows.forEach((w, k) => {
      const m = this.gMarks
        .append('g')
        .attr('class', 'window-mark')
        .attr('transform', `translate(${this.x(w.departure)},${this.y(w.tof / 86400)})`);
      m.append('circle').attr('r', 5).attr('fill', 'none').attr('stroke', '#0f1416').attr('stroke-width', 3);
      m.append('circle').attr('r', 5).attr('fill', 'none').attr('stroke', '#ff9b45').attr('stroke-width', 1.6);
      m.append('text')
        .attr('x', 8)
        .attr('y', -6)
        .attr('fill', '#ff9b45')
        .attr('font-size', 11)
        .attr('font-weight', 600)
        .text(String(k + 1));
    });
  }

  private hover(ev: PointerEvent): void {
    const g = this.grid;
    if (!g) return;
    const [px, py] = d3.pointer(ev, this.svg.node());
    const L = this.layout();
    this.cross.attr('display', null);
    this.cross.select('.cx').attr('x1', px).attr('x2', px).attr('y1', L.y0).attr('y2', L.y1);
    this.cross.select('.cy').attr('x1', L.x0).attr('x2', L.x1).attr('y1', py).attr('y2', py);
    const departure = this.x.invert(px);
    const tofDays = this.y.invert(py);
    const nDep = g.departTimes.length;
    const nSec = g.secondValues.length;
    const i = Math.round(((departure - g.departTimes[0]) / (g.departTimes[nDep - 1] - g.departTimes[0] || 1)) * (nDep - 1));
    const secVal = g.request.secondAxis === 'tof' ? tofDays * 86400 : departure + tofDays * 86400;
    const j = Math.round(((secVal - g.secondValues[0]) / (g.secondValues[nSec - 1] - g.secondValues[0] || 1)) * (nSec - 1));
    if (i < 0 || j < 0 || i >= nDep || j >= nSec) {
      this.cb.onHover(null);
      return;
    }
    this.cb.onHover({ i, j, departure, tof: tofDays * 86400 });
  }

  dispose(): void {
    this.svg.remove();
  }
}
