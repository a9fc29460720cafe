import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { gameScheduleCsvColumns, readGameScheduleJson } from '../../../core/io/index.ts';
import { decodeRuntimeBinary, trackIndex, trackPosition } from '../../../core/runtime/index.ts';
import { runCli } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';
const dir = mkdtempSync(join(tmpdir(), 'waymark-handoff-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The demo at a game's 1/60 s, long coasts extrapolated in the verification (seconds, not the minute every step takes). */
const FAST = ['handoff', DEMO, '--integrator', 'symplectic-euler', '--dt', '1/60', '--verify', 'extrapolated'];

describe.concurrent('waymark handoff', () => {
  it('retargets the demo for semi-implicit Euler at 1/60 s and writes a schedule that reads back with the burns it reports', async () => {
    const json = join(dir, 'demo.schedule.json');
    const csv = join(dir, 'demo.schedule.csv');
    const bin = join(dir, 'demo.runtime.bin');
    const r = await runCli([
      ...FAST,
      '--schedule',
      json,
      '--csv',
      csv,
      '--runtime',
      bin,
      '--length',
      'km',
      '--time',
      'steps',
      '--axes',
      'y-up-left-handed',
      '--json',
    ]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const rt = out.retarget;
    expect(rt.status).toBe('met');
    expect(rt.verification.mode).toBe('extrapolated');
    expect(out.written).toEqual([json, csv, bin]);
    // every goal's retargeted value within its tolerance, recomputed here from the figures
    expect(rt.goals.length).toBeGreaterThan(0);
    for (const g of rt.goals) {
      expect(g.met).toBe(true);
      expect(Math.abs(g.after - g.wanted)).toBeLessThanOrEqual(g.tolerance);
    }
    // the JSON file: a game schedule in km, steps and y-up left-handed axes, which reads back to the burns reported (SI, Waymark axes)
    const doc = JSON.parse(readFileSync(json, 'utf8'));
    expect(doc.units).toEqual({ length: 'km', time: 'steps', axes: 'y-up-left-handed' });
    const back = readGameScheduleJson(doc);
    expect(back.physics.integrator).toBe('symplectic-euler');
    expect(back.burns.map((b) => b.step)).toEqual(rt.schedule.burns.map((b: { step: number }) => b.step));
    back.burns.forEach((b, k) => {
      const want = rt.schedule.burns[k].dv as number[];
      // the round trip (÷1000 km, ×dt per step, an axis swap) rounds in the last bits only: 1e-9 m/s of Δv of kilometres per second
      for (let i = 0; i < 3; i++) expect(Math.abs(b.dv[i] - want[i])).toBeLessThan(1e-9);
    });
    // the CSV: the header for these units, one row per burn
    const lines = readFileSync(csv, 'utf8').trimEnd().split('\r\n');
    expect(lines[0]).toBe(gameScheduleCsvColumns({ length: 'km', time: 'steps', axes: 'y-up-left-handed' }).join(','));
    expect(lines.length - 1).toBe(rt.schedule.burns.length);
    expect(lines.slice(1).map((l) => Number(l.split(',')[0]))).toEqual(back.burns.map((b) => b.step));
    // the runtime file (binary, by its name): every track within its stated fit, as the report says; the ship starts where the schedule does
    const buf = readFileSync(bin);
    const data = decodeRuntimeBinary(buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength) as ArrayBuffer);
    expect(data.tracks.map((t) => ({ name: t.name, kind: t.kind, tolerance: t.tolerance, maxError: t.maxError }))).toEqual(out.runtime);
    for (const t of data.tracks) expect(t.maxError).toBeLessThanOrEqual(t.tolerance);
    const ship = trackIndex(data, 'ship');
    expect(data.tracks[ship].arcs[0].center.toLowerCase()).toBe(back.start.central.toLowerCase());
    const p = trackPosition(data, ship, back.t0, [0, 0, 0]);
    // within the ship track's tolerance (10 m by default) of the schedule's start position
    expect(Math.hypot(p[0] - back.start.state[0], p[1] - back.start.state[1], p[2] - back.start.state[2])).toBeLessThanOrEqual(data.tracks[ship].tolerance);
  });

  it('text output: the verdict, the goals table, the burns table and the verification; the file written named', async () => {
    const csv = join(dir, 'text.schedule.csv');
    const t = await runCli([...FAST, '--csv', csv]);
    expect(t.code).toBe(0);
    expect(t.stdout).toMatch(/written: .*text\.schedule\.csv/);
    expect(readFileSync(csv, 'utf8').split('\r\n')[0]).toBe(gameScheduleCsvColumns().join(','));
    expect(t.stdout).toMatch(/verdict: MET/);
    expect(t.stdout).toMatch(/wanted +plan's burns in the game +retargeted +tolerance/);
    expect(t.stdout).toMatch(/periapsis time at Ochre +\d+-\d+T\d\d:\d\d:\d\d/);
    expect(t.stdout).toMatch(/Departure +\d+ +\d+-\d+T/);
    expect(t.stdout).toMatch(/verification: long coasts extrapolated; [\d,]+ game steps flown/);
  });

  it('a step too coarse (velocity Verlet at 120 s): exit 1, the goals missed and the step that works, no schedule written', async () => {
    const json = join(dir, 'coarse.schedule.json');
    const r = await runCli(['handoff', DEMO, '--integrator', 'verlet', '--dt', '120', '--verify', 'extrapolated', '--schedule', json, '--json']);
    expect(r.code).toBe(1);
    const rt = JSON.parse(r.stdout).retarget;
    expect(rt.status).toBe('not-met');
    expect(rt.goals.some((g: { met: boolean }) => !g.met)).toBe(true);
    expect(rt.recommendation.reason).toBe('step');
    expect(rt.recommendation.dt).toBeLessThan(120);
    expect(JSON.parse(r.stdout).written).toEqual([]);
    expect(() => readFileSync(json)).toThrow(/ENOENT/);
  });

  it('bad flags exit 2 with a message naming the flag, before any work', async () => {
    const cases: [string[], RegExp][] = [
      [['--verify', 'sometimes'], /--verify must be one of: every-step, extrapolated/],
      [['--tolerance-altitude', '0'], /--tolerance-altitude must be a length > 0/],
      [['--tolerance-inclination', '-1'], /--tolerance-inclination must be an angle > 0/],
      [['--tolerance-time', '5parsecs'], /--tolerance-time has unknown unit/],
      [['--axes', 'x-up'], /--axes must be one of "z-up-right-handed"/],
      [['--length', 'mi'], /--length must be one of "m", "km"/],
      [['--time', 'min'], /--time must be one of "s", "steps"/],
      [['--dt', '0'], /--dt must be a step > 0/],
      [['--integrator', 'leapfrogger'], /--integrator must be one of/],
      [['--gravity', 'some'], /--gravity must be one of: central, all/],
      [['--no-such-flag'], /unknown option '--no-such-flag'/],
    ];
    const runs = await Promise.all(cases.map(([args]) => runCli(['handoff', DEMO, ...args])));
    runs.forEach((r, k) => {
      expect(r.code, cases[k][0].join(' ')).toBe(2);
      expect(r.stderr).toMatch(cases[k][1]);
      expect(r.stdout).toBe('');
    });
    const both = await runCli(['handoff', DEMO, '--schedule', '-', '--json']);
    expect(both.code).toBe(2);
    expect(JSON.parse(both.stdout).error.field).toBe('--schedule');
  });

  it('an existing file Waymark did not write is not overwritten, nor the plan itself', async () => {
    const mine = join(dir, 'notes.json');
    writeFileSync(mine, '{"level": 3}\n');
    const r = await runCli(['handoff', DEMO, '--schedule', mine]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--schedule .*notes\.json: not written: it holds a JSON document Waymark did not write/);
    expect(readFileSync(mine, 'utf8')).toBe('{"level": 3}\n');
    const plan = readFileSync(DEMO, 'utf8');
    const over = await runCli(['handoff', DEMO, '--csv', DEMO]);
    expect(over.code).toBe(2);
    expect(over.stderr).toMatch(/--csv .*: not written: it is the plan file being retargeted/);
    expect(readFileSync(DEMO, 'utf8')).toBe(plan);
  });
});
