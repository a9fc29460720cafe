import { describe, expect, it } from 'vitest';
import { flyFiniteBurn } from '../../../core/conic/finiteBurn.ts';
import type { Vehicle } from '../../../core/plan/plan.ts';
import { G0 } from '../../../core/plan/rocket.ts';
import { createVehicleState, spendBurn } from '../../../core/plan/vehicle.ts';
import { elementsToState } from '../../../core/orbit/elements.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { MU_EARTH, R_EARTH } from '../plan/helpers.ts';
import { ODEX_CONVERGED, odexSolve } from '../integrate/odexRef.ts';

const norm = (a: ArrayLike<number>): number => Math.hypot(a[0], a[1], a[2]);

function ship(thrust: number, isp = 320, prop = 800): Vehicle {
  return { name: 'f', payloadMass: 200, stages: [{ name: 's', dryMass: 200, propellantMass: prop, isp, thrust }] };
}

/** Finite prograde burn of dv centred at t = 0 on a circular orbit; returns the result and the impulsive end state. */
function prograde(thrust: number, dv: number, pointing: 'velocity' | 'inertial' = 'velocity') {
  const r = R_EARTH + 400e3;
  const centre = elementsToState(MU_EARTH, { a: r, e: 0, i: 0.2, raan: 0.3, argp: 0, nu: 1.0 });
  const v = norm([centre[3], centre[4], centre[5]]);
  const dvVec = [(centre[3] / v) * dv, (centre[4] / v) * dv, (centre[5] / v) * dv];
  const vehicle = ship(thrust);
  const book = spendBurn(vehicle, createVehicleState(vehicle), dv);
  const tStart = -0.5 * book.duration;
  const start = propagateKepler(MU_EARTH, centre, tStart);
  const res = flyFiniteBurn({ mu: MU_EARTH, state: start, tStart, dvImpulsive: dvVec, centreState: centre, pointing, book, samples: 8 });
  const imp = [centre[0], centre[1], centre[2], centre[3] + dvVec[0], centre[4] + dvVec[1], centre[5] + dvVec[2]];
  const impEnd = propagateKepler(MU_EARTH, imp, res.tEnd);
  return { res, impEnd, book };
}

describe('finite burn', () => {
  it('converges to the impulsive burn as thrust grows: gravity loss → 0, end state → impulsive', () => {
    // per decade of thrust (burn time / 10): the loss falls ~100× (second order in the burn arc),
    // the position miss ~10× (first order: centring in time, not in impulse, with the mass falling)
    let prevLoss = Infinity;
    let prevMiss = Infinity;
    for (const thrust of [2e3, 2e4, 2e5, 2e6]) {
      const { res, impEnd } = prograde(thrust, 500);
      const miss = Math.hypot(res.state[0] - impEnd[0], res.state[1] - impEnd[1], res.state[2] - impEnd[2]);
      expect(res.gravityLoss).toBeGreaterThan(0);
      if (prevLoss < Infinity) {
        expect(prevLoss / res.gravityLoss).toBeGreaterThan(80);
        expect(prevMiss / miss).toBeGreaterThan(9);
      }
      prevLoss = res.gravityLoss;
      prevMiss = miss;
    }
    expect(prevLoss).toBeLessThan(1e-5);
    expect(prevMiss).toBeLessThan(3);
  });

  it('gravity loss grows as the square of the burn arc for short burns (Robbins 1966, from memory)', () => {
    const a = prograde(2e3, 500).res.gravityLoss;
    const b = prograde(4e3, 500).res.gravityLoss; // half the burn time
    expect(a / b).toBeGreaterThan(3.6);
    expect(a / b).toBeLessThan(4.4);
  });

  it('propellant matches the rocket equation for the delivered Δv (Tsiolkovsky, analytic; gravity negligible)', () => {
    // far from the body gravity is negligible: the velocity change equals c·ln(m0/m1)
    const vehicle = ship(5e3, 300, 600);
    const book = spendBurn(vehicle, createVehicleState(vehicle), 1200);
    const state = [1e12, 0, 0, 0, 1, 0];
    const dir = [0.6, 0, 0.8];
    const res = flyFiniteBurn({
      mu: 1,
      state,
      tStart: 0,
      dvImpulsive: dir.map((x) => 1200 * x),
      centreState: state,
      pointing: 'inertial',
      book,
      samples: 0,
    });
    const dvActual = norm([res.state[3] - state[3], res.state[4] - state[4], res.state[5] - state[5]]);
    const m0 = 1000;
    expect(res.massEnd).toBeCloseTo(m0 - book.propellantUsed, 6);
    expect(dvActual).toBeCloseTo(300 * G0 * Math.log(m0 / res.massEnd), 4);
    expect(dvActual).toBeCloseTo(1200, 4);
    expect(res.dvPropellant).toBeCloseTo(1200, 6);
    expect(res.gravityLoss).toBeCloseTo(0, 4);
  });

  it('velocity pointing follows the velocity; inertial pointing loses more on a long burn', () => {
    const v = prograde(1500, 500, 'velocity').res.gravityLoss;
    const i = prograde(1500, 500, 'inertial').res.gravityLoss;
    expect(v).toBeGreaterThan(0);
    expect(i).toBeGreaterThan(v);
  });

  it('across staging: phases burn in turn, propellant and mass agree with the bookkeeping', () => {
    const vehicle: Vehicle = {
      name: 'two',
      payloadMass: 100,
      stages: [
        { name: 'a', dryMass: 100, propellantMass: 300, isp: 300, thrust: 3e4 },
        { name: 'b', dryMass: 50, propellantMass: 200, isp: 330, thrust: 1e4 },
      ],
    };
    const book = spendBurn(vehicle, createVehicleState(vehicle), 3000);
    expect(book.phases).toBe(2);
    const state = [1e12, 0, 0, 0, 1, 0];
    const res = flyFiniteBurn({ mu: 1, state, tStart: 0, dvImpulsive: [3000, 0, 0], centreState: state, pointing: 'inertial', book, samples: 16 });
    expect(res.tEnd).toBeCloseTo(book.duration, 9);
    expect(res.massEnd).toBeCloseTo(book.massAfter, 6);
    expect(res.dvPropellant).toBeCloseTo(3000, 6);
    expect(res.state[3]).toBeCloseTo(3000, 3);
    expect(res.sampleT.length).toBe(16);
    expect(res.sampleT[15]).toBeCloseTo(book.duration, 9);
  });
});

describe('finite burn against an independent integrator', () => {
  it('matches odex on the equations written plainly here: central gravity, thrust F/m along û or at fixed VNB components (V = v/|v|, N = r×v/|r×v|, B = V×N; Vallado, 4th ed., §3.3), ṁ = −F/c', () => {
    for (const pointing of ['velocity', 'inertial'] as const) {
      for (const tilt of [0, 0.5]) {
        const r = R_EARTH + 400e3;
        const centre = elementsToState(MU_EARTH, { a: r, e: 0, i: 0.2, raan: 0.3, argp: 0, nu: 1.0 });
        const vn = norm([centre[3], centre[4], centre[5]]);
        const h = [centre[1] * centre[5] - centre[2] * centre[4], centre[2] * centre[3] - centre[0] * centre[5], centre[0] * centre[4] - centre[1] * centre[3]];
        const hn = norm(h);
        // Δv of 500 m/s along the velocity, tilted out of the plane by `tilt` rad
        const dv = [0, 1, 2].map((i) => 500 * (Math.cos(tilt) * (centre[3 + i] / vn) + Math.sin(tilt) * (h[i] / hn)));
        const vehicle = ship(1500);
        const book = spendBurn(vehicle, createVehicleState(vehicle), 500);
        const tStart = -0.5 * book.duration;
        const start = propagateKepler(MU_EARTH, centre, tStart);
        const res = flyFiniteBurn({ mu: MU_EARTH, state: start, tStart, dvImpulsive: dv, centreState: centre, pointing, book, samples: 0 });
        // the same burn, plainly: VNB components of û at the centre, then the frame of each state
        const u = dv.map((x) => x / 500);
        const frame = (s: ArrayLike<number>): number[][] => {
          const V = [s[3], s[4], s[5]].map((x) => x / norm([s[3], s[4], s[5]]));
          const n = [s[1] * s[5] - s[2] * s[4], s[2] * s[3] - s[0] * s[5], s[0] * s[4] - s[1] * s[3]];
          const N = n.map((x) => x / norm(n));
          return [V, N, [V[1] * N[2] - V[2] * N[1], V[2] * N[0] - V[0] * N[2], V[0] * N[1] - V[1] * N[0]]];
        };
        const F0 = frame(centre);
        const l = F0.map((ax) => ax[0] * u[0] + ax[1] * u[1] + ax[2] * u[2]);
        const st = vehicle.stages[0]; // one stage fires
        expect(book.phases).toBe(1);
        const c = st.isp * G0;
        const f = (_t: number, y: number[]): number[] => {
          const rr = norm(y);
          let d = u;
          if (pointing === 'velocity') {
            const F = frame(y);
            d = [0, 1, 2].map((i) => l[0] * F[0][i] + l[1] * F[1][i] + l[2] * F[2][i]);
          }
          const a = st.thrust / y[6];
          return [y[3], y[4], y[5], ...[0, 1, 2].map((i) => (-MU_EARTH * y[i]) / rr ** 3 + a * d[i]), -st.thrust / c];
        };
        const want = odexSolve(f, tStart, [...Array.from(start), book.massBefore], res.tEnd, 1e-13, 1e-9);
        expect(want.outcome).toBe(ODEX_CONVERGED);
        // RK45 at rtol 1e-10 with atol 1e-9·|r| (~7 mm per step) over the burn's dozen steps:
        // measured 0.7–0.9 mm and 1.4 µm/s; the bounds allow ten times that
        expect(Math.hypot(res.state[0] - want.y[0], res.state[1] - want.y[1], res.state[2] - want.y[2])).toBeLessThan(1e-2);
        expect(Math.hypot(res.state[3] - want.y[3], res.state[4] - want.y[4], res.state[5] - want.y[5])).toBeLessThan(1e-5);
        expect(res.massEnd).toBeCloseTo(want.y[6], 6);
      }
    }
  });
});
