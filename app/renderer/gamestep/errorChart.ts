/**
 * The game-step check's error lanes in the Timeline (imperative d3 code): a legend row, then
 * position error, velocity error and |relative energy error| against time on log scales with
 * decade numbers, drawn with the Timeline's own time scale (timeline/timelineChart.ts
 * TimelineExtra), so they zoom and pan with it. Decade numbers stand in the label column, right
 * of the lane's name band; the largest and last values sit in the lane's top band. Measured stretches are solid, extrapolated
 * ones dashed, stretches measured after an extrapolated region faded (errorSeries.ts); the
 * position lane shows the tolerance (dashed), the reference flight's own accuracy (dotted) and
 * the first time the tolerance was exceeded.
 */
import * as d3 from 'd3';
import type { TimelineExtra } from '../timeline/timelineChart.ts';
import { LAYOUT } from '../timeline/timelineChart.ts';
import type { ErrorLane, ErrorLanes, Run } from './errorSeries.ts';
import { clampLog, decadeTicks, lengthTick, powerOfTen, speedTick } from './logAxis.ts';
import { GAME_STYLE } from './style.ts';
import { PALETTE } from '../scene/palette.ts';

export const LANES_LAYOUT = {
  /** Legend row. */
  header: 18,
  lane: 54,
  /** Top band of a lane for its texts (label, max and end); the curves are drawn below it. */
  band: 15,
  gap: 4,
  /** Least vertical room per decade label, px. */
  tickSpacing: 11,
} as const;

/** Height of the lanes block for n lanes. */
export function lanesHeight(n: number): number {
  return LANES_LAYOUT.header + n * (LANES_LAYOUT.lane + LANES_LAYOUT.gap);
}

const TICK_LABEL: Record<ErrorLane['key'], (v: number) => string> = { position: lengthTick, velocity: speedTick, energy: powerOfTen };

/** Readout of a value for the lane's max/end text. */
export function laneValue(key: ErrorLane['key'], v: number): string {
  if (!Number.isFinite(v) || v >= 1e300) return 'diverged';
  if (key === 'energy') return v === 0 ? '0' : v.toExponential(1);
  const u = key === 'position' ? 'm' : 'm/s';
  const a = Math.abs(v);
  if (a === 0) return `0 ${u}`;
  if (a < 1e-3) return `${v.toExponential(1)} ${u}`;
  if (a < 1) return `${(v * 1e3).toPrecision(3)} m${u}`;
  if (a < 1e3) return `${v.toPrecision(3)} ${u}`;
  if (a < 1e9) return `${(v / 1e3).toPrecision(3)} k${u}`;
  return `${(v / 1e3).toExponential(2)} k${u}`;
}

export class GameStepLanes implements TimelineExtra {
  readonly height: number;
  private g: d3.Selection<SVGGElement, unknown, null, undefined> | null = null;

  /** `caption`: the physics in a few words for the legend row ("velocity Verlet, 16.7 ms, float64"). */
  constructor(
    private readonly data: ErrorLanes,
    private readonly caption: string,
  ) {
    this.height = lanesHeight(data.lanes.length);
  }

  mount(node: SVGGElement, clipId: string): void {
    const L = LANES_LAYOUT;
    const g = d3.select(node).attr('class', 'extra gamestep-lanes').attr('data-testid', 'gamestep-lanes');
    this.g = g;
    // legend row
    const head = g.append('g').attr('class', 'gs-legend');
    head.append('text').attr('class', 'lane-label').attr('x', 10).attr('y', 14).text('Game step');
    head
      .append('text')
      .attr('class', 'gs-caption')
      .attr('x', LAYOUT.left + 4)
      .attr('y', 14)
      .attr('fill', GAME_STYLE.game)
      .style('font', '10.5px var(--mono)')
      .text(this.caption);
    const items: { label: string; draw: (s: d3.Selection<SVGGElement, unknown, null, undefined>) => void }[] = [
      { label: 'measured', draw: (s) => s.append('line').attr('x2', 18).attr('stroke', GAME_STYLE.game).attr('stroke-width', 1.6) },
    ];
    if (this.data.hasExtrapolated) {
      items.push({
        label: 'extrapolated',
        draw: (s) => s.append('line').attr('x2', 18).attr('stroke', GAME_STYLE.game).attr('stroke-width', 1.6).attr('stroke-dasharray', GAME_STYLE.dash),
      });
    }
    if (this.data.hasCarried) {
      items.push({
        label: 'measured after extrapolation',
        draw: (s) =>
          s.append('line').attr('x2', 18).attr('stroke', GAME_STYLE.game).attr('stroke-width', 1.6).attr('stroke-opacity', GAME_STYLE.carriedOpacity),
      });
    }
    const tol = this.data.lanes[0]?.lines.find((l) => l.kind === 'tolerance');
    items.push({
      label: tol ? `tolerance ${laneValue('position', tol.value)}` : 'tolerance',
      draw: (s) => s.append('line').attr('x2', 18).attr('stroke', GAME_STYLE.tolerance).attr('stroke-dasharray', '3 2'),
    });
    if (this.data.lanes[0]?.lines.some((l) => l.kind === 'resolution')) {
      items.push({
        label: 'reference accuracy',
        draw: (s) => s.append('line').attr('x2', 18).attr('stroke', GAME_STYLE.resolution).attr('stroke-dasharray', '1 2'),
      });
    }
    items.push({ label: 'log scales', draw: () => undefined });
    const legend = head.append('g').attr('class', 'gs-legend-items');
    for (const it of items) {
      const s = legend.append('g').attr('class', 'gs-legend-item');
      const sym = s.append('g').attr('transform', 'translate(0,10)');
      it.draw(sym);
      s.append('text')
        .attr('x', sym.node()!.childElementCount > 0 ? 22 : 0)
        .attr('y', 14)
        .attr('fill', PALETTE.muted)
        .style('font-size', '10px')
        .text(it.label);
    }
    // lanes
    this.data.lanes.forEach((lane, k) => {
      const y = L.header + k * (L.lane + L.gap);
      const lg = g.append('g').attr('class', `gs-lane gs-lane-${lane.key}`).attr('data-lane', lane.key).attr('transform', `translate(0,${y})`);
      lg.append('title').text(lane.title);
      lg.append('text').attr('class', 'lane-label').attr('x', 10).attr('y', 10).text(lane.label);
      let max = -Infinity;
      for (let i = 0; i < lane.values.length; i++) max = Math.max(max, lane.values[i]);
      const end = lane.values.length ? lane.values[lane.values.length - 1] : NaN;
      lg.append('rect').attr('class', 'chart-bg').attr('x', LAYOUT.left).attr('y', 0).attr('height', L.lane);
      lg.append('text')
        .attr('class', 'chart-scale gs-extent')
        .attr('y', 11)
        .attr('text-anchor', 'end')
        .text(lane.values.length ? `max ${laneValue(lane.key, max)} · end ${laneValue(lane.key, end)}` : '');
      const inner = lg.append('g').attr('class', 'gs-plot').attr('clip-path', `url(#${clipId})`);
      inner.append('g').attr('class', 'gs-grid');
      inner.append('g').attr('class', 'gs-lines');
      inner.append('g').attr('class', 'gs-curves');
      inner.append('g').attr('class', 'gs-marks');
      lg.append('g').attr('class', 'gs-ticks');
      if (!lane.domain)
        lg.append('text')
          .attr('class', 'chart-scale')
          .attr('x', LAYOUT.left + 8)
          .attr('y', L.lane / 2 + 4)
          .text('no error above zero');
    });
  }

  draw(x: d3.ScaleLinear<number, number>, width: number): void {
    const g = this.g;
    if (!g) return;
    const L = LANES_LAYOUT;
    const right = width - LAYOUT.right;
    g.selectAll('.chart-bg').attr('width', Math.max(0, right - LAYOUT.left));
    g.selectAll('.gs-extent').attr('x', right - 6);
    // legend items laid out from the right edge of the caption
    const caption = g.select<SVGTextElement>('.gs-caption').node();
    let lx = LAYOUT.left + 4 + (caption ? caption.getComputedTextLength() : 0) + 18;
    g.selectAll<SVGGElement, unknown>('.gs-legend-item').each(function () {
      d3.select(this).attr('transform', `translate(${lx},0)`);
      lx += (this.getBBox?.().width ?? 60) + 14;
    });
    const { t, runs } = this.data;
    this.data.lanes.forEach((lane) => {
      const lg = g.select(`.gs-lane-${lane.key}`);
      const d = lane.domain;
      if (!d) return;
      const y = d3
        .scaleLog()
        .domain([d.lo, d.hi])
        .range([L.lane - 3, L.band + 2]);
      const ticks = decadeTicks(d, Math.floor((L.lane - 3 - L.band - 2) / L.tickSpacing) + 1);
      lg.select('.gs-grid')
        .selectAll<SVGLineElement, number>('line')
        .data(ticks)
        .join('line')
        .attr('class', 'gs-gridline')
        .attr('stroke', '#223030')
        .attr('x1', LAYOUT.left)
        .attr('x2', right)
        .attr('y1', (v) => y(v))
        .attr('y2', (v) => y(v));
      const label = TICK_LABEL[lane.key];
      lg.select('.gs-ticks')
        .selectAll<SVGTextElement, number>('text')
        .data(ticks)
        .join('text')
        .attr('class', 'gs-tick')
        .attr('fill', PALETTE.muted)
        .attr('text-anchor', 'end')
        .style('font', '9.5px var(--mono)')
        .attr('x', LAYOUT.left - 5)
        .attr('y', (v) => y(v) + 3.5)
        .text((v) => label(v));
      lg.select('.gs-lines')
        .selectAll<SVGLineElement, ErrorLane['lines'][number]>('line')
        .data(lane.lines.filter((l) => l.value > d.lo && l.value < d.hi))
        .join('line')
        .attr('class', (l) => `gs-ref gs-${l.kind}`)
        .attr('x1', LAYOUT.left)
        .attr('x2', right)
        .attr('y1', (l) => y(l.value))
        .attr('y2', (l) => y(l.value))
        .attr('stroke', (l) => (l.kind === 'tolerance' ? GAME_STYLE.tolerance : GAME_STYLE.resolution))
        .attr('stroke-dasharray', (l) => (l.kind === 'tolerance' ? '3 2' : '1 2'));
      const line = d3
        .line<number>()
        .x((i) => x(t[i]))
        .y((i) => y(clampLog(lane.values[i], d)));
      lg.select('.gs-curves')
        .selectAll<SVGPathElement, Run>('path')
        .data(runs)
        .join('path')
        .attr('class', (r) => `gs-curve gs-${r.style}`)
        .attr('data-style', (r) => r.style)
        .attr('fill', 'none')
        .attr('stroke', GAME_STYLE.game)
        .attr('stroke-width', 1.6)
        .attr('stroke-dasharray', (r) => (r.style === 'extrapolated' ? GAME_STYLE.dash : null))
        .attr('stroke-opacity', (r) => (r.style === 'carried' ? GAME_STYLE.carriedOpacity : 1))
        .attr('d', (r) => line(d3.range(r.from, r.to + 1)));
      const marks: { t: number; label: string; colour: string }[] = [];
      if (lane.key === 'position' && this.data.firstExceed !== null)
        marks.push({ t: this.data.firstExceed, label: 'exceeds tolerance', colour: GAME_STYLE.exceed });
      if (this.data.divergedAt !== null) marks.push({ t: this.data.divergedAt, label: 'diverged', colour: GAME_STYLE.exceed });
      const mk = lg
        .select('.gs-marks')
        .selectAll<SVGGElement, (typeof marks)[number]>('g.gs-mark')
        .data(marks)
        .join((enter) => {
          const m = enter.append('g').attr('class', 'gs-mark');
          m.append('line').attr('y1', 0).attr('y2', L.lane);
          m.append('text')
            .attr('x', 4)
            .attr('y', L.lane - 6)
            .style('font-size', '10px');
          return m;
        });
      mk.attr('transform', (m) => `translate(${x(m.t)},0)`);
      mk.select('line').attr('stroke', (m) => m.colour);
      mk.select('text')
        .attr('fill', (m) => m.colour)
        .text((m) => m.label);
    });
  }
}
