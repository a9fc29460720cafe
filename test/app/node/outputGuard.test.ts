/**
 * The output guard of app/node/files.ts (checkOutput, checkOutputs, identifyFile): what an
 * output may replace, what it never may, and that its messages name the option and the path as
 * the user wrote them. The exports are recognised by their writers' own output (core/io), not
 * by hand-written samples.
 */
import { execFileSync } from 'node:child_process';
import { linkSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { sampleEphemeris } from '../../../core/conic/ephemerisSampler.ts';
import { burnTableCsv, ephemerisCsv } from '../../../core/io/csv.ts';
import { writeOem } from '../../../core/io/oem.ts';
import { serializePlanFile } from '../../../core/io/planFile.ts';
import { budgetReport } from '../../../core/io/report.ts';
import { gameScheduleCsv, gameScheduleJson } from '../../../core/io/gameSchedule.ts';
import type { GameSchedule } from '../../../core/handoff/index.ts';
import { encodeRuntimeBinary, encodeRuntimeJson, runtimeEphemeris } from '../../../core/runtime/index.ts';
import {
  FileError,
  checkOutput,
  checkOutputs,
  identifyFile,
  savePlanFile,
  writeOutput,
  writeStdout,
  type OutputKind,
  type OutputTarget,
  type StdoutLike,
} from '../../../app/node/files.ts';
import { NEWER_VERSION_RULE } from '../../../app/preload/fileHeader.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem, demoSystemText } from '../../fuzz/files.ts';
import { samplePlan } from '../../core/io/planSamples.ts';

const ROOT = new URL('../../../', import.meta.url).pathname;
const SYSTEM = join(ROOT, 'assets/systems/ilmar.system.json');
const work = mkdtempSync(join(tmpdir(), 'waymark-guard-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

let n = 0;
function freshDir(): string {
  const d = join(work, `case-${n++}`);
  mkdirSync(d);
  return d;
}

type Exports = Record<'oem' | 'csv' | 'burns-csv' | 'report' | 'schedule-json' | 'schedule-csv' | 'runtime-json' | 'runtime-bin', string | Uint8Array>;

/** A small burn schedule for a game (one impulse), as `waymark handoff` writes it through core/io. */
const schedule: GameSchedule = {
  plan: 'Guard test',
  system: 'Ilmar',
  physics: { integrator: 'verlet', dt: 1 / 60, precision: 'float64', rebase: null, gravity: 'central', burns: 'impulsive', guidance: 'open-loop' },
  t0: 1000,
  start: { central: 'Tessel', state: [6.2e6, 0, 0, 0, 8000, 0] },
  endStep: 600,
  burns: [{ id: 'b', name: 'Burn', step: 60, t: 1001, dv: [0, 10, 0], dvMag: 10, dvBurnFrame: [10, 0, 0], change: [0, 0, 0], central: 'Tessel', thrust: null }],
};
let exportsMade: Exports | null = null;

/** The four exports of the demo plan, as core/io writes them (made once). */
function exportsOfDemo(): Exports {
  exportsMade ??= makeExports();
  return exportsMade;
}

function makeExports(): Exports {
  const system = demoSystem();
  const plan = structuredClone(demoPlan);
  const result = evaluate(system, plan);
  const eph = sampleEphemeris(system, result, { step: 86400 });
  // the bodies over one day: a small runtime ephemeris, as `waymark handoff --runtime` writes it through core/runtime
  const runtime = runtimeEphemeris(system, { t0: 0, t1: 86400 });
  return {
    oem: writeOem(system, eph, { objectName: plan.vehicle.name, creationDate: '2000-01-01T00:00:00' }),
    csv: ephemerisCsv(system, eph),
    'burns-csv': burnTableCsv(result.budget),
    report: budgetReport(system, plan, result),
    'schedule-json': `${JSON.stringify(gameScheduleJson(schedule), null, 2)}\n`,
    'schedule-csv': gameScheduleCsv(schedule, { length: 'km', time: 'steps' }),
    'runtime-json': `${JSON.stringify(encodeRuntimeJson(runtime))}\n`,
    'runtime-bin': new Uint8Array(encodeRuntimeBinary(runtime)),
  };
}

const planText = (version = 1): string => {
  const doc = JSON.parse(serializePlanFile(samplePlan(), { kind: 'path', path: SYSTEM })) as Record<string, unknown>;
  doc.version = version;
  return JSON.stringify(doc, null, 2);
};
const systemText = (version = 1): string => {
  const doc = JSON.parse(demoSystemText()) as Record<string, unknown>;
  doc.version = version;
  return JSON.stringify(doc, null, 2);
};

/** Writes `text` to a fresh file and returns its path. */
function fileWith(name: string, text: string | Uint8Array): string {
  const p = join(freshDir(), name);
  writeFileSync(p, text);
  return p;
}

describe('identifyFile', () => {
  it("recognises each export by its writer's own output, and plans and systems by their header", async () => {
    const texts = exportsOfDemo();
    for (const [kind, text] of Object.entries(texts)) expect((await identifyFile(fileWith(`x.${kind}`, text))).kind).toBe(kind);
    expect(await identifyFile(fileWith('p.json', planText(1)))).toEqual({ kind: 'plan', version: 1 });
    expect(await identifyFile(fileWith('s.json', systemText(2)))).toEqual({ kind: 'system', version: 2 });
    expect((await identifyFile(fileWith('e.txt', ''))).kind).toBe('empty');
    expect((await identifyFile(fileWith('w.txt', ' \n\t'))).kind).toBe('empty');
    expect((await identifyFile(fileWith('j.json', '{"token":"secret"}'))).kind).toBe('json');
    expect((await identifyFile(fileWith('d.json', '{"format": "waymark-plan", "version": 2'))).kind).toBe('json'); // damaged
    expect((await identifyFile(fileWith('n.txt', 'notes to self'))).kind).toBe('unknown');
  });
});

describe('checkOutput: what an output may replace', () => {
  const T = (flag: string, path: string, kind: OutputKind): OutputTarget => ({ flag, path, kind });

  it('a missing file, an empty file, and a previous export of the same kind: allowed', async () => {
    const dir = freshDir();
    await expect(checkOutput(T('--csv', join(dir, 'new.csv'), 'csv'))).resolves.toBe(join(dir, 'new.csv'));
    await expect(checkOutput(T('--csv', fileWith('empty.csv', ''), 'csv'))).resolves.toBeTruthy();
    const texts = exportsOfDemo();
    for (const kind of ['oem', 'csv', 'burns-csv', 'report', 'schedule-json', 'schedule-csv', 'runtime-json', 'runtime-bin'] as const) {
      await expect(checkOutput(T(`--${kind}`, fileWith(`old.${kind}`, texts[kind]), kind))).resolves.toBeTruthy();
    }
    await expect(checkOutput(T('--output', fileWith('old.plan.json', planText(1)), 'plan'))).resolves.toBeTruthy();
  });

  it('standard output is no file: nothing to check', async () => {
    await expect(checkOutput(T('--csv', '-', 'csv'))).resolves.toBeNull();
  });

  it('never one of the inputs: by its own path, through a symbolic link, through a hard link', async () => {
    const dir = freshDir();
    const plan = join(dir, 'trip.plan.json');
    writeFileSync(plan, planText());
    const sym = join(dir, 'sym.csv');
    symlinkSync(plan, sym);
    const hard = join(dir, 'hard.csv');
    linkSync(plan, hard);
    const inputs = [{ path: plan, what: 'the plan file being flown' }];
    for (const p of [plan, sym, hard]) {
      await expect(checkOutput(T('--csv', p, 'csv'), { inputs })).rejects.toThrow(
        `--csv ${p}: not written: it is the plan file being flown, an input of this command; choose another file`,
      );
    }
    // the same file written as the plan it is: still an input
    await expect(checkOutput(T('--output', plan, 'plan'), { inputs })).rejects.toThrow(/an input of this command/);
  });

  it('never a folder, a FIFO or a device; the message names the option, the path and standard output', async () => {
    const dir = freshDir();
    await expect(checkOutput(T('--grid-out', dir, 'grid-json'))).rejects.toThrow(`--grid-out ${dir}: not written: it is a folder; name a file`);
    const pipe = join(dir, 'pipe.csv');
    execFileSync('mkfifo', [pipe]);
    await expect(checkOutput(T('--csv', pipe, 'csv'))).rejects.toThrow(
      `--csv ${pipe}: not written: it is not a regular file (it is a FIFO (named pipe)); Waymark writes regular files, or standard output with --csv -`,
    );
    await expect(checkOutput(T('--oem', '/dev/null', 'oem'))).rejects.toThrow(
      /--oem \/dev\/null: not written: it is not a regular file \(it is a character device\)/,
    );
  });

  it('a plan or system file is replaced only by its own kind, never when a newer Waymark wrote it', async () => {
    const texts = exportsOfDemo();
    const plan = fileWith('a.plan.json', planText(1));
    const system = fileWith('a.system.json', systemText(1));
    await expect(checkOutput(T('--report', plan, 'report'))).rejects.toThrow(
      `--report ${plan}: not written: it is a Waymark plan file, which a Markdown budget report would replace; choose another file`,
    );
    await expect(checkOutput(T('--output', system, 'plan'))).rejects.toThrow(
      `--output ${system}: not written: it is a Waymark system file, which a Waymark plan file would replace`,
    );
    await expect(checkOutput(T('--grid-out', system, 'grid-json'))).rejects.toThrow(/it is a Waymark system file/);
    const newerPlan = fileWith('v2.plan.json', planText(2));
    const newerSystem = fileWith('v2.system.json', systemText(2));
    await expect(checkOutput(T('--output', newerPlan, 'plan'))).rejects.toThrow(
      `--output ${newerPlan}: not written: it ${NEWER_VERSION_RULE} (plan file version 2; this program writes version 1); saving would lose what that version added — choose another file`,
    );
    await expect(checkOutput(T('--report', newerPlan, 'report'))).rejects.toThrow(NEWER_VERSION_RULE);
    await expect(checkOutput(T('--output', newerSystem, 'plan'))).rejects.toThrow(/system file version 2/);
    // desktop rules: the dialog asked "replace?", yet plan and system files stay protected
    await expect(checkOutput(T('Export', plan, 'report'), { unidentified: 'replace' })).rejects.toThrow(/it is a Waymark plan file/);
    await expect(checkOutput(T('Export', fileWith('b.md', texts.csv), 'report'), { unidentified: 'replace' })).resolves.toBeTruthy();
  });

  it('on the command line, another kind of export, JSON Waymark cannot identify or any other text: refused', async () => {
    const texts = exportsOfDemo();
    const burns = fileWith('burns.csv', texts['burns-csv']);
    await expect(checkOutput(T('--csv', burns, 'csv'))).rejects.toThrow(
      `--csv ${burns}: not written: it holds a burn table (CSV), not an ephemeris CSV; Waymark replaces only its own ephemeris CSV — choose another file or remove it first`,
    );
    const json = fileWith('settings.json', '{"token":"secret"}');
    await expect(checkOutput(T('--grid-out', json, 'grid-json'))).rejects.toThrow(
      /it holds a JSON document Waymark did not write, not a porkchop grid \(JSON\)/,
    );
    const notes = fileWith('notes.md', 'my notes');
    await expect(checkOutput(T('--report', notes, 'report'))).rejects.toThrow(/it holds a file Waymark did not write, not a Markdown budget report/);
    await expect(checkOutput(T('Export', notes, 'report'), { unidentified: 'replace' })).resolves.toBeTruthy();
  });
});

describe('checkOutputs: the outputs of one command together', () => {
  it('no two to one file (also through a link), at most one to standard output', async () => {
    const dir = freshDir();
    const a = join(dir, 'a.csv');
    await expect(
      checkOutputs([
        { flag: '--csv', path: a, kind: 'csv' },
        { flag: '--burns', path: a, kind: 'burns-csv' },
      ]),
    ).rejects.toThrow(`--burns ${a}: not written: --csv writes the same file; give each output its own file`);
    writeFileSync(a, '');
    const link = join(dir, 'link.csv');
    symlinkSync(a, link);
    await expect(
      checkOutputs([
        { flag: '--csv', path: a, kind: 'csv' },
        { flag: '--burns', path: link, kind: 'burns-csv' },
      ]),
    ).rejects.toThrow(/--csv writes the same file/);
    await expect(
      checkOutputs([
        { flag: '--csv', path: '-', kind: 'csv' },
        { flag: '--oem', path: '-', kind: 'oem' },
      ]),
    ).rejects.toThrow('--oem -: not written: --csv and --oem cannot all go to standard output; give all but one a file');
  });
});

describe('writeOutput and savePlanFile go through the guard', () => {
  it('refuse before writing: the file in the way is unchanged and no backup is made', async () => {
    const plan = fileWith('keep.plan.json', planText(1));
    const before = readFileSync(plan, 'utf8');
    await expect(writeOutput({ flag: '--csv', path: plan, kind: 'csv' }, 't_s\n')).rejects.toThrow(FileError);
    expect(readFileSync(plan, 'utf8')).toBe(before);
    const system = fileWith('keep.system.json', systemText(1));
    await expect(savePlanFile(system, samplePlan(), { kind: 'path', path: SYSTEM })).rejects.toThrow(`cannot save ${system}: it is a Waymark system file`);
    await expect(savePlanFile(system, samplePlan(), { kind: 'path', path: SYSTEM }, { flag: '-o' })).rejects.toThrow(`-o ${system}: not written:`);
    expect(readFileSync(system, 'utf8')).toBe(systemText(1));
  });
});

describe('writeStdout', () => {
  /** A stream that records what it is given and answers each write with `err`. */
  const stream = (isTTY: boolean, err: (Error & { code?: string }) | null = null) => {
    const got: string[] = [];
    const out: StdoutLike = {
      isTTY,
      write: (chunk, callback) => {
        got.push(chunk);
        callback(err);
        return true;
      },
      on: () => undefined,
    };
    return { out, got };
  };
  const shout = (t: string): string => t.toUpperCase();

  it('hands the text over as it is to a pipe, through forTerminal to a terminal', async () => {
    const pipe = stream(false);
    await writeStdout('a\u001b[2J', pipe.out, { forTerminal: shout });
    expect(pipe.got).toEqual(['a\u001b[2J']);
    const tty = stream(true);
    await writeStdout('abc', tty.out, { forTerminal: shout });
    expect(tty.got).toEqual(['ABC']);
  });

  it('a reader that went away (EPIPE) ends the write quietly; any other error is passed on', async () => {
    await expect(writeStdout('x', stream(false, Object.assign(new Error('broken pipe'), { code: 'EPIPE' })).out)).resolves.toBeUndefined();
    await expect(writeStdout('x', stream(false, Object.assign(new Error('disk full'), { code: 'ENOSPC' })).out)).rejects.toThrow('disk full');
  });
});
