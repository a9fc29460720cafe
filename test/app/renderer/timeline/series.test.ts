import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { timelineData, valueAt } from '../../../../app/renderer/timeline/series.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const plan = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const result = evaluate(system, plan);
const data = timelineData(system, plan, result);

describe('timeline series from a PlanResult', () => {
  it('has one bar per budget row, as long as the burn', () => {
    expect(data.burns.map((b) => b.id)).toEqual(result.budget.rows.map((r) => r.planEventId));
    for (const [k, b] of data.burns.entries()) expect(b.tEnd - b.tStart).toBeCloseTo(result.budget.rows[k].duration, 6);
  });

  it('covers the flight with sphere-of-influence spans in order, Tessel first and Ochre last', () => {
    expect(data.soi[0].name).toBe('Tessel');
    expect(data.soi.at(-1)!.name).toBe('Ochre');
    for (let k = 1; k < data.soi.length; k++) expect(data.soi[k].t0).toBeCloseTo(data.soi[k - 1].t1, 3);
  });

  it('Δv left: the capacity before the first burn, the budget figure after the last', () => {
    expect(valueAt(data.dvLeft, result.t0)).toBeCloseTo(result.budget.capacity, 6);
    expect(valueAt(data.dvLeft, result.t1)).toBeCloseTo(result.budget.dvLeft, 6);
  });

  it('propellant: everything loaded at the start, the mass balance of the vehicle at the end', () => {
    const loaded = plan.vehicle.stages.reduce((s, st) => s + st.propellantMass, 0);
    expect(valueAt(data.propellant, result.t0)).toBeCloseTo(loaded, 6);
    // At the end only the last stage is attached (the kick stage was dropped).
    const last = plan.vehicle.stages.at(-1)!;
    expect(valueAt(data.propellant, result.t1)).toBeCloseTo(result.budget.finalMass - plan.vehicle.payloadMass - last.dryMass, 3);
  });

  it('distance to the target falls to about the closest approach the evaluation reports', () => {
    let min = Infinity;
    for (const v of data.distance.v) min = Math.min(min, v);
    const ca = result.target!.closestApproach!.distance;
    expect(min).toBeGreaterThanOrEqual(ca * 0.999);
    expect(min).toBeLessThan(ca * 1.25);
    expect(data.distance.v[0]).toBeGreaterThan(1e10);
  });

  it('reads values between points linearly and takes the later value at a jump', () => {
    const s = { t: Float64Array.from([0, 10, 10, 20]), v: Float64Array.from([0, 10, 50, 70]) };
    expect(valueAt(s, 5)).toBe(5);
    expect(valueAt(s, 10)).toBe(50);
    expect(valueAt(s, 15)).toBe(60);
    expect(valueAt(s, -1)).toBe(0);
    expect(valueAt(s, 99)).toBe(70);
  });
});
