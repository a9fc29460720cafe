/**
 * End to end: the plan on disk is always valid. A new user types −5 into a stage's dry mass; the
 * field says why in its own words and units, the document (window.waymarkDebug.session.doc) is
 * unchanged — no undo step, no unsaved marker, no recovery copy — and Save writes the unchanged,
 * valid plan. Setup (build, server, chromium) is in harness.ts; waits are hang guards only.
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../core/io/planFile.ts';
import { OUT, buildApp, requireChromium, startApp, type E2eApp, HANG_GUARD_MS } from './harness.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-valid-edits/', import.meta.url).pathname;

let app: E2eApp;
let page: Page;

const js = <T>(expr: string): Promise<T> => page.evaluate(expr) as Promise<T>;
const doc = () => js<{ plan: Record<string, unknown>; revision: number; canUndo: boolean; dirty: boolean }>('window.waymarkDebug.session.doc.get()');

describe.skipIf(!have)('an invalid edit is refused at the field (e2e)', () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
    ({ page } = await app.openPage());
  }, HANG_GUARD_MS);

  afterAll(async () => {
    await app?.close();
  });

  it('typing −5 t of dry mass shows the rule at the field and leaves the document and the saved file unchanged', async () => {
    const before = await doc();
    const field = page.locator('input[data-path="vehicle.stages[0].dryMass"]');
    const shown = await field.inputValue();
    await field.fill('−5');
    await field.press('Enter');
    const message = page.locator('[data-field-message="vehicle.stages[0].dryMass"]').first();
    await message.waitFor({ timeout: HANG_GUARD_MS });
    expect(await message.textContent()).toBe('Stage 1 dry mass must be at least 0 t');
    const after = await doc();
    expect(after.plan).toEqual(before.plan);
    expect(after.revision).toBe(before.revision);
    expect(after.canUndo).toBe(false);
    expect(after.dirty).toBe(false);
    expect(await page.locator('[data-testid=unsaved]').count()).toBe(0);
    expect(await js<string | null>("localStorage.getItem('waymark.recovery')")).toBeNull();
    await message.scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${OUT}valid-edits-refused.png` });

    // Leaving the field puts the plan's value back; the message stays until the value changes.
    await page.locator('input[data-path="vehicle.stages[0].propellantMass"]').focus();
    expect(await field.inputValue()).toBe(shown);
    expect(await message.textContent()).toBe('Stage 1 dry mass must be at least 0 t');

    // Save writes the unchanged plan, and it opens again.
    await page.click('[data-testid=menu-file]');
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: HANG_GUARD_MS }), page.click('[data-action=save]')]);
    const saved = `${OUT}valid-edits.plan.json`;
    await download.saveAs(saved);
    const fromDisk = parsePlanFile(readFileSync(saved, 'utf8')).plan;
    expect(fromDisk).toEqual(before.plan);
    expect((fromDisk.vehicle.stages[0] as { dryMass: number }).dryMass).toBeGreaterThan(0);

    // A valid value goes through, and the message goes with the old value.
    await field.fill('1.5');
    await field.press('Enter');
    await expect.poll(() => js<number>('window.waymarkDebug.session.doc.get().plan.vehicle.stages[0].dryMass'), { timeout: HANG_GUARD_MS }).toBe(1500);
    expect(await page.locator('[data-field-message="vehicle.stages[0].dryMass"]').count()).toBe(0);
  });
});
