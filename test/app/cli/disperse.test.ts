import { describe, expect, it } from 'vitest';
import { runCli } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';

describe.concurrent('waymark disperse', () => {
  it('prints the probabilities and percentiles and exits 0', async () => {
    const r = await runCli(['disperse', DEMO, '--samples', '100', '--mag-sigma', '0.1', '--point-sigma', '0.05', '--workers', '1']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^dispersion of Long Patience to Ochre: 100 samples, seed 1/);
    expect(r.stdout).toMatch(/P\(margin >= 0\)\s+\d+\.\d\d %/);
    expect(r.stdout).toMatch(/margin m\/s\s+p5 -?\d+\.\d\s+p50 -?\d+\.\d\s+p95 -?\d+\.\d/);
    expect(r.stdout).toMatch(/P\(periapsis >= 40\.0 km\)/);
  });

  it('gives the same numbers on 1 and 3 workers (--json)', async () => {
    const args = ['disperse', DEMO, '--samples', '120', '--seed', '5', '--mag-sigma', '0.2', '--point-sigma', '0.1', '--resolve', 'retarget', '--json'];
    const [a, b] = await Promise.all([runCli([...args, '--workers', '1']), runCli([...args, '--workers', '3'])]);
    expect(a.code).toBe(0);
    expect(b.code).toBe(0);
    const ja = JSON.parse(a.stdout);
    const jb = JSON.parse(b.stdout);
    expect(jb.workers).toBe(3);
    for (const k of ['pMarginHolds', 'pPeriapsisSafe', 'pArrive', 'margin', 'periapsisAltitude', 'nominal']) expect(jb[k]).toEqual(ja[k]);
  });

  it('zero σ: P(margin holds) is exactly 1 for the demo', async () => {
    const r = await runCli(['disperse', DEMO, '--samples', '20', '--mag-sigma', '0', '--point-sigma', '0', '--json', '--workers', '1']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.pMarginHolds).toBe(1);
    expect(j.margin.p5).toBe(j.margin.p95);
  });

  it('exits 2 for bad options', async () => {
    const r = await runCli(['disperse', DEMO, '--samples', '0']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--samples must be a whole number >= 1');
    const s = await runCli(['disperse', DEMO, '--samples', '5', '--point-sigma', '-1']);
    expect(s.code).toBe(2);
  });
});
