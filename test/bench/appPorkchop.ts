/**
 * The Windows view's porkchop in the app against the same job in Node, for scrub.bench.ts:
 * "click → list" is the wall time in the page from the Compute click to the windows list in the
 * DOM (the view's `waymark:porkchop:listed` mark, after Svelte's update), and "→ next frame"
 * adds the wait for the animation frame that shows it; "click → picture" runs to the picture on
 * the canvas (`waymark:porkchop:drawn`), which the workers send after the list. The reference is the same job (the grid
 * and its windows: core computePorkchop + findWindows, one thread) for the same request (the
 * view's form for the page's plan, windowsForm.ts), run in this Node process between the
 * page's clicks so both see the same machine load. Warm: after one click of the same size.
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { PORKCHOP_GRID_CHOICES, WINDOW_COUNT } from '../../core/io/defaults.ts';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import type { Plan } from '../../core/plan/index.ts';
import { computePorkchop } from '../../core/search/porkchop.ts';
import { findWindows } from '../../core/search/windows.ts';
import { initialWindowsForm, windowsRequest } from '../../app/renderer/windows/windowsForm.ts';

/** The goal: click → list in the app within GOAL × the same job in Node. */
export const GOAL = 1.5;

// In-page code is passed as text (the bench runner's transpiler would add helpers the page lacks).
const CLICK = `(async () => {
  const raf = () => new Promise((r) => requestAnimationFrame(r));
  await raf();
  await new Promise((r) => setTimeout(r, 30));
  performance.clearMarks();
  const t0 = performance.now();
  document.querySelector('[data-testid=win-compute]').click();
  const listed = () => performance.getEntriesByName('waymark:porkchop:listed')[0];
  while (!listed()) await new Promise((r) => setTimeout(r, 1));
  await raf();
  const frame = performance.now();
  const drawn = () => performance.getEntriesByName('waymark:porkchop:drawn')[0];
  while (!drawn()) await new Promise((r) => setTimeout(r, 1));
  const mark = (k) => performance.getEntriesByName('waymark:porkchop:' + k)[0].startTime;
  const msg = document.querySelector('[data-testid=win-message]').textContent;
  const d = performance.getEntriesByName('waymark:porkchop:list-received')[0].detail;
  const e = performance.getEntriesByName('waymark:porkchop:received')[0].detail;
  return { list: mark('listed') - t0, frame: frame - t0, picture: mark('drawn') - t0, page: mark('listed') - mark('list-received'), pagePicture: mark('drawn') - mark('received'), posted: mark('posted') - t0, post: d.startedAt - t0, back: mark('list-received') - d.sentAt, grid: d.gridMs, windows: d.windowsMs, raster: e.rasterMs, msg };
})()`;

interface Click {
  list: number;
  frame: number;
  /** Click → the picture on the canvas (it follows the list). */
  picture: number;
  /** The page's share: the windows received → the list in the DOM (Svelte update). */
  page: number;
  /** The grid and picture received → the picture on the canvas. */
  pagePicture: number;
  /** Click → the page has posted the job; → the leader starts; the leader sends the windows → the page receives them. */
  posted: number;
  post: number;
  back: number;
  /** The leader's grid (until every band is in), windows and picture. */
  grid: number;
  windows: number;
  raster: number;
  msg: string;
}

const median = (a: number[]) => [...a].sort((x, y) => x - y)[Math.floor(a.length / 2)];
const p95 = (a: number[]) => {
  const s = [...a].sort((x, y) => x - y);
  return s[Math.min(s.length - 1, Math.ceil(s.length * 0.95) - 1)];
};

/**
 * Rows for the scrub bench's table (figure, median, p95, reference, ref median, ref p95, ratio):
 * for each size, the warm click → list, the same click → next frame, the page's share, and
 * the first click after the page loaded (workers warmed while idle).
 */
export async function porkchopInApp(page: Page, sizes: number[] = [200, 500], repeats = 7): Promise<(string | number)[][]> {
  const { system } = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8'));
  const plan = (await page.evaluate('window.waymarkDebug.session.doc.get().plan')) as Plan;
  const workers = (await page.evaluate('Math.min(2, navigator.hardwareConcurrency || 1)')) as number;
  await page.click('[data-tab=windows]');
  const rows: (string | number)[][] = [];
  let first = true;
  for (const n of sizes) {
    if (!PORKCHOP_GRID_CHOICES.includes(n)) throw new Error(`the Windows view offers no ${n} × ${n} grid`);
    await page.selectOption('[data-testid=win-grid]', String(n));
    const request = windowsRequest(system, initialWindowsForm(system, plan, n));
    if (!request) throw new Error('the demo plan names no leg to search');
    const nodeJob = () => {
      const t0 = performance.now();
      findWindows(system, computePorkchop(system, request), { count: WINDOW_COUNT });
      return performance.now() - t0;
    };
    const cold = (await page.evaluate(CLICK)) as Click;
    nodeJob();
    const app: Click[] = [];
    const node: number[] = [];
    // interleaved, so both see the same load
    for (let k = 0; k < repeats; k++) {
      app.push((await page.evaluate(CLICK)) as Click);
      node.push(nodeJob());
    }
    const list = app.map((c) => c.list);
    const frame = app.map((c) => c.frame);
    const picture = app.map((c) => c.picture);
    const part = (k: 'page' | 'pagePicture' | 'posted' | 'post' | 'back' | 'grid' | 'windows' | 'raster') => app.map((c) => c[k]);
    const ref = median(node);
    const tag = `porkchop ${n}×${n}`;
    rows.push([
      `${tag}: click → list in the app (warm, ${workers} workers)`,
      median(list),
      p95(list),
      'same job in Node (grid + windows)',
      ref,
      p95(node),
      median(list) / ref,
    ]);
    rows.push([`${tag}: click → next frame`, median(frame), p95(frame), 'same job in Node', ref, p95(node), median(frame) / ref]);
    for (const [label, k] of [
      ['click → the page has posted the job', 'posted'],
      ['click → the leading worker starts', 'post'],
      ['grid (every band in)', 'grid'],
      ['windows', 'windows'],
      ['worker → page message (the windows)', 'back'],
      ['the page (list)', 'page'],
    ] as const) {
      rows.push([`  of which ${label}`, median(part(k)), p95(part(k)), '', '', '', '']);
    }
    rows.push([
      `${tag}: click → picture on the canvas (after the list)`,
      median(picture),
      p95(picture),
      'same job in Node',
      ref,
      p95(node),
      median(picture) / ref,
    ]);
    for (const [label, k] of [
      ['picture rasterised', 'raster'],
      ['the page (picture on the canvas)', 'pagePicture'],
    ] as const) {
      rows.push([`  of which ${label}`, median(part(k)), p95(part(k)), '', '', '', '']);
    }
    if (first) rows.push([`${tag}: first click of the session (workers warmed while idle)`, cold.list, '', 'same job in Node', ref, '', cold.list / ref]);
    first = false;
  }
  return rows;
}
