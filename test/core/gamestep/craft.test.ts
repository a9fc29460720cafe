import { describe, expect, it } from 'vitest';
import { EVALS_PER_STEP, GAME_INTEGRATORS, GameCraft, METHOD_ORDER } from '../../../core/gamestep/craft.ts';
import { noRound } from '../../../core/gamestep/float32.ts';
import { kernelFor } from '../../../core/gamestep/kernel.ts';

const MU = 3.986e14; // Earth, Curtis, Orbital Mechanics for Engineering Students, Table A.2 (from memory)
const R0 = 7000e3;
const N_MEAN = Math.sqrt(MU / R0 ** 3);
const PERIOD = (2 * Math.PI) / N_MEAN;

// A circular equatorial orbit of radius R0 started on +x, flown n steps of h; the position
// error against the analytic circle r(t) = R0 (cos nt, sin nt, 0).
function circleError(method: (typeof GAME_INTEGRATORS)[number], h: number, n: number): number {
  const K = kernelFor('float64');
  const c = new GameCraft(noRound);
  c.accel = K.centralGravity(c, MU);
  c.px = R0;
  c.uy = R0 * N_MEAN;
  K.advance(c, method, 0, h, n);
  const t = n * h;
  return Math.hypot(c.px - R0 * Math.cos(N_MEAN * t), c.py - R0 * Math.sin(N_MEAN * t), c.pz);
}

describe('GameCraft', () => {
  it('moves its floating origin uniformly: O(t) = O₀ + W·(t − t_O) (analytic)', () => {
    const c = new GameCraft(noRound);
    c.ox = 1e6;
    c.oy = -2e6;
    c.oz = 3;
    c.wx = 10;
    c.wy = 0.5;
    c.wz = -4;
    c.tOrigin = 100;
    const o = new Float64Array(3);
    c.originAt(100, o);
    expect(Array.from(o)).toEqual([1e6, -2e6, 3]);
    c.originAt(140, o); // 40 s later: exact in binary (small integers and halves)
    expect(Array.from(o)).toEqual([1e6 + 400, -2e6 + 20, 3 - 160]);
    const arr = [0, 0, 0];
    c.originAt(60, arr); // before t_O: the line extends backwards
    expect(arr).toEqual([1e6 - 400, -2e6 - 20, 3 + 160]);
  });

  it('starts with no gravity and no stop thresholds', () => {
    const c = new GameCraft(noRound);
    const a = new Float64Array([7, 7, 7]);
    c.accel(0, 1, 2, 3, a);
    expect(Array.from(a)).toEqual([0, 0, 0]);
    expect(c.rebase2).toBe(Infinity);
    expect(c.exit2).toBe(Infinity);
    expect(c.evals).toBe(0);
  });

  it('EVALS_PER_STEP is the number of gravity evaluations the kernels make per step (Verlet: one more on its first step)', () => {
    for (const m of GAME_INTEGRATORS) {
      const K = kernelFor('float64');
      const c = new GameCraft(noRound);
      // count the calls independently of the kernel's own counter
      let calls = 0;
      const g = K.centralGravity(c, MU);
      c.accel = (t, x, y, z, out) => {
        calls++;
        g(t, x, y, z, out);
      };
      c.px = R0;
      c.uy = R0 * N_MEAN;
      K.advance(c, m, 0, 10, 50);
      const first = m === 'verlet' ? 1 : 0; // velocity Verlet needs a(x₀) before its first kick
      expect(calls, m).toBe(50 * EVALS_PER_STEP[m] + first);
      expect(c.evals, m).toBe(calls);
      K.advance(c, m, 500, 10, 30);
      expect(calls, m).toBe(80 * EVALS_PER_STEP[m] + first);
    }
  });

  // Global error ∝ h^p: halving the step divides the error by 2^p (Hairer, Nørsett & Wanner,
  // Solving ODEs I, 2nd ed., §II.3). Measured on a quarter of a circular orbit against the
  // analytic circle, at steps where truncation dominates rounding by many orders.
  for (const m of GAME_INTEGRATORS) {
    it(`METHOD_ORDER of ${m} is its measured order against the analytic circular orbit`, () => {
      const steps = m === 'rk4' ? 200 : 4000;
      const h = PERIOD / 4 / steps;
      const e1 = circleError(m, h, steps);
      const e2 = circleError(m, h / 2, 2 * steps);
      const p = Math.log2(e1 / e2);
      // the next term of the error expansion is O(h) smaller: measured p = 0.99997, 2.000000,
      // 0.9995, 4.009 (symplectic Euler, Verlet, explicit Euler, RK4); 0.02 leaves twice the worst
      expect(Math.abs(p - METHOD_ORDER[m])).toBeLessThan(0.02);
    });
  }
});
