/**
 * End to end: "Retarget for my game" in the app (browser mode, headless chromium; setup in
 * harness.ts). On the demo plan, with semi-implicit Euler at 1/60 s and the verification's long
 * coasts extrapolated (seconds, not the minute every step takes): the retargeting runs in its
 * worker with progress, the verdict says the goals are met, the goals and burns tables fill, the
 * Timeline shows both error curves (the game flying the plan's burns and the retargeted
 * schedule, extrapolated stretches dashed); the burn schedule and the runtime data download and
 * read back with the core's readers. The layout probe (layoutProbe.ts) finds nothing cramped at
 * 1024×640 and 1920×1080; screenshots go to test/output/e2e/handoff-*.png.
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readGameScheduleJson } from '../../core/io/index.ts';
import { decodeRuntimeBinary } from '../../core/runtime/index.ts';
import { HANG_GUARD_MS, OUT, buildApp, requireChromium, startApp, type E2eApp } from './harness.ts';
import { layoutProblems } from './layoutProbe.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-handoff/', import.meta.url).pathname;
const G = { timeout: HANG_GUARD_MS };

let app: E2eApp;
let page: Page;
let errors: string[];

const js = <T>(expr: string): Promise<T> => page.evaluate(expr) as Promise<T>;

async function downloaded(click: () => Promise<void>): Promise<{ name: string; bytes: Buffer }> {
  const [d] = await Promise.all([page.waitForEvent('download', G), click()]);
  const path = await d.path();
  return { name: d.suggestedFilename(), bytes: readFileSync(path) };
}

describe.skipIf(!have)('Retarget for my game (e2e)', () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
    ({ page, errors } = await app.openPage({ viewport: { width: 1024, height: 640 } }));
  });

  afterAll(async () => {
    await app?.close();
  });

  it('retargets the demo for semi-implicit Euler at 1/60 s: verdict met, goals and burns tables, both curves in the Timeline', async () => {
    await page.click('[data-side=gamestep]');
    await page.selectOption('[data-field=integrator]', 'symplectic-euler');
    await page.fill('[data-field=dt]', '1/60');
    // the defaults are shown as placeholders; the hint says what each verification costs
    expect(await page.getAttribute('[data-field=rt-altitude]', 'placeholder')).toBe('1');
    expect(await page.getAttribute('[data-field=rt-inclination]', 'placeholder')).toBe('0.01');
    expect(await page.getAttribute('[data-field=rt-time]', 'placeholder')).toBe('60');
    expect(await page.textContent('[data-testid=retarget-verify-hint]')).toMatch(/Every step: all [\d.]+e9 game steps flown/);
    await page.selectOption('[data-field=rt-verify]', 'extrapolated');
    expect(await page.textContent('[data-testid=retarget-verify-hint]')).toMatch(/Extrapolated: long coasts estimated/);
    await page.click('[data-action=retarget-run]');
    await page.waitForSelector('[data-action=retarget-cancel]', G);
    await page.waitForSelector('[data-testid=retarget-result]', G);
    const ms = await js<number>('window.waymarkDebug.checks.get().game.retarget.ms');
    console.log(`retargeting for semi-implicit Euler at 1/60 s, extrapolated verification, in the browser worker: ${ms.toFixed(0)} ms`);

    const verdict = (await page.textContent('[data-testid=retarget-verdict]'))!;
    expect(verdict).toMatch(/^\s*Met\b/);
    expect(verdict).toMatch(/flies the retargeted schedule to every goal/);
    // one row of values per goal of the core's result, each met
    const goals = await js<number>('window.waymarkDebug.checks.get().game.retarget.value.retarget.goals.length');
    expect(goals).toBeGreaterThan(0);
    expect(await page.locator('[data-testid=retarget-goals] tr.values').count()).toBe(goals);
    const marks = await page.locator('[data-testid=retarget-goals] tr.name .mark').allTextContents();
    expect(marks.length).toBe(goals);
    expect(marks.every((m) => m.trim() === '✓ met')).toBe(true);
    // the arrival time: a calendar date wanted, the flights as offsets from it
    const time = (await page.textContent('[data-testid=retarget-goals] tr.values[data-goal^="periapsis time"]'))!;
    expect(time).toMatch(/\d{3}-\d{3}T\d\d:\d\d:\d\d/);
    // the five burns of the demo, each with its step and time, Δv in VNB and the change from the plan
    expect(await page.locator('[data-testid=retarget-burns] tr.bvalues').count()).toBe(5);
    expect(await page.locator('[data-testid=retarget-burns] tr.bname').first().textContent()).toMatch(
      /^1\. Departure step [\d\u202f]+ · \d{3}-\d{3}T\d\d:\d\d:\d\d$/,
    );
    const dep = (await page.textContent('[data-testid=retarget-burns] tr.bvalues[data-burn="1"]'))!;
    expect(dep).toMatch(/3\s?632\.\d{3}/); // the departure's Δv along the velocity, m/s (the demo's 3,632 m/s burn)
    expect(await page.textContent('[data-testid=retarget-verification]')).toMatch(/game steps flown; 1 long coast .* extrapolated/);
    expect(await page.textContent('[data-testid=retarget]')).not.toMatch(/NaN|undefined/);

    // the Timeline: both curves, each drawn, extrapolated stretches dashed
    const lane = page.locator('[data-testid=retarget-lane]');
    await expect.poll(() => lane.count(), G).toBe(1);
    for (const key of ['before', 'after']) {
      const ds = await page.$$eval(`[data-testid=retarget-lane] path.rt-${key}`, (ps) => ps.map((p) => p.getAttribute('d') ?? ''));
      expect(ds.length, key).toBeGreaterThan(0);
      expect(ds.join('').length, key).toBeGreaterThan(100);
      expect(ds.join('')).not.toMatch(/NaN/);
    }
    const dashed = await page.$$eval('[data-testid=retarget-lane] path[data-style=extrapolated]', (ps) => ps.map((p) => p.getAttribute('stroke-dasharray')));
    expect(dashed.length).toBeGreaterThan(0);
    expect(dashed.every((d) => d !== null && d !== '')).toBe(true);
    const legend = (await page.textContent('[data-testid=retarget-lane] .rt-legend'))!;
    expect(legend).toMatch(/game: plan's burns/);
    expect(legend).toMatch(/game: retargeted/);
    // the lane toggle takes the curves out of the Timeline and back
    await page.uncheck('[data-testid=retarget-lane-toggle]');
    await expect.poll(() => lane.count(), G).toBe(0);
    await page.check('[data-testid=retarget-lane-toggle]');
    await expect.poll(() => lane.count(), G).toBe(1);
  });

  it('looks right at 1024×640 and 1920×1080: nothing overlaps or leaves its panel (screenshots)', async () => {
    for (const [w, h] of [
      [1024, 640],
      [1920, 1080],
    ] as const) {
      await page.setViewportSize({ width: w, height: h });
      await page.waitForTimeout(200);
      await page.locator('[data-testid=retarget-verdict]').scrollIntoViewIfNeeded();
      await page.screenshot({ path: `${OUT}handoff-${w}x${h}.png` });
      await page.locator('[data-testid=retarget-burns]').scrollIntoViewIfNeeded();
      await page.screenshot({ path: `${OUT}handoff-${w}x${h}-burns.png` });
      await page.locator('[data-testid=retarget-lane] .rt-lane').scrollIntoViewIfNeeded();
      await page.locator('[data-testid=timeline]').screenshot({ path: `${OUT}handoff-${w}x${h}-timeline.png` });
      const problems = (await layoutProblems(page, 1)).map((p) => `${p.panel}: ${p.kind} ${p.a}${p.b ? ` / ${p.b}` : ''} (${p.px} px)`);
      expect(problems, `${w}×${h}`).toEqual([]);
    }
    await page.setViewportSize({ width: 1024, height: 640 });
  });

  it('saves the burn schedule (JSON, km, steps, y-up) and the runtime data (binary), which read back with the core readers', async () => {
    await page.selectOption('[data-field=rt-schedule-format]', 'json');
    await page.selectOption('[data-field=rt-length]', 'km');
    await page.selectOption('[data-field=rt-time-unit]', 'steps');
    await page.selectOption('[data-field=rt-axes]', 'y-up-right-handed');
    const s = await downloaded(() => page.click('[data-action=retarget-save-schedule]'));
    expect(s.name).toMatch(/\.schedule\.json$/);
    const doc = JSON.parse(s.bytes.toString('utf8'));
    expect(doc.units).toEqual({ length: 'km', time: 'steps', axes: 'y-up-right-handed' });
    const back = readGameScheduleJson(doc);
    const steps = await js<number[]>('window.waymarkDebug.checks.get().game.retarget.value.retarget.schedule.burns.map((b) => b.step)');
    expect(back.burns.map((b) => b.step)).toEqual(steps);
    await page.selectOption('[data-field=rt-schedule-format]', 'csv');
    const c = await downloaded(() => page.click('[data-action=retarget-save-schedule]'));
    expect(c.name).toMatch(/\.schedule\.csv$/);
    expect(c.bytes.toString('utf8').split('\r\n')[0]).toMatch(/^step,elapsed_steps,id,name,central,dv_x_km_per_step/);
    await page.selectOption('[data-field=rt-runtime-format]', 'bin');
    const r = await downloaded(() => page.click('[data-action=retarget-save-runtime]'));
    expect(r.name).toMatch(/\.runtime\.bin$/);
    const data = decodeRuntimeBinary(r.bytes.buffer.slice(r.bytes.byteOffset, r.bytes.byteOffset + r.bytes.byteLength) as ArrayBuffer);
    expect(data.tracks.filter((t) => t.kind === 'ship').length).toBe(1);
    for (const t of data.tracks) expect(t.maxError).toBeLessThanOrEqual(t.tolerance);
    expect(await page.textContent('[data-testid=retarget-saved]')).toMatch(/runtime\.bin/);
    expect(errors).toEqual([]);
  });

  it('a step too coarse (velocity Verlet at 120 s): not met, why, and the step that works as one click into the physics form', async () => {
    await page.selectOption('[data-field=integrator]', 'verlet');
    await page.fill('[data-field=dt]', '120');
    await page.click('[data-action=retarget-run]');
    await expect.poll(() => page.textContent('[data-testid=retarget-verdict]'), G).toMatch(/^\s*Not met/);
    const verdict = (await page.textContent('[data-testid=retarget-verdict]'))!;
    expect(verdict).toMatch(/does not reach .* within tolerance/);
    const rec = await js<{ dt: number | null }>('window.waymarkDebug.checks.get().game.retarget.value.retarget.recommendation');
    expect(rec.dt).not.toBeNull();
    expect(rec.dt!).toBeLessThan(120);
    const marks = await page.locator('[data-testid=retarget-goals] tr.name .mark').allTextContents();
    expect(marks.some((m) => m.trim() === '✗ not met')).toBe(true);
    await page.locator('[data-action=retarget-fix]').scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${OUT}handoff-1024x640-not-met.png` });
    await page.click('[data-action=retarget-fix]');
    expect(Number(await page.inputValue('[data-field=dt]'))).toBe(rec.dt);
    expect(errors).toEqual([]);
  });

  it("with the game-step check's lanes too, the Timeline stacks both: the check's lanes, then the retargeting's", async () => {
    await page.click('[data-action=gamestep-run]');
    await page.waitForSelector('[data-testid=gamestep-result]', G);
    await expect.poll(() => page.locator('[data-testid=gamestep-lanes] path.gs-curve').count(), G).toBeGreaterThan(0);
    expect(await page.locator('[data-testid=retarget-lane] path.rt-after').count()).toBeGreaterThan(0);
    const top = async (sel: string) => (await page.locator(sel).boundingBox())!.y;
    expect(await top('[data-testid=retarget-lane] .rt-lane')).toBeGreaterThan(await top('[data-testid=gamestep-lanes] [data-lane=energy]'));
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.waitForTimeout(200);
    await page.locator('[data-testid=retarget-lane] .rt-lane').scrollIntoViewIfNeeded();
    await page.locator('[data-testid=timeline]').screenshot({ path: `${OUT}handoff-1920x1080-timeline-stacked.png` });
    expect(errors).toEqual([]);
  });
});
