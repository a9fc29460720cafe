/**
 * The vehicle a route is built with: the ship's stages with their specific impulse scaled so it
 * carries at least AMPLE_DV, masses and thrusts kept. The Δv is checked against the rocket
 * equation written out here (Tsiolkovsky, Δv = g₀·Isp·ln(m₀/m_f), per stage, the upper stages
 * and payload carried; g₀ = 9.80665 m/s², the standard value).
 */
import { describe, expect, it } from 'vitest';
import type { Vehicle } from '../../../core/plan/index.ts';
import { AMPLE_DV, ampleVehicle } from '../../../core/route/ample.ts';

const G0 = 9.80665;

/** Rocket equation over the stages in firing order. */
function rocketDv(v: Vehicle): number {
  let m = v.payloadMass + v.stages.reduce((s, st) => s + st.dryMass + st.propellantMass, 0);
  let dv = 0;
  for (const st of v.stages) {
    dv += G0 * st.isp * Math.log(m / (m - st.propellantMass));
    m -= st.dryMass + st.propellantMass;
  }
  return dv;
}

const ship: Vehicle = {
  name: 'Two-stage test ship',
  payloadMass: 3000,
  stages: [
    { name: 'Kick', dryMass: 2400, propellantMass: 27000, isp: 338, thrust: 400e3 },
    { name: 'Cruise', dryMass: 1100, propellantMass: 5200, isp: 321, thrust: 27e3 },
  ],
};

describe('ampleVehicle', () => {
  it('carries AMPLE_DV with the masses, thrusts and stages of the ship', () => {
    const a = ampleVehicle(ship);
    // the ship itself carries about 6.5 km/s; the scaling is exact but for rounding (1e-9 relative)
    expect(rocketDv(ship)).toBeLessThan(7000);
    expect(Math.abs(rocketDv(a) - AMPLE_DV) / AMPLE_DV).toBeLessThan(1e-9);
    expect(a.stages.map((s) => [s.name, s.dryMass, s.propellantMass, s.thrust])).toEqual(
      ship.stages.map((s) => [s.name, s.dryMass, s.propellantMass, s.thrust]),
    );
    expect(a.payloadMass).toBe(ship.payloadMass);
    // the ship is not changed
    expect(ship.stages[0].isp).toBe(338);
  });

  it('a ship already carrying more is kept as it is', () => {
    const big: Vehicle = { ...ship, stages: ship.stages.map((s) => ({ ...s, isp: s.isp * 100 })) };
    expect(rocketDv(ampleVehicle(big))).toBeCloseTo(rocketDv(big), 6);
  });

  it('a ship without propellant gets propellant in its last stage and then AMPLE_DV', () => {
    const empty: Vehicle = { ...ship, stages: ship.stages.map((s) => ({ ...s, propellantMass: 0 })) };
    expect(rocketDv(empty)).toBe(0);
    const a = ampleVehicle(empty);
    expect(a.stages[1].propellantMass).toBeGreaterThan(0);
    expect(Math.abs(rocketDv(a) - AMPLE_DV) / AMPLE_DV).toBeLessThan(1e-9);
  });
});
