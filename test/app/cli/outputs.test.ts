/**
 * The command line against hostile paths, end to end (each case a regression of a finding):
 * - reading: a FIFO, /dev/zero, /dev/urandom, or a plan whose system.path names one (or a
 *   symbolic link to one) exits 2 at once with "not a regular file", instead of blocking
 *   forever or reading gigabytes;
 * - writing: an export over a FIFO or a device (or a link to one) exits 2 and leaves it as it
 *   was (no ordinary file in its place, no backup linked to it); a link to a regular file is
 *   written through, with a copied backup;
 * - `-` is standard output for every export (`fly --csv/--oem/--burns/--report -`,
 *   `correct -o -`, `windows --grid-out -`), alone on stdout, and a reader that stops early
 *   ends nothing in a stack trace;
 * - the output guard: never an input (`fly X --csv X`, `correct -o` onto the plan's own system
 *   file, `windows --grid-out` onto the system file), never a newer version (`fly --report`
 *   onto a version-2 plan, `correct -o` onto a version-2 system), never a folder (no stack
 *   trace); messages name the option and the path as typed; exit 2, the file unchanged.
 * Hang guards only (HANG_GUARD, for every test of the file): without the fixes the FIFO cases
 * never end. The tests run one after another (each starts a few command-line processes at once).
 */
import { execFileSync, spawn } from 'node:child_process';
import { existsSync, linkSync, lstatSync, mkdirSync, mkdtempSync, readFileSync, readlinkSync, rmSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { parseCsv } from '../../../core/io/csv.ts';
import { parseOem } from '../../../core/io/oem.ts';
import { parsePlanFile } from '../../../core/io/planFile.ts';
import { identifyFile } from '../../../app/node/files.ts';
import { ROOT, runCli, type CliRun } from './runCli.ts';

const HANG_GUARD = 180_000;
vi.setConfig({ testTimeout: HANG_GUARD });
const SYSTEM = join(ROOT, 'assets/systems/ilmar.system.json');
const work = mkdtempSync(join(tmpdir(), 'waymark-outputs-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

let n = 0;
function freshDir(): string {
  const d = join(work, `case-${n++}`);
  mkdirSync(d);
  return d;
}

/** The demo plan, naming its system file by its absolute path (so copies work anywhere), with `version`. */
function demoPlanText(version = 1): string {
  const doc = JSON.parse(readFileSync(join(ROOT, 'assets/plans/tessel-to-ochre.plan.json'), 'utf8')) as Record<string, unknown>;
  doc.system = { path: SYSTEM };
  doc.version = version;
  return `${JSON.stringify(doc, null, 2)}\n`;
}

function systemText(version = 1): string {
  const doc = JSON.parse(readFileSync(SYSTEM, 'utf8')) as Record<string, unknown>;
  doc.version = version;
  return `${JSON.stringify(doc, null, 2)}\n`;
}

function put(dir: string, name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

function fifo(dir: string, name: string): string {
  const p = join(dir, name);
  execFileSync('mkfifo', [p]);
  return p;
}

/** Refused before anything was written: exit 2, one line on stderr starting with the message, no stack trace. */
function expectRefused(r: CliRun, message: string | RegExp): void {
  expect(r.code).toBe(2);
  expect(r.stdout).toBe('');
  if (typeof message === 'string') expect(r.stderr).toContain(message);
  else expect(r.stderr).toMatch(message);
  expect(r.stderr).not.toMatch(/\n\s+at /);
}

const WINDOWS = ['windows', '--from', 'tessel', '--to', 'ochre', '--grid', '12x10', '--workers', '0', '--top', '1'];

describe('reading: regular files only', () => {
  it('a FIFO, /dev/zero, /dev/urandom, or a plan whose system.path names one or a link to one: exit 2 at once', async () => {
    const dir = freshDir();
    const planPipe = fifo(dir, 'pipe.plan.json');
    fifo(dir, 'pipe.system.json');
    symlinkSync('/dev/zero', join(dir, 'zero.system.json'));
    const viaPipe = put(dir, 'via-pipe.plan.json', demoPlanText().replace(JSON.stringify(SYSTEM), '"pipe.system.json"'));
    const viaZero = put(dir, 'via-zero.plan.json', demoPlanText().replace(JSON.stringify(SYSTEM), '"zero.system.json"'));
    const [a, b, c, d, e] = await Promise.all([
      runCli(['check', planPipe]),
      runCli(['check', '/dev/zero']),
      runCli(['stability', '/dev/urandom']),
      runCli(['check', viaPipe]),
      runCli(['fly', viaZero]),
    ]);
    expectRefused(a, `waymark: cannot read ${planPipe}: it is not a regular file (it is a FIFO (named pipe))`);
    expectRefused(b, 'waymark: cannot read /dev/zero: it is not a regular file (it is a character device)');
    expectRefused(c, 'waymark: cannot read /dev/urandom: it is not a regular file (it is a character device)');
    expectRefused(d, `waymark: cannot read ${join(dir, 'pipe.system.json')}: it is not a regular file (it is a FIFO (named pipe))`);
    expectRefused(e, `waymark: cannot read ${join(dir, 'zero.system.json')}: it is not a regular file (it is a character device)`);
  });

  it('windows --system names a FIFO: exit 2 at once', async () => {
    const pipe = fifo(freshDir(), 'pipe.system.json');
    expectRefused(await runCli([...WINDOWS, '--system', pipe]), `cannot read ${pipe}: it is not a regular file (it is a FIFO (named pipe))`);
  });
});

describe('writing: FIFOs and devices refused, links followed', () => {
  it('fly --csv onto a FIFO, --oem onto a link to /dev/null: exit 2, both left as they were, no backup', async () => {
    const dir = freshDir();
    const plan = put(dir, 'trip.plan.json', demoPlanText());
    const pipe = fifo(dir, 'out.csv');
    const link = join(dir, 'out.oem');
    symlinkSync('/dev/null', link);
    const [a, b] = await Promise.all([runCli(['fly', plan, '--csv', pipe]), runCli(['fly', plan, '--oem', link])]);
    expectRefused(
      a,
      `waymark: --csv ${pipe}: not written: it is not a regular file (it is a FIFO (named pipe)); Waymark writes regular files, or standard output with --csv -`,
    );
    expectRefused(b, `waymark: --oem ${link}: not written: it is not a regular file (it is a character device)`);
    expect(lstatSync(pipe).isFIFO()).toBe(true);
    expect(readlinkSync(link)).toBe('/dev/null');
    expect(existsSync(`${pipe}.bak`)).toBe(false);
    expect(existsSync(`${link}.bak`)).toBe(false);
  });

  it.skipIf(process.getuid?.() !== 0)('fly --burns onto a device node (mknod, as root): exit 2, still the device, no backup linked to it', async () => {
    const dir = freshDir();
    const plan = put(dir, 'trip.plan.json', demoPlanText());
    const dev = join(dir, 'burns.csv');
    execFileSync('mknod', [dev, 'c', '1', '3']);
    expectRefused(await runCli(['fly', plan, '--burns', dev]), /--burns .*burns\.csv: not written: it is not a regular file \(it is a character device\)/);
    expect(lstatSync(dev).isCharacterDevice()).toBe(true);
    expect(existsSync(`${dev}.bak`)).toBe(false);
  });

  it('fly --csv onto a link to a previous export: written through, the link stays, the backup is a copy', async () => {
    const dir = freshDir();
    const plan = put(dir, 'trip.plan.json', demoPlanText());
    const real = join(dir, 'real.csv');
    expect((await runCli(['fly', plan, '--csv', real, '--step', '1d'])).code).toBe(0);
    const first = readFileSync(real, 'utf8');
    const link = join(dir, 'latest.csv');
    symlinkSync(real, link);
    const r = await runCli(['fly', plan, '--csv', link, '--step', '2d']);
    expect(r.code).toBe(0);
    expect(readlinkSync(link)).toBe(real);
    expect(readFileSync(real, 'utf8')).not.toBe(first);
    expect(readFileSync(`${real}.bak`, 'utf8')).toBe(first);
    expect(statSync(`${real}.bak`).nlink).toBe(1);
  });
});

describe('- is standard output for every export', () => {
  it('fly --csv/--oem/--burns/--report -: the export alone on stdout, no file named "-"', async () => {
    const dir = freshDir();
    const plan = put(dir, 'trip.plan.json', demoPlanText());
    const [csv, oem, burns, report, file] = await Promise.all([
      runCli(['fly', plan, '--csv', '-', '--step', '1d']),
      runCli(['fly', plan, '--oem', '-', '--step', '1d']),
      runCli(['fly', plan, '--burns', '-']),
      runCli(['fly', plan, '--report', '-']),
      runCli(['fly', plan, '--csv', join(dir, 'same.csv'), '--step', '1d']),
    ]);
    for (const r of [csv, oem, burns, report, file]) {
      expect(r.code).toBe(0);
      expect(r.stderr).toBe('');
    }
    expect(csv.stdout).toBe(readFileSync(join(dir, 'same.csv'), 'utf8')); // exactly what the file gets
    expect(parseCsv(csv.stdout)[0][0]).toBe('t_s');
    expect(parseOem(oem.stdout).segments.length).toBeGreaterThan(0);
    expect(parseCsv(burns.stdout)[0].slice(0, 2)).toEqual(['event', 'name']);
    expect(report.stdout).toMatch(/^# Δv budget: Long Patience to Ochre\n/);
    expect(existsSync(join(ROOT, '-'))).toBe(false);
    expect(existsSync(join(dir, '-'))).toBe(false);
  });

  it('correct -o - prints the corrected plan (naming its system by absolute path); windows --grid-out - prints the grid', async () => {
    const dir = freshDir();
    const plan = put(dir, 'trip.plan.json', demoPlanText().replace(JSON.stringify(SYSTEM), JSON.stringify(relative(dir, SYSTEM)))); // named relative to the plan
    const [c, w] = await Promise.all([runCli(['correct', plan, '-o', '-']), runCli([...WINDOWS, '--system', SYSTEM, '--grid-out', '-'])]);
    expect(c.code).toBe(0);
    const corrected = parsePlanFile(c.stdout);
    expect(corrected.system).toEqual({ kind: 'path', path: SYSTEM });
    expect(corrected.plan.name).toBe('Long Patience to Ochre');
    expect(w.code).toBe(0);
    const grid = JSON.parse(w.stdout) as { planes: { dvTotal: unknown[] } };
    expect(grid.planes.dvTotal.length).toBe(12 * 10);
  });

  it('- together with --json, or two exports to -: exit 2 naming the options', async () => {
    const plan = put(freshDir(), 'trip.plan.json', demoPlanText());
    const [a, b, c, d] = await Promise.all([
      runCli(['fly', plan, '--csv', '-', '--json']),
      runCli(['fly', plan, '--csv', '-', '--oem', '-']),
      runCli([...WINDOWS, '--system', SYSTEM, '--grid-out', '-', '--csv']),
      runCli(['correct', plan, '-o', '-', '--json']),
    ]);
    expect(a.code).toBe(2);
    expect(JSON.parse(a.stdout).error.message).toMatch(/^--csv cannot be - \(standard output\) together with --json/);
    expectRefused(b, 'waymark: --csv -: not written: --oem and --csv cannot all go to standard output; give all but one a file');
    expectRefused(c, 'waymark: --grid-out cannot be - (standard output) together with --csv');
    expect(d.code).toBe(2);
    expect(JSON.parse(d.stdout).error.message).toMatch(/^--output cannot be - \(standard output\) together with --json/);
  });

  it('a reader that stops early (… | head): the rest is dropped quietly, exit 0, no stack trace', async () => {
    const plan = put(freshDir(), 'trip.plan.json', demoPlanText());
    const r = await new Promise<{ code: number | null; stderr: string; got: number }>((resolve, reject) => {
      const child = spawn(process.execPath, ['--import', 'tsx', 'app/cli/main.ts', 'fly', plan, '--csv', '-', '--step', '60'], {
        cwd: ROOT,
        stdio: ['ignore', 'pipe', 'pipe'],
      });
      let stderr = '';
      let got = 0;
      child.stdout.once('data', (b: Buffer) => {
        got = b.length;
        child.stdout.destroy(); // the reader goes away after its first chunk
      });
      child.stderr.on('data', (b: Buffer) => (stderr += b.toString()));
      child.on('error', reject);
      child.on('close', (code) => resolve({ code, stderr, got }));
    });
    expect(r.got).toBeGreaterThan(0);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
  });
});

describe('the output guard', () => {
  it('fly X --csv X, --report onto a version-2 plan, --burns onto a hard link of the plan: exit 2, files unchanged', async () => {
    const dir = freshDir();
    const plan = put(dir, 'trip.plan.json', demoPlanText());
    const newer = put(dir, 'newer.plan.json', demoPlanText(2));
    const hard = join(dir, 'hard.csv');
    linkSync(plan, hard);
    const [a, b, c] = await Promise.all([
      runCli(['fly', plan, '--csv', plan]),
      runCli(['fly', plan, '--report', newer]),
      runCli(['fly', plan, '--burns', hard]),
    ]);
    expectRefused(a, `waymark: --csv ${plan}: not written: it is the plan file being flown, an input of this command; choose another file`);
    expectRefused(
      b,
      `waymark: --report ${newer}: not written: it was written by a newer version of Waymark (plan file version 2; this program writes version 1)`,
    );
    expectRefused(c, `waymark: --burns ${hard}: not written: it is the plan file being flown, an input of this command`);
    expect(readFileSync(plan, 'utf8')).toBe(demoPlanText());
    expect(readFileSync(newer, 'utf8')).toBe(demoPlanText(2));
    for (const p of [plan, newer]) expect(existsSync(`${p}.bak`)).toBe(false);
  });

  it("correct -o onto the plan's own system file, onto a version-2 system file, onto the plan itself: exit 2, unchanged", async () => {
    const dir = freshDir();
    const system = put(dir, 'own.system.json', systemText());
    const plan = put(dir, 'trip.plan.json', demoPlanText().replace(JSON.stringify(SYSTEM), '"own.system.json"'));
    const newer = put(dir, 'v2.system.json', systemText(2));
    const [a, b, c] = await Promise.all([
      runCli(['correct', plan, '-o', system]),
      runCli(['correct', plan, '-o', newer]),
      runCli(['correct', plan, '--output', plan]),
    ]);
    expectRefused(a, `waymark: --output ${system}: not written: it is the plan's system file, an input of this command; choose another file`);
    expectRefused(
      b,
      `waymark: --output ${newer}: not written: it was written by a newer version of Waymark (system file version 2; this program writes version 1)`,
    );
    expectRefused(c, `waymark: --output ${plan}: not written: it is the plan file being corrected, an input of this command`);
    expect(readFileSync(system, 'utf8')).toBe(systemText());
    expect(readFileSync(newer, 'utf8')).toBe(systemText(2));
  });

  it('windows --grid-out onto the system file read, or onto a folder: exit 2 without a stack trace, before any grid is computed', async () => {
    const dir = freshDir();
    const system = put(dir, 'ilmar.system.json', systemText());
    const [a, b] = await Promise.all([
      runCli([...WINDOWS, '--system', system, '--grid-out', system]),
      runCli([...WINDOWS, '--system', system, '--grid-out', dir]),
    ]);
    expectRefused(a, `waymark: --grid-out ${system}: not written: it is the system file read (--system), an input of this command; choose another file`);
    expectRefused(b, `waymark: --grid-out ${dir}: not written: it is a folder; name a file`);
    expect(readFileSync(system, 'utf8')).toBe(systemText());
  });

  it('windows --grid-out replaces its own previous grid (backed up), not a grid of the other format', async () => {
    const dir = freshDir();
    const json = join(dir, 'grid.json');
    const csv = join(dir, 'grid.csv');
    const [a, b] = await Promise.all([
      runCli([...WINDOWS, '--system', SYSTEM, '--grid-out', json]),
      runCli([...WINDOWS, '--system', SYSTEM, '--grid-out', csv]),
    ]);
    expect([a.code, b.code]).toEqual([0, 0]);
    expect((await identifyFile(json)).kind).toBe('grid-json');
    expect((await identifyFile(csv)).kind).toBe('grid-csv');
    const again = await runCli([...WINDOWS, '--system', SYSTEM, '--grid-out', json, '--depart', '0d..300d']);
    expect(again.code).toBe(0);
    expect(readFileSync(`${json}.bak`, 'utf8')).not.toBe(readFileSync(json, 'utf8'));
    const other = join(dir, 'other.json');
    writeFileSync(other, readFileSync(csv));
    expectRefused(
      await runCli([...WINDOWS, '--system', SYSTEM, '--grid-out', other]),
      `--grid-out ${other}: not written: it holds a porkchop grid (CSV), not a porkchop grid (JSON)`,
    );
  });
});
