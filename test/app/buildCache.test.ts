/**
 * Reusing a build: the decision from the build's presence and the stored and current input
 * hashes, and the hash itself over a scratch tree (a changed, added or renamed input changes it;
 * an untouched tree gives the same one; node_modules and dist are not inputs).
 */
import { mkdirSync, mkdtempSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { decideBuild, inputsHash, readStamp, writeStamp } from '../../app/buildCache.ts';

describe('decideBuild', () => {
  it('builds when there is no build, even with a matching stamp', () => {
    expect(decideBuild(false, 'abc', 'abc')).toBe('build');
    expect(decideBuild(false, null, 'abc')).toBe('build');
  });
  it('builds when the build has no stamp (made by an older start)', () => {
    expect(decideBuild(true, null, 'abc')).toBe('build');
  });
  it('rebuilds when the inputs changed', () => {
    expect(decideBuild(true, 'abc', 'abd')).toBe('rebuild');
  });
  it('reuses when the inputs are unchanged', () => {
    expect(decideBuild(true, 'abc', 'abc')).toBe('reuse');
  });
});

describe('inputsHash and the stamp', () => {
  let dir = '';
  const tree = () => {
    dir = mkdtempSync(join(tmpdir(), 'waymark-cache-'));
    mkdirSync(join(dir, 'src/sub'), { recursive: true });
    mkdirSync(join(dir, 'src/node_modules'), { recursive: true });
    writeFileSync(join(dir, 'src/a.ts'), 'export const a = 1;\n');
    writeFileSync(join(dir, 'src/sub/b.ts'), 'export const b = 2;\n');
    writeFileSync(join(dir, 'lock.json'), '{}\n');
    return dir;
  };
  const INPUTS = ['src', 'lock.json', 'missing.txt'];
  afterEach(() => {
    if (dir) rmSync(dir, { recursive: true, force: true });
    dir = '';
  });

  it('is the same for an untouched tree and ignores node_modules', () => {
    const d = tree();
    const h = inputsHash(d, INPUTS);
    expect(h).toMatch(/^[0-9a-f]{64}$/);
    writeFileSync(join(d, 'src/node_modules/x.js'), 'junk');
    expect(inputsHash(d, INPUTS)).toBe(h);
  });
  it('changes when a file changes, is added or is renamed', () => {
    const d = tree();
    const h0 = inputsHash(d, INPUTS);
    writeFileSync(join(d, 'src/sub/b.ts'), 'export const b = 3;\n');
    const h1 = inputsHash(d, INPUTS);
    expect(h1).not.toBe(h0);
    writeFileSync(join(d, 'src/c.ts'), '');
    const h2 = inputsHash(d, INPUTS);
    expect(h2).not.toBe(h1);
    renameSync(join(d, 'src/c.ts'), join(d, 'src/d.ts'));
    expect(inputsHash(d, INPUTS)).not.toBe(h2);
  });
  it('round-trips through the stamp file, which reads as null when absent', () => {
    const d = tree();
    expect(readStamp(d)).toBeNull();
    const h = inputsHash(d, INPUTS);
    writeStamp(d, h);
    expect(decideBuild(true, readStamp(d), inputsHash(d, INPUTS))).toBe('reuse');
    writeFileSync(join(d, 'lock.json'), '{"x":1}\n');
    expect(decideBuild(true, readStamp(d), inputsHash(d, INPUTS))).toBe('rebuild');
  });
});
