import { describe, expect, it } from 'vitest';
import type { Vehicle } from '../../../core/plan/plan.ts';
import { G0 } from '../../../core/plan/rocket.ts';
import {
  checkVehicle,
  copyVehicleState,
  createVehicleState,
  deltaVLeft,
  dropStage,
  spendBurn,
  stageDeltaVs,
  thrustToWeightAt,
  vehicleMass,
} from '../../../core/plan/vehicle.ts';
import type { Body } from '../../../core/system/model.ts';

/**
 * Hand-worked two-stage example (rocket equation Δv = g0·Isp·ln(m0/mf), serial staging as in
 * Curtis, Orbital Mechanics for Engineering Students, §11.6):
 *   payload 1,000 kg; stage 1: dry 2,000 kg, propellant 10,000 kg, Isp 300 s, 200 kN;
 *   stage 2: dry 500 kg, propellant 3,000 kg, Isp 350 s, 30 kN.
 *   m0 = 1,000 + 2,000 + 10,000 + 500 + 3,000 = 16,500 kg.
 *   Stage 1: c1 = 300·9.80665 = 2,941.995 m/s; burnout 6,500 kg;
 *            Δv1 = 2,941.995·ln(16,500/6,500) = 2,941.995·0.931558 = 2,740.640 m/s.
 *   Stage 2 starts at 6,500 − 2,000 = 4,500 kg, burnout 1,500 kg; c2 = 3,432.3275 m/s;
 *            Δv2 = 3,432.3275·ln 3 = 3,432.3275·1.098612 = 3,770.797 m/s.
 *   Total 6,511.437 m/s.
 */
const twoStage: Vehicle = {
  name: 'worked example',
  payloadMass: 1000,
  stages: [
    { name: 'first', dryMass: 2000, propellantMass: 10000, isp: 300, thrust: 200e3 },
    { name: 'second', dryMass: 500, propellantMass: 3000, isp: 350, thrust: 30e3 },
  ],
};

// The hand-worked figures carry 3 decimals: checked to half a unit of the last (5e-4); measured
// differences at most 4.2e-4.
describe('vehicle: stage Δv', () => {
  it('matches the hand-worked two-stage example (rocket equation by hand)', () => {
    const dvs = stageDeltaVs(twoStage);
    expect(dvs[0]).toBeCloseTo(2740.64, 3);
    expect(dvs[1]).toBeCloseTo(3770.797, 3);
    expect(deltaVLeft(twoStage)).toBeCloseTo(6511.437, 3);
    expect(createVehicleState(twoStage).mass).toBe(16500);
  });

  it('a single stage is Tsiolkovsky: c·ln(m0/mf) (analytic)', () => {
    const v: Vehicle = { name: 's', payloadMass: 100, stages: [{ name: 'a', dryMass: 100, propellantMass: 200 * (Math.E - 1), isp: 400, thrust: 1e3 }] };
    expect(deltaVLeft(v)).toBeCloseTo(400 * G0, 9); // mass ratio e
  });
});

describe('vehicle: burns across staging', () => {
  it('a 3,000 m/s burn empties stage 1 and finishes on stage 2 (hand-worked)', () => {
    // Stage 1 gives 2,740.640 m/s; 259.360 m/s remain for stage 2 starting at 4,500 kg:
    //   propellant = 4,500·(1 − e^(−259.360/3,432.3275)) = 327.508 kg.
    // Times: ṁ1 = 200,000/2,941.995 = 67.981 kg/s → 10,000 kg in 147.100 s;
    //        ṁ2 = 30,000/3,432.3275 = 8.7404 kg/s → 327.508 kg in 37.471 s; total 184.570 s.
    // Δv left: 3,432.3275·ln(4,172.492/1,500) = 3,511.437 m/s (= 6,511.437 − 3,000).
    const st = createVehicleState(twoStage);
    const b = spendBurn(twoStage, st, 3000);
    expect(b.delivered).toBeCloseTo(3000, 9);
    expect(b.missing).toBe(0);
    expect(b.dryMidBurn).toBe(true);
    expect(b.stagesFired).toEqual([0, 1]);
    expect(b.dropped).toEqual([{ stage: 0, offset: expect.closeTo(147.09975, 5) as unknown as number, dry: true }]);
    expect(b.propellantUsed).toBeCloseTo(10000 + 327.508, 3);
    expect(b.duration).toBeCloseTo(184.57, 3);
    expect(b.massAfter).toBeCloseTo(4172.492, 3);
    expect(st.stage).toBe(1);
    expect(st.mass).toBeCloseTo(vehicleMass(twoStage, st), 9);
    expect(deltaVLeft(twoStage, st)).toBeCloseTo(3511.437, 3);
  });

  it('Δv left falls by exactly the Δv burned while the stage order is unchanged (rocket-equation additivity)', () => {
    const st = createVehicleState(twoStage);
    const total = deltaVLeft(twoStage, st);
    let spent = 0;
    for (const dv of [500, 1200, 900, 1500]) {
      spendBurn(twoStage, st, dv);
      spent += dv;
      expect(deltaVLeft(twoStage, st)).toBeCloseTo(total - spent, 6);
    }
  });

  it('runs out of propellant and reports the missing Δv', () => {
    const st = createVehicleState(twoStage);
    const b = spendBurn(twoStage, st, 7000);
    expect(b.delivered).toBeCloseTo(6511.437, 3);
    expect(b.missing).toBeCloseTo(7000 - 6511.437, 3);
    expect(b.massAfter).toBeCloseTo(1500, 6); // payload + last stage dry mass: the last stage is kept
    expect(deltaVLeft(twoStage, st)).toBe(0);
  });

  it('a staging event drops the active stage with its leftover propellant', () => {
    const st = createVehicleState(twoStage);
    spendBurn(twoStage, st, 1000);
    const leftover = st.propellant[0];
    expect(leftover).toBeGreaterThan(0);
    const massBefore = st.mass;
    expect(dropStage(twoStage, st)).toBe(0);
    expect(st.mass).toBeCloseTo(massBefore - 2000 - leftover, 9);
    expect(deltaVLeft(twoStage, st)).toBeCloseTo(3770.797, 3); // only the full second stage remains
    expect(dropStage(twoStage, st)).toBe(1);
    expect(dropStage(twoStage, st)).toBe(-1);
  });

  it('a spent stage still attached is dropped at the next burn (automatic staging)', () => {
    const st = createVehicleState(twoStage);
    spendBurn(twoStage, st, 2740.6395783915236); // exactly stage 1
    expect(st.stage).toBe(0);
    const b = spendBurn(twoStage, st, 100);
    expect(b.dropped[0]).toEqual({ stage: 0, offset: 0, dry: true });
    expect(b.stagesFired).toEqual([1]);
    expect(b.dryMidBurn).toBe(false);
  });

  it('copies state without sharing arrays', () => {
    const a = createVehicleState(twoStage);
    const b = copyVehicleState(a);
    spendBurn(twoStage, b, 100);
    expect(a.propellant[0]).toBe(10000);
  });

  it('thrust-to-weight at a body: F/(m·μ/R²) (definition)', () => {
    const body = { mu: 3.986004418e14, radius: 6.371e6 } as Body; // Earth (textbook constants)
    const st = createVehicleState(twoStage);
    const g = 3.986004418e14 / 6.371e6 ** 2;
    expect(thrustToWeightAt(twoStage, st, body)).toBeCloseTo(200e3 / (16500 * g), 12);
  });

  it('rejects bad vehicles with the field path', () => {
    expect(() => checkVehicle({ ...twoStage, payloadMass: -1 })).toThrow(/vehicle.payloadMass must be >= 0/);
    const bad = structuredClone(twoStage);
    bad.stages[1].isp = 0;
    expect(() => checkVehicle(bad)).toThrow(/vehicle.stages\[1\].isp must be > 0/);
    const bad2 = structuredClone(twoStage);
    bad2.stages[0].propellantMass = NaN;
    expect(() => checkVehicle(bad2)).toThrow(/vehicle.stages\[0\].propellantMass/);
    expect(() => checkVehicle({ ...twoStage, stages: [] })).toThrow(/vehicle.stages/);
  });
});
