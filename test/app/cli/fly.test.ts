import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCsv } from '../../../core/io/csv.ts';
import { parseOem } from '../../../core/io/oem.ts';
import { parsePlanFile } from '../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { sampleEphemeris } from '../../../core/conic/ephemerisSampler.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { ROOT, runCli, type CliRun } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';
const work = mkdtempSync(join(tmpdir(), 'waymark-fly-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const oem = join(work, 'demo.oem');
const csv = join(work, 'demo.csv');
const burns = join(work, 'burns.csv');
const report = join(work, 'report.md');
let run: CliRun;
beforeAll(async () => {
  run = await runCli(['fly', DEMO, '--oem', oem, '--csv', csv, '--burns', burns, '--report', report, '--step', '6h', '--json']);
});

describe('waymark fly', () => {
  it('flies the demo plan and reports the files it wrote', () => {
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const out = JSON.parse(run.stdout);
    expect([out.model, out.truthModel, out.reached]).toEqual(['conic', 'conic', true]); // the plan's truth model when --model is not given
    expect(out.files).toEqual({ oem, csv, burns, report });
    expect(out.events[0].kind).toBe('start');
  });

  it('--oem writes a file the OEM parser accepts, with the states the core computes', () => {
    const msg = parseOem(readFileSync(oem, 'utf8'));
    expect(msg.segments.map((s) => s.metadata.CENTER_NAME)).toEqual(['TESSEL', 'ILMAR', 'OCHRE']);
    // The same flight in this process, sampled at the same step.
    const system = parseSystemFile(readFileSync(join(ROOT, 'assets/systems/ilmar.system.json'), 'utf8')).system;
    const plan = parsePlanFile(readFileSync(join(ROOT, DEMO), 'utf8')).plan;
    const eph = sampleEphemeris(system, evaluate(system, plan), { step: 6 * 3600 });
    expect(msg.segments.length).toBe(eph.spans.length);
    msg.segments.forEach((seg, k) => {
      const span = eph.spans[k];
      expect(seg.t.length).toBe(span.t.length);
      for (let j = 0; j < span.t.length; j++) {
        expect(Math.abs(seg.t[j] - span.t[j])).toBeLessThan(1e-6);
        for (let c = 0; c < 3; c++) {
          // Printed to 1 mm and 1 µm/s; Ilmar-centred positions (~1.8e11 m) carry ~3e-5 m of rounding.
          expect(Math.abs(seg.states[6 * j + c] - span.states[6 * j + c])).toBeLessThan(6e-4);
          expect(Math.abs(seg.states[6 * j + 3 + c] - span.states[6 * j + 3 + c])).toBeLessThan(6e-7);
        }
      }
    });
  });

  it('--csv, --burns and --report write the ephemeris, the burn table and the Markdown report', () => {
    const rows = parseCsv(readFileSync(csv, 'utf8'));
    expect(rows[0]).toEqual(['t_s', 'x_m', 'y_m', 'z_m', 'vx_mps', 'vy_mps', 'vz_mps', 'mass_kg', 'central']);
    expect(new Set(rows.slice(1).map((r) => r[8]))).toEqual(new Set(['tessel', 'ilmar', 'ochre']));
    const b = parseCsv(readFileSync(burns, 'utf8'));
    expect(b.slice(1).map((r) => r[2])).toEqual(['departure', 'mid-course', 'capture', 'plane', 'trim']);
    const md = readFileSync(report, 'utf8');
    expect(md).toContain('# Δv budget: Long Patience to Ochre');
    expect(md).toContain('**The margin holds.**');
  });

  it('--model nbody on the demo (targeted in patched conics): flies the same burns through n-body gravity, reports the arrival difference, writes a valid OEM, and exits 1 naming the missed periapsis', async () => {
    const file = join(work, 'nbody.oem');
    const r = await runCli(['fly', DEMO, '--model', 'nbody', '--oem', file, '--step', '6h', '--json']);
    expect(r.code).toBe(1);
    const out = JSON.parse(r.stdout);
    expect([out.model, out.truthModel, out.reached]).toEqual(['nbody', 'conic', false]);
    expect(out.nbody.spans.length).toBeGreaterThan(0);
    for (const s of out.nbody.spans) expect(typeof s.reason).toBe('string');
    expect(out.nbody.arrival.conic.altitude).toBeGreaterThan(0);
    expect(Number.isFinite(out.nbody.arrival.missDistance)).toBe(true);
    // the n-body flight of the patched-conic burns passes Ochre far off: the periapsis goal is not met
    const peri = out.goals.find((g: { name: string }) => g.name === 'periapsis altitude about Ochre');
    expect(peri.met).toBe(false);
    expect(Math.abs(peri.value - peri.wanted)).toBeGreaterThan(peri.tolerance);
    const oem = parseOem(readFileSync(file, 'utf8'));
    expect(oem.segments.length).toBeGreaterThan(1);
    for (const seg of oem.segments) expect(seg.states.length).toBeGreaterThan(0);
    expect(oem.comments.join(' ')).toContain('n-body');
  });

  it('an unknown model or a bad step: exit 2 naming the option', async () => {
    const [a, b] = await Promise.all([runCli(['fly', DEMO, '--model', 'warp']), runCli(['fly', DEMO, '--step', '-5', '--oem', join(work, 'x.oem')])]);
    expect(a.code).toBe(2);
    expect(a.stderr).toContain('--model must be one of: conic, finite, nbody');
    expect(b.code).toBe(2);
    expect(b.stderr).toContain('--step');
  });
});
