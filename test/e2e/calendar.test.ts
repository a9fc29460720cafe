/**
 * End to end: the Survey screen's window calendar (browser mode, headless chromium; setup in
 * harness.ts). The user opens Survey → Window calendar and computes the default calendar (20
 * years, 10 %, every ordered pair of planets) on the page's workers; the windows the chart draws
 * are the core's for the same request (computed here: the same code, so to 1e-9 relative — the
 * worker's V8 may differ from this process's in the last bits of its floating-point library); the
 * table lists every window; hovering a window shows its dates, Δv and flight time; the CSV export
 * downloads one row per window, the rows `waymark calendar --csv` prints for the same system. Screenshots at 1024×640 and 1920×1080 go to test/output/e2e/.
 * Nothing sticks out sideways. Waits are hang guards only.
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCsv } from '../../core/io/csv.ts';
import { CALENDAR_CSV_COLUMNS, parseSystemFile } from '../../core/io/index.ts';
import { planetPairs, windowCalendar } from '../../core/survey/index.ts';
import { runCli } from '../app/cli/runCli.ts';
import { HANG_GUARD_MS, OUT, buildApp, requireChromium, startApp, type E2eApp } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-calendar/', import.meta.url).pathname;
const root = new URL('../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const G = { timeout: HANG_GUARD_MS };

let app: E2eApp;
let page: Page;
let errors: string[] = [];

/** Boxes of the panel that stick out of it sideways by more than 1 px. */
async function sideways(): Promise<string[]> {
  return page.evaluate(() => {
    const view = document.querySelector('[data-testid=calendar-panel]')!;
    const v = view.getBoundingClientRect();
    const out: string[] = [];
    if (view.scrollWidth > view.clientWidth + 1) out.push('the panel scrolls sideways');
    for (const el of Array.from(view.querySelectorAll('input, button, summary, svg, table'))) {
      const r = el.getBoundingClientRect();
      // hidden (a closed pair grid) or in the table's own scroller
      if (r.width === 0 || !el.checkVisibility() || el.closest('.table-wrap')) continue;
      if (r.left < v.left - 1 || r.right > v.right + 1) out.push(`${el.tagName} '${(el.textContent ?? '').trim().slice(0, 20)}' sticks out`);
    }
    return out;
  });
}

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(1, Math.abs(b));

describe.skipIf(!have)('window calendar in the Survey screen (e2e)', () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
    ({ page, errors } = await app.openPage({ viewport: { width: 1024, height: 640 } }));
  }, HANG_GUARD_MS);

  afterAll(async () => {
    await app?.close();
  });

  it('computes the default calendar in the workers and draws the core’s windows', async () => {
    await page.click('[data-tab=survey]');
    await page.click('[data-testid=survey-mode-calendar]');
    await page.waitForSelector('[data-testid=calendar-compute]', G);
    await page.click('[data-testid=calendar-compute]');
    await page.waitForSelector('[data-testid=calendar-table]', G);
    const cal = windowCalendar(system, { years: 20, within: 0.1, pairs: planetPairs(system) });
    const shown = await page.$$eval('[data-testid=calendar-svg] g.window', (gs) =>
      gs.map((g) => ({
        pair: g.getAttribute('data-pair')!,
        opens: Number(g.getAttribute('data-opens')),
        closes: Number(g.getAttribute('data-closes')),
        best: Number(g.getAttribute('data-best')),
        dv: Number(g.getAttribute('data-dv')),
      })),
    );
    const expected = cal.pairs.flatMap((p) => p.windows.map((w) => ({ pair: `${p.from}:${p.to}`, w })));
    expect(shown.length).toBe(expected.length);
    expect(shown.length).toBeGreaterThan(100);
    shown.forEach((s, k) => {
      const e = expected[k];
      expect(s.pair).toBe(e.pair);
      expect(rel(s.opens, e.w.opens)).toBeLessThanOrEqual(1e-9);
      expect(rel(s.closes, e.w.closes)).toBeLessThanOrEqual(1e-9);
      expect(rel(s.best, e.w.best.depart)).toBeLessThanOrEqual(1e-9);
      expect(rel(s.dv, e.w.best.dv)).toBeLessThanOrEqual(1e-9);
    });
    // one row per pair, labelled "Tessel → Ochre"
    const labels = await page.$$eval('[data-testid=calendar-svg] g.rows text', (ts) => ts.map((t) => t.childNodes[0]?.textContent ?? ''));
    expect(labels).toContain('Tessel → Ochre');
    expect(labels.length).toBe(20);
    expect(await page.locator('[data-testid=calendar-table] tbody tr').count()).toBe(expected.length);
    expect(await page.textContent('[data-testid=calendar-message]')).toMatch(/windows of 20 pairs over 20 years, computed in [\d.]+ s on [12] workers?/);
    expect(await sideways()).toEqual([]);
  });

  it('shows a window’s dates, Δv and flight time on hover', async () => {
    const bar = page.locator('[data-testid=calendar-svg] g.window[data-pair="tessel:ochre"] rect').nth(1);
    await bar.scrollIntoViewIfNeeded(G);
    const box = (await bar.boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    const tip = await page.textContent('[data-testid=calendar-tip]', G);
    expect(tip).toMatch(/Tessel → Ochre, window 2/);
    expect(tip).toMatch(/opens \d{3}-\d{3}T\d\d:\d\d/);
    expect(tip).toMatch(/best Δv [\d\u202f ,]+ m\/s/);
    expect(tip).toMatch(/flight time [\d.]+ d/);
    await page.screenshot({ path: `${OUT}calendar-1024x640.png` });
    await page.mouse.move(2, 2);
  });

  it('exports the windows as CSV, one row per window', async () => {
    const [d] = await Promise.all([page.waitForEvent('download', G), page.click('[data-testid=calendar-export-csv]')]);
    expect(d.suggestedFilename()).toBe('ilmar.calendar.csv');
    const rows = parseCsv(readFileSync(await d.path(), 'utf8'));
    expect(rows[0]).toEqual([...CALENDAR_CSV_COLUMNS]);
    const cal = windowCalendar(system, { years: 20, within: 0.1, pairs: planetPairs(system) }, { curve: false });
    const windows = cal.pairs.flatMap((p) => p.windows.map((w) => ({ p, w })));
    expect(rows.length - 1).toBe(windows.length);
    windows.forEach(({ p, w }, k) => {
      expect(rows[k + 1][0]).toBe(p.from);
      expect(rows[k + 1][1]).toBe(p.to);
      expect(rel(Number(rows[k + 1][3]), w.opens)).toBeLessThanOrEqual(1e-9);
      expect(rel(Number(rows[k + 1][11]), w.best.dv)).toBeLessThanOrEqual(1e-9);
    });
  });

  it('the exported CSV is what `waymark calendar --csv` prints for the same system (app → file → command line)', async () => {
    const [d] = await Promise.all([page.waitForEvent('download', G), page.click('[data-testid=calendar-export-csv]')]);
    const app = parseCsv(readFileSync(await d.path(), 'utf8'));
    const run = await runCli(['calendar', '--system', 'assets/systems/ilmar.system.json', '--years', '20', '--within', '10', '--csv', '--workers', '0']);
    expect(run.code, run.stderr).toBe(0);
    const cli = parseCsv(run.stdout);
    expect(cli.length).toBe(app.length);
    expect(cli[0]).toEqual(app[0]);
    // text columns equal; numbers to 1e-9 relative (the page's V8 and this Node's may differ in
    // the last bits of their floating-point libraries)
    for (let r = 1; r < app.length; r++)
      app[r].forEach((cell, c) => {
        const a = Number(cell);
        if (cell === '' || Number.isNaN(a)) expect(cli[r][c]).toBe(cell);
        else expect(rel(Number(cli[r][c]), a)).toBeLessThanOrEqual(1e-9);
      });
  });

  it('chooses pairs in a From × To grid', async () => {
    await page.click('[data-testid=calendar-pairs] summary');
    await page.uncheck('[data-testid=calendar-pair-moravel-fennick]');
    expect(await page.textContent('[data-testid=calendar-pairs] summary')).toBe('Pairs: 19 of 20');
    expect(await sideways()).toEqual([]);
    await page.screenshot({ path: `${OUT}calendar-pairs-1024x640.png` });
    await page.check('[data-testid=calendar-pair-moravel-fennick]');
    await page.click('[data-testid=calendar-pairs] summary');
    expect(await page.textContent('[data-testid=calendar-pairs] summary')).toBe('Pairs: 20 of 20');
  });

  it('fits at 1920×1080 too, and no page errors', async () => {
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.waitForTimeout(300);
    expect(await sideways()).toEqual([]);
    await page.screenshot({ path: `${OUT}calendar-1920x1080.png` });
    await page.setViewportSize({ width: 1024, height: 640 });
    expect(errors).toEqual([]);
  });
});
