/**
 * End to end: the window's layout at the smallest declared size, 1024×640, and at 1920×1080, in
 * every screen and right-panel tab (System view with Budget, Windows before and after a porkchop
 * and with a moon of another planet, the Target and n-body panels and the Dispersion panel after a
 * run, Game step and Stability after a run). In each state the layout probe (layoutProbe.ts)
 * measures the element rectangles of every panel:
 *
 * - no two visible interactive or text boxes of one panel overlap by more than 1 px both ways;
 * - no box reaches more than 1 px beyond its panel (or a clipping ancestor) sideways unless it is
 *   inside a sideways scroll container, and no panel scrolls sideways;
 * - no box, chart or canvas reaches more than 1 px above or below its panel into the next one.
 *
 * 1 px: layout in fractional pixels rounds to whole pixels when painted. Screenshots of each
 * state go to test/output/e2e/layout-*.png. The Windows form's New-plan reset is checked here
 * too: after File › New plan its departure range is the new plan's, not the previous plan's.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HANG_GUARD_MS, OUT, buildApp, requireChromium, startApp, type E2eApp } from './harness.ts';
import { layoutProblems, type LayoutProblem } from './layoutProbe.ts';

const have = requireChromium();
const BUILD = new URL('../../dist/e2e-layout/', import.meta.url).pathname;
/** Sub-pixel rounding of fractional layout, px. */
const TOL = 1;
const SIZES: readonly [number, number][] = [
  [1024, 640],
  [1920, 1080],
];
const G = { timeout: HANG_GUARD_MS };

/** The states visited, in order, each set up from the one before. */
const STATES: readonly [string, (page: Page) => Promise<void>][] = [
  [
    'system-budget',
    async (page) => {
      await page.click('[data-tab=system]');
      await page.click('[data-side=budget]');
    },
  ],
  ['windows', (page) => page.click('[data-tab=windows]')],
  [
    'windows-porkchop',
    async (page) => {
      await page.selectOption('[data-testid=win-grid]', '60');
      await page.click('[data-testid=win-compute]');
      await page.waitForSelector('[data-testid=windows-list] tr[data-window]', G);
    },
  ],
  [
    'windows-moon',
    async (page) => {
      await page.selectOption('[data-testid=win-to]', 'skerry');
      await page.waitForSelector('[data-testid=win-through]', G);
    },
  ],
  [
    'target',
    async (page) => {
      await page.click('[data-tab=system]');
      await page.click('[data-action=target-run]');
      await page.waitForSelector('[data-testid=target-result]', G);
    },
  ],
  [
    'nbody',
    async (page) => {
      await page.click('[data-action=nbody-verify]');
      await page.waitForSelector('[data-testid=nbody-result]', G);
    },
  ],
  [
    'dispersion',
    async (page) => {
      await page.fill('[data-testid=dispersion] input >> nth=0', '20');
      await page.click('[data-action=disperse]');
      await page.waitForSelector('[data-testid=dispersion-result]', G);
    },
  ],
  [
    'gamestep',
    async (page) => {
      await page.click('[data-side=gamestep]');
      await page.fill('[data-field=dt]', '10');
      await page.click('[data-action=gamestep-run]');
      await page.waitForSelector('[data-testid=gamestep-result]', G);
    },
  ],
  [
    'stability',
    async (page) => {
      await page.click('[data-side=stability]');
      await page.fill('[data-field=years]', '20');
      await page.click('[data-action=stability-run]');
      await page.waitForSelector('[data-testid=stability-result]', G);
    },
  ],
];

const show = (ps: LayoutProblem[]): string[] => ps.map((p) => `${p.panel}: ${p.kind} ${p.px} px — ${p.a}${p.b ? ` / ${p.b}` : ''}`);

let app: E2eApp;

describe.skipIf(!have)('layout at 1024×640 and 1920×1080 (e2e)', () => {
  beforeAll(async () => {
    app = await startApp(await buildApp(BUILD));
  });

  afterAll(async () => {
    await app?.close();
  });

  for (const [w, h] of SIZES) {
    it(`every tab at ${w}×${h}: no overlapping boxes, nothing beyond its panel`, async () => {
      const { context, page, errors } = await app.openPage({ viewport: { width: w, height: h } });
      try {
        const seen: string[] = [];
        for (const [name, go] of STATES) {
          await go(page);
          await page.waitForTimeout(200); // a frame or two for the layout to settle after the change
          await page.screenshot({ path: `${OUT}layout-${w}x${h}-${name}.png` });
          seen.push(...show(await layoutProblems(page, TOL)).map((s) => `${name}: ${s}`));
        }
        expect(seen).toEqual([]);
        expect(errors).toEqual([]);
      } finally {
        await context.close();
      }
    });
  }

  it('the probe sees an overlap and a box beyond its panel (it can fail)', async () => {
    const { context, page } = await app.openPage({ viewport: { width: 1024, height: 640 } });
    try {
      await page.evaluate(`(() => {
        const side = document.querySelector('aside.budget');
        const a = document.createElement('button'); a.textContent = 'A'; a.style.cssText = 'position:absolute;left:20px;top:90px;width:80px';
        const b = document.createElement('button'); b.textContent = 'B'; b.style.cssText = 'position:absolute;left:40px;top:95px;width:80px';
        const c = document.createElement('span'); c.textContent = 'wide'; c.style.cssText = 'display:inline-block;width:3000px';
        side.append(a, b, c);
      })()`);
      const kinds = (await layoutProblems(page, TOL)).filter((p) => p.panel === 'right panel').map((p) => p.kind);
      expect(kinds).toContain('overlap');
      expect(kinds).toContain('overflow');
    } finally {
      await context.close();
    }
  });

  it('File › New plan starts the Windows form over from the new plan (not the previous date ranges)', async () => {
    const { context, page, errors } = await app.openPage({ viewport: { width: 1024, height: 640 } });
    try {
      await page.click('[data-tab=windows]');
      const depart = page.locator('.windows form input').first(); // Departures from
      const before = await depart.inputValue();
      await page.click('[data-testid=menu-file]');
      await page.click('[data-action=new]');
      // the demo plan is unchanged, so no question; the blank plan starts at the system's epoch
      await expect.poll(() => page.evaluate('window.waymarkDebug.session.doc.get().plan.name'), G).toBe('New plan');
      await expect.poll(() => depart.inputValue(), G).not.toBe(before);
      expect(await page.evaluate('window.waymarkDebug.session.doc.get().plan.start.epoch')).toBe(0);
      // the new plan's departures start at its epoch, the date its own Epoch field shows
      const epochField = (await page.locator('aside.plan input').evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value))).find((v) =>
        /^\d+-\d{3}/.test(v),
      );
      expect(epochField).toBeDefined();
      expect((await depart.inputValue()).slice(0, 7)).toBe(epochField!.slice(0, 7));
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
