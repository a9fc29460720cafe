/**
 * `npm start` → first 3D frame, on a built tree, in browser mode (WAYMARK_BROWSER=1) and headless
 * Debian chromium (software WebGL), as a user whose browser is already open would see it:
 * - the renderer build is made first when its inputs changed (app/buildCache.ts), so the start
 *   reuses it; a run whose start rebuilt anyway (a source edited meanwhile) is counted apart;
 * - `npm start` is spawned (its own process group, ended after each run); the page is opened as
 *   soon as the URL is printed; stages: process start → server ready (URL printed) → page
 *   loaded (DOMContentLoaded) → first 3D frame drawn (the page's `waymark:first-3d-frame` mark,
 *   at the end of the first render call) → shown (the next animation frame, which waits for the
 *   compositor to take the frame: on a software rasteriser the first frame's shaders compile
 *   there).
 * Reference: the goal of 3 s (issue 16). Absolute times depend on the machine's load; the
 * stages say where the time goes.
 * Run: npm run bench -- startup
 */
import { type ChildProcess, spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import config from '../../electron.config.ts';
import { decideBuild, inputsHash, readStamp, RENDERER_INPUTS } from '../../app/buildCache.ts';
import { printTable } from './table.ts';

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
const repo = fileURLToPath(new URL('../..', import.meta.url));
const GOAL_S = 3;
const RUNS = 3;
/** Hang guard for one start (a rebuild takes about 10 s; far above it). */
const START_GUARD_MS = 120_000;

/** Records, in the page, the time of the first animation frame after the first 3D frame's mark. */
const SHOWN = `(() => {
  const loop = () => {
    if (performance.getEntriesByName('waymark:first-3d-frame').length > 0) { window.__waymarkShown = performance.now(); return; }
    requestAnimationFrame(loop);
  };
  requestAnimationFrame(loop);
})();`;

interface Run {
  /** ms from spawning `npm start`. */
  ready: number;
  loaded: number;
  frame: number;
  shown: number;
  /** What the start process printed as its own ready time (from its process start), s. */
  saidReady: string;
  rebuilt: boolean;
}

/** Resolves with the URL once the start process prints it (and whether it built first). */
function waitForUrl(child: ChildProcess): Promise<{ url: string; output: string }> {
  return new Promise((resolve, reject) => {
    let output = '';
    const guard = setTimeout(() => reject(new Error(`npm start printed no URL within ${START_GUARD_MS} ms:\n${output}`)), START_GUARD_MS);
    const onData = (b: Buffer) => {
      output += b.toString();
      const m = /Waymark is at (http:\/\/\S+)/.exec(output);
      if (m) {
        clearTimeout(guard);
        resolve({ url: m[1], output });
      }
    };
    child.stdout?.on('data', onData);
    child.stderr?.on('data', onData);
    child.on('exit', (code) => {
      clearTimeout(guard);
      reject(new Error(`npm start exited (${code}) before printing its URL:\n${output}`));
    });
  });
}

/** Ends the start process and everything it started (its process group), and waits for it. */
async function stop(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.pid === undefined) return;
  const exited = new Promise<void>((r) => child.once('exit', () => r()));
  try {
    process.kill(-child.pid, 'SIGTERM');
  } catch {
    child.kill('SIGTERM');
  }
  const t = setTimeout(() => {
    try {
      process.kill(-(child.pid as number), 'SIGKILL');
    } catch {
      // already gone
    }
  }, 5000);
  await exited;
  clearTimeout(t);
}

export async function run(): Promise<void> {
  if (!existsSync(CHROMIUM)) {
    console.log(`  (skipped: ${CHROMIUM} not found; apt-get install -y chromium)`);
    return;
  }
  const outDir = `${repo}${config.build.rendererDir}`;
  const hash = inputsHash(repo, RENDERER_INPUTS);
  if (decideBuild(existsSync(`${outDir}/index.html`), readStamp(outDir), hash) !== 'reuse') {
    const { buildRenderer } = await import('../../app/renderer/build/buildRenderer.ts');
    await buildRenderer();
  }
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ARGS });
  const runs: Run[] = [];
  try {
    for (let i = 0; i < RUNS; i++) {
      const context = await browser.newContext({ viewport: { width: config.window.width, height: config.window.height } });
      await context.addInitScript(SHOWN);
      const page = await context.newPage();
      const t0 = performance.now();
      const child = spawn('npm', ['start'], {
        cwd: repo,
        env: { ...process.env, WAYMARK_BROWSER: '1' },
        stdio: ['ignore', 'pipe', 'pipe'],
        detached: true,
      });
      try {
        const { url, output } = await waitForUrl(child);
        const ready = performance.now() - t0;
        const goneAt = performance.now();
        await page.goto(url);
        await page.waitForFunction(() => (window as unknown as { __waymarkShown?: number }).__waymarkShown !== undefined, null, {
          timeout: START_GUARD_MS,
        });
        // page times are from the page's time origin (the navigation start), at `goneAt`
        const p = await page.evaluate(() => {
          const nav = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming;
          return {
            loaded: nav.domContentLoadedEventEnd,
            frame: performance.getEntriesByName('waymark:first-3d-frame')[0].startTime,
            shown: (window as unknown as { __waymarkShown: number }).__waymarkShown,
          };
        });
        const base = goneAt - t0;
        runs.push({
          ready,
          loaded: base + p.loaded,
          frame: base + p.frame,
          shown: base + p.shown,
          saidReady: /ready in ([\d.]+) s/.exec(output)?.[1] ?? '?',
          rebuilt: /[Bb]uilding|rebuilding/.test(output),
        });
      } finally {
        await stop(child);
        await context.close();
      }
    }
  } finally {
    await browser.close();
  }
  const counted = runs.filter((r) => !r.rebuilt);
  const rebuilt = runs.length - counted.length;
  if (counted.length === 0) {
    console.log(`  every start rebuilt the renderer (sources edited during the benchmark): no figure`);
    return;
  }
  const med = (f: (r: Run) => number) => {
    const s = counted.map(f).sort((a, b) => a - b);
    return s[Math.floor(s.length / 2)];
  };
  const s = (ms: number) => ms / 1000;
  console.log(
    `  headless chromium, software WebGL, ${config.window.width}×${config.window.height}; median of ${counted.length} starts${rebuilt ? ` (${rebuilt} more rebuilt the renderer: not counted)` : ''}; the start process said "ready in ${counted.map((r) => r.saidReady).join(', ')} s" (from its own process start)`,
  );
  printTable(
    ['figure', 'median s', 'stage s', 'reference', 'ref s', 'ratio'],
    [
      ['npm start → server ready (URL printed)', s(med((r) => r.ready)), s(med((r) => r.ready)), '', '', ''],
      ['  → page loaded (DOMContentLoaded)', s(med((r) => r.loaded)), s(med((r) => r.loaded - r.ready)), '', '', ''],
      [
        'npm start → first 3D frame drawn (built tree)',
        s(med((r) => r.frame)),
        s(med((r) => r.frame - r.loaded)),
        'goal',
        GOAL_S,
        s(med((r) => r.frame)) / GOAL_S,
      ],
      ['  → shown (next animation frame)', s(med((r) => r.shown)), s(med((r) => r.shown - r.frame)), 'goal', GOAL_S, s(med((r) => r.shown)) / GOAL_S],
    ],
  );
}
