/**
 * The Timeline's imperative d3 code: a calendar time axis with zoom (wheel) and pan (drag on the
 * lanes), lanes for burns, sphere-of-influence spans and events, three charts against time, and
 * the time cursor (drag its handle or the axis strip, click anywhere to place it). The Svelte
 * component passes data in and receives cursor intents; moving the cursor only moves one group.
 * The corner above the lane titles names the model the lanes show; the distance chart draws the
 * comparison model's distance faint and dashed behind the truth model's.
 * Below the charts, the sky lanes (skySeries.ts; hidden with setSkyShown(false)): the one-way light
 * time to a body as a chart, and the ship's shadow passes as bands (penumbra light, umbra dark).
 */
import * as d3 from 'd3';
import type { SystemCalendar } from '../../../core/system/index.ts';
import { formatCompactDate } from '../../../core/system/index.ts';
import { distance as formatDistance } from '../format/format.ts';
import { PALETTE } from '../scene/palette.ts';
import type { Series, TimelineData } from './series.ts';
import { type SkyData, lightTimeText, passText, shadowLabel, shadowTitle } from './skySeries.ts';
import { calendarTicks } from './ticks.ts';
import { BURN_HIT_PX, DRAG_THRESHOLD_PX } from './burnDrag.ts';

export const LAYOUT = {
  left: 118,
  right: 14,
  axis: 26,
  lane: 20,
  chart: 46,
  gap: 6,
} as const;

/** The same with shorter lanes and charts, for short windows (the 3D view keeps its height); the left and right margins are LAYOUT's. */
export const DENSE_LAYOUT = {
  ...LAYOUT,
  axis: 20,
  lane: 16,
  chart: 34,
  gap: 4,
} as const;

export type TimelineLayout = typeof LAYOUT | typeof DENSE_LAYOUT;

const LANES = [
  { label: 'Burns', title: 'Burns: bars as long as each burn' },
  { label: 'SOI', title: 'Sphere of influence: the body the ship is about' },
  { label: 'Events', title: 'Events of the flight' },
] as const;
/** Width of a lane label's character, px (10 px sans; an estimate that errs wide, so labels never collide). */
const CHAR_PX = 6.6;
const CHARTS = [
  { key: 'propellant', label: 'Propellant', colour: PALETTE.warn },
  { key: 'dvLeft', label: 'Δv left', colour: PALETTE.path },
  { key: 'distance', label: 'To target', colour: '#9fb7ff' },
] as const;

export interface TimelineCallbacks {
  /** The user moved the cursor (drag or click). */
  onCursor(t: number): void;
  /** The user clicked a burn bar. */
  onSelectBurn?(id: string): void;
  /** Null when the burn's mark may be dragged, else why not (its tooltip). */
  whyNotDraggable?(id: string): string | null;
  /** The time a drag of the burn by dx pixels at the axis's scale gives (snapped), for the preview and the release. */
  draggedTime?(id: string, t0: number, dxPx: number, secondsPerPx: number): number;
  /** The user dragged a burn's mark and let go: the burn's new time (one edit). */
  onRetimeBurn?(id: string, t: number): void;
}

type ChartKey = (typeof CHARTS)[number]['key'];

/** Colours of the sunlight lane's bands: penumbra (partly lit) and umbra (dark), of our own. */
export const SHADOW_COLOURS = { penumbra: '#8d83c9', umbra: '#5a4fb0', light: '#c9b7ff' } as const;

/** Height of the lanes and charts above the sky lanes, px. */
export function chartsHeight(L: TimelineLayout): number {
  return L.axis + LANES.length * L.lane + L.gap + CHARTS.length * (L.chart + L.gap);
}

/** Height of the sky lanes (the light-time chart and the sunlight lane), px. */
export function skyHeight(L: TimelineLayout): number {
  return L.chart + L.gap + L.lane + L.gap;
}

/**
 * Extra lanes below the charts (e.g. the game-step check's error lanes), drawn against the
 * Timeline's own time scale, so they zoom and pan with it and the cursor crosses them.
 */
export interface TimelineExtra {
  /** Height, px. */
  readonly height: number;
  /** Called once with the group to draw into (its origin at the extra lanes' top left) and the plot's clip-path id. */
  mount(g: SVGGElement, clipId: string): void;
  /** Called on every redraw with the time scale (range [LAYOUT.left, width − LAYOUT.right]) and the svg width. */
  draw(x: d3.ScaleLinear<number, number>, width: number): void;
}

/** A coordinate as d3-shape writes it into a path: rounded to 3 decimals (its default `digits`). */
const r3 = (v: number) => Math.round(v * 1000) / 1000;

/**
 * The SVG path of a polyline through (xs[k], ys[k]): the string d3.line draws with its default
 * (linear) curve and precision, written directly; a chart redraws on every edit and this skips
 * d3-shape's per-point generator calls. Null for no points (as d3.line).
 */
export function linePath(xs: ArrayLike<number>, ys: ArrayLike<number>): string | null {
  const n = xs.length;
  if (n === 0) return null;
  let d = `M${r3(xs[0])},${r3(ys[0])}`;
  for (let k = 1; k < n; k++) d += `L${r3(xs[k])},${r3(ys[k])}`;
  return n === 1 ? `${d}Z` : d;
}

/** The SVG path of the area between the polyline and the level `base`: d3.area's string (linear curve, y0 = base). */
export function areaPath(xs: ArrayLike<number>, ys: ArrayLike<number>, base: number): string | null {
  const n = xs.length;
  if (n === 0) return null;
  const b = r3(base);
  let d = `M${r3(xs[0])},${r3(ys[0])}`;
  for (let k = 1; k < n; k++) d += `L${r3(xs[k])},${r3(ys[k])}`;
  for (let k = n - 1; k >= 0; k--) d += `L${r3(xs[k])},${b}`;
  return `${d}Z`;
}

export class TimelineChart {
  private svg: d3.Selection<SVGSVGElement, unknown, null, undefined>;
  private gAxis: d3.Selection<SVGGElement, unknown, null, undefined>;
  private gLanes: d3.Selection<SVGGElement, unknown, null, undefined>;
  private gCharts: d3.Selection<SVGGElement, unknown, null, undefined>;
  private gCursor: d3.Selection<SVGGElement, unknown, null, undefined>;
  private gExtra: d3.Selection<SVGGElement, unknown, null, undefined>;
  private gSky: d3.Selection<SVGGElement, unknown, null, undefined>;
  private sky: SkyData | null = null;
  private skyShown = true;
  /** What the sky lanes were last drawn for (figures, time axis): an edit redraws the other lanes, not these. */
  private skyDrawn: { sky: SkyData | null; d0: number; d1: number; r0: number; r1: number } | null = null;
  private extra: TimelineExtra | null = null;
  private baseHeight = 0;
  private clipId = `tl-clip-${Math.random().toString(36).slice(2, 8)}`;
  private x0 = d3.scaleLinear();
  private x = d3.scaleLinear();
  private zoom: d3.ZoomBehavior<SVGSVGElement, unknown>;
  private data: TimelineData | null = null;
  private cal: SystemCalendar | null = null;
  private width = 600;
  private height = 0;
  private cursorT = 0;
  private readonly L: TimelineLayout;
  /** The burn being dragged: its id, its time before, and its previewed time. */
  private dragging: { id: string; t0: number; t: number } | null = null;

  constructor(
    private readonly container: HTMLElement,
    private readonly cb: TimelineCallbacks,
    options: { dense?: boolean; sky?: boolean } = {},
  ) {
    this.L = options.dense ? DENSE_LAYOUT : LAYOUT;
    const L = this.L;
    this.skyShown = options.sky ?? true;
    this.height = chartsHeight(L) + (this.skyShown ? skyHeight(L) : 0);
    this.baseHeight = this.height;
    this.svg = d3.select(container).append('svg').attr('class', 'timeline-svg').attr('height', this.height);
    this.svg.append('defs').append('clipPath').attr('id', this.clipId).append('rect');
    const plot = this.svg.append('g').attr('class', 'plot');
    this.gAxis = plot.append('g').attr('class', 'axis');
    this.gLanes = plot.append('g').attr('class', 'lanes');
    this.gCharts = plot.append('g').attr('class', 'charts');
    this.gSky = plot
      .append('g')
      .attr('class', 'sky')
      .attr('transform', `translate(0,${chartsHeight(L)})`)
      .attr('display', this.skyShown ? null : 'none');
    this.gExtra = plot.append('g').attr('class', 'extra').attr('transform', `translate(0,${this.baseHeight})`);
    this.gCursor = plot.append('g').attr('class', 'cursor');
    this.buildStatic();

    this.zoom = d3
      .zoom<SVGSVGElement, unknown>()
      .filter((ev: Event) => {
        const target = ev.target as Element;
        if (target.closest('.cursor-handle, .axis-strip, .burn.draggable')) return false;
        return (ev.type === 'wheel' || (ev as MouseEvent).button === 0) && !(ev as MouseEvent).ctrlKey;
      })
      .on('zoom', (ev: d3.D3ZoomEvent<SVGSVGElement, unknown>) => {
        this.x = ev.transform.rescaleX(this.x0);
        if (!this.settingData) this.redraw();
      });
    this.svg.call(this.zoom).on('dblclick.zoom', null);

    // Click (without drag) on the lanes or charts places the cursor.
    let down: [number, number] | null = null;
    this.svg.on('pointerdown.cursor', (ev: PointerEvent) => {
      down = [ev.clientX, ev.clientY];
    });
    this.svg.on('click.cursor', (ev: MouseEvent) => {
      if (!down || Math.hypot(ev.clientX - down[0], ev.clientY - down[1]) > 3) return;
      const target = ev.target as Element;
      const burn = target.closest('.burn') as SVGElement | null;
      if (burn?.dataset.id) this.cb.onSelectBurn?.(burn.dataset.id);
      const [px] = d3.pointer(ev, this.svg.node());
      if (px >= LAYOUT.left) this.cb.onCursor(this.clampT(this.x.invert(px)));
    });

    // Dragging the handle or the axis strip moves the cursor.
    const drag = d3.drag<SVGGElement, unknown>().on('start drag', (ev: d3.D3DragEvent<SVGGElement, unknown, unknown>) => {
      const [px] = d3.pointer(ev.sourceEvent as Event, this.svg.node());
      this.cb.onCursor(this.clampT(this.x.invert(Math.max(LAYOUT.left, Math.min(this.width - LAYOUT.right, px)))));
    });
    this.gAxis.select<SVGGElement>('.axis-strip-group').call(drag);
    this.gCursor.select<SVGGElement>('.cursor-handle').call(drag);
    this.resize();
  }

  /** Seconds per pixel of the time axis as shown now. */
  secondsPerPx(): number {
    const [a, b] = this.x.domain();
    const [p, q] = this.x.range();
    return (b - a) / Math.max(1, q - p);
  }

  /** Drag on a draggable burn mark: the bar follows (snapped), the time shows in its tooltip; release makes the edit, a click selects. */
  private burnDrag(): d3.DragBehavior<SVGGElement, TimelineData['burns'][number], unknown> {
    let startX = 0;
    return (
      d3
        .drag<SVGGElement, TimelineData['burns'][number]>()
        // only burns with a time of their own; a press elsewhere pans (the zoom's own drag)
        .filter((ev: MouseEvent, d) => ev.button === 0 && !ev.ctrlKey && (this.cb.whyNotDraggable ? this.cb.whyNotDraggable(d.id) === null : false))
        .on('start', (ev: d3.D3DragEvent<SVGGElement, TimelineData['burns'][number], unknown>, d) => {
          startX = ev.x;
          this.dragging = { id: d.id, t0: d.t, t: d.t };
        })
        .on('drag', (ev: d3.D3DragEvent<SVGGElement, TimelineData['burns'][number], unknown>, d) => {
          if (!this.dragging || this.dragging.id !== d.id) return;
          const dx = ev.x - startX;
          const t = this.cb.draggedTime ? this.cb.draggedTime(d.id, d.t, dx, this.secondsPerPx()) : d.t + dx * this.secondsPerPx();
          this.dragging.t = t;
          this.drawDragPreview();
        })
        .on('end', (ev: d3.D3DragEvent<SVGGElement, TimelineData['burns'][number], unknown>, d) => {
          const drag = this.dragging;
          this.dragging = null;
          const dx = ev.x - startX;
          if (!drag || drag.id !== d.id) return;
          // a press without a drag is a click (the svg's click handler selects the burn)
          if (Math.abs(dx) >= DRAG_THRESHOLD_PX && drag.t !== drag.t0) this.cb.onRetimeBurn?.(d.id, drag.t);
          this.redraw();
        })
    );
  }

  /** Moves the dragged burn's mark to its previewed time. */
  private drawDragPreview(): void {
    const drag = this.dragging;
    if (!drag) return;
    const shift = this.x(drag.t) - this.x(drag.t0);
    this.gLanes
      .selectAll<SVGGElement, TimelineData['burns'][number]>('g.burn')
      .filter((d) => d.id === drag.id)
      .attr('transform', `translate(${shift},0)`)
      .classed('dragging', true)
      .select('.burn-time')
      .text(this.cal ? formatCompactDate(this.cal, drag.t, { seconds: true }) : '');
  }

  private clampT(t: number): number {
    if (!this.data) return t;
    return Math.min(this.data.t1, Math.max(this.data.t0, t));
  }

  private buildStatic(): void {
    const L = this.L;
    const strip = this.gAxis.append('g').attr('class', 'axis-strip-group');
    strip.append('rect').attr('class', 'axis-strip').attr('x', L.left).attr('y', 0).attr('height', L.axis).attr('fill', PALETTE.panel);
    this.gAxis.append('g').attr('class', 'ticks');
    const model = this.gAxis.append('g').attr('class', 'model').attr('data-testid', 'timeline-model');
    model
      .append('text')
      .attr('class', 'model-label')
      .attr('x', 10)
      .attr('y', L.axis - 9);
    model.append('title');
    LANES.forEach((lane, k) => {
      const y = L.axis + k * L.lane;
      const g = this.gLanes.append('g').attr('class', `lane lane-${k}`).attr('transform', `translate(0,${y})`);
      g.append('text')
        .attr('class', 'lane-label')
        .attr('x', 10)
        .attr('y', L.lane / 2 + 4)
        .text(lane.label)
        .append('title')
        .text(lane.title);
      g.append('line').attr('class', 'lane-rule').attr('x1', L.left).attr('y1', L.lane).attr('y2', L.lane);
      g.append('g').attr('class', 'items').attr('clip-path', `url(#${this.clipId})`);
    });
    const chartTop = L.axis + LANES.length * L.lane + L.gap;
    CHARTS.forEach((c, k) => {
      const y = chartTop + k * (L.chart + L.gap);
      const g = this.gCharts.append('g').attr('class', `chart chart-${c.key}`).attr('transform', `translate(0,${y})`);
      // title, max and min stacked in the chart's height (closer together in the dense layout)
      const dense = L.chart < LAYOUT.chart;
      g.append('text')
        .attr('class', 'lane-label')
        .attr('x', 10)
        .attr('y', dense ? 10 : 14)
        .text(c.label);
      g.append('text')
        .attr('class', 'chart-scale chart-max')
        .attr('x', 10)
        .attr('y', dense ? 21 : 28);
      g.append('text')
        .attr('class', 'chart-scale chart-min')
        .attr('x', 10)
        .attr('y', L.chart - 2);
      g.append('rect').attr('class', 'chart-bg').attr('x', L.left).attr('y', 0).attr('height', L.chart);
      const inner = g.append('g').attr('clip-path', `url(#${this.clipId})`);
      inner.append('path').attr('class', 'chart-area').attr('fill', c.colour).attr('fill-opacity', 0.12);
      if (c.key === 'distance') inner.append('path').attr('class', 'chart-comparison').attr('fill', 'none').append('title');
      inner.append('path').attr('class', 'chart-line').attr('stroke', c.colour).attr('fill', 'none').attr('stroke-width', 1.5);
      if (c.key === 'distance') g.append('text').attr('class', 'chart-legend').attr('y', 11).attr('text-anchor', 'end');
    });
    this.buildSky();
    this.gCursor.append('line').attr('class', 'cursor-line').attr('y1', 0).attr('y2', this.height).attr('stroke', PALETTE.cursor);
    const handle = this.gCursor.append('g').attr('class', 'cursor-handle');
    handle.append('path').attr('d', 'M-7,0 H7 V12 L0,19 L-7,12 Z').attr('fill', PALETTE.cursor);
  }

  /** The sky lanes' static parts: the light-time chart (its title beside the body chooser the component lays over it) and the sunlight lane. */
  private buildSky(): void {
    const L = this.L;
    const dense = L.chart < LAYOUT.chart;
    const g = this.gSky.append('g').attr('class', 'chart chart-light').attr('data-testid', 'sky-light');
    g.append('text')
      .attr('class', 'lane-label')
      .attr('x', 10)
      .attr('y', dense ? 10 : 14)
      .text('Light')
      .append('title')
      .text('One-way light time from the ship to the body chosen beside: the distance at the same instant over c');
    g.append('text')
      .attr('class', 'chart-scale chart-max')
      .attr('x', 10)
      .attr('y', dense ? 21 : 28);
    g.append('text')
      .attr('class', 'chart-scale chart-min')
      .attr('x', 10)
      .attr('y', L.chart - 2);
    g.append('rect').attr('class', 'chart-bg').attr('x', L.left).attr('y', 0).attr('height', L.chart);
    const inner = g.append('g').attr('clip-path', `url(#${this.clipId})`);
    inner.append('path').attr('class', 'chart-area').attr('fill', SHADOW_COLOURS.light).attr('fill-opacity', 0.12);
    inner.append('path').attr('class', 'chart-line').attr('stroke', SHADOW_COLOURS.light).attr('fill', 'none').attr('stroke-width', 1.5);
    // the model read, bottom right (the light time grows away from the start body: the curve is high on the right)
    g.append('text')
      .attr('class', 'chart-legend')
      .attr('y', L.chart - 4)
      .attr('text-anchor', 'end');
    const lane = this.gSky
      .append('g')
      .attr('class', 'lane sky-sun')
      .attr('data-testid', 'sky-sun')
      .attr('transform', `translate(0,${L.chart + L.gap})`);
    lane
      .append('text')
      .attr('class', 'lane-label')
      .attr('x', 10)
      .attr('y', L.lane / 2 + 4)
      .append('title');
    lane.append('line').attr('class', 'lane-rule').attr('x1', L.left).attr('y1', L.lane).attr('y2', L.lane);
    lane.append('g').attr('class', 'items').attr('clip-path', `url(#${this.clipId})`);
  }

  /** The sky lanes' readouts (null: none yet); `stale` while those of the plan before the last edit are shown. */
  setSky(sky: SkyData | null, stale: boolean): void {
    this.gSky.classed('stale', stale);
    // the same figures marked stale (an edit: new ones come after it settles): no redraw
    if (sky === this.sky) return;
    this.sky = sky;
    this.drawSky();
  }

  /** Shows or hides the sky lanes; the Timeline's height follows. */
  setSkyShown(shown: boolean): void {
    if (shown === this.skyShown) return;
    this.skyShown = shown;
    this.gSky.attr('display', shown ? null : 'none');
    this.skyDrawn = null;
    this.baseHeight = chartsHeight(this.L) + (shown ? skyHeight(this.L) : 0);
    this.gExtra.attr('transform', `translate(0,${this.baseHeight})`);
    this.relayout();
  }

  private relayout(): void {
    this.height = this.baseHeight + (this.extra ? this.extra.height : 0);
    this.svg.attr('height', this.height);
    this.gCursor.select('.cursor-line').attr('y2', this.height);
    this.resize();
  }

  private drawSky(): void {
    if (!this.skyShown) return;
    const L = this.L;
    const x = this.x;
    const sky = this.sky;
    const [d0, d1] = x.domain();
    const [r0, r1] = x.range();
    const was = this.skyDrawn;
    if (was && was.sky === sky && was.d0 === d0 && was.d1 === d1 && was.r0 === r0 && was.r1 === r1) return;
    this.skyDrawn = { sky, d0, d1, r0, r1 };
    const g = this.gSky.select('.chart-light');
    const sun = this.gSky.select('.sky-sun');
    const n = sky ? sky.light.t.length : 0;
    if (!sky || n === 0) {
      g.selectAll('path').attr('d', null);
      g.select('.chart-max').text('');
      g.select('.chart-min')
        .text(sky ? 'no flight' : 'computing…')
        .attr('data-value', null);
      g.select('.chart-legend').text('');
      sun.select('.lane-label').text('Sunlight').attr('data-eclipses', null).append('title').text("The ship in sunlight or in a body's shadow (computing…)");
      sun.select('.items').selectAll('*').remove();
      return;
    }
    const s = sky.light;
    let lo = Infinity;
    let hi = -Infinity;
    for (let k = 0; k < n; k++) {
      lo = Math.min(lo, s.v[k]);
      hi = Math.max(hi, s.v[k]);
    }
    const y = d3
      .scaleLinear()
      .domain([0, hi > 0 ? hi * 1.05 : 1])
      .range([L.chart - 2, 3]);
    const xs = new Float64Array(n);
    const ys = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      xs[k] = x(s.t[k]);
      ys[k] = y(s.v[k]);
    }
    g.select('.chart-line').attr('d', linePath(xs, ys));
    g.select('.chart-area').attr('d', areaPath(xs, ys, L.chart - 2));
    g.select('.chart-max')
      .text(`max ${lightTimeText(hi)}`)
      .attr('data-value', hi);
    g.select('.chart-min')
      .text(`min ${lightTimeText(lo)}`)
      .attr('data-value', lo);
    g.select('.chart-legend').text(sky.model);
    const label = sun.select('.lane-label');
    label.text('Shadow').attr('data-eclipses', sky.eclipses);
    label
      .append('tspan')
      .attr('class', 'sky-count')
      .text(` ${shadowLabel(sky)}`);
    label.append('title').text(shadowTitle(sky));
    const minW = 2;
    sun
      .select('.items')
      .selectAll<SVGRectElement, SkyData['passes'][number]>('rect.pass')
      .data(sky.passes, (d) => `${d.body}-${d.kind}-${d.t0}`)
      .join((enter) => {
        const r = enter.append('rect');
        r.append('title');
        return r;
      })
      .attr('class', (d) => `pass pass-${d.kind}`)
      .attr('fill', (d) => SHADOW_COLOURS[d.kind])
      .attr('y', (d) => (d.kind === 'umbra' ? 2 : 5))
      .attr('height', (d) => (d.kind === 'umbra' ? L.lane - 4 : L.lane - 10))
      .attr('x', (d) => Math.min(x(d.t0), (x(d.t0) + x(d.t1)) / 2 - minW / 2))
      .attr('width', (d) => Math.max(minW, x(d.t1) - x(d.t0)))
      .select('title')
      .text((d) => `${passText(d)} (${sky.model})`);
  }

  /** Shows extra lanes below the charts (null: none); the Timeline grows by their height. */
  setExtra(extra: TimelineExtra | null): void {
    if (extra === this.extra) return;
    this.gExtra.selectAll('*').remove();
    this.extra = extra;
    this.height = this.baseHeight + (extra ? extra.height : 0);
    this.svg.attr('height', this.height);
    this.gCursor.select('.cursor-line').attr('y2', this.height);
    if (extra) extra.mount(this.gExtra.node()!, this.clipId);
    this.resize();
  }

  setCalendar(cal: SystemCalendar): void {
    this.cal = cal;
    this.redraw();
  }

  /** Names the model the lanes show (short words in the corner, the full sentence as its tooltip; faint while `stale`). */
  setModel(label: string, title: string, stale: boolean): void {
    const g = this.gAxis.select('.model');
    g.select('.model-label').classed('stale', stale).text(label);
    g.select('title').text(title);
  }

  setData(data: TimelineData | null, keepView = false): void {
    const prev = this.data;
    this.data = data;
    if (!data) {
      this.redraw();
      return;
    }
    const pad = Math.max(1, (data.t1 - data.t0) * 0.01);
    const sameSpan = prev && prev.t0 === data.t0 && prev.t1 === data.t1;
    this.x0.domain([data.t0 - pad, data.t1 + pad]);
    if (!(keepView && sameSpan)) {
      // the zoom event this emits must not draw: the one redraw below does, with the new extents
      this.settingData = true;
      try {
        this.svg.call(this.zoom.transform, d3.zoomIdentity);
      } finally {
        this.settingData = false;
      }
      this.x = this.x0.copy();
    } else this.x = d3.zoomTransform(this.svg.node()!).rescaleX(this.x0);
    const span = data.t1 - data.t0 + 2 * pad;
    this.zoom.scaleExtent([1, Math.max(1, span / 20)]).translateExtent([
      [LAYOUT.left, 0],
      [this.width - LAYOUT.right, this.height],
    ]);
    this.redraw();
  }

  /** Zooms so [a, b] fills the plot. */
  zoomTo(a: number, b: number): void {
    if (!this.data || !(b > a)) return;
    // screen = k·x0(t) + tx: put a at the left edge and b at the right edge of the plot.
    const k = (this.width - LAYOUT.right - LAYOUT.left) / (this.x0(b) - this.x0(a));
    const tx = LAYOUT.left - k * this.x0(a);
    this.svg.call(this.zoom.transform, d3.zoomIdentity.translate(tx, 0).scale(k));
  }

  resetZoom(): void {
    this.svg.call(this.zoom.transform, d3.zoomIdentity);
  }

  /** Visible time span, s. */
  visibleSpan(): [number, number] {
    const [a, b] = this.x.domain();
    return [a, b];
  }

  resize(): void {
    this.width = Math.max(320, this.container.clientWidth);
    this.svg.attr('width', this.width).attr('viewBox', `0 0 ${this.width} ${this.height}`);
    const range: [number, number] = [LAYOUT.left, this.width - LAYOUT.right];
    this.x0.range(range);
    this.x.range(range);
    this.svg
      .select(`#${this.clipId} rect`)
      .attr('x', LAYOUT.left)
      .attr('y', -2)
      .attr('width', this.width - LAYOUT.left - LAYOUT.right)
      .attr('height', this.height + 4);
    this.gAxis.select('.axis-strip').attr('width', this.width - LAYOUT.left - LAYOUT.right);
    this.gLanes.selectAll('.lane-rule').attr('x2', this.width - LAYOUT.right);
    this.gCharts.selectAll('.chart-bg').attr('width', this.width - LAYOUT.left - LAYOUT.right);
    this.gCharts.selectAll('.chart-legend').attr('x', this.width - LAYOUT.right - 5);
    this.gSky.selectAll('.chart-bg').attr('width', this.width - LAYOUT.left - LAYOUT.right);
    this.gSky.selectAll('.chart-legend').attr('x', this.width - LAYOUT.right - 5);
    this.gSky.selectAll('.lane-rule').attr('x2', this.width - LAYOUT.right);
    this.zoom.extent([
      [LAYOUT.left, 0],
      [this.width - LAYOUT.right, this.height],
    ]);
    if (this.data) this.setData(this.data, true);
    else this.redraw();
  }

  setCursor(t: number): void {
    this.cursorT = t;
    this.placeCursor();
  }

  private placeCursor(): void {
    const px = this.x(this.cursorT);
    const visible = Number.isFinite(px) && px >= LAYOUT.left - 0.5 && px <= this.width - LAYOUT.right + 0.5;
    this.gCursor.attr('transform', `translate(${px},0)`).attr('display', visible ? null : 'none');
  }

  /** setData is resetting the zoom (its zoom event then does not redraw). */
  private settingData = false;

  private redraw(): void {
    const L = this.L;
    const x = this.x;
    const data = this.data;
    // Axis.
    const ticks = data && this.cal ? calendarTicks(this.cal, x.domain()[0], x.domain()[1], Math.max(3, Math.floor((this.width - L.left) / 110))) : [];
    const tg = this.gAxis
      .select('.ticks')
      .selectAll<SVGGElement, (typeof ticks)[number]>('g.tick')
      .data(ticks, (d) => String(d.t))
      .join((enter) => {
        const g = enter.append('g').attr('class', 'tick');
        g.append('line')
          .attr('y1', L.axis - 6)
          .attr('y2', this.height);
        g.append('text')
          .attr('y', L.axis - 9)
          .attr('x', 3);
        return g;
      });
    tg.attr('transform', (d) => `translate(${x(d.t)},0)`)
      .classed('major', (d) => d.major)
      .select('text')
      .text((d) => d.label);
    tg.select('line').attr('y2', this.height);

    if (!data) {
      this.gLanes.selectAll('.items').selectAll('*').remove();
      this.gCharts.selectAll('path').attr('d', null);
      this.placeCursor();
      return;
    }
    const lane = (k: number) => this.gLanes.select(`.lane-${k} .items`);
    const minW = 4;
    // Burns: bars as long as the burn (at least 4 px so an impulsive burn shows), each over a
    // grab area of at least BURN_HIT_PX; a burn with a time of its own drags (ew cursor), one
    // timed by the event before it says why not in its tooltip.
    const why = (id: string) => (this.cb.whyNotDraggable ? this.cb.whyNotDraggable(id) : 'not draggable here');
    const burns = lane(0)
      .selectAll<SVGGElement, TimelineData['burns'][number]>('g.burn')
      .data(data.burns, (d) => d.id)
      .join((enter) => {
        const g = enter.append('g').attr('class', 'burn');
        g.append('rect').attr('class', 'burn-hit').attr('fill', 'transparent').attr('y', 0).attr('height', L.lane);
        g.append('rect')
          .attr('class', 'burn-bar')
          .attr('y', 3)
          .attr('height', L.lane - 6);
        g.append('text')
          .attr('class', 'burn-time chart-scale')
          .attr('y', L.lane - 4);
        g.append('title');
        g.call(this.burnDrag());
        return g;
      })
      .attr('data-id', (d) => d.id)
      .attr('transform', null)
      .classed('dragging', false)
      .classed('draggable', (d) => why(d.id) === null)
      .attr('cursor', (d) => (why(d.id) === null ? 'ew-resize' : 'not-allowed'));
    burns
      .select('.burn-bar')
      .attr('class', (d) => `burn-bar${d.flagged ? ` flag-${d.flagged}` : ''}`)
      .attr('data-id', (d) => d.id)
      .attr('x', (d) => Math.min(x(d.tStart), x(d.t) - minW / 2))
      .attr('width', (d) => Math.max(minW, x(d.tEnd) - x(d.tStart)));
    burns
      .select('.burn-hit')
      .attr('x', (d) => Math.min(x(d.tStart), x(d.t) - BURN_HIT_PX / 2))
      .attr('width', (d) => Math.max(BURN_HIT_PX, x(d.tEnd) - x(d.tStart)));
    burns
      .select('.burn-time')
      .attr('x', (d) => x(d.t) + BURN_HIT_PX / 2 + 2)
      .text('');
    burns.select('title').text((d) => {
      const w = why(d.id);
      return `${d.name}: ${d.dv.toFixed(1)} m/s${w === null ? ' · drag to retime (whole minutes), [ ] with it selected' : ` · ${w}`}`;
    });
    if (this.dragging) this.drawDragPreview();
    // SOI spans.
    const soiSel = lane(1)
      .selectAll<SVGGElement, TimelineData['soi'][number]>('g.soi')
      .data(data.soi, (d) => `${d.central}-${d.t0}`)
      .join((enter) => {
        const g = enter.append('g').attr('class', 'soi');
        g.append('rect')
          .attr('y', 3)
          .attr('height', L.lane - 6);
        g.append('text').attr('y', L.lane / 2 + 4);
        g.append('title');
        return g;
      });
    soiSel
      .attr('data-name', (d) => d.name)
      .select('rect')
      .attr('x', (d) => x(d.t0))
      .attr('width', (d) => Math.max(1, x(d.t1) - x(d.t0)))
      .attr('fill', (d) => d.colour);
    soiSel.select('title').text((d) => `${d.name}'s sphere of influence`);
    // Each span's name inside it when it fits, else just before it when the lane is free there
    // (a short last span: the arrival), else none; names never overlap each other.
    let free = L.left; // the lane is free from here on
    soiSel.select<SVGTextElement>('text').each((d, k, nodes) => {
      const a = Math.max(x(d.t0), L.left);
      const b = Math.min(x(d.t1), x.range()[1]);
      const w = d.name.length * CHAR_PX;
      const el = d3.select(nodes[k]);
      if (b - a > w + 8 && a + 4 >= free) {
        el.attr('x', a + 4)
          .attr('text-anchor', 'start')
          .text(d.name);
        free = a + 4 + w + 6;
      } else if (b > a - 1 && a - 3 - w >= free) {
        el.attr('x', a - 3)
          .attr('text-anchor', 'end')
          .text(d.name);
        free = b + 2;
      } else el.text('');
    });
    // Events: ticks with a tooltip.
    lane(2)
      .selectAll<SVGPathElement, TimelineData['events'][number]>('path.event')
      .data(data.events, (d) => `${d.kind}-${d.t}`)
      .join('path')
      .attr('class', (d) => `event event-${d.kind}`)
      .attr('d', (d) => `M${x(d.t)},4 l4,6 l-4,6 l-4,-6 Z`)
      .selectAll('title')
      .data((d) => [d])
      .join('title')
      .text((d) => d.label);
    // Charts.
    CHARTS.forEach((c) => this.drawChart(c.key, data[c.key] as Series, c.key === 'distance' ? data.comparison : null));
    this.drawSky();
    this.extra?.draw(x, this.width);
    this.placeCursor();
  }

  private drawChart(key: ChartKey, s: Series, comparison: TimelineData['comparison']): void {
    const L = this.L;
    const g = this.gCharts.select(`.chart-${key}`);
    const n = s.t.length;
    const cmp = comparison && comparison.distance.t.length > 0 ? comparison : null;
    g.select('.chart-legend').text(cmp ? `- - ${cmp.label}` : '');
    if (n === 0) {
      g.selectAll('path').attr('d', null);
      g.select('.chart-max').text('');
      g.select('.chart-min')
        .text(key === 'distance' ? 'no target' : '')
        .attr('data-value', null);
      return;
    }
    let lo = Infinity;
    let hi = -Infinity;
    for (let k = 0; k < n; k++) {
      lo = Math.min(lo, s.v[k]);
      hi = Math.max(hi, s.v[k]);
    }
    // the comparison shares the scale (the labels stay the shown model's)
    let yLo = lo;
    let yHi = hi;
    if (cmp)
      for (let k = 0; k < cmp.distance.v.length; k++) {
        yLo = Math.min(yLo, cmp.distance.v[k]);
        yHi = Math.max(yHi, cmp.distance.v[k]);
      }
    const log = key === 'distance';
    let y: d3.ScaleContinuousNumeric<number, number>;
    if (log)
      y = d3
        .scaleLog()
        .domain([Math.max(1, yLo) * 0.8, Math.max(yHi, yLo * 2) * 1.2])
        .range([L.chart - 2, 3]);
    else
      y = d3
        .scaleLinear()
        .domain([Math.min(0, lo), hi > lo ? hi * 1.05 : lo + 1])
        .range([L.chart - 2, 3]);
    const floor = log ? 1 : -Infinity;
    const xs = new Float64Array(n);
    const ys = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      xs[k] = this.x(s.t[k]);
      ys[k] = y(Math.max(floor, s.v[k]));
    }
    g.select('.chart-line').attr('d', linePath(xs, ys));
    g.select('.chart-area').attr('d', areaPath(xs, ys, L.chart - 2));
    if (key === 'distance') {
      const c = g.select('.chart-comparison');
      if (cmp) {
        const cs = cmp.distance;
        const m = cs.t.length;
        const cx = new Float64Array(m);
        const cy = new Float64Array(m);
        for (let k = 0; k < m; k++) {
          cx[k] = this.x(cs.t[k]);
          cy[k] = y(Math.max(1, cs.v[k]));
        }
        c.attr('d', linePath(cx, cy));
        c.select('title').text(`distance to the target in ${cmp.label} (the comparison)`);
      } else c.attr('d', null);
    }
    const fmt = (v: number) => (key === 'propellant' ? `${(v / 1000).toFixed(1)} t` : key === 'dvLeft' ? `${(v / 1000).toFixed(2)} km/s` : formatDistance(v));
    g.select('.chart-max').text(`max ${fmt(hi)}`);
    g.select('.chart-min')
      .text(`min ${fmt(lo)}`)
      .attr('data-value', lo);
  }

  dispose(): void {
    this.svg.remove();
  }
}
