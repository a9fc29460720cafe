/**
 * End to end: the Survey screen's Δv map in the app (browser mode, headless chromium; setup in
 * harness.ts). On the demo plan the Survey tab computes the map of Ilmar in the analysis worker;
 * every transfer of the core's map (computed here with core/survey deltaVMap) is in the diagram
 * with its Δv; the aerobraking toggle adds the aerobraked figures; the SVG and PNG exports
 * download (paper theme; the PNG at twice the diagram's size) and the table lists every edge. The
 * exported JSON is the map `waymark map --json` prints. The layout probe (layoutProbe.ts) finds nothing cramped at 1024×640 and 1920×1080; screenshots go
 * to test/output/e2e/survey-map-*.png.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dvWords, parseSystemFile } from '../../core/io/index.ts';
import { deltaVMap, type DeltaVMap } from '../../core/survey/index.ts';
import { HANG_GUARD_MS, OUT, buildApp, openFile, requireChromium, startApp, type E2eApp } from './harness.ts';
import { layoutProblems } from './layoutProbe.ts';
import { runCli } from '../app/cli/runCli.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-survey-map/', import.meta.url).pathname;
const G = { timeout: HANG_GUARD_MS };
const ilmar = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;

let app: E2eApp;
let page: Page;
let errors: string[];
let map: DeltaVMap;

async function downloaded(click: () => Promise<void>): Promise<{ name: string; bytes: Buffer }> {
  const [d] = await Promise.all([page.waitForEvent('download', G), click()]);
  const path = await d.path();
  return { name: d.suggestedFilename(), bytes: readFileSync(path) };
}

/** The text shown by an edge's group in the diagram. */
const edgeText = (id: string) => page.locator(`[data-testid=dv-map-diagram] g[data-edge="${id}"] text`).allTextContents();

describe.skipIf(!have)('Survey: the Δv map (e2e)', () => {
  beforeAll(async () => {
    map = deltaVMap(ilmar);
    app = await startApp(await buildApp(BUILD));
    ({ page, errors } = await app.openPage({ viewport: { width: 1024, height: 640 } }));
  });

  afterAll(async () => {
    await app?.close();
  });

  it('the Survey tab computes the demo system’s map: every transfer of the core’s map in the diagram with its Δv, every edge in the table', async () => {
    await page.click('[data-tab=survey]');
    await page.waitForSelector('[data-testid=dv-map-diagram] svg', G);
    expect(await page.textContent('[data-testid=dv-map-message]')).toMatch(/^\d+ edges between \d+ places, computed in [\d.]+ s\.$/);
    const transfers = map.edges.filter((e) => e.kind === 'transfer');
    expect(transfers.length).toBeGreaterThan(20);
    for (const e of transfers) {
      const g = page.locator(`[data-testid=dv-map-diagram] g[data-edge="${e.id}"]`);
      expect(await g.count(), e.id).toBe(1);
      expect(await g.getAttribute('data-dv')).toBe(String(Math.round(e.dv)));
      expect((await edgeText(e.id)).join(' ')).toContain(dvWords(e.dv));
      expect(await g.locator('title').textContent()).toBe(e.how);
    }
    expect(await page.locator('[data-testid=dv-map-diagram] g[data-edge]').count()).toBe(map.edges.length);
    expect(await page.locator('[data-testid=dv-map-table] tbody tr').count()).toBe(map.edges.length);
    // hovering an edge's figure marks its row
    const first = transfers[0];
    await page.locator(`[data-testid=dv-map-diagram] g[data-edge="${first.id}"] text`).first().hover();
    await expect.poll(() => page.locator(`[data-testid=dv-map-table] tr.hot[data-edge-row="${first.id}"]`).count(), G).toBe(1);
    expect(await page.textContent('[data-testid=dv-map-panel]')).not.toMatch(/NaN|undefined|Infinity/);
  });

  it('the aerobraking toggle shows the aerobraked figures where a body has air', async () => {
    const aeroEdges = map.edges.filter((e) => e.dvAero !== null);
    expect(aeroEdges.length).toBeGreaterThan(0);
    const e = aeroEdges[0];
    const aero = dvWords(e.dvAero ?? Number.NaN);
    expect((await edgeText(e.id)).join(' ')).not.toContain(aero);
    await page.check('[data-testid=dv-map-aero]');
    await expect.poll(async () => (await edgeText(e.id)).join(' '), G).toContain(aero);
    for (const a of aeroEdges) expect((await edgeText(a.id)).join(' ')).toContain(dvWords(a.dvAero ?? Number.NaN));
  });

  it('exports the diagram as SVG and PNG (paper theme; the PNG at 2×) and the table as CSV', async () => {
    const svg = await downloaded(() => page.click('[data-testid=dv-map-export-svg]'));
    expect(svg.name).toBe('ilmar.dv-map.svg');
    const text = svg.bytes.toString('utf8');
    expect(text.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(text).toContain('fill="#ffffff"');
    for (const e of map.edges) expect(text).toContain(`data-edge="${e.id.replace(/>/g, '&gt;')}"`);
    const size = /viewBox="0 0 (\d+) (\d+)"/.exec(text);
    expect(size).not.toBeNull();

    const png = await downloaded(() => page.click('[data-testid=dv-map-export-png]'));
    expect(png.name).toBe('ilmar.dv-map.png');
    writeFileSync(`${OUT}survey-map-export.png`, png.bytes);
    // PNG signature and IHDR (ISO/IEC 15948 §5.2, §11.2.2): width and height big-endian at bytes 16 and 20
    expect([...png.bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(png.bytes.subarray(12, 16).toString('latin1')).toBe('IHDR');
    expect(png.bytes.readUInt32BE(16)).toBe(2 * Number(size?.[1]));
    expect(png.bytes.readUInt32BE(20)).toBe(2 * Number(size?.[2]));
    // a drawn picture compresses far less than a blank one of that size (a few kB)
    expect(png.bytes.length).toBeGreaterThan(50_000);

    const csv = await downloaded(() => page.click('[data-testid=dv-map-export-csv]'));
    expect(csv.name).toBe('ilmar.dv-map.csv');
    expect(
      csv.bytes
        .toString('utf8')
        .split('\r\n')
        .filter((l) => l !== '').length,
    ).toBe(map.edges.length + 1);
    expect(errors).toEqual([]);
  });

  it('the exported JSON is the map `waymark map --json` prints for the same system (app → file → command line)', async () => {
    const json = await downloaded(() => page.click('[data-testid=dv-map-export-json]'));
    const fromApp = JSON.parse(json.bytes.toString('utf8')) as DeltaVMap;
    const run = await runCli(['map', '--system', 'assets/systems/ilmar.system.json', '--json']);
    expect(run.code, run.stderr).toBe(0);
    const fromCli = JSON.parse(run.stdout) as DeltaVMap;
    // the figures to 1e-9 relative (the page's V8 and this Node's may differ in the last bits of
    // their floating-point libraries: the SOI radii already do), the words exactly
    expect(fromCli.nodes.map((n) => [n.id, n.label])).toEqual(fromApp.nodes.map((n) => [n.id, n.label]));
    fromApp.nodes.forEach((n, k) => expect(Math.abs(fromCli.nodes[k].altitude - n.altitude)).toBeLessThanOrEqual(1e-9 * n.altitude));
    expect(fromCli.edges.map((e) => [e.id, e.kind, e.how])).toEqual(fromApp.edges.map((e) => [e.id, e.kind, e.how]));
    fromApp.edges.forEach((e, k) => {
      const c = fromCli.edges[k];
      expect(Math.abs(c.dv - e.dv)).toBeLessThanOrEqual(1e-9 * e.dv);
      if (e.window) expect(Math.abs(c.window!.depart - e.window.depart)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(e.window.depart)));
    });
  });

  it('looks right at 1024×640 and 1920×1080: nothing overlaps or leaves its panel (screenshots)', async () => {
    for (const [w, h] of [
      [1024, 640],
      [1920, 1080],
    ] as const) {
      await page.setViewportSize({ width: w, height: h });
      await page.waitForTimeout(200);
      await page.screenshot({ path: `${OUT}survey-map-${w}x${h}.png` });
      // the probe before scrolling: it counts boxes scrolled out of sight as overlapping the mode tabs
      const problems = (await layoutProblems(page, 1)).map((p) => `${p.panel}: ${p.kind} ${p.a}${p.b ? ` / ${p.b}` : ''} (${p.px} px)`);
      expect(problems, `${w}×${h}`).toEqual([]);
      await page.locator('[data-testid=dv-map-table]').scrollIntoViewIfNeeded();
      await page.screenshot({ path: `${OUT}survey-map-${w}x${h}-table.png` });
      await page.locator('[data-testid=dv-map-panel]').evaluate((el) => el.parentElement?.scrollTo(0, 0));
      // the diagram over the whole window; Esc brings it back
      await page.click('[data-testid=dv-map-large]');
      const box = await page.locator('[data-testid=dv-map-whole]').boundingBox();
      expect(box?.width).toBeGreaterThan(w - 20);
      expect(box?.height).toBeGreaterThan(h - 20);
      await page.waitForTimeout(200);
      await page.screenshot({ path: `${OUT}survey-map-${w}x${h}-whole-window.png` });
      await page.keyboard.press('Escape');
      await expect.poll(() => page.locator('[data-testid=dv-map-whole]').count(), G).toBe(0);
    }
    await page.setViewportSize({ width: 1024, height: 640 });
    expect(errors).toEqual([]);
  });

  it('Cancel stops a computation at once and keeps the map shown', async () => {
    // both clicks in one page task: the job (hundreds of ms in the worker) cannot finish in between
    const cancelled = await page.evaluate(async () => {
      (document.querySelector('[data-testid=dv-map-compute]') as HTMLButtonElement).click();
      await new Promise((r) => setTimeout(r, 0));
      const cancel = document.querySelector('[data-testid=dv-map-cancel]') as HTMLButtonElement | null;
      cancel?.click();
      return cancel !== null;
    });
    expect(cancelled).toBe(true);
    await expect.poll(() => page.textContent('[data-testid=dv-map-message]'), G).toBe('Cancelled.');
    expect(await page.locator('[data-testid=dv-map-diagram] g[data-edge]').count()).toBe(map.edges.length);
    expect(await page.locator('[data-testid=dv-map-cancel]').count()).toBe(0);
  });

  it('another system opened: the map is computed again for it, names drawn as text', async () => {
    const system = JSON.parse(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8'));
    system.name = 'Ilmar <revised> & co';
    for (const b of system.bodies) if (b.id === 'tessel') b.name = 'Tessel <b>bold</b>';
    const plan = JSON.parse(readFileSync(new URL('../../assets/plans/tessel-to-ochre.plan.json', import.meta.url), 'utf8'));
    plan.system = { embedded: system };
    const path = join(mkdtempSync(join(tmpdir(), 'wm-survey-map-')), 'revised.plan.json');
    writeFileSync(path, JSON.stringify(plan, null, 2));
    await openFile(page, path);
    await expect.poll(() => page.locator('[data-testid=dv-map-diagram] svg').getAttribute('data-map-system'), G).toBe('Ilmar <revised> & co');
    await expect.poll(() => page.locator('[data-testid=dv-map-stale]').count(), G).toBe(0);
    expect(await page.locator('[data-testid=dv-map-diagram] b').count()).toBe(0);
    expect(await page.locator('[data-testid=dv-map-diagram] text', { hasText: 'Tessel <b>bold</b>' }).count()).toBeGreaterThan(0);
    expect(await page.locator('[data-testid=dv-map-table] td', { hasText: 'Tessel <b>bold</b> low orbit' }).count()).toBeGreaterThan(0);
    expect(errors).toEqual([]);
  });
});
