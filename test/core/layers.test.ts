/**
 * The layers of core/ (DESIGN.md): math ← integrate ← orbit ← system ← mission ← search ← io.
 * A layer imports only itself and the layers below it, and core/ imports no Node built-in,
 * no DOM-only module and no UI package, so it runs unchanged in the renderer, workers and the CLI.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const LAYERS = ['math', 'integrate', 'orbit', 'system', 'mission', 'search', 'io'];
const core = new URL('../../core/', import.meta.url).pathname;

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? files(p) : p.endsWith('.ts') ? [p] : [];
  });
}

const imports = (text: string): string[] => [...text.matchAll(/(?:import|export)[^'"]*?from\s+['"]([^'"]+)['"]/g)].map((m) => m[1]);

describe('core layering', () => {
  it('every layer imports only itself and lower layers', () => {
    const bad: string[] = [];
    for (const [level, layer] of LAYERS.entries()) {
      for (const f of files(join(core, layer))) {
        for (const spec of imports(readFileSync(f, 'utf8'))) {
          const m = /^\.\.\/([a-z]+)\//.exec(spec);
          if (m && LAYERS.indexOf(m[1]) > level) bad.push(`${f.slice(core.length)} imports ${spec}`);
        }
      }
    }
    expect(bad).toEqual([]);
  });

  it('imports no Node built-ins, DOM-only or UI packages', () => {
    const bad: string[] = [];
    for (const f of files(core)) {
      for (const spec of imports(readFileSync(f, 'utf8'))) {
        if (/^(node:|fs$|path$|os$|child_process|worker_threads|electron|svelte|three|d3)/.test(spec)) bad.push(`${f.slice(core.length)} imports ${spec}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it('the scan sees the imports it checks (it can fail)', () => {
    expect(imports("import { a } from '../mission/x.ts';\nexport type { b } from 'node:fs';")).toEqual(['../mission/x.ts', 'node:fs']);
  });
});
