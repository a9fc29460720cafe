/**
 * End to end: the author's readouts on the Timeline. On the demo (tessel-to-ochre, patched
 * conics), the light-time readout at a cursor time is core's light time to the same body at that
 * time (the plan parsed and evaluated here with core/conic, the ship placed by hand), and the
 * sunlight lane shows as many eclipses as core's shadow search finds on the same flight (the
 * demo starts in a low parking orbit of Tessel and ends in orbit about Ochre: both shadow it).
 * Screenshots sky-timeline-1024x640.png and sky-timeline-1920x1080.png in test/output/e2e/.
 * Waits are hang guards.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { evaluate, shipStateAt } from '../../core/conic/index.ts';
import { parsePlanFile, parseSystemFile } from '../../core/io/index.ts';
import { lightTimeAt, shadowPasses } from '../../core/sky/index.ts';
import { bodyState } from '../../core/system/index.ts';
import { buildApp, HANG_GUARD_MS, OUT, requireChromium, startApp, type E2eApp } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-sky/', import.meta.url).pathname;
const root = new URL('../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const plan = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const result = evaluate(system, plan);
const s6 = new Float64Array(6);
const c6 = new Float64Array(6);
/** The ship's star-relative state at t, from the evaluation's segments (core/conic shipStateAt plus its central body's state). */
const shipAt = (t: number, out: Float64Array) => {
  const k = shipStateAt(result, t, s6);
  bodyState(system, result.segments[k].central, t, c6);
  for (let j = 0; j < 6; j++) out[j] = s6[j] + c6[j];
};

let app: E2eApp;

describe.skipIf(!have)("the author's readouts on the Timeline (e2e)", () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
  }, HANG_GUARD_MS);

  afterAll(async () => {
    await app?.close();
  });

  it('light time at the cursor and the shadow passes match core on the demo; screenshots at 1024×640 and 1920×1080', async () => {
    // the home world (the system's calendar names Tessel) is the light time's default body
    const home = system.calendar.homeIndex;
    expect(system.bodies[home].name).toBe('Tessel');
    const shadow = shadowPasses(system, shipAt, result.t0, result.t1);
    // the demo's parking orbit about Tessel passes through its shadow in the first orbit
    expect(shadow.passes[0].bodyName).toBe('Tessel');
    expect(shadow.passes[0].t0 - result.t0).toBeLessThan(6000);
    for (const viewport of [
      { width: 1024, height: 640 },
      { width: 1920, height: 1080 },
    ]) {
      const { page, context, errors } = await app.openPage({ viewport });
      await page.waitForSelector('[data-testid=sky-sun] .lane-label[data-eclipses]', { timeout: HANG_GUARD_MS });
      expect(Number(await page.getAttribute('[data-testid=sky-sun] .lane-label', 'data-eclipses'))).toBe(shadow.eclipses);
      expect(await page.locator('[data-testid=sky-sun] rect.pass').count()).toBe(shadow.passes.length);
      expect(await page.locator('[data-testid=sky-sun] rect.pass-umbra').count()).toBe(shadow.passes.filter((p) => p.kind === 'umbra').length);
      expect(await page.inputValue('[data-testid=sky-body]')).toBe(String(home));
      // the readout at a cursor time against core's light time at that time
      for (const f of [0.001, 0.37, 0.93]) {
        const t = result.t0 + f * (result.t1 - result.t0);
        await page.evaluate(
          (tt) => (window as unknown as { waymarkDebug: { session: { cursor: { set(t: number): void } } } }).waymarkDebug.session.cursor.set(tt),
          t,
        );
        shipAt(t, s6);
        const want = lightTimeAt(system, home, t, s6[0], s6[1], s6[2]);
        await expect
          .poll(async () => Number(await page.getAttribute('[data-testid=read-light]', 'data-value')), { timeout: HANG_GUARD_MS })
          // the page evaluates the same core code on the same plan: agreement to rounding (1e-9 of a value ≥ 0.02 s)
          .toBeCloseTo(want, 9);
      }
      // another body: the lane and the readout follow (Ochre at the cursor)
      const ochre = system.indexById.ochre;
      await page.selectOption('[data-testid=sky-body]', String(ochre));
      const t = result.t0 + 0.93 * (result.t1 - result.t0);
      shipAt(t, s6);
      const want = lightTimeAt(system, ochre, t, s6[0], s6[1], s6[2]);
      await expect.poll(async () => Number(await page.getAttribute('[data-testid=read-light]', 'data-value')), { timeout: HANG_GUARD_MS }).toBeCloseTo(want, 9);
      await expect.poll(() => page.textContent('[data-testid=sky-light] .chart-min'), { timeout: HANG_GUARD_MS }).toMatch(/^min \d/);
      const ms = await page.getAttribute('[data-testid=sky-body]', 'data-compute-ms');
      console.log(`sky lanes computed in ${Number(ms).toFixed(1)} ms at ${viewport.width}×${viewport.height} (after the edit settles, off the edit)`);
      // the sky lanes inside the window: the Timeline scrolls to them at 1024×640
      await page.evaluate(`document.querySelector('[data-testid=timeline] .chart').scrollTop = 1e6`);
      const box = await page.locator('[data-testid=sky-sun]').boundingBox();
      expect(box).not.toBeNull();
      expect(box!.y + box!.height).toBeLessThanOrEqual(viewport.height);
      expect(box!.x + box!.width).toBeLessThanOrEqual(viewport.width);
      await page.selectOption('[data-testid=sky-body]', String(home));
      await page.waitForTimeout(300);
      await page.screenshot({ path: `${OUT}sky-timeline-${viewport.width}x${viewport.height}.png` });
      if (viewport.width === 1920) {
        // zoomed on the first orbits: the Tessel shadow passes as bands (penumbra light, umbra dark)
        const first = (await page.locator('[data-testid=sky-sun] rect.pass-umbra').first().boundingBox())!;
        await page.mouse.move(first.x + first.width / 2, first.y + first.height / 2);
        for (let k = 0; k < 13; k++) {
          await page.mouse.wheel(0, -300);
          await page.waitForTimeout(50);
        }
        await page.waitForTimeout(300);
        const band = (await page.locator('[data-testid=sky-sun] rect.pass-umbra').first().boundingBox())!;
        expect(band.width).toBeGreaterThan(20);
        expect(band.x).toBeGreaterThan(0);
        expect(band.x + band.width).toBeLessThan(viewport.width);
        await page.screenshot({ path: `${OUT}sky-timeline-zoom-${viewport.width}x${viewport.height}.png` });
      }
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  it('in n-body the lanes read the n-body flight and say so; the readout still follows the cursor', async () => {
    const { page, context, errors } = await app.openPage({ viewport: { width: 1440, height: 900 } });
    await page.selectOption('[data-testid=truth-model]', 'nbody');
    await expect.poll(() => page.textContent('[data-testid=sky-light] .chart-legend'), { timeout: HANG_GUARD_MS }).toBe('n-body');
    await expect
      .poll(async () => Number(await page.getAttribute('[data-testid=sky-sun] .lane-label', 'data-eclipses')), { timeout: HANG_GUARD_MS })
      .toBeGreaterThan(0);
    // the n-body flight leaves the same parking orbit: its first shadow is Tessel's, within the first orbit (~1.6 h)
    const first = await page.locator('[data-testid=sky-sun] rect.pass title').first().textContent();
    expect(first).toMatch(/^in Tessel's (penumbra|umbra) .* \(n-body\)$/);
    // 10 min into the parking orbit both models fly the same start state: the light time to Tessel agrees to the n-body samples'
    // chord (samples ~3° of arc apart on a 6 200 km orbit: the chord sags r·(1 − cos 1.5°) ≈ 2 km, 3.4e-4 of the distance; 1e-3 leaves room)
    const t = result.t0 + 600;
    await page.evaluate(
      (tt) => (window as unknown as { waymarkDebug: { session: { cursor: { set(t: number): void } } } }).waymarkDebug.session.cursor.set(tt),
      t,
    );
    shipAt(t, s6);
    const conic = lightTimeAt(system, system.calendar.homeIndex, t, s6[0], s6[1], s6[2]);
    await expect
      .poll(async () => Math.abs(Number(await page.getAttribute('[data-testid=read-light]', 'data-value')) / conic - 1), { timeout: HANG_GUARD_MS })
      .toBeLessThan(1e-3);
    await page.screenshot({ path: `${OUT}sky-timeline-nbody-1440x900.png` });
    expect(errors).toEqual([]);
    await context.close();
  });
});
