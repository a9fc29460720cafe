import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import type { GameBurn } from '../../../core/gamestep/burns.ts';
import { gameStepCheck } from '../../../core/gamestep/check.ts';
import { burnDv, spreadDuration } from '../../../core/gamestep/guidance.ts';
import type { BurnEvent } from '../../../core/plan/plan.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem, impulsive, testSystem } from '../plan/helpers.ts';

const system = testSystem();
const TERRA = 1;
const MU = system.bodies[TERRA].mu;
const R0 = 7000e3;
const N_MEAN = Math.sqrt(MU / R0 ** 3);
const V0 = R0 * N_MEAN;

function burn(over: Partial<GameBurn>): GameBurn {
  return {
    id: 'b',
    name: 'b',
    t: 1000,
    tStart: 1000,
    duration: 0,
    dv: [1, 2, 3],
    dvMag: Math.hypot(1, 2, 3),
    mass0: 1000,
    mass1: 900,
    mdot: 0,
    thrust: 0,
    event: null,
    central: TERRA,
    fraction: 1,
    ...over,
  };
}

// absolute state of a circular equatorial orbit about loam at phase θ, at time t
function circular(theta: number, t: number, z = 0): Float64Array {
  const b = bodyState(system, TERRA, t, new Float64Array(6));
  const rel = [R0 * Math.cos(theta), R0 * Math.sin(theta), z, -V0 * Math.sin(theta), V0 * Math.cos(theta), 0];
  return Float64Array.from(b, (x, i) => x + rel[i]);
}

describe('burn Δv as the game obtains it', () => {
  const prograde = impulsive('b', 1000, [100, 0, 0], 'vnb') as BurnEvent;

  it("open-loop, or a burn without a plan event, flies the plan's inertial Δv", () => {
    const out: [number, number, number] = [0, 0, 0];
    expect(burnDv(system, burn({ event: prograde }), 'open-loop', 1000, circular(0.3, 1000), false, out)).toBe(true);
    expect(out).toEqual([1, 2, 3]);
    expect(burnDv(system, burn({}), 'resolve', 1000, circular(0.3, 1000), false, out)).toBe(true);
    expect(out).toEqual([1, 2, 3]);
  });

  it("resolve: a prograde VNB burn points along the velocity of the game's own state (analytic circular orbit)", () => {
    const out = new Float64Array(3);
    const theta = 0.3;
    expect(burnDv(system, burn({ event: prograde }), 'resolve', 1000, circular(theta, 1000), false, out)).toBe(true);
    // the V axis is v̂: the relative velocity, a difference of ~3e4 m/s absolute velocities, is
    // rounded by ~4e-12 m/s, 5e-16 of its 7.5 km/s, so 5e-14 m/s on 100 m/s (measured 1e-14)
    expect(Math.abs(out[0] - 100 * -Math.sin(theta))).toBeLessThan(1e-12);
    expect(Math.abs(out[1] - 100 * Math.cos(theta))).toBeLessThan(1e-12);
    expect(Math.abs(out[2])).toBeLessThan(1e-12);
    // the vehicle delivers only part of it: scaled by the fraction
    const half = new Float64Array(3);
    burnDv(system, burn({ event: prograde, fraction: 0.5 }), 'resolve', 1000, circular(theta, 1000), false, half);
    for (let i = 0; i < 3; i++) expect(half[i]).toBeCloseTo(0.5 * out[i], 12);
  });

  it('resolve at the start of a spread burn solves for its centre: the velocity a quarter orbit on (analytic)', () => {
    const out = new Float64Array(3);
    const quarter = Math.PI / 2 / N_MEAN;
    const t0 = 1000 - quarter;
    expect(burnDv(system, burn({ event: prograde, t: 1000, tStart: t0, duration: 2 * quarter }), 'resolve', t0, circular(0, t0), true, out)).toBe(true);
    // at θ = π/2 the velocity is −x; universal-variable Kepler converges to rounding, so the
    // direction is off by ~1e-15 as above (measured 9e-14 m/s on 100 m/s)
    expect(Math.abs(out[0] + 100)).toBeLessThan(1e-12);
    expect(Math.abs(out[1])).toBeLessThan(1e-12);
  });

  it("falls back to the plan's Δv and says so when the solve fails", () => {
    // a plane change to 0.1 rad from a point 0.5 rad above the reference plane: no rotation about r reaches it
    const plane: BurnEvent = { ...prograde, dv: [0, 0, 0], solve: { kind: 'plane', i: 0.1 } };
    const out: [number, number, number] = [0, 0, 0];
    const s = circular(0, 1000, R0 * Math.tan(0.5));
    expect(burnDv(system, burn({ event: plane }), 'resolve', 1000, s, false, out)).toBe(false);
    expect(out).toEqual([1, 2, 3]);
  });
});

describe('spread burn duration (Tsiolkovsky, Curtis, 3rd ed., §11.3)', () => {
  it('burns m0(1 − e^(−Δv/ve)) of propellant at the mass flow F/ve', () => {
    const ve = 3000;
    const thrust = 30e3;
    const b = burn({ mass0: 1000, thrust, mdot: thrust / ve, dvMag: 2000, duration: 50 });
    // Δv = ve·ln 2 halves the mass: 500 kg at 10 kg/s
    expect(spreadDuration(b, ve * Math.LN2)).toBeCloseTo(50, 9);
    expect(spreadDuration(b, 0)).toBe(0);
  });

  it('without a mass flow, scales the planned duration by Δv', () => {
    expect(spreadDuration(burn({ dvMag: 200, duration: 40 }), 50)).toBe(10);
    expect(spreadDuration(burn({ dvMag: 200, duration: 0 }), 50)).toBe(0);
  });
});

describe('guidance on the demo plan (Ilmar, Tessel to Ochre)', () => {
  const demo = demoSystem();
  const result = evaluate(demo, demoPlan, { samplesPerSegment: 0 });
  it('re-solved guidance removes the departure error at the mid-course burn; open-loop burns do not', () => {
    const base = { integrator: 'verlet' as const, dt: 4 };
    const resolve = gameStepCheck(demo, demoPlan, { physics: { ...base, guidance: 'resolve' }, result, maxStepsPerSpan: 1_000_000 });
    const open = gameStepCheck(demo, demoPlan, { physics: { ...base, guidance: 'open-loop' }, result, maxStepsPerSpan: 1_000_000 });
    expect(resolve.passes).toBe(true);
    expect(open.arrival!.positionError).toBeGreaterThan(100 * resolve.arrival!.positionError);
    expect(open.passes).toBe(false);
  });
});
