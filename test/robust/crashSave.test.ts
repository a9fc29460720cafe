/**
 * Files survive crashes (file level): a child process saves a plan over and over with
 * savePlanFile (app/node/files.ts) and is killed with SIGKILL at a random moment, KILLS times
 * over; after every kill the file on disk is a complete old or new version (it reads back with
 * parsePlanFile and equals one of the two) and the backup, when there is one, is valid too.
 * And a plan file written by a newer version of the program: the loader refuses it naming
 * `version`, and savePlanFile refuses to save over it.
 *
 * Speed: the child is bundled once with esbuild (the bundler tsx runs on), so a start costs a
 * plain `node` start plus loading the file layer — about 0.2 s, most of it compiling the two
 * JSON Schemas — and PARALLEL children run at once: about 15 s on a 2-core machine.
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

const KILLS = 100;
const PARALLEL = 2;
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

/** Starts the child, waits for its first save, kills it after `delayMs`; resolves once it is gone. */
function saveAndKill(dir: string, target: string, a: string, b: string, delayMs: number): Promise<void> {
  return new Promise((resolve, reject) => {
    const p = spawn(process.execPath, [child, target, a, b], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    let killed = false;
    p.stdout.on('data', (d: Buffer) => {
      out += d.toString();
      if (!killed && out.includes('ready')) {
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

describe('a plan saved over and over survives SIGKILL at random moments', () => {
  it(`is always a complete old or new version, with a valid backup (${KILLS} kills)`, async () => {
    const plan = samplePlan();
    const other = { ...samplePlan(), name: 'Sample run, second version', reserve: { percent: 7, absolute: 40 } };
    const rng = createRng(20240611);
    const kinds = new Map<string, number>();
    let done = 0;
    const lane = async (k: number): Promise<void> => {
      const dir = join(work, `lane-${k}`);
      mkdirSync(dir);
      const ref: PlanSystemRef = { kind: 'path', path: SYSTEM };
      const texts = [serializePlanFile(plan, ref), serializePlanFile(other, ref)];
      const a = join(dir, 'a.src');
      const b = join(dir, 'b.src');
      writeFileSync(a, texts[0]);
      writeFileSync(b, texts[1]);
      const target = join(dir, 'mission.plan.json');
      while (done < KILLS) {
        done++;
        await saveAndKill(dir, target, a, b, rng.next() * 12);
        const text = readFileSync(target, 'utf8');
        expect(texts).toContain(text);
        const got = parsePlanFile(text).plan;
        expect([plan.name, other.name]).toContain(got.name);
        const bak = `${target}.bak`;
        if (existsSync(bak)) {
          expect(texts).toContain(readFileSync(bak, 'utf8'));
          parsePlanFile(readFileSync(bak, 'utf8'));
        }
        const stray = readdirSync(dir).filter((f) => f.endsWith('.tmp')).length;
        kinds.set(stray > 0 ? 'killed mid-save' : 'killed between saves', (kinds.get(stray > 0 ? 'killed mid-save' : 'killed between saves') ?? 0) + 1);
        for (const f of readdirSync(dir)) if (f.endsWith('.tmp')) rmSync(join(dir, f));
      }
    };
    await Promise.all(Array.from({ length: PARALLEL }, (_, k) => lane(k)));
    expect(done).toBeGreaterThanOrEqual(KILLS);
    // the kills really did land inside saves (a temporary file was left behind) as well as between them
    expect(kinds.get('killed mid-save') ?? 0).toBeGreaterThan(0);
  }, 60_000);
});

describe('a plan file written by a newer version', () => {
  const newer = (): string => {
    const doc = JSON.parse(serializePlanFile(samplePlan(), { kind: 'path', path: SYSTEM })) as Record<string, unknown>;
    doc.version = 2;
    doc.added_by_version_2 = { note: 'a field this program does not know' };
    return `${JSON.stringify(doc, null, 2)}\n`;
  };

  it('is refused on opening, naming version and saying it is newer', () => {
    const p = join(work, 'newer-open.plan.json');
    writeFileSync(p, newer());
    let e: unknown;
    try {
      loadPlanFile(p);
    } catch (x) {
      e = x;
    }
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
    await expect(savePlanFile(p, samplePlan(), { kind: 'path', path: SYSTEM })).rejects.toThrow(/newer Waymark \(plan file version 2/);
    expect(readFileSync(p, 'utf8')).toBe(text);
    expect(existsSync(`${p}.bak`)).toBe(false);
  });

  it('a damaged or foreign file in the way is still saved over (only a newer plan file is protected)', async () => {
    for (const old of ['{"format": "waymark-plan", "version": 2', '{"format": "waymark-system", "version": 9}', 'not json']) {
      const p = join(work, `overwrite-${old.length}.plan.json`);
      writeFileSync(p, old);
      await savePlanFile(p, samplePlan(), { kind: 'path', path: SYSTEM });
      expect(parsePlanFile(readFileSync(p, 'utf8')).plan.name).toBe(samplePlan().name);
    }
  });
});
