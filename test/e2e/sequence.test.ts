/**
 * End to end: the Windows screen's sequence mode (browser mode, headless chromium; setup in
 * harness.ts). The user picks Tessel → Moravel → Fennick in order, searches over the default
 * departures (one synodic period of Tessel and Moravel from the plan's epoch): the search runs in
 * the analysis worker, the list of solutions is the core's answer for the same request (computed
 * here), the chart draws one mark per solution and the direct transfer's line, a picked
 * solution shows its legs and the Moravel flyby, and the System view draws its legs; "Make a
 * plan from this" puts it in the plan as one edit (undone). A search is cancelled. Screenshots at 1024×640 and 1920×1080 go to test/output/e2e/. Waits are hang
 * guards only.
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parsePlanFile, parseSystemFile } from '../../core/io/index.ts';
import { searchSequence } from '../../core/search/index.ts';
import { chainChanged, initialSequenceForm, sequenceRequest } from '../../app/renderer/windows/sequenceForm.ts';
import { HANG_GUARD_MS, OUT, buildApp, requireChromium, startApp, type E2eApp } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-sequence/', import.meta.url).pathname;
const root = new URL('../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const demo = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const CHAIN = ['tessel', 'moravel', 'fennick'];

let app: E2eApp;
let page: Page;
let errors: string[] = [];

/** Boxes of the sequence view that stick out of it sideways by more than 1 px (sub-pixel rounding). */
async function sideways(): Promise<string[]> {
  return page.evaluate(() => {
    const view = document.querySelector('[data-testid=sequence-view]')!;
    const v = view.getBoundingClientRect();
    const out: string[] = [];
    if (view.scrollWidth > view.clientWidth + 1) out.push('the view scrolls sideways');
    for (const el of Array.from(view.querySelectorAll('input, select, button, th, td, svg'))) {
      const r = el.getBoundingClientRect();
      if (r.width === 0) continue;
      const inScroller = el.closest('.detail');
      if (!inScroller && (r.left < v.left - 1 || r.right > v.right + 1)) out.push(`${el.tagName} '${(el.textContent ?? '').trim().slice(0, 20)}' sticks out`);
    }
    return out;
  });
}

describe.skipIf(!have)('sequence search in the Windows screen (e2e)', () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
    ({ page, errors } = await app.openPage({ viewport: { width: 1024, height: 640 } }));
  }, HANG_GUARD_MS);

  afterAll(async () => {
    await app?.close();
  });

  it('picks Tessel → Moravel → Fennick, searches in the worker and lists the core answer', async () => {
    await page.click('[data-tab=windows]');
    await page.click('[data-testid=win-mode-sequence]');
    await page.waitForSelector('[data-testid=seq-chain]', { timeout: HANG_GUARD_MS });
    // empty the chain the plan suggested, then pick the bodies in order
    while ((await page.locator('[data-testid=seq-chain] .chip').count()) > 0) await page.locator('[data-testid=seq-chain] .chip button').first().click();
    expect(await page.isDisabled('[data-testid=seq-search]')).toBe(true);
    for (const id of CHAIN) await page.selectOption('[data-testid=seq-add]', id);
    expect(await page.$$eval('[data-testid=seq-chain] .chip', (c) => c.map((e) => e.getAttribute('data-body')))).toEqual(CHAIN);
    await page.click('[data-testid=seq-search]');
    await page.waitForSelector('[data-testid=sequence-list] tr[data-solution]', { timeout: HANG_GUARD_MS });

    // The list is the core's answer to the same request (the form as the page built it) in this
    // process; the worker runs the same code on another V8 build, so the totals agree to the last
    // bits of the floating-point library (1e-12 relative).
    const request = sequenceRequest(system, form0());
    if (typeof request === 'string') throw new Error(request);
    const expected = searchSequence(system, request);
    const shown = await page.$$eval('[data-testid=sequence-list] tr[data-solution]', (rows) => rows.map((r) => Number(r.getAttribute('data-dv'))));
    expect(shown.length).toBe(expected.solutions.length);
    expect(shown.length).toBeGreaterThan(0);
    shown.forEach((dv, k) => expect(Math.abs(dv - expected.solutions[k].dvTotal)).toBeLessThanOrEqual(1e-12 * expected.solutions[k].dvTotal));
    if (expected.direct) expect(Number(await page.getAttribute('[data-testid=sequence-direct-row]', 'data-dv'))).toBeCloseTo(expected.direct.dvTotal, 6);

    // the chart: one mark per solution, the direct line when there is one
    expect(await page.locator('[data-testid=sequence-chart] g.solution').count()).toBe(shown.length);
    expect(await page.locator('[data-testid=sequence-direct]').count()).toBe(expected.direct ? 1 : 0);
    // the picked solution's legs and flyby
    const detail = page.locator('[data-testid=sequence-detail]');
    expect(await detail.locator('tr[data-leg]').count()).toBe(2);
    expect(await detail.locator('tr[data-flyby]').textContent()).toMatch(/^Moravel/);
    if (shown.length > 1) {
      await page.click('[data-testid=sequence-list] tr[data-solution="1"]');
      expect(await detail.textContent()).toMatch(/^\s*#2/);
      expect(await page.getAttribute('[data-testid=sequence-list] tr[data-solution="1"]', 'class')).toMatch(/picked/);
    }
    expect(await page.textContent('[data-testid=seq-message]')).toMatch(/Lambert solves/);
    expect(await page.textContent('[data-testid=sequence-view]')).not.toMatch(/NaN|undefined/);
    expect(await sideways()).toEqual([]);
    await page.screenshot({ path: `${OUT}sequence-1024x640-list.png` });
    await page.locator('[data-testid=sequence-view]').evaluate((el) => el.scrollTo(0, 0));
    await page.waitForTimeout(100); // one frame for the scroll to paint
    await page.screenshot({ path: `${OUT}sequence-1024x640.png` });

    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.waitForTimeout(150); // one frame for the chart to follow the new size
    expect(await sideways()).toEqual([]);
    await page.screenshot({ path: `${OUT}sequence-1920x1080.png` });
    await page.setViewportSize({ width: 1024, height: 640 });
  });

  it("the System view draws the picked solution's legs as Lambert arcs", async () => {
    await page.click('[data-tab=system]');
    await expect.poll(() => page.evaluate('window.waymarkDebug.scene.sequenceLines()'), { timeout: HANG_GUARD_MS }).toBe(CHAIN.length - 1);
    await page.waitForTimeout(150); // one frame for the scene to paint
    await page.screenshot({ path: `${OUT}sequence-system-view.png` });
    await page.click('[data-tab=windows]');
  });

  it('"Make a plan from this" puts the picked solution in the plan as one edit; Undo brings the plan back', async () => {
    const plan = () =>
      page.evaluate('window.waymarkDebug.session.doc.get().plan') as Promise<{ events: { type: string; body?: string }[]; target: { body: string } | null }>;
    const before = await plan();
    await page.click('[data-testid=sequence-list] tr[data-solution="0"]');
    await page.click('[data-testid=seq-make-plan]');
    await expect.poll(() => page.textContent('[data-testid=seq-message]'), { timeout: HANG_GUARD_MS }).toMatch(/put in the plan/);
    const after = await plan();
    expect(after.events.filter((e) => e.type === 'flyby').map((e) => e.body)).toEqual(['moravel']);
    expect(after.target?.body).toBe('fennick');
    await page.click('[data-action=undo]');
    expect(await plan()).toEqual(before);
    await page.click('[data-tab=windows]');
  });

  it('Cancel stops a search: the worker is stopped, the last answer stays', async () => {
    const rows = () => page.$$eval('[data-testid=sequence-list] tr[data-solution]', (r) => r.map((e) => e.getAttribute('data-dv')));
    const before = await rows();
    // Search, then Cancel as soon as it shows (the next task: the search takes far longer than that)
    const shown = await page.evaluate(async () => {
      (document.querySelector('[data-testid=seq-search]') as HTMLButtonElement).click();
      await new Promise((r) => setTimeout(r, 0));
      const cancel = document.querySelector<HTMLButtonElement>('[data-testid=seq-cancel]');
      cancel?.click();
      return cancel !== null;
    });
    expect(shown).toBe(true);
    await page.waitForSelector('[data-testid=seq-search]:not([disabled])', { timeout: HANG_GUARD_MS });
    expect(await page.textContent('[data-testid=seq-message]')).toBe('Cancelled.');
    expect(await rows()).toEqual(before);
    expect(errors).toEqual([]);
  });
});

/** The form for the chain as the first test built it. */
function form0() {
  let form = initialSequenceForm(system, demo);
  form = chainChanged(system, { ...form, bodies: [] });
  for (const id of CHAIN) form = chainChanged(system, { ...form, bodies: [...form.bodies, id] });
  return form;
}
