/**
 * What the vehicle editor shows under each stage: its Δv stacked in firing order (the rocket
 * equation, core/plan/vehicle.ts), its ignition mass, and its thrust-to-weight at ignition
 * against a body's surface gravity (g = μ / R²).
 */
import type { Vehicle } from '../../../core/plan/index.ts';
import { stageDeltaVs } from '../../../core/plan/index.ts';

export interface StageSummary {
  /** Δv of the stage with everything above it still attached, m/s. */
  dv: number;
  /** Mass at the stage's ignition, kg. */
  ignitionMass: number;
  /** Thrust-to-weight at ignition against the body's surface gravity. */
  twr: number;
}

export function stageSummaries(vehicle: Vehicle, body: { mu: number; radius: number }): StageSummary[] {
  const dvs = stageDeltaVs(vehicle);
  const g = body.mu / (body.radius * body.radius);
  let m = vehicle.payloadMass;
  for (const s of vehicle.stages) m += s.dryMass + s.propellantMass;
  return vehicle.stages.map((s, k) => {
    const out = { dv: dvs[k], ignitionMass: m, twr: s.thrust / (m * g) };
    m -= s.dryMass + s.propellantMass;
    return out;
  });
}
