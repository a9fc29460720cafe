import { describe, expect, it } from 'vitest';
import { budgetReport } from '../../../core/io/report.ts';
import type { PlanResult } from '../../../core/plan/result.ts';
import { samplePlan } from './planSamples.ts';
import { ilmar, syntheticBudget, syntheticResult } from './syntheticResult.ts';

function result(margin: number): PlanResult {
  const r = syntheticResult();
  r.budget = syntheticBudget(margin);
  r.flags = margin < 0 ? [{ code: 'negative-margin', severity: 'error', message: 'the margin is 40.0 m/s short', planEventId: null }] : [];
  r.target = {
    body: ilmar.indexById.ochre,
    reached: margin >= 0,
    achieved: { periapsisAltitude: 401000, apoapsisAltitude: 420000, e: 0.004, i: (59.8 * Math.PI) / 180 },
    desired: { periapsisAltitude: 400000, e: 0.01, apoapsisAltitude: null, i: Math.PI / 3 },
    closestApproach: { t: 25000, distance: 4e6, altitude: 401000 },
  };
  return r;
}

describe('budgetReport (Markdown)', () => {
  it('has the vehicle, burn and budget tables, the margin, flags and target', () => {
    const md = budgetReport(ilmar, samplePlan(), result(12.5));
    expect(md.startsWith('# Δv budget: Sample run\n')).toBe(true);
    expect(md).toContain('| burn | time | Δv (m/s) | duration (s) | propellant (kg) | mass after (kg) | stages | Δv left (m/s) | flags |');
    expect(md).toContain('| Kick, "prograde" | Year 412 TR, day 1, 01:06 (t = 4000 s) | 1234.5 | 20.0 | 200.0 | 1000.0 | Kick | 600.0 |  |');
    expect(md).toContain('| **margin** | **12.5** |');
    expect(md).toContain('| reserve (5.0 % + 25.0 m/s) | 556.3 |');
    expect(md).toContain('**The margin holds.**');
    expect(md).toContain('Ochre: **reached**.');
    expect(md).toContain('| periapsis altitude | 400.0 km | 401.0 km |');
    expect(md).toContain('| inclination | 60.00° | 59.80° |');
    expect(md).toContain('## Flags\n\nNone.');
    // Every table row has the same number of cells as its header.
    for (const block of md.split('\n\n')) {
      const rows = block.split('\n').filter((l) => l.startsWith('|'));
      if (rows.length < 2) continue;
      const cells = (l: string) => l.replace(/\\\|/g, '').split('|').length;
      for (const r of rows) expect(cells(r)).toBe(cells(rows[0]));
    }
  });

  it('Δv per stage is the rocket equation for the stack each stage pushes (Tsiolkovsky)', () => {
    const md = budgetReport(ilmar, samplePlan(), result(12.5));
    // Cruise pushes payload 1500 + its 400 dry: 305 s · g0 · ln(4000.25 / 1900).
    const cruise = 305 * 9.80665 * Math.log((1500 + 400 + 2100.25) / 1900);
    expect(md).toContain(`| Cruise | 400 | 2100 | 305.0 | 8000 | ${cruise.toFixed(1)} |`);
    const kick = 321.5 * 9.80665 * Math.log((4000.25 + 6900) / (4000.25 + 900));
    expect(md).toContain(`| Kick | 900 | 6000 | 321.5 | 45000 | ${kick.toFixed(1)} |`);
  });

  it('a negative margin says the margin does not hold and lists the flag', () => {
    const md = budgetReport(ilmar, samplePlan(), result(-40));
    expect(md).toContain('| **margin** | **-40.0** |');
    expect(md).toContain('**The margin does not hold.**');
    expect(md).toContain('- **error** `negative-margin`: the margin is 40.0 m/s short');
    expect(md).toContain('Ochre: **not reached**.');
  });

  it('escapes | in names', () => {
    const p = samplePlan();
    const r = result(1);
    r.budget.rows[0].name = 'a|b';
    expect(budgetReport(ilmar, p, r)).toContain('| a\\|b |');
  });
});
