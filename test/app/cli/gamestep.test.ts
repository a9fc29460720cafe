import { describe, expect, it } from 'vitest';
import { runCli } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';

describe.concurrent('waymark gamestep', () => {
  it('flies the demo plan with a game step and prints the check as JSON (exit code follows the verdict)', async () => {
    const r = await runCli(['gamestep', DEMO, '--integrator', 'verlet', '--dt', '8', '--max-steps', '400000', '--json']);
    expect(r.stderr).toBe('');
    const out = JSON.parse(r.stdout);
    expect(out.plan).toBe('Long Patience to Ochre');
    const c = out.check;
    expect(c.physics).toEqual({ integrator: 'verlet', dt: 8, precision: 'float64', rebase: null, gravity: 'central', burns: 'impulsive', guidance: 'resolve' });
    expect(c.tolerance).toBe(10000); // the plan target's periapsis tolerance
    expect(c.spans.map((s: { mode: string }) => s.mode)).toEqual(['flown', 'flown', 'flown', 'extrapolated', 'flown', 'flown', 'flown', 'flown']);
    expect(Array.isArray(c.series.t)).toBe(true);
    expect(c.series.positionError.length).toBe(c.series.t.length);
    expect(typeof c.arrival.positionError).toBe('number');
    expect(r.code).toBe(c.passes ? 0 : 1);
    expect(out.sweep).toBeNull();
  });

  it('float32, floating origin, fraction step and km tolerance; text output', async () => {
    const r = await runCli([
      'gamestep',
      DEMO,
      '--integrator',
      'symplectic-euler',
      '--dt',
      '1/2',
      '--float32',
      '--rebase',
      '--rebase-distance',
      '5',
      '--tolerance',
      '50',
      '--max-steps',
      '200000',
    ]);
    expect(r.stderr).toBe('');
    expect(r.stdout).toMatch(
      /physics: semi-implicit Euler \(symplectic-euler\), dt 0\.500000 s, float32, floating origin at 5\.00 km \(position and velocity\)/,
    );
    expect(r.stdout).toMatch(/tolerance 50\.00 km/);
    expect(r.stdout).toMatch(/float32 at the mission's distances/);
    expect(r.stdout).toMatch(/verdict: (PASSES|FAILS)/);
    expect(r.code).toBe(/verdict: PASSES/.test(r.stdout) ? 0 : 1);
    // a path beyond the tolerance on the way is never a plain PASSES
    if (/tolerance .* first exceeded/.test(r.stdout)) expect(r.stdout).not.toMatch(/verdict: PASSES\n/);
  });

  it('--coast-step flies long coasts as a long-step coast; --warp-dt is another name for it', async () => {
    const args = ['gamestep', DEMO, '--integrator', 'verlet', '--dt', '10', '--max-steps', '100000'];
    const [a, b, bad, badOld] = await Promise.all([
      runCli([...args, '--coast-step', '120']),
      runCli([...args, '--warp-dt', '120']),
      runCli([...args, '--coast-step', '-5']),
      runCli([...args, '--warp-dt', '0']),
    ]);
    expect(a.stderr).toBe('');
    expect(b.stdout).toBe(a.stdout);
    // the cruise about Ilmar (8 million game steps at 10 s) is flown at 120 s
    expect(a.stdout).toMatch(/Ilmar .* long-step +120\.00 s/);
    expect(a.stdout).toMatch(/long-step coast \d+\.\d+ d,/);
    expect(a.stdout).not.toMatch(/warp/i);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('--coast-step must be a step > 0');
    expect(badOld.code).toBe(2);
    expect(badOld.stderr).toContain('--warp-dt must be a step > 0');
    const help = await runCli(['gamestep', '--help']);
    expect(help.stdout).toContain('--coast-step <seconds>');
    expect(help.stdout).toContain('also --warp-dt');
  });

  it('--sweep adds the step ladder and the precision verdict', async () => {
    const r = await runCli(['gamestep', DEMO, '--integrator', 'rk4', '--dt', '16', '--max-steps', '500000', '--sweep', '--dt-max', '32', '--json']);
    const out = JSON.parse(r.stdout);
    expect(out.sweep.ladder).toEqual([16, 32]);
    expect(out.sweep.best.map((b: { integrator: string }) => b.integrator)).toEqual(['symplectic-euler', 'verlet', 'explicit-euler', 'rk4']);
    expect(['float32', 'float32-rebase', 'float64', 'none']).toContain(out.sweep.precision.verdict);
    expect(out.sweep.precision.rows.length).toBe(3);
  });

  it('bad options exit 2 with the field named', async () => {
    const r = await runCli(['gamestep', DEMO, '--integrator', 'leapfrog', '--dt', '1', '--json']);
    expect(r.code).toBe(2);
    expect(JSON.parse(r.stdout).error.field).toBe('--integrator');
    const d = await runCli(['gamestep', DEMO, '--integrator', 'verlet', '--dt', '-3']);
    expect(d.code).toBe(2);
    expect(d.stderr).toMatch(/--dt/);
  });
});
