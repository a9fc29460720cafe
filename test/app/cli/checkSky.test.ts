/**
 * `waymark check`'s sky lines (app/cli/commands/check.ts): the shadow passes and the light-time
 * range of the demo against core/sky run here on the same flight (the plan parsed and evaluated
 * with core/conic, the ship placed by hand), in text and in --json.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluate, shipStateAt } from '../../../core/conic/index.ts';
import { parsePlanFile, parseSystemFile } from '../../../core/io/index.ts';
import { lightTimeAt, shadowPasses } from '../../../core/sky/index.ts';
import { bodyState, formatCompactDate } from '../../../core/system/index.ts';
import { ROOT, runCli } from './runCli.ts';

const DEMO = 'assets/plans/tessel-to-ochre.plan.json';
const system = parseSystemFile(readFileSync(join(ROOT, 'assets/systems/ilmar.system.json'), 'utf8')).system;
const plan = parsePlanFile(readFileSync(join(ROOT, DEMO), 'utf8')).plan;
const result = evaluate(system, plan);
const s6 = new Float64Array(6);
const c6 = new Float64Array(6);
const shipAt = (t: number, out: Float64Array) => {
  const k = shipStateAt(result, t, s6);
  bodyState(system, result.segments[k].central, t, c6);
  for (let j = 0; j < 6; j++) out[j] = s6[j] + c6[j];
};

describe.concurrent('waymark check: the sky lines', () => {
  it('--json: the shadow passes and eclipses are core/sky on the flight, the light-time range brackets the samples', async () => {
    const r = await runCli(['check', DEMO, '--json']);
    expect(r.code).toBe(0);
    const sky = JSON.parse(r.stdout).sky;
    const want = shadowPasses(system, shipAt, result.t0, result.t1);
    expect(sky.model).toBe('patched conics');
    expect(sky.shadowModel).toBe('conical');
    expect(sky.eclipses).toBe(want.eclipses);
    expect(sky.passes.length).toBe(want.passes.length);
    // the same core code on the same flight: the same bisections, the same times (1e-6 s against rounding of the JSON text)
    sky.passes.forEach((p: { bodyName: string; kind: string; t0: number; t1: number }, k: number) => {
      expect([p.bodyName, p.kind]).toEqual([want.passes[k].bodyName, want.passes[k].kind]);
      expect(Math.abs(p.t0 - want.passes[k].t0)).toBeLessThan(1e-6);
      expect(Math.abs(p.t1 - want.passes[k].t1)).toBeLessThan(1e-6);
    });
    // the light time to the home world (Tessel): the range of 400 evenly spaced samples, computed here
    expect(sky.light.body).toBe('Tessel');
    let min = Infinity;
    let max = -Infinity;
    for (let k = 0; k < 400; k++) {
      const t = result.t0 + ((result.t1 - result.t0) * k) / 399;
      shipAt(t, s6);
      const tau = lightTimeAt(system, system.calendar.homeIndex, t, s6[0], s6[1], s6[2]);
      min = Math.min(min, tau);
      max = Math.max(max, tau);
    }
    expect(sky.light.min).toBeCloseTo(min, 9);
    expect(sky.light.max).toBeCloseTo(max, 9);
  });

  it('text: one line per pass in the system calendar with its duration, the count and the light-time range', async () => {
    const r = await runCli(['check', DEMO]);
    expect(r.code).toBe(0);
    const want = shadowPasses(system, shipAt, result.t0, result.t1);
    expect(r.stdout).toContain('sky (patched conics; conical shadow model):');
    const lines = r.stdout.split('\n').filter((l) => l.startsWith('  shadow  '));
    expect(lines.length).toBe(want.passes.length);
    const first = want.passes.find((p) => p.kind === 'umbra')!;
    const d = first.t1 - first.t0;
    const line = `${formatCompactDate(system.calendar, first.t0, { seconds: true })} – ${formatCompactDate(system.calendar, first.t1, { seconds: true })}  ${Math.floor(d / 60)} min ${String(Math.floor(d % 60)).padStart(2, '0')} s`;
    expect(lines.find((l) => l.includes('Tessel umbra'))).toContain(line);
    expect(r.stdout).toMatch(new RegExp(`  ${want.eclipses} eclipses, \\d+ h \\d\\d min in shadow`));
    expect(r.stdout).toMatch(/ {2}light time to Tessel {2}\d+\.\d+ s – \d+ min \d\d s {2}\(one way; min – max of 400 times\)/);
  });
});
