/**
 * Hostile paths against the one read and the one save of app/node/files.ts: FIFOs, devices,
 * symbolic links to them, folders, oversized files and a disk that never answers are refused
 * at once with a plain message, never read or written through; a save follows a symbolic link
 * to its regular file and keeps a copy (not a link) as the backup.
 *
 * No test waits on a clock: a FIFO read would block forever without the fix, so the vitest
 * time-out (HANG_GUARD) only turns such a hang into a failure; the fixed code answers at once.
 */
import { execFileSync } from 'node:child_process';
import {
  existsSync,
  linkSync,
  lstatSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  readdirSync,
  readlinkSync,
  rmSync,
  statSync,
  symlinkSync,
  truncateSync,
  writeFileSync,
} from 'node:fs';
import * as fsp from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { serializePlanFile } from '../../../core/io/planFile.ts';
import { FileError, MAX_READ_BYTES, atomicWriteFile, loadPlanFile, loadSystemFile, readRegularFile, readTextFile } from '../../../app/node/files.ts';
import { samplePlan } from '../../core/io/planSamples.ts';

const ROOT = new URL('../../../', import.meta.url).pathname;
const SYSTEM = join(ROOT, 'assets/systems/ilmar.system.json');
const work = mkdtempSync(join(tmpdir(), 'waymark-hostile-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** Turns a hang (the bug) into a failure; never reached by the fixed code. */
const HANG_GUARD = 20_000;
const isRoot = process.getuid?.() === 0;

let n = 0;
function freshDir(): string {
  const d = join(work, `case-${n++}`);
  mkdirSync(d);
  return d;
}

function fifo(dir: string, name = 'pipe.json'): string {
  const p = join(dir, name);
  execFileSync('mkfifo', [p]);
  return p;
}

const tmpFiles = (dir: string) => readdirSync(dir).filter((f) => f.endsWith('.tmp'));

describe('reading: regular files only', () => {
  it(
    'a FIFO with no writer is refused at once (opened without blocking), naming what it is',
    async () => {
      const p = fifo(freshDir());
      await expect(readRegularFile(p)).rejects.toThrow(FileError);
      await expect(readTextFile(p)).rejects.toThrow(`cannot read ${p}: it is not a regular file (it is a FIFO (named pipe)); Waymark reads regular files only`);
    },
    HANG_GUARD,
  );

  it(
    'many FIFO reads at once do not stall later file operations (no file-system thread is left blocked)',
    async () => {
      const dir = freshDir();
      // Node runs blocking opens on 4 threads: 8 blocked opens would stall every later read.
      const pipes = Array.from({ length: 8 }, (_, k) => fifo(dir, `p${k}.json`));
      const results = await Promise.allSettled(pipes.map((p) => readRegularFile(p)));
      expect(results.every((r) => r.status === 'rejected')).toBe(true);
      const ok = join(dir, 'ok.txt');
      writeFileSync(ok, 'after the pipes');
      expect(await readTextFile(ok)).toBe('after the pipes');
    },
    HANG_GUARD,
  );

  it.each([
    ['/dev/zero', 'a character device'],
    ['/dev/urandom', 'a character device'],
    ['/dev/null', 'a character device'],
  ])(
    '%s is refused before a byte is read (%s)',
    async (dev, what) => {
      await expect(readRegularFile(dev)).rejects.toThrow(`cannot read ${dev}: it is not a regular file (it is ${what})`);
    },
    HANG_GUARD,
  );

  it(
    'a symbolic link to /dev/zero or to a FIFO is judged by what it names (checked on the opened descriptor)',
    async () => {
      const dir = freshDir();
      const toZero = join(dir, 'zero.system.json');
      symlinkSync('/dev/zero', toZero);
      const toPipe = join(dir, 'pipe-link.system.json');
      symlinkSync(fifo(dir), toPipe);
      await expect(readTextFile(toZero)).rejects.toThrow(`cannot read ${toZero}: it is not a regular file (it is a character device)`);
      await expect(readTextFile(toPipe)).rejects.toThrow(`cannot read ${toPipe}: it is not a regular file (it is a FIFO (named pipe))`);
      // a link to a regular file reads as that file
      const toFile = join(dir, 'file-link.json');
      symlinkSync(SYSTEM, toFile);
      expect(await readTextFile(toFile)).toBe(readFileSync(SYSTEM, 'utf8'));
    },
    HANG_GUARD,
  );

  it('a folder is refused as a folder', async () => {
    const dir = freshDir();
    await expect(readTextFile(dir)).rejects.toThrow(`cannot read ${dir}: it is a folder, not a file`);
  });

  it('a file over the size limit is refused before any byte is read', async () => {
    const dir = freshDir();
    const big = join(dir, 'huge.plan.json');
    writeFileSync(big, '');
    truncateSync(big, MAX_READ_BYTES + 1); // sparse: no disk used
    let reads = 0;
    const counting = {
      open: async (...a: Parameters<typeof fsp.open>) => {
        const fh = await fsp.open(...a);
        const read = fh.read.bind(fh);
        const counted = (...r: unknown[]) => {
          reads++;
          return (read as (...x: unknown[]) => unknown)(...r);
        };
        return Object.assign(fh, { read: counted as typeof fh.read });
      },
    };
    await expect(readRegularFile(big, { fs: counting as never })).rejects.toThrow(`cannot read ${big}: it is 32.0 MiB, more than the 32.0 MiB Waymark reads`);
    expect(reads).toBe(0);
    // the limit is the file's size in bytes: one byte over a smaller limit is refused, the limit itself is read
    const small = join(dir, 'small.json');
    writeFileSync(small, 'x'.repeat(101));
    await expect(readRegularFile(small, { maxBytes: 100 })).rejects.toThrow(/it is 101 bytes, more than the 100 bytes Waymark reads/);
    expect((await readRegularFile(small, { maxBytes: 101 })).length).toBe(101);
  });

  it('a disk that never answers is given up on after the time-out (open or read)', async () => {
    const dir = freshDir();
    const p = join(dir, 'stalled.json');
    writeFileSync(p, '{}');
    const never = new Promise<never>(() => undefined);
    const stalledOpen = { open: () => never };
    await expect(readRegularFile(p, { timeoutMs: 50, fs: stalledOpen as never })).rejects.toThrow(
      `cannot read ${p}: the disk did not answer within 0.05 s (a stalled disk or network share?)`,
    );
    const stalledRead = {
      open: async (...a: Parameters<typeof fsp.open>) => Object.assign(await fsp.open(...a), { read: () => never }),
    };
    const e = await readRegularFile(p, { timeoutMs: 50, fs: stalledRead as never }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(FileError);
    expect((e as FileError).code).toBe('ETIMEDOUT');
  });

  it(
    'a plan whose system.path names a FIFO or a link to /dev/zero: refused naming the system file, promptly',
    async () => {
      const dir = freshDir();
      const pipe = fifo(dir, 'ilmar.system.json');
      const zero = join(dir, 'zero.system.json');
      symlinkSync('/dev/zero', zero);
      for (const [name, sys, what] of [
        ['via-pipe.plan.json', 'ilmar.system.json', 'a FIFO (named pipe)'],
        ['via-zero.plan.json', 'zero.system.json', 'a character device'],
      ]) {
        const p = join(dir, name);
        writeFileSync(p, serializePlanFile(samplePlan(), { kind: 'path', path: sys }));
        await expect(loadPlanFile(p)).rejects.toThrow(`cannot read ${join(dir, sys)}: it is not a regular file (it is ${what})`);
      }
      await expect(loadSystemFile(pipe)).rejects.toThrow(/not a regular file/);
    },
    HANG_GUARD,
  );
});

describe('saving: regular files only, links followed, backups copied', () => {
  it(
    'a FIFO in the way is refused and left a FIFO; no backup, no temporary file',
    async () => {
      const dir = freshDir();
      const p = fifo(dir, 'out.csv');
      await expect(atomicWriteFile(p, 'a,b\n')).rejects.toThrow(
        `cannot save ${p}: it is not a regular file (it is a FIFO (named pipe)); Waymark saves over regular files only`,
      );
      expect(lstatSync(p).isFIFO()).toBe(true);
      expect(existsSync(`${p}.bak`)).toBe(false);
      expect(tmpFiles(dir)).toEqual([]);
    },
    HANG_GUARD,
  );

  it('a symbolic link to a device is refused; the link and the device stay as they were', async () => {
    const dir = freshDir();
    const p = join(dir, 'out.oem');
    symlinkSync('/dev/null', p);
    await expect(atomicWriteFile(p, 'CCSDS_OEM_VERS = 2.0\n')).rejects.toThrow(`cannot save ${p}: it is not a regular file (it is a character device)`);
    expect(readlinkSync(p)).toBe('/dev/null');
    expect(statSync('/dev/null').isCharacterDevice()).toBe(true);
    expect(existsSync(`${p}.bak`)).toBe(false);
    expect(tmpFiles(dir)).toEqual([]);
  });

  it.skipIf(!isRoot)('a device node in the way (made with mknod, as root) is refused and stays a device; the backup is never a link to it', async () => {
    const dir = freshDir();
    const p = join(dir, 'dev.csv');
    execFileSync('mknod', [p, 'c', '1', '3']); // the null device's numbers
    await expect(atomicWriteFile(p, 'x')).rejects.toThrow(/it is not a regular file \(it is a character device\)/);
    expect(lstatSync(p).isCharacterDevice()).toBe(true);
    expect(existsSync(`${p}.bak`)).toBe(false);
  });

  it('a symbolic link to a regular file: the save goes to that file (the link stays a link) and the backup is a copy', async () => {
    const dir = freshDir();
    const realDir = join(dir, 'real');
    mkdirSync(realDir);
    const real = join(realDir, 'ephemeris.csv');
    writeFileSync(real, 'old\n');
    const link = join(dir, 'latest.csv');
    symlinkSync(real, link);
    await atomicWriteFile(link, 'new\n');
    expect(lstatSync(link).isSymbolicLink()).toBe(true);
    expect(readlinkSync(link)).toBe(real);
    expect(readFileSync(real, 'utf8')).toBe('new\n');
    const bak = `${real}.bak`;
    expect(readFileSync(bak, 'utf8')).toBe('old\n');
    expect(lstatSync(bak).isFile()).toBe(true);
    expect(statSync(bak).nlink).toBe(1); // a copy, not a second name of another file
    expect(existsSync(`${link}.bak`)).toBe(false);
    expect(tmpFiles(dir)).toEqual([]);
    expect(tmpFiles(realDir)).toEqual([]);
  });

  it('the backup is a copy even when the previous version has another name (a hard link): that name keeps its text', async () => {
    const dir = freshDir();
    const p = join(dir, 'plan.json');
    writeFileSync(p, 'version 1');
    const other = join(dir, 'elsewhere.json');
    linkSync(p, other);
    await atomicWriteFile(p, 'version 2');
    expect(readFileSync(p, 'utf8')).toBe('version 2');
    expect(readFileSync(`${p}.bak`, 'utf8')).toBe('version 1');
    expect(statSync(`${p}.bak`).ino).not.toBe(statSync(other).ino);
    expect(readFileSync(other, 'utf8')).toBe('version 1');
  });

  it('a symbolic link to nothing is refused (nowhere to save through it)', async () => {
    const dir = freshDir();
    const p = join(dir, 'dangling.csv');
    symlinkSync(join(dir, 'missing', 'x.csv'), p);
    await expect(atomicWriteFile(p, 'x')).rejects.toThrow(`cannot save ${p}: it is a symbolic link to a file that does not exist`);
    expect(lstatSync(p).isSymbolicLink()).toBe(true);
  });
});
