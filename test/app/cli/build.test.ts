/**
 * The package as a user installs it (slow: it builds and packs the package, about half a minute
 * on two cores). `npm pack` (its prepack builds dist/cli and dist/lib with app/cli/build.ts),
 * the tarball installed offline in a temporary folder, then, with plain node and no tsx to be
 * found from that folder: the README's example script, the installed `waymark` bin, and a
 * porkchop grid on two worker threads started from the built files. Each answer is compared
 * with the same computation run here from the TypeScript sources (a bad file's report with the
 * command line run from the sources).
 */
import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { evaluate } from '../../../core/conic/index.ts';
import { parsePlanFile, parseSystemFile } from '../../../core/io/index.ts';
import { computePorkchop, gridMinimum } from '../../../core/search/porkchop.ts';
import type { PorkchopRequest } from '../../../core/search/index.ts';

const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
/** The environment without the npm_* variables of an enclosing `npm test` (they would steer the inner npm). */
function cleanEnv(): NodeJS.ProcessEnv {
  return Object.fromEntries(Object.entries(process.env).filter(([k]) => !k.toLowerCase().startsWith('npm_')));
}

function npm(args: string[], cwd: string): string {
  return execFileSync('npm', args, { cwd, env: cleanEnv(), encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'], timeout: 240_000 });
}

function node(args: string[], cwd: string): { code: number | null; stdout: string; stderr: string } {
  // the timeout is a hang guard, not a speed check
  const r = spawnSync(process.execPath, args, { cwd, env: cleanEnv(), encoding: 'utf8', timeout: 240_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The README's example script (the ```js block that starts with `// pipeline.mjs`). */
function readmeExample(): string {
  const m = /```js\n(\/\/ pipeline\.mjs[\s\S]*?)```/.exec(readFileSync(join(ROOT, 'README.md'), 'utf8'));
  if (!m) throw new Error('README.md has no ```js block starting with "// pipeline.mjs"');
  return m[1];
}

describe('the packed package, installed (slow)', () => {
  it('installs offline with no run-time dependency; the README example, the bin and the workers run on plain node without tsx', () => {
    const tmp = mkdtempSync(join(tmpdir(), 'waymark-pack-'));
    try {
      npm(['pack', '--pack-destination', tmp, '--silent'], ROOT);
      const tarball = readdirSync(tmp).find((f) => f.endsWith('.tgz'));
      expect(tarball).toBeDefined();
      const inst = join(tmp, 'inst');
      mkdirSync(inst);
      writeFileSync(join(inst, 'package.json'), JSON.stringify({ name: 'pipeline', private: true, type: 'module' }));
      npm(['install', '--offline', '--no-audit', '--no-fund', '--ignore-scripts', join(tmp, tarball!)], inst);

      // nothing but the package itself was installed, and tsx cannot be found from here
      const installed = JSON.parse(readFileSync(join(inst, 'node_modules/waymark/package.json'), 'utf8')) as { dependencies?: object };
      expect(Object.keys(installed.dependencies ?? {})).toEqual([]);
      expect(readdirSync(join(inst, 'node_modules')).filter((f) => !f.startsWith('.'))).toEqual(['waymark']);
      const req = createRequire(join(inst, 'package.json'));
      expect(() => req.resolve('tsx')).toThrow();
      expect(() => req.resolve('waymark/package.json')).not.toThrow();

      // the demo plan and its system, copied beside the script as a pipeline keeps them
      const work = join(inst, 'work');
      cpSync(join(inst, 'node_modules/waymark/assets/plans'), join(work, 'plans'), { recursive: true });
      cpSync(join(inst, 'node_modules/waymark/assets/systems'), join(work, 'systems'), { recursive: true });
      const planPath = join(work, 'plans/tessel-to-ochre.plan.json');
      const system = parseSystemFile(readFileSync(join(ROOT, 'assets/systems/ilmar.system.json'), 'utf8')).system;
      const plan = parsePlanFile(readFileSync(join(ROOT, 'assets/plans/tessel-to-ochre.plan.json'), 'utf8'), { system }).plan;
      const budget = evaluate(system, plan).budget;

      // the README example, with plain node: the same budget as the sources give here
      writeFileSync(join(inst, 'pipeline.mjs'), readmeExample());
      const ex = node(['pipeline.mjs', planPath], inst);
      expect(ex.stderr).toBe('');
      expect(ex.code).toBe(0);
      const out = JSON.parse(ex.stdout) as { plan: string; totalDv_mps: number; margin_mps: number; nbody: string };
      expect(out.plan).toBe(plan.name);
      expect(out.totalDv_mps).toBe(budget.total);
      expect(out.margin_mps).toBe(budget.margin);
      expect(['done', 'impact']).toContain(out.nbody);
      const csv = readFileSync(join(work, 'plans/tessel-to-ochre.burns.csv'), 'utf8').trim().split('\n');
      expect(csv).toHaveLength(budget.rows.length + 1);
      expect(readFileSync(join(work, 'plans/tessel-to-ochre.oem'), 'utf8')).toMatch(/^CCSDS_OEM_VERS\s*=\s*2\.0\n/);

      // the installed bin: a plan that holds exits 0 with the same budget
      const bin = join(inst, 'node_modules/.bin/waymark');
      const check = node([bin, 'check', planPath, '--json'], inst);
      expect(check.code).toBe(0);
      const checked = JSON.parse(check.stdout) as { budget: { total: number; margin: number } };
      expect(checked.budget.total).toBe(budget.total);
      expect(checked.budget.margin).toBe(budget.margin);
      // a usage error exits 2, as from the sources
      expect(node([bin, 'check'], inst).code).toBe(2);
      // a file that breaks the schema: the validators generated at build time report what the
      // sources' run-time ajv reports, word for word
      const bad = JSON.parse(readFileSync(planPath, 'utf8')) as { events: { dv_mps?: unknown }[]; vehicle: { stages: { isp_s: number }[] } };
      bad.events[0].dv_mps = 'x';
      bad.vehicle.stages[0].isp_s = -3;
      const badPath = join(work, 'plans/bad.plan.json');
      writeFileSync(badPath, JSON.stringify(bad));
      const built = node([bin, 'check', badPath], inst);
      const sources = node([join(ROOT, 'node_modules/tsx/dist/cli.mjs'), join(ROOT, 'app/cli/main.ts'), 'check', badPath], inst);
      expect(built.code).toBe(2);
      expect(built.stderr).toMatch(/dv_mps/);
      expect(built.stderr).toBe(sources.stderr);

      // a grid on two workers started from the built files is the grid computed here in one thread
      const sys = join(work, 'systems/ilmar.system.json');
      const win = node([bin, 'windows', '--system', sys, '--from', 'tessel', '--to', 'ochre', '--grid', '24x16', '--workers', '2', '--json'], inst);
      expect(win.stderr).toBe('');
      expect(win.code).toBe(0);
      const w = JSON.parse(win.stdout) as { request: PorkchopRequest; grid: { min: { i: number; j: number; dvTotal: number } | null; unsolved: number } };
      const grid = computePorkchop(system, w.request);
      const min = gridMinimum(grid, 'total');
      expect(min).not.toBeNull();
      expect(w.grid.min).toMatchObject({ i: min!.i, j: min!.j });
      // the grid's planes hold float32; the command line prints the cell re-evaluated in double
      expect(Math.fround(w.grid.min!.dvTotal)).toBe(min!.value);
      expect(w.grid.unsolved).toBe(grid.unsolved);
    } finally {
      rmSync(tmp, { recursive: true, force: true });
    }
  });
});
