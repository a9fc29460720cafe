import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile, parseSystemFile } from '../../../../core/io/index.ts';
import type { Vehicle } from '../../../../core/plan/index.ts';
import { planRoute } from '../../../../core/route/index.ts';
import { chooseTo, defaultRouteForm, readRouteForm } from '../../../../app/renderer/route/routeForm.ts';
import { routeSummary } from '../../../../app/renderer/route/routeSummary.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const demo = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;

/** Δv of the full vehicle by the rocket equation, stage after stage (Tsiolkovsky; serial staging), standard g0 = 9.80665 m/s² (common practice). */
function rocketEquation(v: Vehicle): number {
  let m = v.payloadMass + v.stages.reduce((a, s) => a + s.dryMass + s.propellantMass, 0);
  let dv = 0;
  for (const s of v.stages) {
    dv += s.isp * 9.80665 * Math.log(m / (m - s.propellantMass));
    m -= s.dryMass + s.propellantMass;
  }
  return dv;
}

/** Tessel 300 km to Skerry 500 km in patched conics for the demo plan with `vehicle`. */
function skerry(vehicle: Vehicle) {
  const plan = { ...demo, vehicle };
  const read = readRouteForm(system, plan, {
    ...chooseTo(system, defaultRouteForm(system, plan), 'skerry'),
    fromAltitude: '300',
    periapsis: '500',
    truthModel: 'conic',
  });
  if (!read.ok) throw new Error(JSON.stringify(read.errors));
  return planRoute(system, read.intent);
}

/** "6 180 m/s" (narrow no-break spaces grouping the digits) as a number. */
const mps = (text: string): number =>
  Number(
    text
      .replace(/ m\/s$/, '')
      .replace(/[\s\u202f]/g, '')
      .replace('−', '-'),
  );

describe('the route summary', () => {
  it('shows the shortfall when the estimate is more than the ship carries (the demo ship to Skerry), and none when it carries enough', () => {
    const r = skerry(demo.vehicle);
    const carries = rocketEquation(demo.vehicle);
    // the premise: the demo ship (about 6.5 km/s) carries less than the trip's estimate
    expect(r.dvEstimate).toBeGreaterThan(carries);
    const s = routeSummary(system, r, 'patched conics');
    expect(s.vehicle).toBe(demo.vehicle.name);
    // whole m/s shown: within half a unit of the rocket equation (plus the float rounding of a log)
    expect(Math.abs(mps(s.capacity) - carries)).toBeLessThanOrEqual(0.5 + 1e-9);
    expect(s.shortfall).not.toBeNull();
    expect(Math.abs(mps(s.shortfall!) - (r.dvEstimate - carries))).toBeLessThanOrEqual(0.5 + 1e-9);
    expect(JSON.stringify(s)).not.toMatch(/NaN|undefined/);

    // tanks filled to 300 t and 40 t: more than the estimate, no shortfall
    const full = { ...demo.vehicle, stages: demo.vehicle.stages.map((st, k) => ({ ...st, propellantMass: [300_000, 40_000][k] })) };
    const f = skerry(full);
    expect(rocketEquation(full)).toBeGreaterThan(f.dvEstimate);
    expect(routeSummary(system, f, 'patched conics').shortfall).toBeNull();
  }, 60_000);
});
