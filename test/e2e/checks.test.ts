/**
 * End to end: the game-step check and the system stability check in the app (browser mode,
 * headless chromium, software WebGL; setup in harness.ts). On the demo plan: the game-step
 * panel flies velocity Verlet at 1/60 s in its worker, the verdict shows numbers, the error
 * lanes draw in the Timeline, the game's path shows in the System view (pixels change with its
 * toggle); a sweep at a coarse step fills its table; the stability check over a short span
 * draws its element histories and finds no flags. Screenshots go to test/output/e2e/.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { OUT, buildApp, requireChromium, startApp, type E2eApp, HANG_GUARD_MS } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-checks/', import.meta.url).pathname;

let app: E2eApp;
let page: Page;

const js = <T>(expr: string): Promise<T> => page.evaluate(expr) as Promise<T>;
/** A checksum of the 3D canvas pixels. */
const canvasSum = () =>
  js<number>(`(() => {
    const s = window.waymarkDebug.scene; s.renderNow();
    const gl = s.renderer.getContext(); const w = gl.drawingBufferWidth, h = gl.drawingBufferHeight;
    const px = new Uint8Array(w * h * 4); gl.readPixels(0, 0, w, h, gl.RGBA, gl.UNSIGNED_BYTE, px);
    let a = 0; for (let k = 0; k < px.length; k += 4) a = (a * 31 + px[k] * 7 + px[k + 1] * 3 + px[k + 2]) % 1000000007;
    return a; })()`);
/** Pixels of the canvas in the game-step hue (rose), roughly. */
const rosePixels = () =>
  js<number>(`(() => {
    const s = window.waymarkDebug.scene; s.renderNow();
    const gl = s.renderer.getContext(); const w = gl.drawingBufferWidth, h = gl.drawingBufferHeight;
    const px = new Uint8Array(w * h * 4); gl.readPixels(0, 0, w, h, gl.RGBA, gl.UNSIGNED_BYTE, px);
    let n = 0; for (let k = 0; k < px.length; k += 4) if (px[k] > 180 && px[k + 1] > 100 && px[k + 1] < 170 && px[k + 2] > 140 && px[k + 2] < 220) n++;
    return n; })()`);

describe.skipIf(!have)('the checks in the browser (e2e)', () => {
  beforeAll(async () => {
    const root = await buildApp(BUILD);
    app = await startApp(root);
    ({ page } = await app.openPage());
  });

  afterAll(async () => {
    await app?.close();
  });

  it('runs the game-step check of the demo (velocity Verlet, 1/60 s) in a worker: verdict with numbers, error lanes in the Timeline', async () => {
    await page.click('[data-side=gamestep]');
    await page.selectOption('[data-field=integrator]', 'verlet');
    await page.fill('[data-field=dt]', '1/60');
    const t0 = Date.now();
    await page.click('[data-action=gamestep-run]');
    await page.waitForSelector('[data-action=gamestep-cancel]', { timeout: HANG_GUARD_MS });
    await page.waitForSelector('[data-testid=gamestep-result]', { timeout: HANG_GUARD_MS });
    const ms = Date.now() - t0;
    const workerMs = await js<number>('window.waymarkDebug.checks.get().game.check.ms');
    console.log(`game-step check, velocity Verlet at 1/60 s, in the browser: ${ms} ms (worker ${workerMs.toFixed(0)} ms)`);
    const verdict = (await page.textContent('[data-testid=gamestep-verdict]'))!;
    expect(verdict).toMatch(/Passes|Fails|Diverged/);
    const miss = (await page.textContent('[data-line=miss]'))!;
    expect(miss).toMatch(/\d+(\.\d+)? (mm|m|km|Gm)/);
    expect(await page.textContent('[data-line=drift]')).toMatch(/\d\.\de[−-]\d+ per orbit/);
    expect(await page.textContent('[data-testid=gamestep-float32]')).toMatch(/\d+(\.\d+)? (mm|m|km)/);
    const text = (await page.textContent('[data-testid=gamestep]'))!;
    expect(text).not.toMatch(/NaN|undefined/);
    // the lanes: three curves' paths with data, log-axis numbers, a legend naming both bases
    const lanes = page.locator('[data-testid=gamestep-lanes]');
    await expect.poll(() => lanes.count()).toBe(1);
    const ds = await page.$$eval('[data-testid=gamestep-lanes] path.gs-curve', (ps) => ps.map((p) => p.getAttribute('d') ?? ''));
    expect(ds.length).toBeGreaterThanOrEqual(3);
    expect(ds.every((d) => d.length > 20 && !d.includes('NaN'))).toBe(true);
    const styles = await page.$$eval('[data-testid=gamestep-lanes] [data-lane=position] path.gs-curve', (ps) => ps.map((p) => p.getAttribute('data-style')));
    expect(styles).toContain('measured');
    expect(styles).toContain('extrapolated'); // the 234-day cruise at 1/60 s is ~10⁹ steps: extrapolated
    const legend = (await page.textContent('[data-testid=gamestep-lanes] .gs-legend'))!;
    expect(legend).toMatch(/measured/);
    expect(legend).toMatch(/extrapolated/);
    const ticks = await page.$$eval('[data-testid=gamestep-lanes] [data-lane=position] .gs-tick', (ts) => ts.map((t) => t.textContent ?? ''));
    expect(ticks.length).toBeGreaterThanOrEqual(2);
    expect(ticks.every((t) => /^(\d+ (mm|m|km)|10[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+ k?m)$/.test(t))).toBe(true);
    await page.screenshot({ path: `${OUT}c1-gamestep.png` });
    await page.locator('[data-testid=timeline]').screenshot({ path: `${OUT}c2-gamestep-lanes.png` });
  });

  it('the lanes zoom and pan with the Timeline', async () => {
    const before = await page.getAttribute('[data-testid=gamestep-lanes] [data-lane=velocity] path.gs-curve', 'd');
    // the game-step lanes scroll inside the Timeline (it never grows over the 3D view): bring the lane into view
    await page.locator('[data-testid=gamestep-lanes] [data-lane=velocity] .chart-bg').scrollIntoViewIfNeeded();
    const box = (await page.locator('[data-testid=gamestep-lanes] [data-lane=velocity] .chart-bg').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.05, box.y + box.height / 2);
    for (let k = 0; k < 6; k++) await page.mouse.wheel(0, -300);
    await page.waitForTimeout(150);
    const after = await page.getAttribute('[data-testid=gamestep-lanes] [data-lane=velocity] path.gs-curve', 'd');
    expect(after).not.toBe(before);
    await page.locator('[data-testid=timeline]').screenshot({ path: `${OUT}c3-gamestep-lanes-zoomed.png` });
    await page.click('[data-testid=timeline] button:has-text("Whole plan")');
  });

  it("draws the game's path in the System view (pixels change with its toggle)", async () => {
    expect(await js<boolean>('window.waymarkDebug.scene.hasGameStep()')).toBe(true);
    await page.waitForTimeout(100);
    const on = { sum: await canvasSum(), rose: await rosePixels() };
    await page.locator('[data-testid=system-canvas]').screenshot({ path: `${OUT}c4-gamestep-path.png` });
    await page.uncheck('[data-testid=system-gamestep-toggle]');
    await page.waitForTimeout(100);
    const off = { sum: await canvasSum(), rose: await rosePixels() };
    expect(await js<boolean>('window.waymarkDebug.scene.hasGameStep()')).toBe(false);
    expect(off.sum).not.toBe(on.sum);
    expect(on.rose).toBeGreaterThan(off.rose);
    await page.check('[data-testid=system-gamestep-toggle]');
    // zoomed on the home world: the parking orbit and the departure drawn in the planet's frame
    await page.selectOption('[data-testid=focus]', { label: 'Tessel' });
    await page.waitForTimeout(200);
    await page.locator('[data-testid=system-canvas]').screenshot({ path: `${OUT}c5-gamestep-path-tessel.png` });
    await page.selectOption('[data-testid=focus]', { label: 'Ilmar' });
  });

  it('sweeps the step at a coarse start and shows the largest passing step per integrator, the cheapest marked', async () => {
    await page.fill('[data-field=dt]', '8');
    const t0 = Date.now();
    await page.click('[data-action=gamestep-sweep]');
    await page.waitForSelector('[data-testid=gamestep-sweep]', { timeout: HANG_GUARD_MS });
    console.log(`sweep from 8 s in the browser: ${Date.now() - t0} ms`);
    const rows = await page.locator('[data-testid=gamestep-sweep] tbody tr').count();
    expect(rows).toBe(4);
    expect(await page.locator('[data-testid=gamestep-sweep] tr.cheapest').count()).toBe(1);
    expect(await page.textContent('[data-testid=gamestep-precision]')).toMatch(/float(32|64)/);
    expect(await page.textContent('[data-testid=gamestep-sweep]')).not.toMatch(/NaN/);
    await page.locator('[data-testid=gamestep-sweep]').screenshot({ path: `${OUT}c6-gamestep-sweep.png` });
    await page.locator('[data-testid=gamestep-verdict]').scrollIntoViewIfNeeded();
    await page.locator('aside.budget').screenshot({ path: `${OUT}c6-gamestep-verdict.png` });
  });

  it('shows a core InputError in plain words, never NaN', async () => {
    await page.selectOption('[data-field=precision]', 'float32');
    await page.fill('[data-field=dt]', '1e-46');
    await page.click('[data-action=gamestep-run]');
    await expect.poll(() => page.textContent('[data-testid=gamestep-error]'), { timeout: HANG_GUARD_MS }).toMatch(/^Step must be representable in float32/);
    await page.selectOption('[data-field=precision]', 'float64');
    await page.fill('[data-field=dt]', '1/60');
  });

  it('runs the stability check over a short span: estimate first, charts draw, no flags', async () => {
    await page.click('[data-side=stability]');
    await expect.poll(() => page.textContent('[data-testid=stability-estimate]'), { timeout: HANG_GUARD_MS }).toMatch(/about .+ here/);
    const estimate10k = (await page.textContent('[data-testid=stability-estimate]'))!;
    console.log(`stability estimate, 10 000 years: ${estimate10k.trim()}`);
    await page.fill('[data-field=years]', '200');
    // moons flown (the default merges them when flying them costs more than 4× the planets' steps)
    await page.selectOption('[data-field=merge]', 'fly');
    const t0 = Date.now();
    await page.click('[data-action=stability-run]');
    await page.waitForSelector('[data-testid=stability-result]', { timeout: HANG_GUARD_MS });
    console.log(`stability, 200 years with moons, in the browser: ${Date.now() - t0} ms`);
    expect(await page.textContent('[data-testid=stability-summary]')).toMatch(/^No flags/);
    expect(await page.textContent('[data-testid=stability-result]')).not.toMatch(/NaN/);
    expect(await page.locator('[data-testid=stability-pairs] tbody tr').count()).toBeGreaterThan(3);
    await page.waitForSelector('[data-testid=stability-view]');
    const ds = await page.$$eval('[data-testid=stability-charts] path.history-line', (ps) => ps.map((p) => p.getAttribute('d') ?? ''));
    expect(ds.length).toBeGreaterThanOrEqual(3 * 8 + 1);
    expect(ds.every((d) => d.length > 20 && !d.includes('NaN'))).toBe(true);
    const ticks = await page.$$eval('[data-testid=stability-charts] .history-tick', (ts) => ts.map((t) => t.textContent ?? ''));
    expect(ticks.length).toBeGreaterThan(20);
    expect(ticks.every((t) => /\d/.test(t))).toBe(true);
    await page.screenshot({ path: `${OUT}c7-stability.png` });
    await page.locator('[data-testid=stability-view]').screenshot({ path: `${OUT}c8-stability-charts.png` });
    await page.locator('aside.budget').screenshot({ path: `${OUT}c9-stability-panel.png` });
    expect(app.pageErrors).toEqual([]);
  });
});
