/**
 * End to end: planning a route as a new user would, from the demo plan (browser mode, headless
 * chromium; setup in harness.ts). File → "New plan from a route…" opens the route panel; the
 * demo ship carries too little Δv for Moravel's moons: the summary says by how much beside the
 * verdict, and its "edit the vehicle" takes the user to the stages to fill the tanks;
 * "Plan a route…" brings the form back as it was; a run in n-body is cancelled; then From
 * Tessel 300 km, To Skerry 500 km, a departure range around the window the route builder finds
 * (asked of core here, so nothing is hard-coded), patched conics; Propose runs in the analysis
 * worker; the verdict is "met"; from the Plan screen "Replace this plan" replaces the plan as one
 * edit: the Plan screen shows its events, the Budget its burns, the status line its truth model;
 * Undo brings the plan back. From the File menu, "Open as a new plan" asks about the unsaved
 * changes and opens the route's plan as a new untitled document. The panel is measured at
 * 1024×640 and 1920×1080 (no two boxes overlap, nothing outside the dialog or the window) and
 * screenshots go to test/output/e2e/. Waits are hang guards only.
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parsePlanFile, parseSystemFile } from '../../core/io/index.ts';
import { planRoute } from '../../core/route/index.ts';
import { formatCompactDate } from '../../core/system/index.ts';
import { ROUTE_FIELD_LABELS, chooseTo, defaultRouteForm, readRouteForm } from '../../app/renderer/route/routeForm.ts';
import { HANG_GUARD_MS, OUT, buildApp, requireChromium, startApp, type E2eApp } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-route/', import.meta.url).pathname;
const root = new URL('../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const demo = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;

/** Propellant the user gives the demo's two stages for the trip, t (the demo's 27 t and 5.2 t carry about 6.5 km/s; Skerry takes about twice that). */
const TANKS = [300, 40];

let app: E2eApp;
let page: Page;
let errors: string[] = [];

const js = <T>(expr: string): Promise<T> => page.evaluate(expr) as Promise<T>;
const plan = () => js<{ name: string; events: { name: string; kind: string }[]; truthModel?: string }>('window.waymarkDebug.session.doc.get().plan');

/**
 * Boxes of the route dialog that overlap (neither inside the other) or stick out of the dialog or
 * the window, by more than 1 px (sub-pixel rounding of fractional layout). The form and result
 * scroll between the title and the buttons: there a box counts as far as it is scrolled into
 * view, and nothing may be cut off sideways.
 */
async function dialogProblems(): Promise<string[]> {
  return page.evaluate(() => {
    const dialog = document.querySelector('[data-testid=route-panel]')!;
    const body = dialog.querySelector('[data-testid=route-body]')!;
    const d = dialog.getBoundingClientRect();
    const b = body.getBoundingClientRect();
    const out: string[] = [];
    if (d.left < -1 || d.top < -1 || d.right > innerWidth + 1 || d.bottom > innerHeight + 1) out.push('the dialog leaves the window');
    if (dialog.scrollWidth > dialog.clientWidth + 1) out.push('the dialog scrolls sideways');
    if (body.scrollWidth > body.clientWidth + 1) out.push('the form is cut off at its side');
    const hasText = (el: Element) => Array.from(el.childNodes).some((n) => n.nodeType === 3 && n.textContent!.trim() !== '');
    const seen = (el: Element) => {
      const r = el.getBoundingClientRect();
      if (!body.contains(el)) return r;
      const top = Math.max(r.top, b.top);
      const bottom = Math.min(r.bottom, b.bottom);
      return bottom - top >= 1 ? new DOMRect(r.left, top, r.width, bottom - top) : null;
    };
    const boxes = Array.from(dialog.querySelectorAll('*'))
      .filter((el) => el.matches('input, select, button') || hasText(el))
      .map((el) => ({ el, r: seen(el) }))
      .filter((x): x is { el: Element; r: DOMRect } => x.r !== null && x.r.width >= 1 && x.r.height >= 1);
    const name = (el: Element) => `${el.tagName.toLowerCase()} '${(el.getAttribute('data-route') ?? el.textContent ?? '').trim().slice(0, 30)}'`;
    for (const [i, { el, r }] of boxes.entries()) {
      if (r.left < d.left - 1 || r.right > d.right + 1) out.push(`${name(el)} sticks out of the dialog`);
      for (const { el: other, r: q } of boxes.slice(i + 1)) {
        if (el.contains(other) || other.contains(el)) continue;
        const w = Math.min(r.right, q.right) - Math.max(r.left, q.left);
        const h = Math.min(r.bottom, q.bottom) - Math.max(r.top, q.top);
        if (w > 1 && h > 1) out.push(`${name(el)} overlaps ${name(other)}`);
      }
    }
    return out;
  });
}

/**
 * Texts of the Timeline's left column (each chart's title, max and min; each lane's name) whose
 * boxes overlap another's by more than 1 px either way (sub-pixel rounding of the font boxes).
 */
async function timelineLabelOverlaps(): Promise<string[]> {
  return page.evaluate(() => {
    const texts = Array.from(document.querySelectorAll<SVGTextElement>('.timeline-svg .lane-label, .timeline-svg .chart-scale')).filter(
      (t) => t.getBoundingClientRect().height > 0,
    );
    // three charts of title, max and min at least: the check has something to measure
    const out: string[] = texts.length >= 9 ? [] : [`only ${texts.length} labels shown`];
    for (const [i, a] of texts.entries()) {
      const r = a.getBoundingClientRect();
      for (const b of texts.slice(i + 1)) {
        const q = b.getBoundingClientRect();
        const w = Math.min(r.right, q.right) - Math.max(r.left, q.left);
        const h = Math.min(r.bottom, q.bottom) - Math.max(r.top, q.top);
        if (w > 1 && h > 1) out.push(`'${a.textContent}' overlaps '${b.textContent}' by ${h.toFixed(1)} px`);
      }
    }
    return out;
  });
}

describe.skipIf(!have)('planning a route in the browser (e2e)', () => {
  /** The departure range typed: 30 days either side of the window core finds for the default range. */
  let range: { after: string; before: string };

  beforeAll(async () => {
    // the window: what the route builder itself finds over the form's default range
    const form = { ...chooseTo(system, defaultRouteForm(system, demo), 'skerry'), fromAltitude: '300', periapsis: '500', truthModel: 'conic' as const };
    const ship = { ...demo, vehicle: { ...demo.vehicle, stages: demo.vehicle.stages.map((st, k) => ({ ...st, propellantMass: TANKS[k] * 1000 })) } };
    const read = readRouteForm(system, ship, form);
    if (!read.ok) throw new Error(JSON.stringify(read.errors));
    const found = planRoute(system, read.intent);
    const depart = found.hops[0].depart;
    const day = 86_400;
    range = {
      after: formatCompactDate(system.calendar, Math.max(read.intent.departAfter, depart - 30 * day), { seconds: false }),
      before: formatCompactDate(system.calendar, depart + 30 * day, { seconds: false }),
    };
    app = await startApp(await buildApp(BUILD));
    ({ page, errors } = await app.openPage({ viewport: { width: 1024, height: 640 } }));
  }, HANG_GUARD_MS);

  afterAll(async () => {
    await app?.close();
  });

  it('the Plan screen offers "Plan a route…" at its top, inside the plan column', async () => {
    const button = page.locator('[data-action=route-open]');
    const box = (await button.boundingBox())!;
    const column = (await page.locator('aside.plan').boundingBox())!;
    expect(box.x).toBeGreaterThanOrEqual(column.x);
    expect(box.x + box.width).toBeLessThanOrEqual(column.x + column.width);
    expect(box.y + box.height).toBeLessThanOrEqual(column.y + column.height / 3);
    await button.click();
    await page.waitForSelector('[data-testid=route-panel]', { timeout: HANG_GUARD_MS });
    // the defaults come from the plan: its start body and altitude
    expect(await page.inputValue('[data-route=from]')).toBe('tessel');
    expect(await page.inputValue('[data-route=fromAltitude]')).toBe('300');
    expect(await page.inputValue('[data-route=fromInclination]')).toBe('');
    // from the Plan screen the route's plan takes this plan's place
    expect((await page.textContent('[data-action=route-use]'))!.trim()).toBe('Replace this plan');
    await page.click('[data-testid=route-panel] [data-action=route-discard]');
    expect(await page.locator('[data-testid=route-panel]').count()).toBe(0);
  });

  it('refuses a periapsis below the safe altitude and a missing date at their fields, in the words the form shows', async () => {
    await page.click('[data-testid=menu-file]');
    await page.click('[data-action=new-from-route]');
    // the keyboard starts on the first choice
    await expect.poll(() => js<string | null>("document.activeElement?.getAttribute('data-route') ?? null"), { timeout: HANG_GUARD_MS }).toBe('from');
    // from the File menu the route's plan opens as a new plan
    expect((await page.textContent('[data-action=route-use]'))!.trim()).toBe('Open as a new plan');
    await page.selectOption('[data-route=to]', 'skerry');
    await page.fill('[data-route=periapsis]', '1');
    const before = await page.inputValue('[data-route=departBefore]');
    await page.fill('[data-route=departBefore]', '');
    await page.click('[data-action=route-propose]');
    const msg = (await page.textContent('[data-route-message=periapsis]'))!;
    expect(msg).toMatch(/^Periapsis altitude must be at least 8 km, Skerry's safe altitude$/);
    // the date's message names the field as the dialog shows it: its group's name, then its own label
    const shown = await page.evaluate(() => {
      const input = document.querySelector('[data-route=departBefore]')!;
      const group = input.closest('.group')!;
      return `${group.querySelector('.legend')!.textContent!.trim()} ${input.closest('label')!.querySelector('span')!.textContent!.trim()}`;
    });
    expect(shown).toBe(ROUTE_FIELD_LABELS.departBefore);
    expect((await page.textContent('[data-route-message=departBefore]'))!).toBe(`${shown} is required`);
    expect(await page.textContent('[data-testid=route-panel]')).not.toMatch(/NaN/);
    expect(await js<boolean>('window.waymarkDebug.session.route.get().running')).toBe(false);
    await page.fill('[data-route=departBefore]', before);
  });

  it('the demo ship carries too little for Skerry: the shortfall beside the verdict, and "edit the vehicle" there', async () => {
    await page.fill('[data-route=periapsis]', '500');
    await page.selectOption('[data-route=truthModel]', 'conic');
    await page.click('[data-action=route-propose]');
    await page.waitForSelector('[data-testid=route-verdict]', { timeout: HANG_GUARD_MS });
    const r = await js<{ dvEstimate: number }>('window.waymarkDebug.session.route.get().result');
    const short = (await page.textContent('[data-testid=route-shortfall]'))!.replace(/\s+/g, ' ').trim();
    expect(short).toMatch(/^Short by [\d\s\u202f]+ m\/s: the estimate is more than .+ carries \([\d\s\u202f]+ m\/s\) — edit the vehicle$/);
    // the shortfall is the estimate less what the ship carries (as the intro shows it), to the whole m/s shown
    const num = (t: string) => Number(t.replace(/[\s\u202f]/g, ''));
    const carries = num(/carries \(([\d\s\u202f]+) m\/s\)/.exec(short)![1]);
    expect(num((await page.textContent('[data-testid=route-capacity]'))!.replace(' m/s', ''))).toBe(carries);
    expect(Math.abs(num(/^Short by ([\d\s\u202f]+) m\/s/.exec(short)![1]) - (r.dvEstimate - carries))).toBeLessThanOrEqual(1); // both shown rounded to whole m/s
    // beside the verdict: on its line, or right under it
    const v = (await page.locator('[data-testid=route-verdict]').boundingBox())!;
    const b = (await page.locator('[data-testid=route-shortfall]').boundingBox())!;
    expect(b.y).toBeLessThan(v.y + v.height + 8);
    await page.locator('[data-testid=route-result]').evaluate((el) => el.scrollIntoView({ block: 'end' }));
    await page.waitForTimeout(100); // one frame for the scroll to paint
    expect(await dialogProblems()).toEqual([]);
    await page.screenshot({ path: `${OUT}route-shortfall-1024x640.png` });
  });

  it('"edit the vehicle" puts the panel aside at the vehicle; the form comes back as it was', async () => {
    await page.click('[data-action=route-shortfall-edit-vehicle]');
    expect(await page.locator('[data-testid=route-panel]').count()).toBe(0);
    expect(await js<string | null>("document.activeElement?.getAttribute('data-path') ?? null")).toBe('vehicle.name');
    for (const [k, t] of TANKS.entries()) {
      const field = page.locator(`input[data-path="vehicle.stages[${k}].propellantMass"]`);
      await field.fill(String(t));
      await field.press('Enter');
    }
    await expect.poll(() => js<number>('window.waymarkDebug.session.doc.get().plan.vehicle.stages[1].propellantMass')).toBe(TANKS[1] * 1000);
    await page.click('[data-action=route-open]');
    expect(await page.inputValue('[data-route=to]')).toBe('skerry');
    expect(await page.inputValue('[data-route=periapsis]')).toBe('500');
    // opened from the Plan screen this time: the plan in this document is replaced
    expect((await page.textContent('[data-action=route-use]'))!.trim()).toBe('Replace this plan');
  });

  it('Cancel stops a run in n-body: the worker is stopped, no route is offered, the plan is unchanged', async () => {
    const revision = await js<number>('window.waymarkDebug.session.doc.get().revision');
    await page.fill('[data-route=periapsis]', '500');
    await page.selectOption('[data-route=truthModel]', 'nbody');
    await page.click('[data-action=route-propose]');
    const cancel = page.locator('[data-action=route-cancel]');
    await cancel.waitFor({ timeout: HANG_GUARD_MS });
    expect(await page.isDisabled('[data-route=to]')).toBe(true);
    await cancel.click();
    await page.waitForSelector('[data-action=route-propose]', { timeout: HANG_GUARD_MS });
    expect(await page.textContent('[data-testid=route-panel]')).toMatch(/Cancelled\./);
    expect(await js<boolean>('window.waymarkDebug.session.route.get().cancelled')).toBe(true);
    expect(await js<unknown>('window.waymarkDebug.session.route.get().result')).toBeNull();
    expect(await page.isDisabled('[data-action=route-use]')).toBe(true);
    expect(await js<number>('window.waymarkDebug.session.doc.get().revision')).toBe(revision);
  });

  it('Tessel 300 km to Skerry 500 km in patched conics: proposed, met, used as one edit, undone', async () => {
    const before = await plan();
    const beforeRevision = await js<number>('window.waymarkDebug.session.doc.get().revision');
    await page.selectOption('[data-route=from]', 'tessel');
    await page.fill('[data-route=fromAltitude]', '300');
    await page.selectOption('[data-route=to]', 'skerry');
    await page.fill('[data-route=periapsis]', '500');
    await page.fill('[data-route=departAfter]', range.after);
    await page.fill('[data-route=departBefore]', range.before);
    await page.selectOption('[data-route=truthModel]', 'conic');
    await page.click('[data-action=route-propose]');
    await page.waitForSelector('[data-testid=route-verdict]', { timeout: HANG_GUARD_MS });
    expect(await page.getAttribute('[data-testid=route-verdict]', 'data-met')).toBe('met');
    expect(await page.textContent('[data-testid=route-verdict]')).toMatch(/Every goal met in patched conics/);
    const hops = await page.locator('[data-testid=route-hops] > li').allTextContents();
    expect(hops.length).toBeGreaterThan(0);
    expect(hops[0]).toMatch(/^Tessel →/);
    expect(hops[hops.length - 1]).toMatch(/→ Skerry/);
    for (const h of hops) expect(h).toMatch(/departs Year \d+ .* arrives Year \d+ .*Δv ≈ [\d\s\u202f.]+ m\/s/);
    expect(await page.textContent('[data-testid=route-margin]')).toMatch(/^Margin −?[\d\s\u202f.]+ m\/s$/);
    expect(await page.textContent('[data-testid=route-panel]')).not.toMatch(/NaN|undefined/);
    // the first hop leaves inside the range typed
    const first = await js<{ depart: number }>('window.waymarkDebug.session.route.get().result.hops[0]');
    const intent = await js<{ departAfter: number; departBefore: number }>('window.waymarkDebug.session.route.get().intent');
    expect(first.depart).toBeGreaterThanOrEqual(intent.departAfter);
    expect(first.depart).toBeLessThanOrEqual(intent.departBefore);
    expect(await dialogProblems()).toEqual([]);
    await page.locator('[data-testid=route-result]').evaluate((el) => el.scrollIntoView({ block: 'end' }));
    await page.waitForTimeout(100); // one frame for the scroll to paint
    expect(await dialogProblems()).toEqual([]);
    await page.screenshot({ path: `${OUT}route-panel-1024x640.png` });
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.waitForTimeout(100); // one frame for the layout to paint
    expect(await dialogProblems()).toEqual([]);
    await page.screenshot({ path: `${OUT}route-panel-1920x1080.png` });

    // Replace this plan: one edit, the route's plan on every screen
    const proposed = await js<{ name: string; events: { name: string }[]; truthModel?: string }>('window.waymarkDebug.session.route.get().result.plan');
    await page.click('[data-action=route-use]');
    expect(await page.locator('[data-testid=route-panel]').count()).toBe(0);
    const after = await plan();
    expect(after).toEqual(proposed);
    expect(await js<number>('window.waymarkDebug.session.doc.get().revision')).toBe(beforeRevision + 1);
    expect(await js<string>('window.waymarkDebug.session.doc.get().undoLabel')).toMatch(/^Plan a route/);
    // the Plan screen: the new events, by name, in order
    expect(await page.inputValue('input[data-path=name]')).toBe(after.name);
    const cards = await page.locator('aside.plan [data-event-id]').count();
    expect(cards).toBe(after.events.length);
    // the Budget: one row per burn of the new plan, the demo's burns gone
    await page.waitForSelector('[data-testid=budget-table] tbody tr.row', { timeout: HANG_GUARD_MS });
    await expect
      .poll(() => js<number>('window.waymarkDebug.session.evaluation.get().result?.budget.rows.length ?? -1'), { timeout: HANG_GUARD_MS })
      .toBe(await page.locator('[data-testid=budget-table] tbody tr.row').count());
    const budgetText = (await page.textContent('[data-testid=budget-table]'))!;
    expect(budgetText).not.toMatch(/Ochre capture/);
    // the status line: the plan's truth model
    expect(await page.textContent('.statusline')).toMatch(/truth model: patched conics/);
    expect(await page.inputValue('[data-testid=truth-model]')).toBe(after.truthModel ?? 'conic');
    await page.screenshot({ path: `${OUT}route-used-1920x1080.png` });
    await page.setViewportSize({ width: 1024, height: 640 });
    await page.waitForTimeout(100); // one frame for the layout to paint
    await page.screenshot({ path: `${OUT}route-used-1024x640.png` });
    expect(await timelineLabelOverlaps()).toEqual([]);

    // Undo: the plan before the route (the demo with its tanks filled) again
    await page.click('[data-action=undo]');
    expect(await plan()).toEqual(before);
    await expect.poll(() => page.textContent('[data-testid=budget-table]'), { timeout: HANG_GUARD_MS }).toMatch(/Ochre capture/);
    expect(errors).toEqual([]);
  });

  it('File › New plan from a route: "Open as a new plan" asks about unsaved changes, then opens an untitled plan', async () => {
    const before = await plan();
    const docName = await js<string>('window.waymarkDebug.session.doc.get().name');
    expect(docName).toBe('tessel-to-ochre.plan.json');
    // the tanks filled above are unsaved changes
    expect(await js<boolean>('window.waymarkDebug.session.doc.get().dirty')).toBe(true);
    await page.click('[data-testid=menu-file]');
    await page.click('[data-action=new-from-route]');
    await page.waitForSelector('[data-testid=route-panel]', { timeout: HANG_GUARD_MS });
    await page.selectOption('[data-route=to]', 'skerry');
    await page.fill('[data-route=fromAltitude]', '300');
    await page.fill('[data-route=periapsis]', '500');
    await page.fill('[data-route=departAfter]', range.after);
    await page.fill('[data-route=departBefore]', range.before);
    await page.selectOption('[data-route=truthModel]', 'conic');
    await page.click('[data-action=route-propose]');
    await page.waitForSelector('[data-testid=route-verdict]', { timeout: HANG_GUARD_MS });
    expect(await page.locator('[data-testid=route-shortfall]').count()).toBe(0);
    const proposed = await js<{ name: string }>('window.waymarkDebug.session.route.get().result.plan');
    expect((await page.textContent('[data-action=route-use]'))!.trim()).toBe('Open as a new plan');

    // the question first; Cancel keeps the open document and the route on offer
    await page.click('[data-action=route-use]');
    await page.waitForSelector('[data-testid=ask]', { timeout: HANG_GUARD_MS });
    expect(await page.textContent('[data-testid=ask]')).toMatch(/tessel-to-ochre\.plan\.json has unsaved changes/);
    await page.click('[data-testid=ask] [data-choice=cancel]');
    expect(await page.locator('[data-testid=route-panel]').count()).toBe(1);
    expect(await plan()).toEqual(before);
    expect(await page.isDisabled('[data-action=route-use]')).toBe(false);

    // Discard changes: a new untitled document with the route's plan
    await page.click('[data-action=route-use]');
    await page.waitForSelector('[data-testid=ask]', { timeout: HANG_GUARD_MS });
    await page.click('[data-testid=ask] [data-choice=discard]');
    await expect.poll(() => page.locator('[data-testid=route-panel]').count(), { timeout: HANG_GUARD_MS }).toBe(0);
    expect(await plan()).toEqual(proposed);
    expect(await js<unknown>('window.waymarkDebug.session.doc.get().file')).toBeNull();
    expect(await js<string>('window.waymarkDebug.session.doc.get().name')).toBe('Untitled plan');
    expect(await js<boolean>('window.waymarkDebug.session.doc.get().canUndo')).toBe(false);
    expect(await page.textContent('.statusline')).toMatch(/Untitled plan/);
    expect(await page.textContent('.statusline')).not.toMatch(/tessel-to-ochre/);
    expect(await page.inputValue('input[data-path=name]')).toBe(proposed.name);
    await page.waitForSelector('[data-testid=budget-table] tbody tr.row', { timeout: HANG_GUARD_MS });
    await page.waitForTimeout(100); // one frame for the layout to paint
    await page.screenshot({ path: `${OUT}route-new-1024x640.png` });
    expect(await timelineLabelOverlaps()).toEqual([]);
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.waitForTimeout(100); // one frame for the layout to paint
    await page.screenshot({ path: `${OUT}route-new-1920x1080.png` });
    await page.setViewportSize({ width: 1024, height: 640 });
    expect(errors).toEqual([]);
  });
});
