/**
 * End to end: the flyby demo, as a designer works it (browser mode, headless chromium; setup in
 * harness.ts). "Far Lantern to Fennick by Moravel" is opened through File → Open; the Budget
 * lists the Moravel pass's free Δv beside the burns; the Target panel lists the flyby leg and
 * targets the plan in n-body in its worker; the targeted plan is applied, and the Budget and the
 * target readout say Fennick's goals are met in n-body, and the Budget's flyby row becomes the
 * pass measured from the n-body flight, at the planned periapsis. Then the System view is focused on
 * Moravel at the pass's periapsis time: the n-body path drawn inside Moravel's sphere of
 * influence is the flyby hyperbola, its closest point at the n-body periapsis. Screenshots at 1024×640
 * and 1920×1080 go to test/output/e2e/. Waits are hang guards only.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HANG_GUARD_MS, OUT, buildApp, openFile, requireChromium, startApp, type E2eApp } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-flyby/', import.meta.url).pathname;
const DEMO = new URL('../../assets/plans/tessel-moravel-fennick.plan.json', import.meta.url).pathname;

let app: E2eApp;
let page: Page;
let errors: string[] = [];
/** The Moravel pass of the opened plan in patched conics: the point the n-body targeting aims its flyby leg at. */
let planned: Pass;
/** The same pass measured from the n-body flight after targeting (the truth report's). */
let nbodyPass: Pass;

/** A speed as the Budget shows it ("8 990.3 m/s", "8.99 km/s"), in m/s. */
function shownSpeed(text: string): number {
  const m = /^([\d\s\u202f.,]+) (m\/s|km\/s)$/.exec(text.trim());
  expect(m, text).not.toBeNull();
  return Number(m![1].replace(/[\s\u202f,]/g, '')) * (m![2] === 'km/s' ? 1e3 : 1);
}

const js = <T>(expr: string): Promise<T> => page.evaluate(expr) as Promise<T>;
/** Polls the page every 50 ms until `expr` is true, for at most HANG_GUARD_MS (a hang guard, not a speed check). */
const until = (expr: string) => expect.poll(() => js<boolean>(expr), { timeout: HANG_GUARD_MS, interval: 50 }).toBe(true);

interface Pass {
  body: number;
  tPeriapsis: number;
  periapsisRadius: number;
  freeDv: number | null;
}

describe.skipIf(!have)('the flyby demo in the app (e2e)', () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
    ({ page, errors } = await app.openPage({ viewport: { width: 1024, height: 640 } }));
  }, HANG_GUARD_MS);

  afterAll(async () => {
    await app?.close();
  });

  it('opens the flyby demo; the Budget lists the Moravel pass beside the burns', async () => {
    await openFile(page, DEMO);
    // a browser has only the plan file itself: it asks for the system file the plan names
    await page.click('[data-testid=ask] [data-choice=bundled]', { timeout: HANG_GUARD_MS });
    await until("window.waymarkDebug.session.doc.get().plan.name === 'Far Lantern to Fennick by Moravel'");
    await until('window.waymarkDebug.session.evaluation.get().result?.flybys?.length === 1');
    const pass = await js<Pass>('window.waymarkDebug.session.evaluation.get().result.flybys[0]');
    planned = pass;
    // the shown free Δv is the report's, in km/s or m/s as the panel formats speeds
    const shown = shownSpeed((await page.textContent('[data-testid=flyby-free]'))!);
    // the panel rounds to its shown digits: within 1 % of the report
    expect(Math.abs(shown - pass.freeDv!)).toBeLessThan(0.01 * pass.freeDv!);
    expect(await page.textContent('[data-testid=target]')).toMatch(/Fennick/);
  });

  it('targets the flyby plan in n-body from the Target panel and applies it', async () => {
    const legs = (await page.textContent('[data-testid=target-legs]'))!;
    expect(legs).toMatch(/Moravel/);
    expect(legs).toMatch(/Fennick/);
    await page.selectOption('[data-testid=target-model]', 'nbody');
    await page.click('[data-action=target-run]');
    await page.waitForSelector('[data-testid=target-result]', { timeout: HANG_GUARD_MS });
    const r = await js<{ status: string; model: string; legs: { status: string }[] }>('window.waymarkDebug.session.targeting.get().result');
    expect(r.model).toBe('nbody');
    expect(r.status).toBe('met');
    for (const leg of r.legs) expect(leg.status).toBe('converged');
    await page.locator('[data-testid=target-result]').evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await page.waitForTimeout(100); // one frame for the scroll to paint
    await page.screenshot({ path: `${OUT}flyby-target-1024x640.png` });

    await page.click('[data-action=target-apply]');
    await expect.poll(() => page.getAttribute('[data-testid=target]', 'data-model'), { timeout: HANG_GUARD_MS }).toBe('nbody');
    await until('window.waymarkDebug.session.truth.get().pending === false');
    expect(await page.getAttribute('[data-testid=target]', 'data-reached')).toBe('true');
    expect(await page.textContent('[data-testid=target]')).toMatch(/Fennick: target reached \(n-body\)/);
    expect(await page.textContent('[data-testid=budget-model]')).toBe('n-body');
    // the Budget's flyby row is now the pass measured from the n-body flight (the truth report's)
    const flown = await js<Pass & { periapsisMethod?: string }>('window.waymarkDebug.session.truth.get().report.flybys[0]');
    expect(flown.periapsisMethod).toBe('probe');
    expect(Math.abs(shownSpeed((await page.textContent('[data-testid=flyby-free]'))!) - flown.freeDv!)).toBeLessThan(0.01 * flown.freeDv!);
    // targeted in n-body, the flown periapsis is the planned one to the B-plane goal's tolerance (0.1 %)
    expect(Math.abs(flown.periapsisRadius - planned.periapsisRadius)).toBeLessThan(1e-3 * planned.periapsisRadius);
    nbodyPass = flown;
    expect(errors).toEqual([]);
  });

  it('focused on Moravel at periapsis, the System view draws the flyby hyperbola', async () => {
    const pass = nbodyPass;
    await page.selectOption('[data-testid=focus]', `body:${pass.body}`);
    await page.evaluate(
      (t) => (window as unknown as { waymarkDebug: { session: { cursor: { set(t: number): void } } } }).waymarkDebug.session.cursor.set(t),
      pass.tPeriapsis,
    );
    // the n-body path drawn in Moravel's frame: its closest point to Moravel is the n-body
    // periapsis (the drawn polyline samples the hyperbola: within 2 % of it)
    const drawn = await js<{ lines: number; closest: number }>(`window.waymarkDebug.scene.pathInFrame(${pass.body})`);
    expect(drawn.lines).toBeGreaterThan(0);
    expect(drawn.closest).toBeGreaterThan(pass.periapsisRadius * 0.98);
    expect(drawn.closest).toBeLessThan(pass.periapsisRadius * 1.02);
    await page.waitForTimeout(200); // frames for the camera move to paint
    await page.screenshot({ path: `${OUT}flyby-moravel-1024x640.png` });
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.click('text=Frame');
    await page.waitForTimeout(200);
    await page.screenshot({ path: `${OUT}flyby-moravel-1920x1080.png` });
    expect(errors).toEqual([]);
  });
});
