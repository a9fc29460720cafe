/**
 * `waymark target` on the demo plan in each model, and the targeted files read back by `check`
 * and `fly` in their truth model. The n-body targeting (a few seconds) runs once, in beforeAll,
 * and its file is reused; every other n-body run here is one flight.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadPlanFile } from '../../../app/node/files.ts';
import { legFraction, parseGoals, parseVary } from '../../../app/cli/commands/target.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { parsePlanFile } from '../../../core/io/planFile.ts';
import { DEFAULT_TARGET_TOLERANCES } from '../../../core/target/index.ts';
import { ROOT, runCli, type CliRun } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';
const work = mkdtempSync(join(tmpdir(), 'waymark-target-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const out = { conic: join(work, 'conic.plan.json'), finite: join(work, 'finite.plan.json'), nbody: join(work, 'nbody.plan.json') };
const run: Record<keyof typeof out, CliRun> = {} as Record<keyof typeof out, CliRun>;
beforeAll(async () => {
  const [c, f, n] = await Promise.all([
    runCli(['target', DEMO, '--model', 'conic', '-o', out.conic, '--json']),
    runCli(['target', DEMO, '--model', 'finite', '-o', out.finite, '--json']),
    runCli(['target', DEMO, '--model', 'nbody', '-o', out.nbody]),
  ]);
  Object.assign(run, { conic: c, finite: f, nbody: n });
});

interface GoalJson {
  name: string;
  value: number | null;
  wanted: number;
  tolerance: number;
  met: boolean;
}

describe('waymark target', () => {
  it('conic: every goal met, the Δv the patched-conic evaluation of the demo gives, unchanged within 0.1 m/s', async () => {
    expect(run.conic.stderr).toBe('');
    expect(run.conic.code).toBe(0);
    const doc = JSON.parse(run.conic.stdout);
    expect([doc.model, doc.status, doc.met, doc.file]).toEqual(['conic', 'met', true, out.conic]);
    expect(doc.legs.map((l: { name: string }) => l.name)).toEqual(['arrival at Ochre', 'final orbit about Ochre']);
    for (const leg of doc.legs) for (const g of leg.goals as GoalJson[]) expect(Math.abs(g.value! - g.wanted)).toBeLessThanOrEqual(g.tolerance);
    // The demo's burns are solved in patched conics already: targeting there must not move them.
    // Reference: the demo evaluated here, without the targeter. 0.1 m/s is the budget table's printed resolution.
    const loaded = await loadPlanFile(join(ROOT, DEMO));
    const total = evaluate(loaded.system, loaded.plan).budget.total;
    expect(Math.abs(doc.dv.after - total)).toBeLessThan(0.1);
    const saved = await loadPlanFile(out.conic); // the system path re-rooted at the temp folder
    expect(saved.plan.truthModel).toBe('conic');
    expect(saved.system.name).toBe('Ilmar');
    expect(Math.abs(evaluate(saved.system, saved.plan).budget.total - total)).toBeLessThan(0.1);
  });

  it('finite: every goal met, written with truth_model "finite"; check reads it in that model and it holds', async () => {
    expect(run.finite.code).toBe(0);
    const doc = JSON.parse(run.finite.stdout);
    expect([doc.model, doc.status]).toEqual(['finite', 'met']);
    expect(doc.legs.length).toBe(2);
    for (const leg of doc.legs) {
      expect(leg.status).toBe('converged');
      expect(leg.flights).toBeGreaterThan(0);
      expect(leg.controls.length).toBeGreaterThan(0);
    }
    expect(JSON.parse(readFileSync(out.finite, 'utf8')).truth_model).toBe('finite');
    const c = await runCli(['check', out.finite]);
    expect(c.code).toBe(0);
    expect(c.stdout).toContain("judged in patched conics, every burn finite (the plan's truth model): HOLDS");
    expect(c.stdout).toMatch(/target Ochre: reached in patched conics, every burn finite/);
  });

  it('nbody: prints each leg with its goals met, the burns changed, the Δv and margin, and writes the plan', () => {
    expect(run.nbody.stderr).toBe('');
    expect(run.nbody.code).toBe(0);
    const t = run.nbody.stdout;
    expect(t).toMatch(/^targeting Long Patience to Ochre in n-body \(2 legs; the plan's truth model was patched conics\)/);
    expect(t).toMatch(/leg 1\/2 arrival at Ochre: every goal met — \d+ iterations?, \d+ flights/);
    expect(t).toMatch(/leg 2\/2 final orbit about Ochre: every goal met — \d+ iterations?, \d+ flights/);
    expect(t).toMatch(/periapsis altitude about Ochre +\d+\.\d+ km +wanted 400\.000 ± 0\.1 km +met/);
    expect(t).toMatch(/Departure Δv x +-?\d+\.\d{3} → +-?\d+\.\d{3} m\/s {2}change [+−]\d+\.\d{3}/);
    expect(t).toMatch(/Δv {6}\d+\.\d → \d+\.\d m\/s \(added [+−]\d+\.\d m\/s\)/);
    expect(t).toMatch(/margin {2}\d+\.\d → \d+\.\d m\/s/);
    expect(t).toContain(`wrote ${out.nbody} (truth model: n-body)`);
    expect(t).not.toContain('NOT MET');
  });

  it('check OUT judges the n-body plan in n-body, says so, and every target goal is within the targeting tolerance', async () => {
    const [text, json] = await Promise.all([runCli(['check', out.nbody]), runCli(['check', out.nbody, '--json'])]);
    expect(text.code).toBe(0);
    expect(text.stdout).toContain("judged in n-body (the plan's truth model): HOLDS");
    expect(text.stdout).toMatch(/target Ochre: reached in n-body/);
    const doc = JSON.parse(json.stdout);
    expect([doc.model, doc.truthModel, doc.comparison, doc.holds, doc.truth.reached]).toEqual(['nbody', 'nbody', false, true, true]);
    // check flies the schedule from the start; the targeter met each goal within its own tolerance
    // (DEFAULT_TARGET_TOLERANCES: 100 m, 0.001°), far inside the plan's (10 km, 0.2°); one flight
    // of the same burns with the same integrator settings lands where the targeter's did.
    const tol = { km: DEFAULT_TARGET_TOLERANCES.altitude, '°': DEFAULT_TARGET_TOLERANCES.i } as Record<string, number>;
    for (const g of doc.truth.goals as (GoalJson & { units: string })[]) {
      expect(g.met).toBe(true);
      expect(Math.abs(g.value! - g.wanted)).toBeLessThanOrEqual(tol[g.units]);
    }
  });

  it('fly OUT --model nbody: the arrival against the target goals, all met, exit 0', async () => {
    const r = await runCli(['fly', out.nbody, '--model', 'nbody']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain("flew Long Patience to Ochre in n-body (the plan's truth model)");
    expect(r.stdout).toMatch(/target Ochre: reached in n-body/);
    for (const goal of ['periapsis altitude about Ochre', 'apoapsis altitude about Ochre', 'inclination about Ochre']) {
      expect(r.stdout).toMatch(new RegExp(`${goal} +\\d+\\.\\d+(?: km|°) +wanted .* met`));
    }
    expect(r.stdout).not.toContain('NOT MET');
  });

  it('check --model nbody on the demo: a comparison, exit 1, naming the missed periapsis', async () => {
    const r = await runCli(['check', DEMO, '--model', 'nbody']);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain("judged in n-body (a comparison; the plan's truth model is patched conics): DOES NOT HOLD");
    expect(r.stdout).toMatch(/ {2}- periapsis altitude about Ochre is \d+\.\d{3} km, wanted 400\.000 km ± 10\.000 km/);
  });

  it('not met: exit 1, the goal and why, and nothing written unless --partial', async () => {
    const none = join(work, 'none.plan.json');
    const part = join(work, 'partial.plan.json');
    const [a, b] = await Promise.all([
      runCli(['target', DEMO, '--model', 'finite', '--max-iterations', '1', '-o', none]),
      runCli(['target', DEMO, '--model', 'finite', '--max-iterations', '1', '-o', part, '--partial', '--json']),
    ]);
    expect(a.code).toBe(1);
    expect(a.stdout).toMatch(/leg 1\/2 arrival at Ochre: NOT MET \(the iteration or flight budget ran out\)/);
    expect(a.stdout).toMatch(/B·[TR] at Ochre .* NOT MET/);
    expect(a.stdout).toContain(`not written: not every goal is met (--partial writes the closest plan found to ${none})`);
    expect(existsSync(none)).toBe(false);
    expect(b.code).toBe(1);
    const doc = JSON.parse(b.stdout);
    expect([doc.status, doc.met, doc.file]).toEqual(['not-met', false, part]);
    expect(doc.legs[0].failure).toBe('iterations');
    expect((await loadPlanFile(part)).plan.truthModel).toBe('finite');
  });

  it('-o - writes the targeted plan alone to standard output, naming its system by absolute path', async () => {
    const r = await runCli(['target', DEMO, '-o', '-']);
    expect(r.code).toBe(0);
    const parsed = parsePlanFile(r.stdout);
    expect(parsed.plan.truthModel).toBe('conic');
    expect(parsed.system).toEqual({ kind: 'path', path: join(ROOT, 'assets/systems/ilmar.system.json') });
  });

  it('bad input: exit 2 naming the option (a model word, a tolerance, --max-change, the input as output)', async () => {
    const x = join(work, 'x.plan.json');
    const [model, tol, change, over, json, vary] = await Promise.all([
      runCli(['target', DEMO, '--model', 'warp', '-o', x]),
      runCli(['target', DEMO, '--altitude-tolerance=-1km', '-o', x]),
      runCli(['target', DEMO, '--max-change', '0', '-o', x]),
      runCli(['target', DEMO, '-o', DEMO]),
      runCli(['target', DEMO, '-o', '-', '--json']),
      runCli(['target', DEMO, '--vary', 'duration:mid-course', '-o', x]),
    ]);
    expect(model.code).toBe(2);
    expect(model.stderr).toContain('waymark: --model must be one of: conic, finite, nbody (got "warp")');
    expect(tol.code).toBe(2);
    expect(tol.stderr).toContain('waymark: --altitude-tolerance must be > 0');
    expect(change.code).toBe(2);
    expect(change.stderr).toContain('waymark: --max-change must be > 0');
    expect(over.code).toBe(2);
    expect(over.stderr).toContain(`--output ${DEMO}: not written`);
    expect(json.code).toBe(2);
    expect(vary.code).toBe(2);
    expect(vary.stderr).toContain('waymark: --vary must name a coast that lasts a duration (got "mid-course")');
    expect(existsSync(x)).toBe(false);
  });

  it('--free-arrival and --vary: the arrival leg drops the periapsis time and varies the burn time named', async () => {
    const r = await runCli(['target', DEMO, '--free-arrival', '--vary', 'time:mid-course', '-o', join(work, 'timed.plan.json'), '--json']);
    expect(r.code).toBe(0);
    const leg = JSON.parse(r.stdout).legs[0];
    expect(leg.goals.map((g: GoalJson) => g.name)).not.toContain('periapsis time at Ochre');
    const t = leg.controls.find((c: { kind: string }) => c.kind === 'burn-time');
    expect([t.name, t.burnId, t.units]).toEqual(['Mid-course correction time', 'mid-course', 'days']);
  });

  it('--vary reads KIND:EVENT, and names the kinds it takes otherwise', () => {
    expect(parseVary(['time:mid-course', 'arrival:departure', 'duration:cruise'])).toEqual([
      { kind: 'burn-time', eventId: 'mid-course' },
      { kind: 'transfer-arrival', eventId: 'departure' },
      { kind: 'coast-duration', eventId: 'cruise' },
    ]);
    expect(() => parseVary(['mid-course'])).toThrow('--vary must be KIND:EVENT with KIND one of: time, arrival, duration');
    expect(() => parseVary(['when:mid-course'])).toThrow('--vary must be KIND:EVENT');
  });

  it('the progress bar: a leg goes from 0 at its first residual to 1 at residual 1 (every goal met), on a log scale', () => {
    expect(legFraction(1e4, 1e4)).toBe(0);
    expect(legFraction(1e4, 1e2)).toBeCloseTo(0.5, 12);
    expect(legFraction(1e4, 1)).toBe(1);
    expect(legFraction(1e4, 0.01)).toBe(1);
    expect(legFraction(0.5, 0.1)).toBe(1); // met from the start
  });
});

describe('--goal', () => {
  const cal = { era: 'TR', dayLength: 86400, yearLength: 365 * 86400, epochYear: 412, epochDay: 1 } as never;
  it("reads KIND:BODY=VALUE with the value in the goal's units, and names the kinds it takes otherwise", () => {
    expect(parseGoals(['periapsis:ochre=600km', 'inclination:ochre=35deg', 'entry:ochre=401d'], cal)).toEqual([
      { kind: 'periapsis-altitude', body: 'ochre', wanted: 600e3 },
      { kind: 'inclination', body: 'ochre', wanted: (35 * Math.PI) / 180 },
      { kind: 'soi-entry-time', body: 'ochre', wanted: 401 * 86400 },
    ]);
    expect(() => parseGoals(['apoapsis:ochre=1km'], cal)).toThrow('--goal must be KIND:BODY=VALUE with KIND one of: periapsis, inclination, entry');
    expect(() => parseGoals(['periapsis:ochre'], cal)).toThrow('--goal must be KIND:BODY=VALUE');
  });

  it('an arrival inclination goal is met and shown as the B-plane aim it becomes; a body the plan does not arrive at is refused by its flag', async () => {
    const ok = await runCli(['target', DEMO, '--model', 'conic', '--goal', 'inclination:ochre=35deg', '-o', join(work, 'inc.plan.json'), '--json']);
    expect(ok.code).toBe(0);
    const names = JSON.parse(ok.stdout).legs[0].goals.map((g: GoalJson) => g.name);
    expect(names[0]).toBe('B-plane miss along T at Ochre (aim: periapsis 400.000 km, inclination 35.000°)');
    const bad = await runCli(['target', DEMO, '--model', 'conic', '--goal', 'inclination:kiln=3deg', '-o', join(work, 'kiln.plan.json')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('--goal[1] must name a body the plan arrives at and burns at (Ochre) (got "kiln")');
  });
});
