/**
 * End to end, the renderer's own defences in the built app (browser mode, headless chromium):
 *
 * 1. The page never evaluates strings as code: under the app's Content-Security-Policy (sent as
 *    a header and as a meta tag), `eval`, `new Function`, string timers and injected inline
 *    scripts are refused, and a request to a remote origin is blocked (connect-src 'self');
 *    the app itself starts without a single policy violation (it needs no eval).
 * 2. Names from files render as text, never as HTML: a plan (with its system embedded) whose
 *    body, plan, vehicle, stage and burn names carry markup is opened, and every view shows the
 *    markup literally — System view labels and focus list, Plan editor, Budget table and
 *    target, Timeline, Windows lists — with no element made from it and no handler run. This
 *    part runs with the CSP bypassed (a context option of the browser), so it tests the
 *    rendering alone: were a name ever put in as HTML, its onerror/onload would run and set
 *    `window.__pwned`.
 *
 * Builds into dist/e2e-security/ so it never collides with app.test.ts's build.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OUT, buildApp, openFile, requireChromium, startApp, type E2eApp, HANG_GUARD_MS } from './harness.ts';

const have = requireChromium();
const repo = new URL('../../', import.meta.url);
const OUT_DIR = new URL('dist/e2e-security/', repo).pathname;

/** Names carrying markup and script, each unique so its display can be found. */
const HOSTILE = {
  star: '<img src=x onerror="window.__pwned=1">Ilmar',
  tessel: '<b>bold</b> Tessel',
  ochre: '<script>window.__pwned=2</script>Ochre',
  quill: '<svg onload="window.__pwned=3"></svg>Quill',
  moravel: '<iframe src="javascript:window.top.__pwned=4"></iframe>Moravel',
  plan: '<b>plan</b> & <i>name</i>',
  vehicle: '<img src=x onerror="window.__pwned=5">Ship',
  stage: '<u>Kick</u> stage',
  departure: '<img src=x onerror="window.__pwned=6">Departure',
  midCourse: '<b>bold</b> mid-course',
  capture: "{@html '<i>x</i>'} capture &amp; &lt;",
  plane: '<a href="javascript:window.__pwned=7">plane</a>',
} as const;

/** The demo plan with the Ilmar system embedded, every name replaced by a hostile one. */
function hostilePlanText(): string {
  const system = JSON.parse(readFileSync(new URL('assets/systems/ilmar.system.json', repo), 'utf8'));
  system.star.name = HOSTILE.star;
  const byId: Record<string, string> = { tessel: HOSTILE.tessel, ochre: HOSTILE.ochre, quill: HOSTILE.quill, moravel: HOSTILE.moravel };
  for (const b of system.bodies) if (byId[b.id]) b.name = byId[b.id];
  const plan = JSON.parse(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', repo), 'utf8'));
  plan.name = HOSTILE.plan;
  plan.system = { embedded: system };
  plan.vehicle.name = HOSTILE.vehicle;
  plan.vehicle.stages[0].name = HOSTILE.stage;
  const burns: Record<string, string> = { departure: HOSTILE.departure, 'mid-course': HOSTILE.midCourse, capture: HOSTILE.capture, plane: HOSTILE.plane };
  for (const e of plan.events) if (burns[e.id]) e.name = burns[e.id];
  return JSON.stringify(plan, null, 2);
}

/** A page script (served from the app's origin) that tries to run strings as code; it records what happened. */
const EVAL_PROBE = `
const attempt = (f) => { try { return 'ran: ' + String(f()); } catch (e) { return e.name; } };
const probe = {
  eval: attempt(() => eval('1 + 1')),
  indirectEval: attempt(() => (0, eval)('2 + 2')),
  fn: attempt(() => new Function('return 3')()),
  asyncFn: attempt(() => new (Object.getPrototypeOf(async () => undefined).constructor)('return 4')),
  timerRan: 'no',
};
window.__timerProbe = () => { probe.timerRan = 'yes'; };
setTimeout('window.__timerProbe()', 0);
setTimeout(() => { window.__evalProbe = probe; }, 20);
`;

/** Elements a name would have made had it been put in as HTML (the app itself uses none of these). */
const INJECTED = 'img, iframe, b, u, i:not([class]), a[href^="javascript:"], [onerror], [onload], script:not([src])';

describe.skipIf(!have)('the renderer never runs strings as code and shows file names as text (e2e)', () => {
  let app: E2eApp;
  beforeAll(async () => {
    const root = await buildApp(OUT_DIR);
    writeFileSync(join(root, 'e2e-eval-probe.js'), EVAL_PROBE);
    app = await startApp(root);
  });
  afterAll(async () => {
    await app?.close();
  });

  describe('under the Content-Security-Policy', () => {
    let page: Page;
    let errors: string[] = [];
    const violations = () => page.evaluate(() => (window as unknown as { __violations: string[] }).__violations);
    beforeAll(async () => {
      const opened = await app.openPage();
      page = opened.page;
      errors = opened.errors;
      // Record CSP violations from the very start of the page (before the app's own scripts).
      await opened.context.addInitScript(
        `window.__violations = []; document.addEventListener('securitypolicyviolation', (e) => window.__violations.push(e.violatedDirective + ' ' + (e.blockedURI || '')));`,
      );
      await page.reload();
      await page.waitForSelector('[data-testid=budget-table] tbody tr.row', { timeout: HANG_GUARD_MS });
    });

    it('is sent with the page, as a header and as a meta tag, without unsafe-eval', async () => {
      const res = await page.request.get(app.served.url);
      const header = res.headers()['content-security-policy'];
      expect(header).toMatch(/script-src 'self'(;|$)/);
      expect(header).not.toMatch(/unsafe-eval|unsafe-inline'[^;]*;?\s*$/);
      const meta = await page.getAttribute('meta[http-equiv="Content-Security-Policy"]', 'content');
      expect(meta).toMatch(/script-src 'self'(;|$)/);
      expect(meta).not.toMatch(/unsafe-eval/);
    });

    it('the app starts and works without one policy violation (it needs no eval)', async () => {
      expect(await violations()).toEqual([]);
      expect(errors).toEqual([]);
    });

    it('refuses eval, new Function and string timers in page scripts', async () => {
      // A script of the page's own origin (script-src 'self' lets it load), trying every way of
      // turning a string into code. (Code that the test harness evaluates through the browser's
      // debugging protocol is exempt from CSP by design, so the attempt must come from the page.)
      await page.evaluate(() => {
        const s = document.createElement('script');
        s.src = './e2e-eval-probe.js';
        document.head.append(s);
      });
      await page.waitForFunction(() => (window as unknown as { __evalProbe?: unknown }).__evalProbe !== undefined);
      await page.waitForTimeout(100); // the string timer's turn
      const r = await page.evaluate(() => (window as unknown as { __evalProbe: Record<string, string> }).__evalProbe);
      expect(r).toEqual({ eval: 'EvalError', indirectEval: 'EvalError', fn: 'EvalError', asyncFn: 'EvalError', timerRan: 'no' });
      expect((await violations()).filter((v) => v.startsWith('script-src')).length).toBeGreaterThanOrEqual(4);
    });

    it('does not run string timers, injected inline scripts, inline handlers or javascript: URLs', async () => {
      await page.evaluate(() => {
        const w = window as unknown as Record<string, unknown>;
        (setTimeout as unknown as (code: string, ms: number) => void)('window.__timer = 1', 0);
        const s = document.createElement('script');
        s.textContent = 'window.__inline = 1';
        document.body.append(s);
        const img = document.createElement('img');
        img.setAttribute('onerror', 'window.__handler = 1');
        img.src = 'data:image/png;base64,broken';
        document.body.append(img);
        const a = document.createElement('a');
        a.href = 'javascript:window.__jsurl=1';
        document.body.append(a);
        a.click();
        w.__tried = true;
      });
      await page.waitForTimeout(200);
      const ran = await page.evaluate(() => {
        const w = window as unknown as Record<string, unknown>;
        return { timer: w.__timer, inline: w.__inline, handler: w.__handler, jsurl: w.__jsurl, tried: w.__tried };
      });
      expect(ran).toEqual({ timer: undefined, inline: undefined, handler: undefined, jsurl: undefined, tried: true });
      await page.evaluate(() => document.querySelectorAll('body > img, body > a, body > script:not([src])').forEach((e) => e.remove()));
    });

    it('blocks requests to other origins (connect-src)', async () => {
      const r = await page.evaluate(async () => {
        try {
          await fetch('https://example.invalid/exfiltrate?x=1');
          return 'fetched';
        } catch (e) {
          return (e as Error).name;
        }
      });
      expect(r).toBe('TypeError');
      expect((await violations()).some((v) => v.startsWith('connect-src') && v.includes('example.invalid'))).toBe(true);
    });
  });

  describe('a plan whose names carry markup (CSP bypassed: the rendering alone is tested)', () => {
    let page: Page;
    let errors: string[] = [];
    const file = `${OUT}hostile-names.plan.json`;
    const texts = (sel: string) => page.locator(sel).evaluateAll((els) => els.map((e) => e.textContent ?? ''));
    const values = (sel: string) => page.locator(sel).evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value));
    const injected = () => page.evaluate((sel) => Array.from(document.querySelectorAll(sel)).map((e) => e.outerHTML.slice(0, 80)), INJECTED);
    const pwned = () => page.evaluate(() => (window as unknown as { __pwned?: unknown }).__pwned);

    beforeAll(async () => {
      writeFileSync(file, hostilePlanText());
      ({ page, errors } = await app.openPage({ bypassCSP: true }));
      expect(await injected()).toEqual([]); // the app's own page has none of these elements
      await openFile(page, file);
      await page.waitForFunction(() => document.querySelector('[data-testid=doc-name]')?.textContent?.includes('hostile-names.plan.json'), undefined, {
        timeout: HANG_GUARD_MS,
      });
      await page.waitForFunction(() => document.querySelectorAll('[data-testid=budget-table] tbody tr.row').length > 3);
      await page.waitForTimeout(300); // let every view (scene labels, timeline) draw the new document
    });

    it('opens the plan, with its names as the data says', async () => {
      const plan = await page.evaluate(
        () => (window as unknown as { waymarkDebug: { session: { doc: { get(): { plan: { name: string } } } } } }).waymarkDebug.session.doc.get().plan.name,
      );
      expect(plan).toBe(HOSTILE.plan);
    });

    it('System view: body labels and the focus list show the markup as text', async () => {
      const labels = await texts('.scene-label');
      for (const name of [HOSTILE.star, HOSTILE.tessel, HOSTILE.ochre, HOSTILE.moravel]) expect(labels, name).toContain(name);
      expect(labels).toContain(HOSTILE.vehicle); // the ship's label
      // A moon's label shows once the view is close enough to tell it from its planet: focus on it.
      const quill = await page
        .locator('[data-testid=focus] option')
        .evaluateAll((els, name) => (els as HTMLOptionElement[]).find((o) => o.textContent?.trim() === name)?.value, HOSTILE.quill);
      expect(quill).toBeTruthy();
      await page.selectOption('[data-testid=focus]', quill!);
      await page.click('button[title="Frame the focused object"]');
      await page.waitForFunction((name) => Array.from(document.querySelectorAll('.scene-label')).some((e) => e.textContent === name), HOSTILE.quill, {
        timeout: HANG_GUARD_MS,
      });
      const focus = await texts('[data-testid=focus] option');
      for (const name of [HOSTILE.star, HOSTILE.tessel, HOSTILE.ochre])
        expect(
          focus.some((t) => t.trim() === name),
          name,
        ).toBe(true);
      await page.locator('[data-testid=system-canvas]').screenshot({ path: `${OUT}sec-01-system-labels.png` });
      await page.selectOption('[data-testid=focus]', 'body:0');
    });

    it('Plan editor: plan, vehicle, stage and burn names are plain field values', async () => {
      const names = await values('.card input.name');
      for (const name of [HOSTILE.departure, HOSTILE.midCourse, HOSTILE.capture, HOSTILE.plane]) expect(names, name).toContain(name);
      expect(await page.locator(`.card[aria-label="Burn ${HOSTILE.departure.replace(/"/g, '\\"')}"]`).count()).toBe(1);
      expect(await page.inputValue('input[data-path="name"]')).toBe(HOSTILE.plan);
      expect(await page.inputValue('input[data-path="vehicle.name"]')).toBe(HOSTILE.vehicle);
      expect(await values('input.stage-name')).toContain(HOSTILE.stage);
      const bodyOptions = await texts('option');
      expect(bodyOptions).toContain(HOSTILE.tessel);
    });

    it('Budget: burn names in the table and the target name as text', async () => {
      const rows = await texts('[data-testid=budget-table] tbody tr.row');
      for (const name of [HOSTILE.departure, HOSTILE.midCourse, HOSTILE.capture, HOSTILE.plane])
        expect(
          rows.some((r) => r.includes(name)),
          name,
        ).toBe(true);
      expect(await page.textContent('[data-testid=target] strong')).toBe(HOSTILE.ochre);
    });

    it('Timeline: burn tooltips and SOI spans carry the names as text', async () => {
      const tips = await texts('.timeline-svg g.burn > title');
      for (const name of [HOSTILE.departure, HOSTILE.midCourse, HOSTILE.capture])
        expect(
          tips.some((t) => t.startsWith(`${name}:`)),
          name,
        ).toBe(true);
      const spans = await texts('.timeline-svg g.soi text');
      expect(spans.some((t) => t === HOSTILE.tessel || t === HOSTILE.star || t === HOSTILE.ochre)).toBe(true);
      expect(await page.textContent('[data-testid=timeline]')).toContain(HOSTILE.ochre); // "to <target>" readout
    });

    it('Windows: the body lists and the window list show names as text', async () => {
      await page.click('[data-tab=windows]');
      const from = await texts('[data-testid=win-from] option');
      const to = await texts('[data-testid=win-to] option');
      expect(from).toContain(HOSTILE.tessel);
      expect(to).toContain(HOSTILE.ochre);
      await page.selectOption('[data-testid=win-grid]', '60');
      await page.click('[data-testid=win-compute]');
      await page.waitForSelector('[data-testid=windows-list] tr[data-window]', { timeout: HANG_GUARD_MS });
      expect(await page.locator('[data-testid=windows-list] tr[data-window]').count()).toBeGreaterThan(0);
      await page.screenshot({ path: `${OUT}sec-02-windows.png` });
      await page.click('[data-tab=system]');
    });

    it('no element was made from any name, and no handler in them ran', async () => {
      expect(await injected()).toEqual([]);
      expect(await pwned()).toBeUndefined();
      const html = await page.content();
      // The markup is in the page only as text (escaped), never as a tag.
      expect(html).not.toContain('<img src="x"');
      expect(html).not.toContain('<b>bold</b>');
      expect(html).toContain('&lt;b&gt;bold&lt;/b&gt;');
      await page.screenshot({ path: `${OUT}sec-03-hostile-names.png` });
      expect(errors).toEqual([]);
    });
  });
});
