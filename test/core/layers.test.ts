/**
 * The layers of core/ (DESIGN.md, DEVELOPERS.md):
 *   math ← integrate ← orbit ← system ← sky ← runtime ← dynamics ← plan ← conic ← nbody ← target ← gamestep ← handoff ← checks ← search ← survey ← route ← io.
 * A folder imports only itself and the folders below it, and another folder only through its
 * front door (index.ts); no module takes part in an import cycle; and core/ imports no Node
 * built-in, no DOM-only module and no UI package, so it runs unchanged in the renderer, workers
 * and the command line.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, normalize, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const LAYERS = [
  'math',
  'integrate',
  'orbit',
  'system',
  'sky',
  'runtime',
  'dynamics',
  'plan',
  'conic',
  'nbody',
  'target',
  'gamestep',
  'handoff',
  'checks',
  'search',
  'survey',
  'route',
  'io',
];
const core = new URL('../../core/', import.meta.url).pathname;

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? files(p) : p.endsWith('.ts') ? [p] : [];
  });
}

const imports = (text: string): string[] => [...text.matchAll(/(?:import|export)[^'"]*?from\s+['"]([^'"]+)['"]/g)].map((m) => m[1]);

/** Folder of core/ that a path lies in ('' outside core/). */
const folderOf = (p: string): string => relative(core, p).split('/')[0] ?? '';

/** Module-level import graph of core/ (relative imports only). */
function graph(): Map<string, string[]> {
  const g = new Map<string, string[]>();
  for (const f of files(core)) {
    const deps = imports(readFileSync(f, 'utf8'))
      .filter((s) => s.startsWith('.') && s.endsWith('.ts'))
      .map((s) => normalize(join(dirname(f), s)));
    g.set(f, deps);
  }
  return g;
}

/** Every cycle found by depth-first search, each as the list of modules around it. */
function cycles(g: Map<string, string[]>): string[][] {
  const state = new Map<string, 1 | 2>();
  const stack: string[] = [];
  const found: string[][] = [];
  const visit = (n: string): void => {
    state.set(n, 1);
    stack.push(n);
    for (const d of g.get(n) ?? []) {
      if (state.get(d) === 1) found.push(stack.slice(stack.indexOf(d)).map((p) => relative(core, p)));
      else if (!state.has(d)) visit(d);
    }
    stack.pop();
    state.set(n, 2);
  };
  for (const n of g.keys()) if (!state.has(n)) visit(n);
  return found;
}

describe('core layering', () => {
  it('core/ holds exactly the capability folders of the layer list, each with a front door', () => {
    const dirs = readdirSync(core).filter((d) => statSync(join(core, d)).isDirectory());
    expect(dirs.sort()).toEqual([...LAYERS].sort());
    for (const d of LAYERS) expect(existsSync(join(core, d, 'index.ts')), `core/${d}/index.ts`).toBe(true);
  });

  it('every folder imports only itself and lower folders', () => {
    const bad: string[] = [];
    for (const [level, layer] of LAYERS.entries()) {
      for (const f of files(join(core, layer))) {
        for (const spec of imports(readFileSync(f, 'utf8'))) {
          if (!spec.startsWith('.')) continue;
          const target = folderOf(normalize(join(dirname(f), spec)));
          if (LAYERS.indexOf(target) > level) bad.push(`${relative(core, f)} imports ${spec}`);
        }
      }
    }
    expect(bad).toEqual([]);
  });

  it('another folder is entered only through its front door (index.ts)', () => {
    const bad: string[] = [];
    for (const f of files(core)) {
      for (const spec of imports(readFileSync(f, 'utf8'))) {
        if (!spec.startsWith('.') || !spec.endsWith('.ts')) continue;
        const target = normalize(join(dirname(f), spec));
        if (!target.startsWith(core)) continue; // schema JSON under assets/ and the like
        if (folderOf(target) !== folderOf(f) && !target.endsWith('/index.ts')) bad.push(`${relative(core, f)} imports ${spec}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it('no module of core/ takes part in an import cycle', () => {
    expect(cycles(graph())).toEqual([]);
  });

  it('the schema declarations (zod, a development dependency) are never loaded at run time: only type imports reach them', () => {
    const declaring = files(core).filter((f) => /from ['"]zod['"]/.test(readFileSync(f, 'utf8')));
    expect(declaring.length).toBeGreaterThan(0); // the scan sees the declarations it guards
    const bad: string[] = [];
    for (const f of files(core)) {
      const text = readFileSync(f, 'utf8');
      for (const m of text.matchAll(/(import|export)(\s+type)?\s[^'"]*?from\s+['"]([^'"]+)['"]/g)) {
        if (m[2] || !m[3].startsWith('.')) continue;
        const target = normalize(join(dirname(f), m[3]));
        if (declaring.includes(target)) bad.push(`${relative(core, f)} loads ${m[3]}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it('imports no Node built-ins, DOM-only or UI packages', () => {
    const bad: string[] = [];
    for (const f of files(core)) {
      for (const spec of imports(readFileSync(f, 'utf8'))) {
        if (/^(node:|fs$|path$|os$|child_process|worker_threads|electron|svelte|three|d3)/.test(spec)) bad.push(`${relative(core, f)} imports ${spec}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it('the scans see what they check (they can fail)', () => {
    expect(imports("import { a } from '../plan/x.ts';\nexport type { b } from 'node:fs';")).toEqual(['../plan/x.ts', 'node:fs']);
    const g = new Map([
      ['a', ['b']],
      ['b', ['c']],
      ['c', ['a']],
      ['d', ['a']],
    ]);
    expect(cycles(g)).toHaveLength(1);
    expect(
      cycles(
        new Map([
          ['a', ['b']],
          ['b', []],
        ]),
      ),
    ).toEqual([]);
  });
});
