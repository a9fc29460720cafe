/**
 * End to end: the built renderer served in browser mode, driven in Debian's headless chromium
 * (software WebGL) through playwright-core. The steps share one page and run in order, as a
 * new user would: the demo plan loads, the 3D view draws, the timeline cursor moves the scene,
 * edits update the budget, undo/redo, save/reopen, a bad file, a porkchop click.
 * Screenshots go to test/output/e2e/. Setup (build, server, chromium) is in harness.ts.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WINDOW_COUNT } from '../../core/io/defaults.ts';
import { parsePlanFile } from '../../core/io/planFile.ts';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import type { Plan } from '../../core/plan/index.ts';
import { computePorkchop } from '../../core/search/porkchop.ts';
import { findWindows } from '../../core/search/windows.ts';
import { initialWindowsForm, windowsRequest } from '../../app/renderer/windows/windowsForm.ts';
import { runCli } from '../app/cli/runCli.ts';
import { OUT, buildApp, openFile as openThroughPicker, requireChromium, startApp, type E2eApp, HANG_GUARD_MS } from './harness.ts';

const have = requireChromium();

let app: E2eApp;
let page: Page;
let pageErrors: string[] = [];

/** Reads a value from the page's debug handle (window.waymarkDebug). */
const js = <T>(expr: string): Promise<T> => page.evaluate(expr) as Promise<T>;
const plan = () => js<Record<string, unknown>>('window.waymarkDebug.session.doc.get().plan');
const budgetRows = () => page.locator('[data-testid=budget-table] tbody tr.row').count();
/** A checksum of the 3D canvas pixels (the renderer keeps its drawing buffer). */
const canvasSum = () =>
  js<number>(`(() => {
    const s = window.waymarkDebug.scene; s.renderNow();
    const gl = s.renderer.getContext(); const w = gl.drawingBufferWidth, h = gl.drawingBufferHeight;
    const px = new Uint8Array(w * h * 4); gl.readPixels(0, 0, w, h, gl.RGBA, gl.UNSIGNED_BYTE, px);
    let a = 0; for (let k = 0; k < px.length; k += 4) a = (a * 31 + px[k] * 7 + px[k + 1] * 3 + px[k + 2]) % 1000000007;
    return a; })()`);

describe.skipIf(!have)('Waymark in the browser (e2e)', () => {
  beforeAll(async () => {
    // The renderer's own dist/renderer (what `npm start` serves); the page loads the demo and waits for its budget.
    app = await startApp(await buildApp());
    pageErrors = app.pageErrors;
    ({ page } = await app.openPage());
  });

  afterAll(async () => {
    await app?.close();
  });

  async function openFile(path: string): Promise<void> {
    await openThroughPicker(page, path);
  }

  it('opens on the demo plan with its budget and a positive margin, without page errors', async () => {
    await expect.poll(() => page.textContent('[data-testid=doc-name]')).toContain('tessel-to-ochre.plan.json');
    expect(await budgetRows()).toBe(5);
    const margin = Number(await page.getAttribute('[data-margin]', 'data-margin'));
    expect(margin).toBeGreaterThan(0);
    expect(await page.textContent('[data-testid=status]')).toMatch(/margin/);
    expect(await page.locator('[data-testid=unsaved]').count()).toBe(0);
    await page.screenshot({ path: `${OUT}01-demo.png` });
    expect(pageErrors).toEqual([]);
  });

  it('draws the 3D view with software WebGL (the canvas is not blank)', async () => {
    const frac = await js<number>('window.waymarkDebug.scene.nonBackgroundFraction()');
    expect(frac).toBeGreaterThan(0.003);
    const colours = await js<number>(`(() => {
      const s = window.waymarkDebug.scene; s.renderNow();
      const gl = s.renderer.getContext(); const w = gl.drawingBufferWidth, h = gl.drawingBufferHeight;
      const px = new Uint8Array(w * h * 4); gl.readPixels(0, 0, w, h, gl.RGBA, gl.UNSIGNED_BYTE, px);
      const set = new Set(); for (let k = 0; k < px.length; k += 16) set.add((px[k] >> 3) << 10 | (px[k + 1] >> 3) << 5 | (px[k + 2] >> 3));
      return set.size; })()`);
    expect(colours).toBeGreaterThan(20);
    await page.locator('[data-testid=system-canvas]').screenshot({ path: `${OUT}02-system-view.png` });
  });

  it('dragging the timeline cursor moves the ship and the bodies and changes the readouts', async () => {
    const before = {
      date: await page.textContent('[data-testid=cursor-date]'),
      met: await page.textContent('[data-testid=cursor-met]'),
      sum: await canvasSum(),
      ship: await js<number[]>('Array.from(window.waymarkDebug.scene.shipPosition())'),
    };
    const handle = page.locator('.cursor-handle');
    const box = (await handle.boundingBox())!;
    const svg = (await page.locator('.timeline-svg').boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + 5);
    await page.mouse.down();
    await page.mouse.move(svg.x + svg.width * 0.45, box.y + 5, { steps: 8 });
    await page.mouse.up();
    await page.waitForTimeout(100);
    const after = {
      date: await page.textContent('[data-testid=cursor-date]'),
      met: await page.textContent('[data-testid=cursor-met]'),
      sum: await canvasSum(),
      ship: await js<number[]>('Array.from(window.waymarkDebug.scene.shipPosition())'),
    };
    expect(after.date).not.toBe(before.date);
    expect(after.met).not.toBe(before.met);
    expect(after.met).toMatch(/^T\+ \d+ d \d\d h \d\d min \d\d s$/);
    expect(after.sum).not.toBe(before.sum);
    expect(Math.hypot(after.ship[0] - before.ship[0], after.ship[1] - before.ship[1], after.ship[2] - before.ship[2])).toBeGreaterThan(1e9);
    // Arrow keys step the cursor.
    await page.focus('[data-testid=timeline]');
    await page.keyboard.press('ArrowRight');
    const stepped = await page.textContent('[data-testid=cursor-date]');
    expect(stepped).not.toBe(after.date);
    // ... wherever focus is, except in a text field
    await page.evaluate('document.activeElement.blur()');
    await page.keyboard.press('ArrowRight');
    expect(await page.textContent('[data-testid=cursor-date]')).not.toBe(stepped);
    await page.screenshot({ path: `${OUT}03-scrubbed.png` });
  });

  it('adding a burn adds a budget row (a zero burn: the demo already ends in its target orbit); a Δv typed in raises the planned total; undo and redo take them back and forth', async () => {
    const rows = await budgetRows();
    const total = await page.textContent('[data-testid=total]');
    const n = await js<number>('window.waymarkDebug.session.doc.get().plan.events.length');
    await page.click('[data-action=add-burn]');
    await expect.poll(budgetRows).toBe(rows + 1);
    expect(await page.locator('[data-testid=budget-table] tbody tr.row').last().textContent()).toMatch(/0\.0 m\/s/);
    expect(await page.textContent('[data-testid=total]')).toBe(total);
    const dv = page.locator(`input[data-path="events[${n}].dv[0]"]`);
    await dv.fill('5');
    await dv.press('Enter');
    await expect.poll(() => page.textContent('[data-testid=total]')).not.toBe(total);
    const raised = await page.textContent('[data-testid=total]');
    expect(await page.locator('[data-testid=unsaved]').count()).toBe(1);
    await page.click('[data-action=undo]');
    await expect.poll(() => page.textContent('[data-testid=total]')).toBe(total);
    await page.click('[data-action=undo]');
    await expect.poll(budgetRows).toBe(rows);
    expect(await page.textContent('[data-testid=total]')).toBe(total);
    await page.click('[data-action=redo]');
    await expect.poll(budgetRows).toBe(rows + 1);
    // Keyboard: Ctrl+Z / Ctrl+Y outside a field.
    await page.focus('[data-testid=timeline]');
    await page.keyboard.press('Control+z');
    await expect.poll(budgetRows).toBe(rows);
    await page.keyboard.press('Control+y');
    await expect.poll(budgetRows).toBe(rows + 1);
    await page.keyboard.press('Control+y');
    await expect.poll(() => page.textContent('[data-testid=total]')).toBe(raised);
    await page.screenshot({ path: `${OUT}04-burn-added.png` });
  });

  it('a field typed wrong shows a message naming it and changes nothing', async () => {
    const rev = await js<number>('window.waymarkDebug.session.doc.get().revision');
    const field = page.locator('input[data-path="vehicle.stages[0].isp"]');
    await field.fill('fast');
    await field.press('Enter');
    await expect.poll(() => page.locator('[data-field-message="vehicle.stages[0].isp"]').first().textContent()).toMatch(/Stage 1 Isp must be a number/);
    expect(await js<number>('window.waymarkDebug.session.doc.get().revision')).toBe(rev);
    await field.fill('339');
    await field.press('Enter');
    await expect.poll(() => js<number>('window.waymarkDebug.session.doc.get().plan.vehicle.stages[0].isp')).toBe(339);
  });

  it('a typed time comes back as typed, and the Timeline says whose day the calendar counts', async () => {
    expect(await page.textContent('[data-testid=calendar-day]')).toBe('days of Tessel: 26 h 06 min');
    const field = page.locator('input[data-path="events[0].solve.arrive"]');
    const shown = await field.inputValue();
    // Both once came back a second short: "413-126T12:59:59" and "413-125T26:06:23".
    for (const typed of ['413-126T13:00', '413-126T00:00']) {
      await field.fill(typed);
      await field.press('Enter');
      await expect.poll(() => field.inputValue()).toBe(`${typed}:00`);
    }
    // An arrival before the burn is refused, said with the burn's number and name and its time as a date.
    await field.fill('412-100T00:00');
    await field.press('Enter');
    await expect
      .poll(() => page.locator('[data-field-message="events[0].solve.arrive"]').first().textContent())
      .toMatch(/^Burn 1 'Departure': arrival must be later than the burn \(412-149T\d\d:\d\d\)$/);
    await field.fill(shown);
    await field.press('Enter');
    await expect.poll(() => field.inputValue()).toBe(shown);
  });

  it('saves (download), reopens the file, and gets the same plan back', async () => {
    const inMemory = await plan();
    await page.click('[data-testid=menu-file]');
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-action=save]')]);
    const saved = `${OUT}saved.plan.json`;
    await download.saveAs(saved);
    expect(download.suggestedFilename()).toBe('tessel-to-ochre.plan.json');
    await expect.poll(() => page.locator('[data-testid=unsaved]').count()).toBe(0);
    const fromDisk = parsePlanFile(readFileSync(saved, 'utf8')).plan;
    expect(fromDisk).toEqual(inMemory);
    await openFile(saved);
    await expect.poll(() => page.textContent('[data-testid=doc-name]')).toContain('saved.plan.json');
    expect(await plan()).toEqual(inMemory);
    expect(await js<boolean>('window.waymarkDebug.session.doc.get().canUndo')).toBe(false);
  });

  it('the downloaded plan carries its system, and `waymark check` reads it to the budget the app shows', async () => {
    const saved = `${OUT}saved.plan.json`; // a download folder: no system file beside it
    expect(parsePlanFile(readFileSync(saved, 'utf8')).system.kind).toBe('embedded');
    const app = await js<{ total: number; margin: number }>('window.waymarkDebug.session.evaluation.get().result.budget');
    const run = await runCli(['check', saved, '--model', 'conic', '--json']);
    expect([0, 1], run.stderr).toContain(run.code);
    const cli = JSON.parse(run.stdout).budget as { total: number; margin: number };
    // Same evaluation of the same plan and system, but in two engines (the page's Chromium, the
    // command line's Node), whose Math functions may round differently in the last bit; the
    // iterative burn solutions then stop on neighbouring iterates (seen: 7e-8 m/s on a 6 km/s
    // total, about 1e-11 relative). 1e-6 m/s bounds that, far below the 0.1 m/s the budget shows.
    const ENGINES = 1e-6; // m/s
    expect(Math.abs(cli.total - app.total)).toBeLessThan(ENGINES);
    expect(Math.abs(cli.margin - app.margin)).toBeLessThan(ENGINES);
  });

  it('a bad plan file shows its messages with field paths and changes nothing', async () => {
    const before = await plan();
    const rev = await js<number>('window.waymarkDebug.session.doc.get().revision');
    const bad = JSON.parse(readFileSync(`${OUT}saved.plan.json`, 'utf8'));
    bad.vehicle.stages[1].thrust_N = 'lots';
    bad.events[0].frame = 'sideways';
    writeFileSync(`${OUT}bad.plan.json`, JSON.stringify(bad, null, 2));
    await openFile(`${OUT}bad.plan.json`);
    const notice = page.locator('[data-testid=notice-error]').last();
    await expect.poll(() => notice.textContent()).toMatch(/bad\.plan\.json was not opened/);
    const text = (await notice.textContent())!;
    expect(text).toContain('vehicle.stages[1].thrust_N');
    expect(text).toContain('events[0].frame');
    await page.screenshot({ path: `${OUT}05-bad-file.png` });
    expect(await plan()).toEqual(before);
    expect(await js<number>('window.waymarkDebug.session.doc.get().revision')).toBe(rev);
    expect(await page.textContent('[data-testid=doc-name]')).toContain('saved.plan.json');
    await notice.locator('button[aria-label=Dismiss]').click();
  });

  it('a plan file that is not valid UTF-8 is refused with the offset of the bad byte and changes nothing', async () => {
    const before = await plan();
    const bytes = readFileSync(`${OUT}saved.plan.json`);
    const at = bytes.indexOf('"name"') + 9;
    bytes[at] = 0xff; // never a byte of UTF-8
    writeFileSync(`${OUT}not-utf8.plan.json`, bytes);
    await openFile(`${OUT}not-utf8.plan.json`);
    const notice = page.locator('[data-testid=notice-error]').last();
    await expect.poll(() => notice.textContent()).toContain(`not-utf8.plan.json is not valid UTF-8 at byte ${at.toLocaleString('en-US')}`);
    expect(await plan()).toEqual(before);
    await notice.locator('button[aria-label=Dismiss]').click();
  });

  it('verifies the plan in n-body gravity, corrects the mid-course burn and runs a dispersion, each in a worker', async () => {
    await page.click('[data-action=nbody-verify]');
    await page.waitForSelector('[data-testid=nbody-result]', { timeout: HANG_GUARD_MS });
    expect(await page.textContent('[data-testid=nbody-miss]')).toMatch(/(km|Gm)$/);
    expect(await page.textContent('[data-testid=status-nbody]')).toMatch(/n-body: DOP853/);
    expect(await js<boolean>('window.waymarkDebug.scene.nbodyLine !== null')).toBe(true);
    await page.click('[data-action=nbody-correct]');
    await page.waitForSelector('[data-action=nbody-apply]', { timeout: HANG_GUARD_MS });
    const before = await plan();
    await page.click('[data-action=nbody-apply]');
    expect(await plan()).not.toEqual(before);
    // The edit makes the verification stale: its path leaves the 3D view.
    await expect.poll(() => js<boolean>('window.waymarkDebug.scene.nbodyLine === null')).toBe(true);
    await page.click('[data-action=undo]');
    expect(await plan()).toEqual(before);
    await page.click('[data-action=disperse]');
    await page.waitForSelector('[data-testid=dispersion-result]', { timeout: HANG_GUARD_MS });
    expect(await page.textContent('[data-testid=dispersion-result]')).toMatch(/of 500 runs keep a margin/);
    await page.screenshot({ path: `${OUT}06-nbody-dispersion.png` });
  });

  it('computes a porkchop in the worker, and a click on a window puts its transfer burns in the plan', async () => {
    await page.click('[data-tab=windows]');
    await page.selectOption('[data-testid=win-grid]', '100');
    await page.click('[data-testid=win-compute]');
    await page.waitForSelector('[data-testid=windows-list] tr[data-window]', { timeout: HANG_GUARD_MS });
    // The list is the core's answer: the same search (the view's form for the page's plan) in
    // this process, in one thread, finds the same windows. The app splits the grid over its
    // workers and runs another V8 build; the cells are computed alike, so the answers agree to
    // the last bit here, and the tolerance allows only last-bit differences of the floating
    // point library (1e-12 relative).
    const shown = await page.$$eval('[data-testid=windows-list] tr[data-window]', (rows) =>
      rows.map((r) => ({
        departure: Number(r.getAttribute('data-departure')),
        arrival: Number(r.getAttribute('data-arrival')),
        dv: Number(r.getAttribute('data-dv')),
      })),
    );
    const { system } = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8'));
    const request = windowsRequest(system, initialWindowsForm(system, (await plan()) as unknown as Plan, 100))!;
    const expected = findWindows(system, computePorkchop(system, request), { count: WINDOW_COUNT });
    expect(shown.length).toBe(expected.length);
    expect(shown.length).toBeGreaterThan(0);
    shown.forEach((w, k) => {
      expect(Math.abs(w.departure - expected[k].departure)).toBeLessThanOrEqual(1e-12 * Math.abs(expected[k].departure));
      expect(Math.abs(w.arrival - expected[k].arrival)).toBeLessThanOrEqual(1e-12 * Math.abs(expected[k].arrival));
      expect(Math.abs(w.dv - expected[k].dvTotal)).toBeLessThanOrEqual(1e-12 * expected[k].dvTotal);
    });
    // The picture is one canvas image, drawn (not blank) over the plot area; it follows the list.
    const painted = () =>
      js<number>(`(() => {
      const c = document.querySelector('[data-testid=porkchop] canvas.porkchop-image');
      if (!c) return 0;
      const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
      const colours = new Set();
      for (let k = 0; k < d.length; k += 4 * 97) colours.add((d[k] << 16) | (d[k + 1] << 8) | d[k + 2]);
      return colours.size; })()`);
    await expect.poll(painted, { timeout: HANG_GUARD_MS }).toBeGreaterThan(5);
    const plot = (await page.locator('[data-testid=porkchop] svg rect.hit').boundingBox())!;
    await page.mouse.move(plot.x + plot.width * 0.3, plot.y + plot.height * 0.4);
    await expect.poll(() => page.textContent('[data-testid=porkchop-readout]')).toMatch(/Δv total/);
    await page.screenshot({ path: `${OUT}07-porkchop.png` });
    const before = await plan();
    await page.click('[data-testid=windows-list] tr[data-window="0"]');
    await expect.poll(() => page.textContent('[data-testid=win-message]')).toMatch(/put in the plan/);
    const after = (await plan()) as { events: { type: string; solve?: { kind: string } }[]; start: unknown };
    expect(after).not.toEqual(before);
    const transfers = after.events.filter((e) => e.type === 'burn' && e.solve?.kind === 'transfer');
    expect(transfers.length).toBeGreaterThanOrEqual(1);
    expect(await budgetRows()).toBeGreaterThanOrEqual(2);
    // One undoable edit.
    await page.click('[data-action=undo]');
    expect(await plan()).toEqual(before);
    await page.click('[data-action=redo]');
    await page.click('[data-tab=system]');
    await page.waitForTimeout(150);
    await page.screenshot({ path: `${OUT}08-after-window.png` });
    expect(pageErrors).toEqual([]);
  });
  it('a moon route round-trips: opened (its system chosen explicitly), downloaded, read by `waymark check` to the same budget, and opened again to the same plan', async () => {
    await page.click('[data-testid=menu-file]');
    const choosing = page.waitForEvent('filechooser');
    await page.click('[data-action=open]');
    await page.click('[data-testid=ask] [data-choice=discard]'); // the porkchop's edit above is not kept
    const chooser = await choosing;
    await chooser.setFiles(new URL('../../assets/plans/tessel-to-skerry.plan.json', import.meta.url).pathname);
    // The browser cannot read ../systems/ilmar.system.json beside the plan: it says so and asks.
    await expect
      .poll(() => page.textContent('[data-testid=ask]'))
      .toMatch(/names the system file "\.\.\/systems\/ilmar\.system\.json".*this browser cannot read files beside/);
    await page.click('[data-testid=ask] [data-choice=bundled]');
    await expect.poll(() => js<string>('window.waymarkDebug.session.doc.get().plan.target.body')).toBe('skerry');
    const inMemory = await plan();
    await page.click('[data-testid=menu-file]');
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-action=save]')]);
    const saved = `${OUT}moon.plan.json`;
    await download.saveAs(saved);
    expect(parsePlanFile(readFileSync(saved, 'utf8')).system.kind).toBe('embedded');
    const app = await js<{ total: number; margin: number }>('window.waymarkDebug.session.evaluation.get().result.budget');
    const run = await runCli(['check', saved, '--model', 'conic', '--json']);
    expect([0, 1], run.stderr).toContain(run.code);
    const cli = JSON.parse(run.stdout).budget as { total: number; margin: number };
    const ENGINES = 1e-6; // m/s: two engines' last-bit rounding through iterative burn solutions (see the demo's round trip above)
    expect(Math.abs(cli.total - app.total)).toBeLessThan(ENGINES);
    expect(Math.abs(cli.margin - app.margin)).toBeLessThan(ENGINES);
    await openFile(saved); // embedded: no question this time
    await expect.poll(() => page.textContent('[data-testid=doc-name]')).toContain('moon.plan.json');
    expect(await page.locator('[data-testid=ask]').count()).toBe(0);
    expect(await plan()).toEqual(inMemory);
    expect(pageErrors).toEqual([]);
  });
});
