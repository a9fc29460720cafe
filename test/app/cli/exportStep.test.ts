/**
 * The exports' default step (app/cli/exportStep.ts) and the burns named as the plan's cards name
 * them: `waymark fly` on the demo without --step, the files read back and counted here.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultSpanSteps, POINTS_PER_ORBIT, thinToSpanSteps } from '../../../app/cli/exportStep.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { parseCsv } from '../../../core/io/csv.ts';
import { parseOem } from '../../../core/io/oem.ts';
import { parsePlanFile } from '../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { ROOT, runCli, type CliRun } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';
const SYSTEM = 'assets/systems/ilmar.system.json';
const planJson = JSON.parse(readFileSync(join(ROOT, DEMO), 'utf8')) as {
  start: { body: string; periapsis_altitude_m: number; e: number };
  events: { id: string; name: string }[];
};
const systemJson = JSON.parse(readFileSync(join(ROOT, SYSTEM), 'utf8')) as { bodies: { id: string; mu_m3_s2: number; radius_m: number }[] };

const work = mkdtempSync(join(tmpdir(), 'waymark-step-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));
const oem = join(work, 'demo.oem');
const burns = join(work, 'burns.csv');
let run: CliRun;
beforeAll(async () => {
  run = await runCli(['fly', DEMO, '--oem', oem, '--burns', burns, '--json']);
});

describe('fly without --step', () => {
  it('the OEM has at least 64 points in every parking-orbit period (counted from the file)', () => {
    expect(run.code).toBe(0);
    const msg = parseOem(readFileSync(oem, 'utf8'));
    const first = msg.segments[0];
    expect(first.metadata.CENTER_NAME.toLowerCase()).toContain(planJson.start.body);
    // the parking orbit's period from the plan and the system file (Kepler's third law, analytic)
    const body = systemJson.bodies.find((b) => b.id === planJson.start.body)!;
    const rp = body.radius_m + planJson.start.periapsis_altitude_m;
    const a = rp / (1 - planJson.start.e);
    const period = 2 * Math.PI * Math.sqrt((a * a * a) / body.mu_m3_s2);
    // every window of one period that lies before the departure burn holds at least 64 epochs
    const tBurn = Number(/at t = ([\d.e+]+) s/.exec(first.comments.find((c) => c.startsWith('burn '))!)![1]);
    const t = first.t;
    let windows = 0;
    for (let j = 0; j < t.length && t[j] + period <= tBurn; j++) {
      let n = 0;
      for (let k = j; k < t.length && t[k] < t[j] + period; k++) n++;
      expect(n).toBeGreaterThanOrEqual(POINTS_PER_ORBIT);
      windows++;
    }
    expect(windows).toBeGreaterThan(0); // the demo's parking coast lasts more than one period
  });

  it('the step rule is stated in the OEM header, and every span has at least 64 points', () => {
    const msg = parseOem(readFileSync(oem, 'utf8'));
    expect(msg.comments.join('\n')).toMatch(/step per span \(its shortest orbital period \/ 64, or a hyperbolic span's duration \/ 64\)/);
    for (const s of msg.segments) expect(s.t.length).toBeGreaterThanOrEqual(POINTS_PER_ORBIT);
  });

  it('the default steps of the demo: the period rule where the orbit is closed, the duration rule otherwise', () => {
    const { system } = parseSystemFile(readFileSync(join(ROOT, SYSTEM), 'utf8'));
    const { plan } = parsePlanFile(readFileSync(join(ROOT, DEMO), 'utf8'), { system });
    const steps = defaultSpanSteps(evaluate(system, plan));
    expect(steps.length).toBe(3);
    for (const s of steps) {
      expect(s.step).toBeLessThanOrEqual((s.t1 - s.t0) / POINTS_PER_ORBIT);
      if (s.period !== null) expect(s.step).toBeLessThanOrEqual(s.period / POINTS_PER_ORBIT);
      // one of the two rules is the one that set it (to rounding)
      const rules = [(s.t1 - s.t0) / POINTS_PER_ORBIT, ...(s.period === null ? [] : [s.period / POINTS_PER_ORBIT])];
      expect(rules.some((r) => Math.abs(r - s.step) <= 1e-12 * r)).toBe(true);
    }
  });
});

describe('burns named as on the cards', () => {
  it('the burn table and the OEM comments give each burn its 1-based place in the plan and its name', () => {
    const rows = parseCsv(readFileSync(burns, 'utf8'));
    expect(rows[0].slice(0, 3)).toEqual(['event', 'name', 'id']);
    expect(rows.length).toBeGreaterThan(1);
    for (const r of rows.slice(1)) {
      const k = planJson.events.findIndex((e) => e.id === r[2]);
      expect(k).toBeGreaterThanOrEqual(0);
      expect(r[0]).toBe(String(k + 1));
      expect(r[1]).toBe(planJson.events[k].name);
    }
    const comments = parseOem(readFileSync(oem, 'utf8')).segments.flatMap((s) => s.comments.filter((c) => c.startsWith('burn ')));
    expect(comments.length).toBe(rows.length - 1);
    rows.slice(1).forEach((r, k) => expect(comments[k].startsWith(`burn ${r[0]} ${r[1]} at t = `)).toBe(true));
  });
});

describe('thinToSpanSteps (the n-body grid thinned span by span)', () => {
  it("each span keeps every k-th sample, k = its step / the grid's, and its ends", () => {
    const grid = 10;
    const span = (center: number, t0: number, n: number) => ({
      center,
      t: Float64Array.from({ length: n }, (_, j) => t0 + j * grid),
      states: Float64Array.from({ length: 6 * n }, (_, j) => j),
      mass: Float64Array.from({ length: n }, (_, j) => 1000 - j),
    });
    const eph = { step: grid, spans: [span(1, 0, 1001), span(0, 10000, 95)] };
    const steps = [
      { a: 0, b: 1, center: 1, t0: 0, t1: 10000, step: 100, period: 6400 },
      { a: 1, b: 2, center: 0, t0: 10000, t1: 10940, step: grid, period: null },
    ];
    const out = thinToSpanSteps(eph, grid, steps);
    const [a, b] = out.spans;
    expect(a.t.length).toBe(101); // 0, 100, ..., 10000
    for (let i = 1; i < a.t.length; i++) expect(a.t[i] - a.t[i - 1]).toBeLessThanOrEqual(100);
    expect(a.t[a.t.length - 1]).toBe(10000);
    // a kept sample keeps its own state and mass
    expect(Array.from(a.states.subarray(6, 12))).toEqual([60, 61, 62, 63, 64, 65]);
    expect(a.mass[1]).toBe(990);
    expect(b.t.length).toBe(95); // the span at the grid's step keeps everything
  });
});
