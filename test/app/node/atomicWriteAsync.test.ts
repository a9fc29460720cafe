/**
 * The async atomic save of app/node/files.ts (the desktop app's main process saves through it):
 * the same steps, backup and messages as the synchronous `atomicWriteFile`.
 * (These checks moved here from test/app/main/atomicWrite.test.ts when the duplicate
 * implementation in app/main was removed.)
 */
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import * as fsp from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { FileError, atomicWriteFileAsync, backupPath } from '../../../app/node/files.ts';

const work = mkdtempSync(join(tmpdir(), 'waymark-atomic-async-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));
let n = 0;
const dir = () => {
  const d = join(work, `case-${n++}`);
  mkdirSync(d);
  return d;
};
const tmpFiles = (d: string) => readdirSync(d).filter((f) => f.endsWith('.tmp'));

describe('atomicWriteFileAsync', () => {
  it('writes a new file and leaves no temporary file behind', async () => {
    const d = dir();
    const p = join(d, 'a.plan.json');
    await atomicWriteFileAsync(p, 'hello');
    expect(readFileSync(p, 'utf8')).toBe('hello');
    expect(readdirSync(d)).toEqual(['a.plan.json']);
  });

  it('keeps the previous version as a backup', async () => {
    const d = dir();
    const p = join(d, 'a.plan.json');
    writeFileSync(p, 'v1');
    await atomicWriteFileAsync(p, 'v2');
    expect(readFileSync(p, 'utf8')).toBe('v2');
    expect(readFileSync(backupPath(p), 'utf8')).toBe('v1');
    expect(readdirSync(d).sort()).toEqual(['a.plan.json', 'a.plan.json.bak']);
    await atomicWriteFileAsync(p, 'v3');
    expect(readFileSync(backupPath(p), 'utf8')).toBe('v2');
  });

  it('backup: false keeps no backup; progress reaches the total', async () => {
    const d = dir();
    const p = join(d, 'a.txt');
    await atomicWriteFileAsync(p, 'one');
    const seen: number[] = [];
    await atomicWriteFileAsync(p, 'x'.repeat(10), { backup: false, chunkSize: 3, onProgress: (w) => seen.push(w) });
    expect(readdirSync(d)).toEqual(['a.txt']);
    expect(seen).toEqual([3, 6, 9, 10]);
  });

  it('leaves the original intact when a rename fails (disk full)', async () => {
    const d = dir();
    const p = join(d, 'a.plan.json');
    writeFileSync(p, 'original');
    const failing = { ...fsp, rename: async () => Promise.reject(new Error('disk full')) };
    await expect(atomicWriteFileAsync(p, 'new', {}, failing)).rejects.toThrow('disk full');
    expect(readFileSync(p, 'utf8')).toBe('original');
    expect(tmpFiles(d)).toEqual([]);
  });

  it('leaves the original intact when only the final rename fails, and says the file is unchanged', async () => {
    const d = dir();
    const p = join(d, 'a.plan.json');
    writeFileSync(p, 'original');
    let calls = 0;
    const failing = {
      ...fsp,
      rename: async (a: string, b: string) => {
        if (++calls === 2) throw Object.assign(new Error('no space left'), { code: 'ENOSPC' });
        return fsp.rename(a, b);
      },
    };
    await expect(atomicWriteFileAsync(p, 'new', {}, failing as never)).rejects.toThrow(/the disk is full \(ENOSPC\); .*a\.plan\.json is unchanged/);
    expect(readFileSync(p, 'utf8')).toBe('original');
    expect(tmpFiles(d)).toEqual([]);
  });

  it('a target that is a folder, or a folder that does not exist: FileError saying why', async () => {
    const d = dir();
    const p = join(d, 'plan.json');
    mkdirSync(p);
    await expect(atomicWriteFileAsync(p, 'x')).rejects.toThrow(FileError);
    await expect(atomicWriteFileAsync(p, 'x')).rejects.toThrow(/is a folder, not a file/);
    expect(statSync(p).isDirectory()).toBe(true);
    await expect(atomicWriteFileAsync(join(d, 'nope', 'plan.json'), 'x')).rejects.toThrow(/the folder .*nope does not exist \(ENOENT\)/);
    expect(tmpFiles(d)).toEqual([]);
  });

  it('writes UTF-8 text exactly (Δv, °)', async () => {
    const d = dir();
    const p = join(d, 'u.json');
    await atomicWriteFileAsync(p, '{"name":"Δv 3° — ok"}\n');
    expect(readFileSync(p, 'utf8')).toBe('{"name":"Δv 3° — ok"}\n');
  });
});
