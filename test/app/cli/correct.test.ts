import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadPlanFile } from '../../../app/node/files.ts';
import type { BurnEvent } from '../../../core/plan/plan.ts';
import { ROOT, runCli } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';
const work = mkdtempSync(join(tmpdir(), 'waymark-correct-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe.concurrent('waymark correct', () => {
  it('converges on the demo, writes a corrected plan that loads, and exits 0', async () => {
    const out = join(work, 'corrected.plan.json');
    const r = await runCli(['correct', DEMO, '-o', out]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/converged in \d+ iterations/);
    expect(r.stdout).toMatch(/burn mid-course: Δv \[.*\] → \[.*\] m\/s \(inertial\), change \d+\.\d{3} m\/s/);
    expect(r.stdout).toMatch(/margin \d+\.\d → \d+\.\d m\/s/);
    expect(r.stdout).toContain(`wrote ${out}`);
    const loaded = await loadPlanFile(out); // its system path was re-rooted at the new folder
    const mc = loaded.plan.events.find((e) => e.id === 'mid-course') as BurnEvent;
    expect(mc.solve.kind).toBe('fixed');
    expect(mc.frame).toBe('inertial');
    expect(loaded.system.name).toBe('Ilmar');
    // each burn carries what was solved (derived), and it is what the plan gives on open
    const written = JSON.parse(readFileSync(out, 'utf8')) as { events: { type: string; resolved?: { model: string } }[] };
    const burns = written.events.filter((e) => e.type === 'burn');
    expect(burns.length).toBeGreaterThan(0);
    for (const b of burns) expect(b.resolved?.model).toBe(loaded.plan.truthModel ?? 'conic');
    expect(loaded.warnings.filter((w) => w.path.endsWith('.resolved'))).toEqual([]);
  });

  it('--json: one document with the iterations, the correction and the margins', async () => {
    const out = join(work, 'c2.plan.json');
    const r = await runCli(['correct', join(ROOT, DEMO), '-o', out, '--json', '--burn', 'mid-course']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.converged).toBe(true);
    expect(doc.burns[0].planEventId).toBe('mid-course');
    expect(doc.correctionDv).toBeGreaterThan(0);
    expect(doc.history.length).toBe(doc.iterations + 1);
    expect(Math.abs(doc.achieved.altitude - doc.desired.altitude)).toBeLessThan(100);
  });

  it('exits 3 with the last residual when it does not converge, and writes nothing', async () => {
    const out = join(work, 'never.plan.json');
    const r = await runCli(['correct', DEMO, '-o', out, '--max-iterations', '1']);
    expect(r.code).toBe(3);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^waymark: correct: no-convergence: no convergence after 1 iteration: the n-body periapsis at Ochre is off by/);
    expect(existsSync(out)).toBe(false);
  });

  it('exits 2 for a bad burn choice', async () => {
    const r = await runCli(['correct', DEMO, '-o', join(work, 'x.plan.json'), '--burn', 'nope']);
    expect(r.code).toBe(2);
    // in the command line's words: the option, not the core's options.burns
    expect(r.stderr).toContain('waymark: --burn names no burn of the plan ("nope")');
  });
});
