/**
 * End to end: targeting the demo plan from the app (browser mode, headless chromium; setup in
 * harness.ts). The panel lists the legs and their goals, runs the targeter in n-body in its
 * worker with the residual drawn as it falls, and applies the targeted plan as one edit; the plan
 * is then read in its truth model: the Budget and the target readout say the target is reached in
 * n-body, the Budget's flags hold the patched-conic path's miss only as the comparison, the System
 * view draws the n-body path with the patched-conic one as the comparison and the burn markers on
 * the n-body path, and the Timeline shows the n-body flight (SOI lane into Ochre, distance to
 * Ochre within its sphere of influence). Undo brings the previous plan back. Screenshots of the
 * panel after the run and of the window after applying, at 1024×640 and 1920×1080, go to
 * test/output/e2e/.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HANG_GUARD_MS, OUT, buildApp, requireChromium, startApp, type E2eApp } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-target/', import.meta.url).pathname;

let app: E2eApp;
let page: Page;
let errors: string[] = [];

const js = <T>(expr: string): Promise<T> => page.evaluate(expr) as Promise<T>;
const plan = () => js<Record<string, unknown>>('window.waymarkDebug.session.doc.get().plan');
/** Polls the page every 50 ms until `expr` is true, for at most HANG_GUARD_MS (a hang guard, not a speed check). */
const until = (expr: string) => expect.poll(() => js<boolean>(expr), { timeout: HANG_GUARD_MS, interval: 50 }).toBe(true);
/** Scrolls the plan column so `selector` starts at its top, then screenshots the window. */
async function shot(selector: string, name: string): Promise<void> {
  await page.locator(selector).evaluate((el) => el.scrollIntoView({ block: 'start' }));
  await page.waitForTimeout(100); // one frame for the scroll to paint
  await page.screenshot({ path: `${OUT}${name}` });
}

describe.skipIf(!have)('targeting the plan in the browser (e2e)', () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
    ({ page, errors } = await app.openPage({ viewport: { width: 1024, height: 640 } }));
  });

  afterAll(async () => {
    await app?.close();
  });

  it('lists the legs with their goals and the burns they vary before running', async () => {
    const legs = page.locator('[data-testid=target-legs] > li');
    await expect.poll(() => legs.count()).toBe(2);
    const text = (await page.textContent('[data-testid=target-legs]'))!;
    expect(text).toMatch(/arrival at Ochre/);
    expect(text).toMatch(/final orbit about Ochre/);
    expect(text).toMatch(/B·T at Ochre\s*[\d\s\u202f.]+ ± [\d.]+ km/);
    expect(text).toMatch(/varies .*Mid-course/);
    // the model defaults to the plan's truth model (the demo names none: patched conics)
    expect(await page.inputValue('[data-testid=target-model]')).toBe('conic');
    expect(await page.inputValue('[data-testid=truth-model]')).toBe('conic');
  });

  it('targets the demo in n-body in the worker, the residual falling to the goals, and shows what changed', async () => {
    await page.selectOption('[data-testid=target-model]', 'nbody');
    const t0 = Date.now();
    await page.click('[data-action=target-run]');
    await until("window.waymarkDebug.session.targeting.get().running === 'nbody' || window.waymarkDebug.session.targeting.get().result !== null");
    await page.waitForSelector('[data-testid=target-result]', { timeout: HANG_GUARD_MS });
    const workerMs = await js<number>('window.waymarkDebug.session.targeting.get().ms');
    console.log(`targeting the demo in n-body from the panel: ${Date.now() - t0} ms (worker ${workerMs.toFixed(0)} ms)`);
    const r = await js<{ status: string; model: string; legs: { status: string; residuals: number[] }[] }>(
      'window.waymarkDebug.session.targeting.get().result',
    );
    expect(r.status).toBe('met');
    expect(r.model).toBe('nbody');
    for (const leg of r.legs) expect(leg.status).toBe('converged');
    // the chart drew the residual of each leg
    expect(await page.locator('[data-testid=target-chart] path.series').count()).toBe(r.legs.length);
    const series = await js<{ leg: number; residual: number }[]>('window.waymarkDebug.session.targeting.get().series');
    for (const leg of [1, 2]) {
      const own = series.filter((p) => p.leg === leg);
      expect(own.length).toBeGreaterThan(1);
      expect(own[own.length - 1].residual).toBeLessThan(own[0].residual);
    }
    expect(await page.textContent('[data-testid=target-status]')).toMatch(/Every goal met in n-body/);
    expect(await page.textContent('[data-testid=target-dv]')).toMatch(/Δv .* → .*margin/);
    expect(await page.textContent('[data-testid=target-message]')).toMatch(/Every goal met in the n-body model/);
    await shot('[data-testid=target-panel]', 'target-panel-1024x640.png');
    await shot('[data-testid=target-result]', 'target-result-1024x640.png');
    await page.setViewportSize({ width: 1920, height: 1080 });
    await shot('[data-testid=target-panel]', 'target-panel-1920x1080.png');
    expect(errors).toEqual([]);
  });

  it('applies the targeted plan as one edit; the Budget and the target readout say the target is reached in n-body', async () => {
    const before = await plan();
    const edited = Date.now();
    await page.click('[data-action=target-apply]');
    const after = await plan();
    expect(after).not.toEqual(before);
    expect(after.truthModel).toBe('nbody');
    expect(await page.inputValue('[data-testid=truth-model]')).toBe('nbody');
    await expect.poll(() => page.getAttribute('[data-testid=target]', 'data-model'), { timeout: HANG_GUARD_MS }).toBe('nbody');
    await until('window.waymarkDebug.session.truth.get().pending === false');
    const truth = await js<{ ms: number; refreshMs: number }>('window.waymarkDebug.session.truth.get()');
    console.log(
      `truth report (n-body) after applying: ${Date.now() - edited} ms on screen (worker ${truth.ms.toFixed(0)} ms, edit to report ${truth.refreshMs.toFixed(0)} ms)`,
    );
    expect(await page.getAttribute('[data-testid=target]', 'data-reached')).toBe('true');
    expect(await page.textContent('[data-testid=target]')).toMatch(/Ochre: target reached \(n-body\)/);
    expect(await page.textContent('[data-testid=budget-model]')).toBe('n-body');
    expect(await page.textContent('[data-testid=margin]')).toMatch(/m\/s$/);
    expect(await page.textContent('[data-testid=budget-comparison]')).toMatch(/Comparison, patched conics: margin/);
    expect(await page.textContent('[data-testid=target-applied]')).toMatch(/targeted in n-body/);
    // the System view: the n-body flight is the path, the patched-conic one the comparison, the ship on it
    const drawn = await js<{ truthLines: number; resultIsComparison: boolean; shipOnTrack: boolean; markers: number; markersOnTrack: number }>(
      'window.waymarkDebug.scene.truthDrawing()',
    );
    expect(drawn.truthLines).toBeGreaterThan(0);
    expect(drawn.resultIsComparison).toBe(true);
    expect(drawn.shipOnTrack).toBe(true);
    expect(await page.textContent('[data-testid=legend-truth]')).toMatch(/path \(n-body\)/);
    // the burn markers sit on the n-body path, every one of them
    expect(drawn.markers).toBe(5);
    expect(drawn.markersOnTrack).toBe(drawn.markers);

    // the Budget's flags: the patched-conic path's miss is the comparison's, not an error of the plan
    expect(await page.locator('[data-testid=flags] li.error').count()).toBe(0);
    expect(await page.textContent('[data-testid=flags-comparison]')).toMatch(/target-missed/);

    // the Timeline shows the n-body flight: its corner names the model, the SOI lane ends in
    // Ochre's sphere of influence, the events lane has the n-body entry into it, and the distance
    // to Ochre falls within Ochre's sphere of influence (the patched-conic flight of the same
    // schedule stays millions of km outside it)
    await expect.poll(() => page.textContent('[data-testid=timeline-model] text'), { timeout: HANG_GUARD_MS }).toBe('n-body');
    const soiNames = await page.locator('.timeline-svg .lane-1 g.soi').evaluateAll((gs) => gs.map((g) => (g as SVGGElement).dataset.name));
    expect(soiNames.at(-1)).toBe('Ochre');
    const soiShown = await page.locator('.timeline-svg .lane-1 g.soi text').allTextContents();
    expect(soiShown).toContain('Ochre');
    const entries = await page.locator('.timeline-svg path.event-soi-entry title').allTextContents();
    expect(entries).toContain("enters Ochre's sphere of influence");
    const minText = (await page.textContent('.timeline-svg .chart-distance .chart-min'))!;
    const m = /^min ([\d\s\u202f.]+) (km|Gm)$/.exec(minText);
    expect(m, minText).not.toBeNull();
    const minDistance = Number(m![1].replace(/[\s\u202f]/g, '')) * (m![2] === 'km' ? 1e3 : 1e9);
    const ochreSoi = await js<number>("window.waymarkDebug.session.doc.get().system.bodies.find((b) => b.id === 'ochre').derived.soiRadius");
    expect(minDistance).toBeLessThan(ochreSoi);
    expect(await page.locator('.timeline-svg .chart-distance path.chart-comparison').getAttribute('d')).toBeTruthy();

    await page.locator('[data-testid=target]').scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${OUT}target-applied-1920x1080.png` });
    await page.setViewportSize({ width: 1024, height: 640 });
    await page.locator('[data-testid=flags-comparison]').evaluate((el) => el.scrollIntoView({ block: 'end' }));
    await page.waitForTimeout(100); // one frame for the layout and the scroll to paint
    await page.screenshot({ path: `${OUT}target-applied-1024x640.png` });

    // Undo: the plan before targeting, read in patched conics again
    await page.click('[data-action=undo]');
    expect(await plan()).toEqual(before);
    expect(await page.inputValue('[data-testid=truth-model]')).toBe('conic');
    await expect.poll(() => page.getAttribute('[data-testid=target]', 'data-model')).toBe('conic');
    expect(await page.textContent('[data-testid=budget-model]')).toBe('patched conics');
    expect(await page.locator('[data-testid=budget-comparison]').count()).toBe(0);
    expect((await js<{ truthLines: number }>('window.waymarkDebug.scene.truthDrawing()')).truthLines).toBe(0);
    expect(await page.textContent('[data-testid=timeline-model] text')).toBe('patched conics');
    // the result fits the plan again: it may be applied again
    expect(await page.locator('[data-action=target-apply]').count()).toBe(1);
    expect(errors).toEqual([]);
  });
});
