/**
 * A hand-built PlanResult in the demo system, for the export tests: every state is written from
 * a closed form, not from evaluate.
 *  - seg 0, coast around Tessel on a circular orbit of radius R0 (x-y plane), [0, 4000] s;
 *  - seg 1, coast around Tessel after an impulsive prograde burn at 4000 s, [4000, 9000] s;
 *  - seg 2, coast around Ilmar (an SOI change at 9000 s), [9000, 20000] s;
 *  - seg 3, a finite burn around Ilmar with constant acceleration ACC, [20000, 20600] s
 *    (positions r0 + v0 τ + ½ a τ², drawn every 100 s), mass 1000 → 950 kg;
 *  - seg 4, coast around Ilmar from the burn's end state, [20600, 30000] s.
 */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import type { Budget, PlanResult, TrajectorySegment } from '../../../core/plan/result.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import type { StarSystem } from '../../../core/system/model.ts';

export const ilmar: StarSystem = parseSystemFile(readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
export const TESSEL = ilmar.indexById.tessel;
export const R0 = 6.3e6;
export const ACC = [0.02, 0.05, -0.01] as const;

function coast(central: number, t0: number, t1: number, state0: ArrayLike<number>, mass: number): TrajectorySegment {
  return {
    kind: 'coast',
    central,
    t0,
    t1,
    state0: Float64Array.from(state0),
    mu: ilmar.bodies[central].mu,
    sampleT: new Float64Array([t0, t1]),
    samples: new Float64Array(6),
    mass0: mass,
    mass1: mass,
  };
}

export function syntheticResult(): PlanResult {
  const mu = ilmar.bodies[TESSEL].mu;
  const vc = Math.sqrt(mu / R0);
  const n = vc / R0;
  // Circular orbit: at t, r = R0 (cos nt, sin nt, 0).
  const s0 = [R0, 0, 0, 0, vc, 0];
  const tb = 4000;
  const c = Math.cos(n * tb),
    s = Math.sin(n * tb);
  const s1 = [R0 * c, R0 * s, 0, -vc * s * 1.3, vc * c * 1.3, 0];
  const after1 = propagateKepler(mu, s1, 5000);
  const tes = bodyState(ilmar, TESSEL, 9000, new Float64Array(6));
  const s2 = Array.from({ length: 6 }, (_, k) => after1[k] + tes[k]);
  const atBurn = propagateKepler(ilmar.bodies[0].mu, s2, 11000);
  const T0 = 20000,
    T1 = 20600;
  const sampleT: number[] = [];
  const samples: number[] = [];
  for (let t = T0; t <= T1; t += 100) {
    const tau = t - T0;
    sampleT.push(t);
    for (let k = 0; k < 3; k++) samples.push(atBurn[k] + atBurn[3 + k] * tau + 0.5 * ACC[k] * tau * tau);
  }
  const tau = T1 - T0;
  const end = [0, 1, 2].map((k) => atBurn[k] + atBurn[3 + k] * tau + 0.5 * ACC[k] * tau * tau);
  const endV = [0, 1, 2].map((k) => atBurn[3 + k] + ACC[k] * tau);
  const burn: TrajectorySegment = {
    kind: 'burn',
    central: 0,
    t0: T0,
    t1: T1,
    state0: Float64Array.from(atBurn),
    mu: ilmar.bodies[0].mu,
    sampleT: Float64Array.from(sampleT),
    samples: Float64Array.from(samples),
    mass0: 1000,
    mass1: 950,
  };
  const segments = [
    coast(TESSEL, 0, tb, s0, 1200),
    coast(TESSEL, tb, 9000, s1, 1000),
    coast(0, 9000, T0, s2, 1000),
    burn,
    coast(0, T1, 30000, [...end, ...endV], 950),
  ];
  return { t0: 0, t1: 30000, segments, events: [], budget: syntheticBudget(), target: null, flags: [], model: 'conic' };
}

export function syntheticBudget(margin = 12.5): Budget {
  return {
    rows: [
      {
        planEventId: 'kick',
        name: 'Kick, "prograde"',
        t: 4000,
        tStart: 3990,
        tEnd: 4010,
        dv: 1234.5,
        frame: 'vnb',
        dvFrame: [1234.5, 0, 0],
        dvInertial: [-1000.25, 723.75, 0],
        duration: 20,
        propellantUsed: 200,
        massBefore: 1200,
        massAfter: 1000,
        stages: ['Kick'],
        dvLeft: 600,
        gravityLoss: null,
        periodFraction: 0.004,
        flags: [],
      },
      {
        planEventId: 'cruise',
        name: 'Cruise push',
        t: 20300,
        tStart: 20000,
        tEnd: 20600,
        dv: 31.25,
        frame: 'inertial',
        dvFrame: [11, 28, -5.5],
        dvInertial: [11, 28, -5.5],
        duration: 600,
        propellantUsed: 50,
        massBefore: 1000,
        massAfter: 950,
        stages: ['Kick', 'Cruise'],
        dvLeft: 568.75,
        gravityLoss: 0.125,
        periodFraction: null,
        flags: [{ code: 'stage-dry-mid-burn', severity: 'warning', message: 'stage Kick runs dry mid-burn', planEventId: 'cruise' }],
      },
    ],
    total: 1265.75,
    capacity: 1834.5,
    reserve: 556.25,
    dvLeft: 568.75,
    margin,
    propellantUsed: 250,
    finalMass: 950,
    failedBurns: [],
  };
}
