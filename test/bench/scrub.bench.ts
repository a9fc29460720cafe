/**
 * Desktop-app benchmarks in headless Debian chromium (software WebGL), on the demo plan, against
 * the built renderer served in browser mode:
 * - scrub: cursor move → finished frame. "JS" is the scene's own work per frame (positions for
 *   the cursor time + three.js render + labels); "move → frame" is the wall time from setting the
 *   cursor to the end of the frame that shows it (includes waiting for the next animation
 *   frame); "+ GPU finish" renders synchronously and waits for the GPU (a 1-pixel readPixels).
 *   Reference: an empty requestAnimationFrame round trip in the same page.
 * - edit → updated views: "+ Burn" clicked → plan re-evaluated, budget, timeline and 3D scene
 *   rebuilt and drawn. Reference: the same rAF round trip.
 * - porkchop 200 × 200 and 500 × 500 in the Windows view's workers, warm click → windows
 *   listed (appPorkchop.ts). Reference: the same job (grid + windows) in this Node process,
 *   run between the page's clicks.
 * Run: npx tsx -e "import('./test/bench/scrub.bench.ts').then(m=>m.run())"
 */
import { existsSync } from 'node:fs';
import { chromium } from 'playwright-core';
import config from '../../electron.config.ts';
import { buildRenderer } from '../../app/renderer/build/buildRenderer.ts';
import { serveStatic } from '../../app/renderer/build/serve.ts';
import { GOAL as PORKCHOP_GOAL, porkchopInApp } from './appPorkchop.ts';
import { printTable } from './table.ts';
import { quantiles, traceClickCpu } from './traceCpu.ts';

const CHROMIUM = '/usr/bin/chromium';
const ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

// In-page code is passed as text (the bench runner's transpiler would add helpers the page lacks).
const SCRUB = (n: number, focus: string) => `(async () => {
  const { session, scene } = window.waymarkDebug;
  const raf = () => new Promise((r) => requestAnimationFrame(r));
  const q = (a) => { const s = a.slice().sort((x, y) => x - y); return [s[Math.floor(s.length / 2)], s[Math.min(s.length - 1, Math.ceil(s.length * 0.95) - 1)]]; };
  ${focus === 'ship' ? "scene.setFocus({ kind: 'ship' }); await raf(); await raf();" : ''}
  const c = session.cursor.get();
  const ref = [];
  for (let i = 0; i < 120; i++) { const a = performance.now(); await raf(); ref.push(performance.now() - a); }
  let frameEnd = 0;
  const prev = scene.onFrame;
  scene.onFrame = (st) => { frameEnd = performance.now(); prev && prev(st); };
  const js = [], wall = [], gpu = [];
  const gl = scene.renderer.getContext(); const px = new Uint8Array(4);
  for (let i = 0; i < ${n}; i++) {
    const t = c.t0 + (c.t1 - c.t0) * ((i * 0.6180339887) % 1);
    const a = performance.now();
    session.cursor.set(t);
    await raf();
    wall.push(frameEnd - a);
    js.push(scene.stats.lastMs);
  }
  for (let i = 0; i < ${n}; i++) {
    const t = c.t0 + (c.t1 - c.t0) * ((i * 0.7548776662) % 1);
    await raf();
    const a = performance.now();
    scene.setTime(t);
    scene.renderNow();
    gl.readPixels(0, 0, 1, 1, gl.RGBA, gl.UNSIGNED_BYTE, px);
    gpu.push(performance.now() - a);
  }
  scene.onFrame = prev;
  return { ref: q(ref), js: q(js), wall: q(wall), gpu: q(gpu), iso: self.crossOriginIsolated };
})()`;

const EDIT = (n: number) => `(async () => {
  const { session, scene } = window.waymarkDebug;
  const raf = () => new Promise((r) => requestAnimationFrame(r));
  const q = (a) => { const s = a.slice().sort((x, y) => x - y); return [s[Math.floor(s.length / 2)], s[Math.min(s.length - 1, Math.ceil(s.length * 0.95) - 1)]]; };
  let frameEnd = 0;
  const prev = scene.onFrame;
  scene.onFrame = (st) => { frameEnd = performance.now(); prev && prev(st); };
  const add = document.querySelector('[data-action=add-burn]');
  const rows = () => document.querySelectorAll('[data-testid=budget-table] tbody tr.row').length;
  // end of the click's task and its microtasks (the store and Svelte updates): a message posted
  // from the click runs after them, before the next frame's rendering
  const ch = new MessageChannel();
  let taskEnd = 0;
  ch.port1.onmessage = () => { taskEnd = performance.now(); };
  const wall = [], evalMs = [], task = [];
  for (let i = 0; i < ${n}; i++) {
    const before = rows();
    await raf();
    const a = performance.now();
    add.click();
    ch.port2.postMessage(0);
    for (let k = 0; k < 6 && (rows() !== before + 1 || frameEnd < a); k++) await raf();
    if (rows() !== before + 1 || frameEnd < a) throw new Error('views not updated within six frames');
    wall.push(frameEnd - a);
    task.push(taskEnd - a);
    evalMs.push(session.evaluation.get().ms);
    session.undo();
    await raf();
  }
  scene.onFrame = prev;
  ch.port1.close();
  return { wall: q(wall), evalMs: q(evalMs), task: q(task) };
})()`;

export async function run(): Promise<void> {
  if (!existsSync(CHROMIUM)) {
    console.log(`  (skipped: ${CHROMIUM} not found; apt-get install -y chromium)`);
    return;
  }
  const root = await buildRenderer();
  const served = await serveStatic({ root, host: '127.0.0.1', port: 0, contentSecurityPolicy: config.security.contentSecurityPolicy });
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ARGS });
  try {
    const page = await (await browser.newContext({ viewport: { width: 1440, height: 900 } })).newPage();
    await page.goto(served.url);
    await page.waitForSelector('[data-testid=budget-table] tbody tr.row', { timeout: 20_000 });
    await page.waitForTimeout(300);

    type Q = [number, number];
    const whole = (await page.evaluate(SCRUB(400, 'star'))) as { ref: Q; js: Q; wall: Q; gpu: Q; iso: boolean };
    const ship = (await page.evaluate(SCRUB(400, 'ship'))) as { ref: Q; js: Q; wall: Q; gpu: Q; iso: boolean };
    const edit = (await page.evaluate(EDIT(40))) as { wall: Q; evalMs: Q; task: Q };
    // the same edits again, traced: their main-thread CPU time (the wall time above waits for a core on a loaded machine)
    const { cpu: editCpu } = await traceClickCpu(browser, page, () => page.evaluate(EDIT(20)));
    const cpuClick = quantiles(editCpu.click);
    const cpuToFrame = quantiles(editCpu.toFrame);

    // Porkchop in the Windows view's workers against the same job in this Node process (appPorkchop.ts).
    const pork = await porkchopInApp(page);

    console.log(
      `  chromium headless, software WebGL (SwiftShader), 1440×900 window; timer ${whole.iso ? 'cross-origin isolated (5 µs)' : '100 µs'} resolution`,
    );
    printTable(
      ['figure', 'median ms', 'p95 ms', 'reference', 'ref median ms', 'ref p95 ms', 'ratio (median)'],
      [
        [
          'scrub JS per frame, whole plan (400 moves)',
          whole.js[0],
          whole.js[1],
          'empty rAF round trip',
          whole.ref[0],
          whole.ref[1],
          whole.js[0] / whole.ref[0],
        ],
        ['scrub move → frame, whole plan', whole.wall[0], whole.wall[1], 'empty rAF round trip', whole.ref[0], whole.ref[1], whole.wall[0] / whole.ref[0]],
        ['scrub JS + GPU finish, whole plan', whole.gpu[0], whole.gpu[1], 'empty rAF round trip', whole.ref[0], whole.ref[1], whole.gpu[0] / whole.ref[0]],
        ['scrub JS per frame, ship focus', ship.js[0], ship.js[1], 'empty rAF round trip', ship.ref[0], ship.ref[1], ship.js[0] / ship.ref[0]],
        ['scrub move → frame, ship focus', ship.wall[0], ship.wall[1], 'empty rAF round trip', ship.ref[0], ship.ref[1], ship.wall[0] / ship.ref[0]],
        ['scrub JS + GPU finish, ship focus', ship.gpu[0], ship.gpu[1], 'empty rAF round trip', ship.ref[0], ship.ref[1], ship.gpu[0] / ship.ref[0]],
        [
          'edit (+ Burn) → updated views (40 edits)',
          edit.wall[0],
          edit.wall[1],
          'empty rAF round trip',
          whole.ref[0],
          whole.ref[1],
          edit.wall[0] / whole.ref[0],
        ],
        ['  of which plan evaluation', edit.evalMs[0], edit.evalMs[1], '', '', '', ''],
        ['  of which click task (evaluation, stores, Svelte updates)', edit.task[0], edit.task[1], '', '', '', ''],
        [
          'edit: main-thread CPU, click task (with its style, layout, paint; 20 edits traced)',
          cpuClick[0],
          cpuClick[1],
          'empty rAF round trip',
          whole.ref[0],
          whole.ref[1],
          cpuClick[0] / whole.ref[0],
        ],
        [
          'edit: main-thread CPU, click → scene frame drawn',
          cpuToFrame[0],
          cpuToFrame[1],
          'empty rAF round trip',
          whole.ref[0],
          whole.ref[1],
          cpuToFrame[0] / whole.ref[0],
        ],
        ...pork,
      ],
    );
    console.log(
      `  targets: scrub p95 < 16 ms (one frame at 60 Hz); edit → views p95 < 33 ms (two frames); porkchop click → list ≤ ${PORKCHOP_GOAL}× the same job in Node`,
    );
  } finally {
    await browser.close();
    await served.close();
  }
}
