import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ROOT, runCli } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';
const HEAVY = 'assets/plans/tessel-to-ochre-heavy.plan.json';
const work = mkdtempSync(join(tmpdir(), 'waymark-check-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** The demo plan, edited, written beside nothing: its system named by absolute path. */
function editedDemo(name: string, edit: (d: Record<string, any>) => void): string {
  const d = JSON.parse(readFileSync(join(ROOT, DEMO), 'utf8'));
  d.system = { path: join(ROOT, 'assets/systems/ilmar.system.json') };
  edit(d);
  const p = join(work, name);
  writeFileSync(p, JSON.stringify(d, null, 2));
  return p;
}

describe.concurrent('waymark check', () => {
  it('the demo plan: prints the budget and exits 0', async () => {
    const r = await runCli(['check', DEMO]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^plan Long Patience to Ochre — vehicle Long Patience, system Ilmar/);
    for (const burn of ['Departure', 'Mid-course correction', 'Ochre capture', 'Plane change', 'Apoapsis trim']) expect(r.stdout).toContain(burn);
    expect(r.stdout).toMatch(/margin\s+\d+\.\d m\/s {2}HOLDS/);
    expect(r.stdout).toMatch(/target Ochre: reached in patched conics/);
    expect(r.stdout).toMatch(/periapsis altitude about Ochre +400\.0 km +wanted 400\.0 ± 10 km +met/);
    expect(r.stdout).toContain("judged in patched conics (the plan's truth model): HOLDS");
  });

  it('the flyby demo: the Moravel pass is printed with its free Δv beside the burns, not added to the planned total', async () => {
    const j = JSON.parse((await runCli(['check', 'assets/plans/tessel-moravel-fennick.plan.json', '--json'])).stdout);
    const f = j.budget.flybys[0];
    expect(f.name).toBe('Moravel flyby');
    // the planned total is the burns' Δv alone (sum of the rows, to the 0.1 m/s the rows are printed with)
    const rows = j.budget.rows.reduce((a: number, r: { dv: number }) => a + r.dv, 0);
    expect(Math.abs(j.budget.total - rows)).toBeLessThan(1e-6 * rows);
    const t = await runCli(['check', 'assets/plans/tessel-moravel-fennick.plan.json']);
    expect(t.code).toBe(0);
    expect(t.stdout).toMatch(new RegExp(`flyby +${f.freeDv.toFixed(1)} m/s {2}free at Moravel \\(Moravel flyby\\): periapsis \\d+ km`));
  });

  it('the flyby demo read in n-body: the pass printed and in --json is the one measured from the n-body flight', async () => {
    const args = ['check', 'assets/plans/tessel-moravel-fennick.plan.json', '--model', 'nbody'];
    const j = JSON.parse((await runCli([...args, '--json'])).stdout);
    const conic = JSON.parse((await runCli(['check', 'assets/plans/tessel-moravel-fennick.plan.json', '--model', 'conic', '--json'])).stdout);
    const f = j.flybys[0];
    expect(f.periapsisMethod).toBe('probe');
    // the untargeted plan drifts over its 1000-day cruise in n-body: its pass is not the patched-conic one
    // (the n-body periapsis lies far outside the planned one), so the line cannot be the conic reading
    expect(f.periapsisRadius).toBeGreaterThan(2 * conic.flybys[0].periapsisRadius);
    expect(j.budget.flybys[0].freeDv).toBe(f.freeDv);
    const t = await runCli(args);
    expect(t.stdout).toMatch(
      new RegExp(`flyby +${f.freeDv.toFixed(1)} m/s {2}free at Moravel \\(Moravel flyby\\): periapsis ${Math.round(f.periapsisAltitude / 1000)} km`),
    );
  });

  it('the negative-margin demo: exits 1 and says why', async () => {
    const r = await runCli(['check', HEAVY]);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/margin\s+-\d+\.\d m\/s {2}DOES NOT HOLD/);
    expect(r.stdout).toContain('negative-margin');
    expect(r.stdout).toMatch(/DOES NOT HOLD\n {2}- margin -\d+\.\d m\/s is below zero$/m);
  });

  it('a later burn that cannot be solved: the margin is marked not valid and the plan does not hold (exit 1)', async () => {
    // the trim asks for a transfer to Ochre while the ship already orbits it: no solution, flown as 0 m/s of solved Δv
    const p = editedDemo('unsolved-trim.plan.json', (d) => {
      d.target = null;
      d.events.find((e: { id: string }) => e.id === 'trim').solve = { kind: 'transfer', to: 'ochre', arrive_s: 40000000 };
    });
    const [bad, good] = await Promise.all([runCli(['check', p]), runCli(['check', DEMO])]);
    expect(bad.code).toBe(1);
    expect(bad.stdout).toMatch(/margin\s+\d+\.\d m\/s {2}NOT VALID: Apoapsis trim \(row 5\) failed to solve, so its Δv is not counted/);
    expect(bad.stdout).toContain("judged in patched conics (the plan's truth model): DOES NOT HOLD");
    expect(bad.stdout).toMatch(/ {2}- Apoapsis trim: transfer burn not solved/);
    // the unsolved burn counted as 0 m/s leaves more Δv than the solved plan: a margin that looks better, marked not valid
    const margin = (s: string) => Number(/margin\s+(-?\d+\.\d) m\/s/.exec(s)?.[1]);
    expect(margin(bad.stdout)).toBeGreaterThan(margin(good.stdout));
    // each failing condition once
    const lines = bad.stdout.split('\n').filter((l) => l.startsWith('  - '));
    expect(new Set(lines).size).toBe(lines.length);
  });

  it('--model finite on the demo: judged as a comparison, each failing condition named, exit 1', async () => {
    const r = await runCli(['check', DEMO, '--model', 'finite']);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain("judged in patched conics, every burn finite (a comparison; the plan's truth model is patched conics): DOES NOT HOLD");
    expect(r.stdout).toMatch(/ {2}- margin -\d+\.\d m\/s is below zero/);
    expect(r.stdout).toMatch(/ {2}- periapsis altitude about Ochre is \d+\.\d{3} km, wanted 400\.000 km ± 10\.000 km/);
  });

  it('an unknown --model word: exit 2 naming the option and the words allowed', async () => {
    const r = await runCli(['check', DEMO, '--model', 'exact']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('waymark: --model must be one of: conic, finite, nbody (got "exact")');
  });

  it('--json: one document with the verdict and the budget in SI', async () => {
    const r = await runCli(['check', DEMO, '--json']);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.holds).toBe(true);
    expect([out.model, out.truthModel, out.comparison, out.failures]).toEqual(['conic', 'conic', false, []]);
    expect(out.truth.goals.map((g: { met: boolean }) => g.met)).toEqual([true, true, true]);
    expect(out.budget.rows.length).toBe(5);
    expect(out.budget.margin).toBeGreaterThan(0);
    expect(out.budget.margin).toBeCloseTo(out.budget.dvLeft - out.budget.reserve, 9);
  });

  it('a bad file: exits 2 with the field-precise message', async () => {
    const p = editedDemo('bad.plan.json', (d) => {
      d.events[4].dv_mps[0] = 'fast';
      d.vehicle.stages[1].isp_s = -3;
    });
    const r = await runCli(['check', p]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain(`waymark: plan file ${p}: 2 problems`);
    // In the user's words: the stage and the burn named and numbered from 1 as on the cards, the field path on a details line.
    expect(r.stderr).toContain("  Stage 2 'Cruise stage': Isp must be > 0\n    (plan field: vehicle.stages[1].isp_s)");
    expect(r.stderr).toContain("  Burn 5 'Mid-course correction': Δv component 1 must be a number\n    (plan field: events[4].dv_mps[0])");
    expect(r.stderr).not.toMatch(/^ {2}(events|vehicle)\[/m);
  });

  it('a file with three problems in different places reports all three at once (schema and system checks together)', async () => {
    const p = editedDemo('three.plan.json', (d) => {
      d.vehicle.stages[0].dry_kg = -5;
      d.events[0].solve.to = 'nowhere';
      d.target.tolerance.e = 0;
    });
    const r = await runCli(['check', p, '--json']);
    expect(r.code).toBe(2);
    const paths = (JSON.parse(r.stdout).error.issues as { path: string; severity: string }[]).filter((i) => i.severity === 'error').map((i) => i.path);
    expect(paths.sort()).toEqual(['events[0].solve.to', 'target.tolerance.e', 'vehicle.stages[0].dry_kg']);
  });

  it('a bad file with --json: exit 2 and the issues as data', async () => {
    const p = editedDemo('bad2.plan.json', (d) => (d.events[0].frame = 'sideways'));
    const r = await runCli(['check', p, '--json']);
    expect(r.code).toBe(2);
    const out = JSON.parse(r.stdout);
    expect(out.error.type).toBe('ValidationError');
    expect(out.error.issues).toEqual([
      {
        path: 'events[0].frame',
        rule: 'must be one of: "vnb", "rtn", "inertial"',
        severity: 'error',
        words: 'Burn 1 \'Departure\': frame must be one of: "vnb", "rtn", "inertial"',
      },
    ]);
  });

  it('a plan whose system file is missing, or a plan file that does not exist: exit 2', async () => {
    const p = editedDemo('lost.plan.json', (d) => (d.system = { path: 'gone.system.json' }));
    const [a, b] = await Promise.all([runCli(['check', p]), runCli(['check', join(work, 'none.plan.json')])]);
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/system\.path names "gone\.system\.json", which does not exist/);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/cannot read .*none\.plan\.json: .*does not exist \(ENOENT\)/);
  });
});

describe('check: finite burns', () => {
  it('judged with every burn finite, the table gains a gravity-loss column and says what it measures', async () => {
    const r = await runCli(['check', DEMO, '--model', 'finite']);
    const head = r.stdout.split('\n').find((l) => l.startsWith('burn '));
    expect(head).toContain('g-loss m/s');
    const dep = r.stdout.split('\n').find((l) => l.startsWith('Departure'));
    // the departure burns for 3.5 minutes deep in Tessel's well: its loss is a few m/s (5.4 measured), never negative
    const loss = Number(dep?.trim().split(/\s+/).at(-1));
    expect(loss).toBeGreaterThan(1);
    expect(loss).toBeLessThan(20);
    expect(r.stdout).toContain('g-loss: Δv the finite burn put into no orbital energy');
    const plain = await runCli(['check', DEMO]);
    expect(plain.stdout).not.toContain('g-loss');
  });
});

describe('check: n-body, a schedule whose patched-conic reading ends early', () => {
  it('the budget table counts every burn of the schedule, and a note says the patched-conic reading is a comparison', async () => {
    const E = 14e6;
    // 300 km circular about Tessel (μ 3e14 m³/s², radius 5900 km); a 1.5 km/s retrograde burn drops
    // the periapsis deep below the surface, so no flight of this path reaches the burn a day later
    const r0 = 6.2e6;
    const p = editedDemo('impacting-schedule.plan.json', (d) => {
      d.start = { kind: 'state', body: 'tessel', epoch_s: E, r_m: [r0, 0, 0], v_mps: [0, Math.sqrt(3e14 / r0), 0] };
      const burn = (id: string, name: string, t: number, dv: number[]) => ({
        type: 'burn',
        id,
        name,
        t_s: t,
        frame: 'inertial',
        dv_mps: dv,
        solve: { kind: 'fixed' },
        mode: 'impulsive',
        pointing: 'velocity',
      });
      d.events = [
        burn('deorbit', 'Deorbit', E + 60, [0, -1500, 0]),
        { type: 'stage', id: 'drop-kick', name: 'Drop kick stage' },
        burn('late', 'Late burn', E + 86400, [0, 0, 300]),
      ];
      d.target = null;
      d.end_s = E + 90000;
      d.truth_model = 'nbody';
    });
    const r = await runCli(['check', p]);
    expect(r.stderr).toBe('');
    expect(r.stdout).toMatch(/^Deorbit /m);
    expect(r.stdout).toMatch(/^Late burn /m);
    // 1500 + 300 m/s, both counted (the patched-conic reading alone flies 1500)
    expect(r.stdout).toMatch(/^planned\s+1800\.0 m\/s$/m);
    expect(r.stdout).toMatch(/note: the patched-conic reading of the schedule hits Tessel on day \d+\.\d\d, before Late burn: a comparison only/);
  });
});
