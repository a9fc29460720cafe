/**
 * Main-thread CPU time of a page's clicks, read from a Chromium trace: the thread time (not the
 * wall time) of the task that ran each click, and of every task from it up to and including the
 * next one that runs animation frames (the frame that draws the 3D scene). On a loaded machine
 * the wall time of an edit mostly waits for a core; the thread time is what the edit costs.
 */
import type { Browser, Page } from 'playwright-core';

interface TraceEvent {
  name: string;
  ph: string;
  pid: number;
  tid: number;
  ts: number;
  dur?: number;
  tdur?: number;
  args?: { name?: string; data?: { type?: string } };
}

export interface ClickCpu {
  /** Thread time of each click's task (the click, its microtasks, and that frame's style, layout and paint), ms. */
  click: number[];
  /** Thread time from the click's task through the next frame's task (the scene drawn), ms. */
  toFrame: number[];
}

/** Runs `work` in `page` while tracing, and returns the main thread's CPU time per click. */
export async function traceClickCpu<T>(browser: Browser, page: Page, work: () => Promise<T>): Promise<{ result: T; cpu: ClickCpu }> {
  await browser.startTracing(page, { categories: ['devtools.timeline', 'disabled-by-default-devtools.timeline'] });
  const result = await work();
  const buffer = await browser.stopTracing();
  return { result, cpu: clickCpu(JSON.parse(buffer.toString()) as { traceEvents: TraceEvent[] } | TraceEvent[]) };
}

export function clickCpu(trace: { traceEvents: TraceEvent[] } | TraceEvent[]): ClickCpu {
  const events = Array.isArray(trace) ? trace : trace.traceEvents;
  const key = (e: TraceEvent) => `${e.pid}:${e.tid}`;
  // the page's main thread: the renderer main thread with the most events
  const mains = new Set(events.filter((e) => e.ph === 'M' && e.name === 'thread_name' && e.args?.name === 'CrRendererMain').map(key));
  const counts = new Map<string, number>();
  for (const e of events) if (mains.has(key(e))) counts.set(key(e), (counts.get(key(e)) ?? 0) + 1);
  const main = [...counts.entries()].sort((a, b) => b[1] - a[1])[0]?.[0];
  const on = events.filter((e) => key(e) === main);
  const tasks = on.filter((e) => e.ph === 'X' && e.name === 'RunTask' && e.tdur !== undefined && e.dur !== undefined).sort((a, b) => a.ts - b.ts);
  const frames = on.filter((e) => e.name === 'FireAnimationFrame').map((e) => e.ts);
  const clicks = on.filter((e) => e.name === 'EventDispatch' && e.args?.data?.type === 'click').sort((a, b) => a.ts - b.ts);
  const out: ClickCpu = { click: [], toFrame: [] };
  const within = (t: TraceEvent, ts: number) => t.ts <= ts && ts <= t.ts + (t.dur ?? 0);
  for (const c of clicks) {
    const k = tasks.findIndex((t) => within(t, c.ts));
    if (k < 0) continue;
    out.click.push((tasks[k].tdur ?? 0) / 1000);
    let cpu = tasks[k].tdur ?? 0;
    for (let j = k + 1; j < tasks.length; j++) {
      cpu += tasks[j].tdur ?? 0;
      if (frames.some((f) => within(tasks[j], f))) break;
    }
    out.toFrame.push(cpu / 1000);
  }
  return out;
}

/** Median and 95th percentile of `a`. */
export function quantiles(a: readonly number[]): [number, number] {
  const s = [...a].sort((x, y) => x - y);
  return [s[Math.floor(s.length / 2)], s[Math.min(s.length - 1, Math.ceil(s.length * 0.95) - 1)]];
}
