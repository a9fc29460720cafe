/**
 * Files survive crashes (file level): a child process saves a plan over and over with
 * savePlanFile (app/node/files.ts) and is killed with SIGKILL, KILLS times over; after every
 * kill the file on disk is a complete old or new version (it reads back with parsePlanFile and
 * equals one of the two) and the backup, when there is one, is valid too.
 * And a plan file written by a newer version of the program: the loader refuses it naming
 * `version`, and savePlanFile refuses to save over it.
 *
 * Bounded by work, not by the machine's speed: the kill points are chosen from a seeded random
 * sequence and most are reached by the child itself — it stops inside a given save at a given
 * number of bytes written, or once the temporary file is on disk, the backup in place or the
 * rename done, reports it and waits to be killed — so each kill lands where it was meant to
 * on a slow machine as on a fast one, and the test knows the exact version each must leave
 * (the one before that save, or after it) and whether a temporary file must be left behind.
 * One kill in five comes instead at a random moment (a seeded delay after the child's first
 * save), for the moments between the named points (copying the backup, syncing the folder);
 * there only "old or new" is checked. The vitest time-out is a hang guard, not a speed bound.
 *
 * The child is bundled once with esbuild (the bundler tsx runs on), so a start costs a plain
 * `node` start plus loading the file layer; PARALLEL children run at once.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { build } from 'esbuild';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ValidationError } from '../../core/math/errors.ts';
import { parsePlanFile, serializePlanFile, type PlanSystemRef } from '../../core/io/planFile.ts';
import { FileError, loadPlanFile, savePlanFile } from '../../app/node/files.ts';
import { samplePlan } from '../core/io/planSamples.ts';
import { createRng } from '../../core/math/random.ts';

const KILLS = 30;
const PARALLEL = 2;
/** Hang guard only: 30 child starts take seconds; a child that never stops would take forever. */
const HANG_GUARD = 300_000;
const ROOT = new URL('../../', import.meta.url).pathname;
const SYSTEM = join(ROOT, 'assets/systems/ilmar.system.json');
const work = mkdtempSync(join(tmpdir(), 'waymark-crash-'));
const child = join(work, 'saveLoopChild.mjs');
afterAll(() => rmSync(work, { recursive: true, force: true }));

beforeAll(async () => {
  await build({
    entryPoints: [new URL('./saveLoopChild.ts', import.meta.url).pathname],
    bundle: true,
    platform: 'node',
    format: 'esm',
    outfile: child,
    logLevel: 'error',
    // ajv is CommonJS: give the ESM bundle a require
    banner: { js: "import { createRequire as __waymarkRequire } from 'node:module'; const require = __waymarkRequire(import.meta.url);" },
  });
});

/** Runs the child with `args`; once it prints `cue`, kills it (after `delayMs`); resolves once it is gone. */
function runAndKill(dir: string, args: string[], cue: string, delayMs = 0): Promise<void> {
  return new Promise((resolve, reject) => {
    const p = spawn(process.execPath, [child, ...args], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    let killed = false;
    p.stdout.on('data', (d: Buffer) => {
      out += d.toString();
      if (!killed && out.includes(cue)) {
        killed = true;
        setTimeout(() => p.kill('SIGKILL'), delayMs);
      }
    });
    p.stderr.on('data', (d: Buffer) => (err += d.toString()));
    p.on('exit', (code, signal) => {
      if (signal === 'SIGKILL' && killed) resolve();
      else reject(new Error(`the saving child ended (code ${code}, signal ${signal}) before it was killed: ${err}`));
    });
  });
}

type Point = 'bytes' | 'written' | 'backed-up' | 'renamed' | 'free';
const POINTS: Point[] = ['bytes', 'written', 'backed-up', 'renamed', 'free'];

describe('a plan saved over and over survives SIGKILL', () => {
  it(
    `is always a complete old or new version, with a valid backup (${KILLS} kills at seeded points)`,
    async () => {
      const plan = samplePlan();
      const other = { ...samplePlan(), name: 'Sample run, second version', reserve: { percent: 7, absolute: 40 } };
      const seen = new Map<Point, number>();
      let done = 0;
      const lane = async (k: number): Promise<void> => {
        const rng = createRng(20240611 + k);
        const dir = join(work, `lane-${k}`);
        mkdirSync(dir);
        const ref: PlanSystemRef = { kind: 'path', path: SYSTEM };
        const texts = [serializePlanFile(plan, ref), serializePlanFile(other, ref)];
        const a = join(dir, 'a.src');
        const b = join(dir, 'b.src');
        writeFileSync(a, texts[0]);
        writeFileSync(b, texts[1]);
        const target = join(dir, 'mission.plan.json');
        const bak = `${target}.bak`;
        const onDisk = (p: string): string | null => (existsSync(p) ? readFileSync(p, 'utf8') : null);
        const strays = (): string[] => readdirSync(dir).filter((f) => f.endsWith('.tmp'));
        while (done < KILLS) {
          done++;
          let current = onDisk(target);
          let backup = onDisk(bak);
          let point = POINTS[Math.floor(rng.next() * POINTS.length)];
          const save = Math.floor(rng.next() * 3);
          if (point === 'free') {
            await runAndKill(dir, [target, a, b, 'free'], 'ready', rng.next() * 12);
          } else {
            // What the child's saves before the stop leave: save j writes texts[j % 2], backing up what was there.
            for (let j = 0; j < save; j++) {
              if (current !== null) backup = current;
              current = texts[j % 2];
            }
            if (point === 'backed-up' && current === null) point = 'written'; // nothing to back up: no such step
            const bytes = Math.floor(rng.next() * texts[save % 2].length);
            await runAndKill(dir, [target, a, b, 'stop', String(save), point, String(bytes)], 'stopped');
            const backedUp = point === 'backed-up' || point === 'renamed';
            if (backedUp && current !== null) backup = current;
            if (point === 'renamed') current = texts[save % 2];
            // The exact versions this kill point leaves, and the temporary file of an unfinished save.
            expect(onDisk(target)).toBe(current);
            expect(onDisk(bak)).toBe(backup);
            expect(strays().length).toBe(point === 'renamed' ? 0 : 1);
          }
          seen.set(point, (seen.get(point) ?? 0) + 1);
          // Old or new, whatever the moment: both files read back as one of the two plans.
          const text = readFileSync(target, 'utf8');
          expect(texts).toContain(text);
          expect([plan.name, other.name]).toContain(parsePlanFile(text).plan.name);
          if (existsSync(bak)) {
            expect(texts).toContain(readFileSync(bak, 'utf8'));
            parsePlanFile(readFileSync(bak, 'utf8'));
          }
          for (const f of strays()) rmSync(join(dir, f));
        }
      };
      await Promise.all(Array.from({ length: PARALLEL }, (_, k) => lane(k)));
      expect(done).toBeGreaterThanOrEqual(KILLS);
      // the seeded sequence reaches every kind of kill point
      expect([...seen.keys()].sort()).toEqual([...POINTS].sort());
    },
    HANG_GUARD,
  );
});

describe('a plan file written by a newer version', () => {
  const newer = (): string => {
    const doc = JSON.parse(serializePlanFile(samplePlan(), { kind: 'path', path: SYSTEM })) as Record<string, unknown>;
    doc.version = 2;
    doc.added_by_version_2 = { note: 'a field this program does not know' };
    return `${JSON.stringify(doc, null, 2)}\n`;
  };

  it('is refused on opening, naming version and saying it is newer', async () => {
    const p = join(work, 'newer-open.plan.json');
    writeFileSync(p, newer());
    const e = await loadPlanFile(p).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(ValidationError);
    const issue = (e as ValidationError).issues[0];
    expect(issue.path).toBe('version');
    expect(issue.rule).toMatch(/newer/);
  });

  it('regression (savePlanFile over a version-2 file): the save is refused and the file is left as it was', async () => {
    const p = join(work, 'newer-save.plan.json');
    const text = newer();
    writeFileSync(p, text);
    await expect(savePlanFile(p, samplePlan(), { kind: 'path', path: SYSTEM })).rejects.toThrow(FileError);
    await expect(savePlanFile(p, samplePlan(), { kind: 'path', path: SYSTEM })).rejects.toThrow(/newer version of Waymark \(plan file version 2/);
    expect(readFileSync(p, 'utf8')).toBe(text);
    expect(existsSync(`${p}.bak`)).toBe(false);
  });

  it('a damaged or foreign file in the way is refused on the command line; where a dialog asked, only Waymark files stay protected', async () => {
    const cases: [string, boolean][] = [
      ['{"format": "waymark-plan", "version": 2', true], // damaged: JSON Waymark cannot identify
      ['not json', true],
      ['{"format": "waymark-system", "version": 9}', false], // a (newer) system file: never replaced by a plan
    ];
    for (const [old, replacedAfterDialog] of cases) {
      const p = join(work, `overwrite-${old.length}.plan.json`);
      writeFileSync(p, old);
      await expect(savePlanFile(p, samplePlan(), { kind: 'path', path: SYSTEM })).rejects.toThrow(FileError);
      expect(readFileSync(p, 'utf8')).toBe(old);
      const after = savePlanFile(p, samplePlan(), { kind: 'path', path: SYSTEM }, { unidentified: 'replace' });
      if (replacedAfterDialog) {
        await after;
        expect(parsePlanFile(readFileSync(p, 'utf8')).plan.name).toBe(samplePlan().name);
        expect(readFileSync(`${p}.bak`, 'utf8')).toBe(old);
      } else {
        await expect(after).rejects.toThrow(/system file version 9/);
        expect(readFileSync(p, 'utf8')).toBe(old);
      }
    }
  });
});
