/**
 * The retargeting's lane in the Timeline (imperative d3 code): a legend row, then the game's
 * distance from the plan's path, |r_game − r_plan| in m, against time on a log scale with decade
 * labels — flying the plan's own burns (rose, thin) and flying the retargeted schedule (green,
 * thicker), extrapolated stretches dashed (retargetSeries.ts). Drawn with the Timeline's own
 * time scale (timeline/timelineChart.ts TimelineExtra), so it zooms and pans with it; the layout
 * follows the game-step lanes (gamestep/errorChart.ts LANES_LAYOUT).
 */
import * as d3 from 'd3';
import type { TimelineExtra } from '../timeline/timelineChart.ts';
import { LAYOUT } from '../timeline/timelineChart.ts';
import { LANES_LAYOUT, laneValue } from '../gamestep/errorChart.ts';
import { clampLog, decadeTicks, lengthTick } from '../gamestep/logAxis.ts';
import { GAME_STYLE } from '../gamestep/style.ts';
import { PALETTE } from '../scene/palette.ts';
import type { CurveRun, RetargetCurve, RetargetLaneData } from './retargetSeries.ts';

/** Each curve's colour and width: the two told apart by width as well as hue. */
export const CURVE_STYLE: Record<RetargetCurve['key'], { colour: string; width: number }> = {
  before: { colour: GAME_STYLE.game, width: 1.2 },
  after: { colour: PALETTE.good, width: 2 },
};

/** The lane is taller than a game-step lane: two curves that may lie decades apart. */
export const RETARGET_LANE = 72;

export class RetargetLane implements TimelineExtra {
  readonly height = LANES_LAYOUT.header + RETARGET_LANE + LANES_LAYOUT.gap;
  private g: d3.Selection<SVGGElement, unknown, null, undefined> | null = null;

  /** `caption`: the physics in a few words for the legend row. */
  constructor(
    private readonly data: RetargetLaneData,
    private readonly caption: string,
  ) {}

  mount(node: SVGGElement, clipId: string): void {
    const L = LANES_LAYOUT;
    // its own group: the node is the Timeline's, which keeps its attributes when the lane is taken out
    const g = d3.select(node).append('g').attr('class', 'retarget-lane').attr('data-testid', 'retarget-lane');
    this.g = g;
    const head = g.append('g').attr('class', 'rt-legend');
    head.append('text').attr('class', 'lane-label').attr('x', 10).attr('y', 14).text('Retargeted');
    head
      .append('text')
      .attr('class', 'rt-caption')
      .attr('x', LAYOUT.left + 4)
      .attr('y', 14)
      .attr('fill', PALETTE.muted)
      .style('font', '10.5px var(--mono)')
      .text(this.caption);
    const items: { label: string; key?: string; draw: (s: d3.Selection<SVGGElement, unknown, null, undefined>) => void }[] = this.data.curves.map((c) => ({
      label: c.label,
      key: c.key,
      draw: (s) => s.append('line').attr('x2', 18).attr('stroke', CURVE_STYLE[c.key].colour).attr('stroke-width', CURVE_STYLE[c.key].width),
    }));
    if (this.data.hasExtrapolated) {
      items.push({
        label: 'extrapolated',
        draw: (s) => s.append('line').attr('x2', 18).attr('stroke', PALETTE.muted).attr('stroke-width', 1.6).attr('stroke-dasharray', GAME_STYLE.dash),
      });
    }
    items.push({ label: '|game − plan|, log scale', draw: () => undefined });
    const legend = head.append('g').attr('class', 'rt-legend-items');
    for (const it of items) {
      const s = legend
        .append('g')
        .attr('class', 'rt-legend-item')
        .attr('data-curve', it.key ?? null);
      const sym = s.append('g').attr('transform', 'translate(0,10)');
      it.draw(sym);
      s.append('text')
        .attr('x', sym.node()!.childElementCount > 0 ? 22 : 0)
        .attr('y', 14)
        .attr('fill', PALETTE.muted)
        .style('font-size', '10px')
        .text(it.label);
    }
    const lg = g.append('g').attr('class', 'rt-lane').attr('transform', `translate(0,${L.header})`);
    lg.append('title').text("How far the game's flight strays from the plan's path, m: flying the plan's own burns, and flying the retargeted schedule");
    lg.append('text').attr('class', 'lane-label').attr('x', 10).attr('y', 10).text('Game vs plan');
    lg.append('rect').attr('class', 'chart-bg').attr('x', LAYOUT.left).attr('y', 0).attr('height', RETARGET_LANE);
    const ends = this.data.curves.map((c) => `${c.key === 'before' ? "plan's burns" : 'retargeted'} max ${laneValue('position', c.max)}`).join(' · ');
    lg.append('text').attr('class', 'chart-scale rt-extent').attr('y', 11).attr('text-anchor', 'end').text(ends);
    const inner = lg.append('g').attr('class', 'rt-plot').attr('clip-path', `url(#${clipId})`);
    inner.append('g').attr('class', 'rt-grid');
    inner.append('g').attr('class', 'rt-curves');
    lg.append('g').attr('class', 'rt-ticks');
    if (!this.data.domain)
      lg.append('text')
        .attr('class', 'chart-scale')
        .attr('x', LAYOUT.left + 8)
        .attr('y', RETARGET_LANE / 2 + 4)
        .text('no distance above zero');
  }

  draw(x: d3.ScaleLinear<number, number>, width: number): void {
    const g = this.g;
    if (!g) return;
    const L = LANES_LAYOUT;
    const right = width - LAYOUT.right;
    g.selectAll('.chart-bg').attr('width', Math.max(0, right - LAYOUT.left));
    g.selectAll('.rt-extent').attr('x', right - 6);
    const caption = g.select<SVGTextElement>('.rt-caption').node();
    let lx = LAYOUT.left + 4 + (caption ? caption.getComputedTextLength() : 0) + 18;
    g.selectAll<SVGGElement, unknown>('.rt-legend-item').each(function () {
      d3.select(this).attr('transform', `translate(${lx},0)`);
      lx += (this.getBBox?.().width ?? 60) + 14;
    });
    const d = this.data.domain;
    if (!d) return;
    const lg = g.select('.rt-lane');
    const y = d3
      .scaleLog()
      .domain([d.lo, d.hi])
      .range([RETARGET_LANE - 3, L.band + 2]);
    const ticks = decadeTicks(d, Math.floor((RETARGET_LANE - 3 - L.band - 2) / L.tickSpacing) + 1);
    lg.select('.rt-grid')
      .selectAll<SVGLineElement, number>('line')
      .data(ticks)
      .join('line')
      .attr('stroke', '#223030')
      .attr('x1', LAYOUT.left)
      .attr('x2', right)
      .attr('y1', (v) => y(v))
      .attr('y2', (v) => y(v));
    lg.select('.rt-ticks')
      .selectAll<SVGTextElement, number>('text')
      .data(ticks)
      .join('text')
      .attr('class', 'rt-tick')
      .attr('fill', PALETTE.muted)
      .attr('text-anchor', 'end')
      .style('font', '9.5px var(--mono)')
      .attr('x', LAYOUT.left - 5)
      .attr('y', (v) => y(v) + 3.5)
      .text((v) => lengthTick(v));
    const paths: { curve: RetargetCurve; run: CurveRun }[] = this.data.curves.flatMap((curve) => curve.runs.map((run) => ({ curve, run })));
    lg.select('.rt-curves')
      .selectAll<SVGPathElement, (typeof paths)[number]>('path')
      .data(paths)
      .join('path')
      .attr('class', (p) => `rt-curve rt-${p.curve.key}`)
      .attr('data-curve', (p) => p.curve.key)
      .attr('data-style', (p) => (p.run.extrapolated ? 'extrapolated' : 'flown'))
      .attr('fill', 'none')
      .attr('stroke', (p) => CURVE_STYLE[p.curve.key].colour)
      .attr('stroke-width', (p) => CURVE_STYLE[p.curve.key].width)
      .attr('stroke-dasharray', (p) => (p.run.extrapolated ? GAME_STYLE.dash : null))
      .attr('d', (p) => {
        const { t, values } = p.curve;
        const line = d3
          .line<number>()
          .defined((i) => Number.isFinite(values[i]))
          .x((i) => x(t[i]))
          .y((i) => y(clampLog(values[i], d)));
        return line(d3.range(p.run.from, p.run.to + 1));
      });
  }
}

/** Several extra lanes stacked in the Timeline, each below the one before (e.g. the game-step lanes, then the retargeting's). */
export class StackedExtras implements TimelineExtra {
  readonly height: number;
  constructor(private readonly parts: readonly TimelineExtra[]) {
    this.height = parts.reduce((h, p) => h + p.height, 0);
  }

  mount(node: SVGGElement, clipId: string): void {
    let y = 0;
    for (const p of this.parts) {
      const g = d3.select(node).append('g').attr('transform', `translate(0,${y})`);
      p.mount(g.node()!, clipId);
      y += p.height;
    }
  }

  draw(x: d3.ScaleLinear<number, number>, width: number): void {
    for (const p of this.parts) p.draw(x, width);
  }
}

/** The extras to show: none, the one there is, or the stack of them. */
export function stackExtras(parts: readonly (TimelineExtra | null)[]): TimelineExtra | null {
  const shown = parts.filter((p): p is TimelineExtra => p !== null);
  return shown.length === 0 ? null : shown.length === 1 ? shown[0] : new StackedExtras(shown);
}
