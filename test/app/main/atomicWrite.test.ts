import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import * as fsp from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BACKUP_SUFFIX, atomicWriteFile } from '../../../app/main/atomicWrite.ts';

const dir = () => mkdtempSync(join(tmpdir(), 'waymark-atomic-'));

describe('atomicWriteFile', () => {
  it('writes a new file and leaves no temporary file behind', async () => {
    const d = dir();
    const p = join(d, 'a.plan.json');
    await atomicWriteFile(p, 'hello');
    expect(readFileSync(p, 'utf8')).toBe('hello');
    expect(readdirSync(d)).toEqual(['a.plan.json']);
  });

  it('keeps the previous version as a backup', async () => {
    const d = dir();
    const p = join(d, 'a.plan.json');
    writeFileSync(p, 'v1');
    await atomicWriteFile(p, 'v2');
    expect(readFileSync(p, 'utf8')).toBe('v2');
    expect(readFileSync(p + BACKUP_SUFFIX, 'utf8')).toBe('v1');
    expect(readdirSync(d).sort()).toEqual(['a.plan.json', `a.plan.json${BACKUP_SUFFIX}`]);
  });

  it('leaves the original intact when the final rename fails', async () => {
    const d = dir();
    const p = join(d, 'a.plan.json');
    writeFileSync(p, 'original');
    const failing = { ...fsp, rename: async () => Promise.reject(new Error('disk full')) };
    await expect(atomicWriteFile(p, 'new', failing)).rejects.toThrow('disk full');
    expect(readFileSync(p, 'utf8')).toBe('original');
    expect(readdirSync(d).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('writes UTF-8 text exactly (Δv, °)', async () => {
    const d = dir();
    const p = join(d, 'u.json');
    await atomicWriteFile(p, '{"name":"Δv 3° — ok"}\n');
    expect(readFileSync(p, 'utf8')).toBe('{"name":"Δv 3° — ok"}\n');
  });
});
