/**
 * End to end: editing that follows intent, time that reads right, and the window's layout at its
 * declared minimum. "+ Burn" adds at the end with defaults that say what they chose; an insertion
 * point puts an event elsewhere; a burn's mark on the Timeline drags its time (whole minutes,
 * Undo restores it) and a burn timed by the event before it says why it does not; the System
 * view frames the whole plan on load (the destination's label inside the 3D view); the standard-
 * day option changes the dates and their note and is remembered; at 1024×640 with the game-step
 * lanes shown the 3D view keeps its height. Screenshots in test/output/e2e/. Waits are hang guards.
 */
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OUT, buildApp, openFile, requireChromium, startApp, type E2eApp, HANG_GUARD_MS } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-edit-time/', import.meta.url).pathname;

let app: E2eApp;

interface Ev {
  id: string;
  type: string;
  name: string;
  t?: number | null;
  solve?: { kind: string };
}
const events = (page: Page) => page.evaluate('window.waymarkDebug.session.doc.get().plan.events') as Promise<Ev[]>;
const rect = (page: Page, selector: string) =>
  page.evaluate(
    `(() => { const r = document.querySelector(${JSON.stringify(selector)}).getBoundingClientRect(); return { x: r.x, y: r.y, w: r.width, h: r.height }; })()`,
  ) as Promise<{
    x: number;
    y: number;
    w: number;
    h: number;
  }>;

describe.skipIf(!have)('editing that follows intent and time that reads right (e2e)', () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
  }, HANG_GUARD_MS);

  afterAll(async () => {
    await app?.close();
  });

  it('frames the whole plan on load: the destination is inside the 3D view at 1024×640 and at 1920×1080', async () => {
    for (const viewport of [
      { width: 1024, height: 640 },
      { width: 1920, height: 1080 },
    ]) {
      const { page, context } = await app.openPage({ viewport });
      await page.waitForSelector('.scene-label', { timeout: HANG_GUARD_MS });
      await page.evaluate('window.waymarkDebug.scene.renderNow()');
      const view = await rect(page, '[data-testid=system-canvas]');
      const labels = (await page.evaluate(
        `Array.from(document.querySelectorAll('.scene-label')).filter((e) => ['Ochre', 'Tessel'].includes(e.textContent)).map((e) => { const r = e.getBoundingClientRect(); return { name: e.textContent, x: r.x + r.width / 2, y: r.y + r.height / 2, shown: getComputedStyle(e).display !== 'none' && r.width > 0 }; })`,
      )) as { name: string; x: number; y: number; shown: boolean }[];
      for (const name of ['Ochre', 'Tessel']) {
        const l = labels.find((x) => x.name === name);
        expect(l, `${name} label at ${viewport.width}×${viewport.height}`).toBeDefined();
        expect(l!.shown).toBe(true);
        expect(l!.x).toBeGreaterThan(view.x);
        expect(l!.x).toBeLessThan(view.x + view.w);
        expect(l!.y).toBeGreaterThan(view.y);
        expect(l!.y).toBeLessThan(view.y + view.h);
      }
      await page.screenshot({ path: `${OUT}edit-time-load-${viewport.width}x${viewport.height}.png` });
      await context.close();
    }
  });

  it("frames the whole plan again after opening another plan: the Skerry plan's destination is inside the 3D view", async () => {
    const { page, context } = await app.openPage({ viewport: { width: 1024, height: 640 } });
    // look somewhere else first: the home world up close
    await page.selectOption('[data-testid=focus]', { label: 'Tessel' });
    await openFile(page, new URL('../../assets/plans/tessel-to-skerry.plan.json', import.meta.url).pathname);
    // A browser cannot read the system file beside the plan: the app asks; the bundled copy is chosen explicitly.
    await page.click('[data-testid=ask] [data-choice=bundled]', { timeout: HANG_GUARD_MS });
    await expect.poll(() => page.evaluate('window.waymarkDebug.session.doc.get().plan.target.body'), { timeout: HANG_GUARD_MS }).toBe('skerry');
    await expect.poll(() => page.inputValue('[data-testid=focus]'), { timeout: HANG_GUARD_MS }).toBe('body:0');
    await page.evaluate('window.waymarkDebug.scene.renderNow()');
    const view = await rect(page, '[data-testid=system-canvas]');
    const moravel = (await page.evaluate(
      `(() => { const e = Array.from(document.querySelectorAll('.scene-label')).find((x) => x.textContent === 'Moravel'); if (!e) return null; const r = e.getBoundingClientRect(); return { x: r.x + r.width / 2, y: r.y + r.height / 2 }; })()`,
    )) as { x: number; y: number } | null;
    expect(moravel).not.toBeNull();
    expect(moravel!.x).toBeGreaterThan(view.x);
    expect(moravel!.x).toBeLessThan(view.x + view.w);
    expect(moravel!.y).toBeGreaterThan(view.y);
    expect(moravel!.y).toBeLessThan(view.y + view.h);
    await page.screenshot({ path: `${OUT}edit-time-opened-skerry-1024x640.png` });
    await context.close();
  });

  it('"+ Burn" goes to the end with defaults it explains; an insertion point puts a coast after event 1; the budget numbers burns as the cards do', async () => {
    const { page, context } = await app.openPage();
    const before = await events(page);
    // select an event first: the new burn still goes to the end (selection is not an insertion point)
    await page.click(`[data-event-id="${before[2].id}"] .index`);
    await page.click('[data-action=add-burn]');
    await expect.poll(async () => (await events(page)).length, { timeout: HANG_GUARD_MS }).toBe(before.length + 1);
    const after = await events(page);
    expect(after.slice(0, before.length).map((e) => e.id)).toEqual(before.map((e) => e.id));
    const added = after[after.length - 1];
    expect(added.type).toBe('burn');
    expect(added.t).not.toBeNull();
    const note = page.locator(`[data-event-id="${added.id}"] [data-testid=event-note]`);
    // the demo ends in its target orbit: a zero burn, said so on the card
    expect(await note.textContent()).toMatch(/Zero Δv to fill in at the end of the plan: the plan already ends in its target orbit about Ochre/);
    // its budget row carries its card number
    const row = page.locator(`[data-row="${added.id}"] .idx`);
    await expect.poll(() => row.textContent(), { timeout: HANG_GUARD_MS }).toBe(String(after.length));

    // an insertion point after event 1: the words say so, the coast goes there, and the point goes back to the end
    await page.click(`[data-action=insert-point][data-where="after 1 ${before[0].name}"]`);
    expect(await page.textContent('[data-testid=insert-where]')).toBe(`after 1 ${before[0].name}`);
    await page.click('[data-action=add-coast]');
    await expect.poll(async () => (await events(page)).length, { timeout: HANG_GUARD_MS }).toBe(before.length + 2);
    const withCoast = await events(page);
    expect(withCoast[1].type).toBe('coast');
    expect(withCoast[0].id).toBe(before[0].id);
    expect(await page.textContent('[data-testid=insert-where]')).toBe('at the end');
    await page.locator(`[data-event-id="${added.id}"]`).scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${OUT}edit-time-new-burn.png` });
    await context.close();
  });

  it('dragging a burn on the Timeline retimes it to a whole minute, Undo restores it; a burn timed by the event before it says why it does not drag; ] nudges the selected burn', async () => {
    const { page, context } = await app.openPage();
    const evs = await events(page);
    const dep = evs[0];
    expect(dep.type).toBe('burn');
    const t0 = dep.t!;
    const hit = page.locator(`.timeline-svg g.burn[data-id="${dep.id}"] .burn-hit`);
    const box = (await hit.boundingBox())!;
    expect(box.width).toBeGreaterThanOrEqual(8);
    const y = box.y + box.height / 2;
    await page.mouse.move(box.x + box.width / 2, y);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width / 2 + 40, y, { steps: 8 });
    // live preview: the mark has moved and shows the time it would take
    expect(await page.locator(`.timeline-svg g.burn[data-id="${dep.id}"]`).getAttribute('transform')).toMatch(/translate\(\d/);
    expect(await page.textContent(`.timeline-svg g.burn[data-id="${dep.id}"] .burn-time`)).toMatch(/^\d+-\d{3}T\d\d:\d\d:00$/);
    await page.mouse.up();
    await expect.poll(async () => (await events(page))[0].t, { timeout: HANG_GUARD_MS }).not.toBe(t0);
    const moved = (await events(page))[0].t!;
    expect(moved).toBeGreaterThan(t0);
    // the card's time field shows a whole minute
    expect(await page.inputValue(`[data-event-id="${dep.id}"] input[data-path="events[0].t"]`)).toMatch(/:00$/);
    expect(await page.evaluate('window.waymarkDebug.session.doc.get().undoLabel')).toBe(`Retime ${dep.name}`);
    await page.screenshot({ path: `${OUT}edit-time-dragged.png` });
    await page.click('[data-action=undo]');
    await expect.poll(async () => (await events(page))[0].t, { timeout: HANG_GUARD_MS }).toBe(t0);

    // a burn without a time of its own: not draggable, and its tooltip says why
    const capture = evs.find((e) => e.name === 'Ochre capture')!;
    const g = page.locator(`.timeline-svg g.burn[data-id="${capture.id}"]`);
    expect(await g.getAttribute('class')).not.toMatch(/draggable/);
    expect(await g.locator('title').textContent()).toMatch(/no time of its own: it fires at the end of \d+ Approach Ochre/);

    // ] moves the selected burn a minute later (one edit), from anywhere but a text field
    await page.click(`[data-event-id="${dep.id}"] .index`);
    await page.keyboard.press(']');
    await expect.poll(async () => (await events(page))[0].t, { timeout: HANG_GUARD_MS }).not.toBe(t0);
    const nudged = (await events(page))[0].t!;
    expect(nudged - t0).toBeGreaterThan(0);
    expect(nudged - t0).toBeLessThanOrEqual(90); // a minute, snapped to the clock's whole minute
    await context.close();
  });

  it('the standard-day option changes dates and their note, is remembered, and a date typed in it comes back as typed', async () => {
    const { page, context } = await app.openPage();
    const note = page.locator('[data-testid=calendar-day]');
    expect(await note.textContent()).toBe('days of Tessel: 26 h 06 min');
    const homeDate = await page.textContent('[data-testid=cursor-date]');
    await note.click();
    expect(await note.textContent()).toBe('standard days: 24 h 00 min');
    expect(await page.textContent('[data-testid=cursor-date]')).not.toBe(homeDate);
    const epoch = page.locator('input[data-path="start.epoch"]');
    await epoch.fill('412-151T13:00');
    await epoch.press('Enter');
    await expect.poll(() => epoch.inputValue(), { timeout: HANG_GUARD_MS }).toBe('412-151T13:00:00');
    // remembered across a reload
    await page.reload();
    await page.waitForSelector('[data-testid=budget-table] tbody tr.row', { timeout: HANG_GUARD_MS });
    expect(await page.textContent('[data-testid=calendar-day]')).toBe('standard days: 24 h 00 min');
    await page.click('[data-testid=calendar-day]');
    expect(await page.textContent('[data-testid=calendar-day]')).toBe('days of Tessel: 26 h 06 min');
    await context.close();
  });

  it('at 1024×640 the game-step lanes do not take the 3D view’s height, and nothing is cut off on the right', async () => {
    const { page, context } = (await app.openPage({ viewport: { width: 1024, height: 640 } })) as { page: Page; context: BrowserContext };
    const without = await rect(page, '[data-testid=system-canvas]');
    await page.click('[data-side=gamestep]');
    await page.selectOption('[data-field=integrator]', 'verlet');
    await page.fill('[data-field=dt]', '1/60');
    await page.click('[data-action=gamestep-run]');
    await page.waitForSelector('[data-testid=gamestep-lanes]', { timeout: HANG_GUARD_MS });
    const withLanes = await rect(page, '[data-testid=system-canvas]');
    console.log(
      `3D view at 1024×640: ${without.w.toFixed(0)}×${without.h.toFixed(0)} px without the game-step lanes, ${withLanes.h.toFixed(0)} px high with them`,
    );
    // the lanes scroll inside the Timeline: the 3D view keeps its height (2 px: sub-pixel layout)
    expect(Math.abs(withLanes.h - without.h)).toBeLessThanOrEqual(2);
    // and that height is usable: at least 280 px, over 40 % of the window's 640 (the Timeline is held
    // to 38 % of the height, the top bar, status line and the view's toolbar take ~95 px; 280 leaves
    // room for font differences between machines)
    expect(withLanes.h).toBeGreaterThanOrEqual(280);
    // the Timeline's own lanes stay visible above the scrolled game-step lanes
    const tl = await rect(page, '[data-testid=timeline]');
    const burnsLane = await rect(page, '.timeline-svg .lane-0');
    expect(burnsLane.y + burnsLane.h).toBeLessThanOrEqual(tl.y + tl.h);
    // nothing past the right edge: the page and the Timeline's bar do not scroll sideways
    expect(await page.evaluate('document.documentElement.scrollWidth')).toBeLessThanOrEqual(1024);
    const bar = (await page.evaluate(
      `(() => { const b = document.querySelector('[data-testid=timeline] .bar'); return [b.scrollWidth, b.clientWidth]; })()`,
    )) as [number, number];
    expect(bar[0]).toBeLessThanOrEqual(bar[1] + 1);
    await page.screenshot({ path: `${OUT}edit-time-1024x640-lanes.png` });
    await context.close();
  });
});
