import { spawn } from 'node:child_process';
import { chmodSync, chownSync, existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import * as fsp from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { build } from 'esbuild';
import { afterAll, describe, expect, it } from 'vitest';
import { ValidationError } from '../../../core/math/errors.ts';
import { parsePlanFile, serializePlanFile, type PlanSystemRef } from '../../../core/io/planFile.ts';
import { FileError, atomicWriteFile, backupPath, loadPlanFile, resolveSystemPath, savePlanFile } from '../../../app/node/files.ts';
import { samplePlan, stateStartPlan } from '../../core/io/planSamples.ts';
import { resolveBurns } from '../../../core/io/resolvedBurns.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';

const ROOT = new URL('../../../', import.meta.url).pathname;
const CHILD = new URL('./saveChild.ts', import.meta.url).pathname;
const SYSTEM = join(ROOT, 'assets/systems/ilmar.system.json');
const work = mkdtempSync(join(tmpdir(), 'waymark-files-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

let n = 0;
function freshDir(): string {
  const d = join(work, `case-${n++}`);
  mkdirSync(d);
  return d;
}

const ref = (dir: string): PlanSystemRef => ({ kind: 'path', path: relativeTo(dir, SYSTEM) });
function relativeTo(dir: string, file: string): string {
  // Plans name their system relative to themselves.
  const a = dir.split('/').filter(Boolean);
  const b = file.split('/').filter(Boolean);
  let k = 0;
  while (k < a.length && a[k] === b[k]) k++;
  return [...a.slice(k).map(() => '..'), ...b.slice(k)].join('/');
}

/** Runs the child script; resolves when it prints `signal` (then SIGKILLs it after `delayMs`). */
function runAndKill(args: string[], signal: string, delayMs = 0): Promise<void> {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', CHILD, ...args], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    let killed = false;
    child.stdout.on('data', (b: Buffer) => {
      out += b.toString();
      if (!killed && out.includes(signal)) {
        killed = true;
        setTimeout(() => child.kill('SIGKILL'), delayMs);
      }
    });
    child.stderr.on('data', (b: Buffer) => (err += b.toString()));
    child.on('exit', (code, sig) => {
      if (sig === 'SIGKILL' && killed) resolvePromise();
      else reject(new Error(`child ended (code ${code}, signal ${sig}) before it was killed: ${err}`));
    });
  });
}

const tmpFiles = (dir: string) => readdirSync(dir).filter((f) => f.endsWith('.tmp'));

/** The unprivileged user and group ids ("nobody" on Linux). */
const NOBODY = 65534;

/**
 * Runs saveChild's `save` as the user nobody: the child is bundled (esbuild, as tsx does) into a
 * file that user can read, in folders it can pass through, so it needs nothing of the checkout.
 */
async function saveAsNobody(target: string, text: string): Promise<{ code: number | null; stdout: string; stderr: string }> {
  const bundle = join(work, 'saveChild.mjs');
  if (!existsSync(bundle)) {
    await build({
      entryPoints: [CHILD],
      bundle: true,
      platform: 'node',
      format: 'esm',
      outfile: bundle,
      logLevel: 'error',
      // ajv is CommonJS: give the ESM bundle a require
      banner: { js: "import { createRequire as __waymarkRequire } from 'node:module'; const require = __waymarkRequire(import.meta.url);" },
    });
  }
  chmodSync(work, 0o755); // mkdtemp made it private to its owner
  return new Promise((resolvePromise, reject) => {
    const child = spawn(process.execPath, [bundle, 'save', target, text], { cwd: work, uid: NOBODY, gid: NOBODY, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (b: Buffer) => (stdout += b.toString()));
    child.stderr.on('data', (b: Buffer) => (stderr += b.toString()));
    child.on('error', reject);
    child.on('close', (code) => resolvePromise({ code, stdout, stderr }));
  });
}

describe('atomicWriteFile', () => {
  it('writes the file and keeps the previous version as <name>.bak', async () => {
    const dir = freshDir();
    const p = join(dir, 'a.txt');
    await atomicWriteFile(p, 'first\n');
    expect(readFileSync(p, 'utf8')).toBe('first\n');
    expect(existsSync(backupPath(p))).toBe(false);
    await atomicWriteFile(p, 'second\n');
    expect(readFileSync(p, 'utf8')).toBe('second\n');
    expect(readFileSync(`${p}.bak`, 'utf8')).toBe('first\n');
    await atomicWriteFile(p, 'third\n');
    expect(readFileSync(`${p}.bak`, 'utf8')).toBe('second\n');
    expect(tmpFiles(dir)).toEqual([]);
  });

  it('backup: false keeps no backup', async () => {
    const dir = freshDir();
    const p = join(dir, 'a.txt');
    await atomicWriteFile(p, 'one');
    await atomicWriteFile(p, 'two', { backup: false });
    expect(existsSync(`${p}.bak`)).toBe(false);
    expect(readFileSync(p, 'utf8')).toBe('two');
  });

  it('a target that is a folder: the save fails, says why, and changes nothing', async () => {
    const dir = freshDir();
    const p = join(dir, 'plan.json');
    mkdirSync(p);
    writeFileSync(join(p, 'inside.txt'), 'keep');
    await expect(atomicWriteFile(p, 'x')).rejects.toThrow(FileError);
    await expect(atomicWriteFile(p, 'x')).rejects.toThrow(/is a folder, not a file/);
    expect(statSync(p).isDirectory()).toBe(true);
    expect(readFileSync(join(p, 'inside.txt'), 'utf8')).toBe('keep');
    expect(tmpFiles(dir)).toEqual([]);
  });

  it('a folder that does not exist: the save fails and says so', async () => {
    const p = join(work, 'no-such-folder', 'plan.json');
    await expect(atomicWriteFile(p, 'x')).rejects.toThrow(/cannot save .*plan\.json: the folder .*no-such-folder does not exist \(ENOENT\)/);
  });

  it('a backup that cannot be kept: the save fails, the old file stays, no temporary file is left', async () => {
    const dir = freshDir();
    const p = join(dir, 'plan.json');
    await atomicWriteFile(p, 'old contents');
    mkdirSync(`${p}.bak`);
    writeFileSync(join(`${p}.bak`, 'blocker'), 'x'); // a non-empty folder cannot be renamed over
    await expect(atomicWriteFile(p, 'new contents')).rejects.toThrow(/cannot keep the previous version as .*plan\.json\.bak: .*plan\.json is unchanged/);
    expect(readFileSync(p, 'utf8')).toBe('old contents');
    expect(tmpFiles(dir)).toEqual([]);
  });

  it('a folder that is not writable: the save fails, says why, and the old file stays (as an unprivileged user, also when the tests run as root)', async () => {
    const dir = freshDir();
    const p = join(dir, 'plan.json');
    await atomicWriteFile(p, 'old contents');
    chmodSync(dir, 0o555);
    try {
      if (process.getuid?.() === 0) {
        // Root may write into any folder: the save runs in a child process as the unprivileged
        // user "nobody" (uid and gid 65534), who owns the folder but has taken away its write permission.
        chownSync(dir, NOBODY, NOBODY);
        const r = await saveAsNobody(p, 'new');
        expect(r.code).toBe(3);
        expect(r.stdout).toMatch(/cannot create a temporary file: permission denied/);
      } else {
        await expect(atomicWriteFile(p, 'new')).rejects.toThrow(/cannot create a temporary file: permission denied/);
      }
      expect(readFileSync(p, 'utf8')).toBe('old contents');
      expect(tmpFiles(dir)).toEqual([]);
    } finally {
      chmodSync(dir, 0o755);
    }
  });

  it('writes in chunks until every byte is in (progress reaches the total) and leaves nothing else behind', async () => {
    const dir = freshDir();
    const p = join(dir, 'a.txt');
    const seen: number[] = [];
    await atomicWriteFile(p, 'x'.repeat(10), { chunkSize: 3, onProgress: (w) => seen.push(w) });
    expect(seen).toEqual([3, 6, 9, 10]);
    expect(readdirSync(dir)).toEqual(['a.txt']);
  });

  it('a write that takes fewer bytes than it was given is continued, not renamed over the target short', async () => {
    const dir = freshDir();
    const p = join(dir, 'short.plan.json');
    await atomicWriteFile(p, 'old');
    const text = serializePlanFile(samplePlan(), ref(dir));
    // a file system that takes at most 1000 bytes a call (as write(2) may on a full disk)
    const stingy = {
      ...fsp,
      open: async (path: string, flags: string, mode?: number) => {
        const fh = await fsp.open(path, flags, mode);
        const write = fh.write.bind(fh) as (b: Uint8Array, o: number, l: number) => Promise<{ bytesWritten: number }>;
        return Object.assign(fh, { write: (b: Uint8Array, o: number, l: number) => write(b, o, Math.min(l, 1000)) });
      },
    };
    await atomicWriteFile(p, text, {}, stingy as never);
    expect(readFileSync(p, 'utf8')).toBe(text);
    expect(readFileSync(`${p}.bak`, 'utf8')).toBe('old');
  });

  it('the final rename failing (disk full) leaves the original and no temporary file, and says the file is unchanged', async () => {
    const dir = freshDir();
    const p = join(dir, 'a.plan.json');
    writeFileSync(p, 'original');
    let calls = 0;
    const failing = {
      ...fsp,
      rename: async (a: string, b: string) => {
        // the first rename puts the backup in place, the second is the save's own
        if (++calls === 2) throw Object.assign(new Error('no space left'), { code: 'ENOSPC' });
        return fsp.rename(a, b);
      },
    };
    await expect(atomicWriteFile(p, 'new', {}, failing as never)).rejects.toThrow(/the disk is full \(ENOSPC\); .*a\.plan\.json is unchanged/);
    expect(readFileSync(p, 'utf8')).toBe('original');
    expect(tmpFiles(dir)).toEqual([]);
  });

  it('writes UTF-8 text exactly (Δv, °)', async () => {
    const dir = freshDir();
    const p = join(dir, 'u.json');
    await atomicWriteFile(p, '{"name":"Δv 3° — ok"}\n');
    expect(readFileSync(p, 'utf8')).toBe('{"name":"Δv 3° — ok"}\n');
  });

  it('a process killed in the middle of writing leaves the old file intact', async () => {
    const dir = freshDir();
    const p = join(dir, 'plan.json');
    const old = serializePlanFile(samplePlan(), ref(dir));
    await atomicWriteFile(p, old);
    const bytes = 8 << 20;
    await runAndKill(['mid-write', p, String(bytes)], 'half');
    expect(readFileSync(p, 'utf8')).toBe(old);
    expect(parsePlanFile(readFileSync(p, 'utf8')).plan).toEqual(samplePlan());
    // The save really was cut short: a partial temporary file is left beside the target.
    const tmps = tmpFiles(dir);
    expect(tmps.length).toBe(1);
    const size = statSync(join(dir, tmps[0])).size;
    expect(size).toBeGreaterThan(0);
    expect(size).toBeLessThan(bytes);
    // The next save is not disturbed by the stray file.
    await atomicWriteFile(p, old.replace('Sample run', 'Sample run 2'));
    expect(parsePlanFile(readFileSync(p, 'utf8')).plan.name).toBe('Sample run 2');
  });

  it('a process killed at a random moment of a run of saves leaves one of the two valid versions', async () => {
    const dir = freshDir();
    const p = join(dir, 'plan.json');
    // Two versions with long descriptions, so that a save takes many write calls.
    const a = samplePlan();
    a.description = 'A'.repeat(3 << 20);
    const b = stateStartPlan();
    b.description = 'B'.repeat(3 << 20);
    const fa = join(dir, 'a.src');
    const fb = join(dir, 'b.src');
    writeFileSync(fa, serializePlanFile(a, ref(dir)));
    writeFileSync(fb, serializePlanFile(b, ref(dir)));
    for (const delay of [0, 7, 23]) {
      await runAndKill(['loop', p, fa, fb], 'started', delay);
      const got = parsePlanFile(readFileSync(p, 'utf8')).plan;
      expect([a.name, b.name]).toContain(got.name);
      expect(got).toEqual(got.name === a.name ? a : b);
      if (existsSync(`${p}.bak`)) expect(() => parsePlanFile(readFileSync(`${p}.bak`, 'utf8'))).not.toThrow();
    }
  });
});

describe('loadPlanFile and savePlanFile', () => {
  it('resolves the system path relative to the plan file', () => {
    expect(resolveSystemPath('/x/plans/a.plan.json', '../systems/s.json')).toBe('/x/systems/s.json');
    expect(resolveSystemPath('/x/plans/a.plan.json', '/abs/s.json')).toBe('/abs/s.json');
  });

  it('saves and loads a plan with its system; a second save keeps the backup', async () => {
    const dir = freshDir();
    const p = join(dir, 'trip.plan.json');
    await savePlanFile(p, samplePlan(), ref(dir));
    const loaded = await loadPlanFile(p);
    expect(loaded.plan).toEqual(samplePlan());
    expect(loaded.system.name).toBe('Ilmar');
    expect(loaded.systemPath).toBe(SYSTEM);
    const changed = { ...loaded.plan, name: 'Changed' };
    await savePlanFile(p, changed, loaded.systemRef);
    expect((await loadPlanFile(p)).plan.name).toBe('Changed');
    expect(parsePlanFile(readFileSync(`${p}.bak`, 'utf8')).plan.name).toBe('Sample run');
  });

  it('loads an embedded system without reading another file', async () => {
    const dir = freshDir();
    const p = join(dir, 'e.plan.json');
    const q = join(dir, 'with-path.plan.json');
    await savePlanFile(q, samplePlan(), ref(dir));
    const sys = (await loadPlanFile(q)).system;
    await savePlanFile(p, samplePlan(), { kind: 'embedded', system: sys });
    const loaded = await loadPlanFile(p);
    expect(loaded.systemPath).toBeNull();
    expect(loaded.system.bodies.length).toBe(sys.bodies.length);
  });

  it("a burn's saved figures that the plan no longer gives are a warning naming the burn, with the system by path or embedded", async () => {
    const dir = freshDir();
    const plain = join(dir, 'plain.plan.json');
    await savePlanFile(plain, demoPlan, ref(dir));
    const system = (await loadPlanFile(plain)).system;
    for (const sysRef of [ref(dir), { kind: 'embedded', system } as PlanSystemRef]) {
      const p = join(dir, `${sysRef.kind}.plan.json`);
      writeFileSync(p, serializePlanFile(demoPlan, sysRef, resolveBurns(system, demoPlan)));
      expect((await loadPlanFile(p)).warnings.filter((w) => w.path.endsWith('.resolved'))).toEqual([]);
      const doc = JSON.parse(readFileSync(p, 'utf8'));
      const k = (doc.events as { type: string }[]).findIndex((e) => e.type === 'burn');
      doc.events[k].resolved.dv_inertial_mps[1] += 0.5;
      writeFileSync(p, JSON.stringify(doc));
      const stale = (await loadPlanFile(p)).warnings.filter((w) => w.path === `events[${k}].resolved`);
      expect(stale.length).toBe(1);
      expect((stale[0] as { words?: string }).words).toMatch(new RegExp(`^Burn ${k + 1} '${doc.events[k].name}': figures saved with the plan are out of date`));
    }
  });

  it('a missing system file is reported against system.path', async () => {
    const dir = freshDir();
    const p = join(dir, 'lost.plan.json');
    await savePlanFile(p, samplePlan(), { kind: 'path', path: 'nowhere/none.system.json' });
    try {
      await loadPlanFile(p);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(ValidationError);
      expect((e as ValidationError).issues[0].path).toBe('system.path');
      expect((e as ValidationError).issues[0].rule).toMatch(
        /^names "nowhere\/none\.system\.json", which does not exist \(looked for .*nowhere\/none\.system\.json\)$/,
      );
    }
  });

  it('a plan naming a body the system lacks is refused after the system is read', async () => {
    const dir = freshDir();
    const p = join(dir, 'bad.plan.json');
    const plan = samplePlan();
    plan.target = { ...plan.target!, body: 'atlantis' };
    await savePlanFile(p, plan, ref(dir));
    await expect(loadPlanFile(p)).rejects.toThrow(
      /Target orbit: body names no body of system "Ilmar" \(got "atlantis"[^\n]*\n {4}\(plan field: target\.body\)/,
    );
  });

  it('a missing plan file is a FileError saying so', async () => {
    await expect(loadPlanFile(join(work, 'nope.plan.json'))).rejects.toThrow(/cannot read .*nope\.plan\.json: .*does not exist \(ENOENT\)/);
  });
});
