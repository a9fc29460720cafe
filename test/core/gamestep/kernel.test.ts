import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { integrateFixed } from '../../../core/integrate/fixed.ts';
import { spacecraftAccel } from '../../../core/integrate/gravity.ts';
import { noRound } from '../../../core/gamestep/float32.ts';
import { GAME_INTEGRATORS, GameCraft, kernelFor, type GameIntegrator } from '../../../core/gamestep/kernel.ts';
import { absolutePositions, treeOrder } from '../../../core/gamestep/reference.ts';
import { ShipForces } from '../../../core/dynamics/shipForces.ts';
import { bodyPosition } from '../../../core/system/ephemeris.ts';
import { demoSystem } from '../plan/helpers.ts';

const MU = 3.986e14; // Earth, Curtis, Orbital Mechanics for Engineering Students, Table A.2 (from memory)

function flyKernel(method: GameIntegrator, steps: number, h: number, r0: number[], v0: number[]): number[] {
  const K = kernelFor('float64');
  const c = new GameCraft(noRound);
  c.accel = K.centralGravity(c, MU);
  [c.px, c.py, c.pz] = r0;
  [c.ux, c.uy, c.uz] = v0;
  let k = 0;
  // uneven batches, as the flight driver makes them
  while (k < steps) k += K.advance(c, method, k * h, h, Math.min(7 + (k % 5), steps - k));
  return [c.px, c.py, c.pz, c.ux, c.uy, c.uz];
}

describe('game-step kernel', () => {
  const r0 = [7000e3, 200e3, -50e3];
  const v0 = [-100, 7400, 900];
  for (const method of GAME_INTEGRATORS) {
    it(`${method} in float64 agrees bit for bit with core/integrate's stepper on spacecraftAccel`, () => {
      const h = 3.7;
      const steps = 2000;
      const accel = spacecraftAccel([{ mu: MU, position: (_t, out) => out.fill(0) }]);
      const ref = integrateFixed(method, accel, 0, r0, v0, { h, steps });
      const got = flyKernel(method, steps, h, r0, v0);
      expect(got).toEqual([...ref.x, ...ref.v]);
    });
  }

  it('float32 and float64 loops are the same code apart from the rounding line', () => {
    const strip = (name: string): string =>
      readFileSync(new URL(`../../../core/gamestep/${name}`, import.meta.url), 'utf8')
        .split('\n')
        .filter((l) => !/^const R = |^import \{ (noRound|fround) \}|arithmetic \(see kernel/.test(l))
        .join('\n');
    expect(strip('kernelF32.ts')).toBe(strip('kernelF64.ts'));
  });

  it("all-body gravity in float64 is the ship force model's star-centred acceleration, the star's indirect term included (core/dynamics/shipForces.ts)", () => {
    const sys = demoSystem();
    const K = kernelFor('float64');
    const c = new GameCraft(noRound);
    const order = treeOrder(sys);
    const acc = K.bodiesGravity(
      c,
      sys.bodies.map((b) => b.mu),
      (t, out) => absolutePositions(sys, order, t, out),
    );
    const f = new ShipForces(sys); // origin: the star
    const got = new Float64Array(3);
    const want = new Float64Array(3);
    const t = 14.2e6;
    const T = bodyPosition(sys, sys.indexById.tessel, t, [0, 0, 0], 0);
    for (const X of [
      [1.3e11, 4e10, -2e9],
      [T[0] + 2e7, T[1] - 1e7, T[2] + 3e6],
      [-6e11, 2e11, 1e10],
    ]) {
      acc(t, X[0], X[1], X[2], got);
      f.accel(t, Float64Array.from(X), new Float64Array(3), want);
      // the same terms summed in another grouping: a few roundings. Without the indirect term the
      // two would differ by the star's acceleration, ~2e-7 m/s² (Moravel's pull): 3e-7 to 1e-3 of |a| here
      expect(Math.hypot(got[0] - want[0], got[1] - want[1], got[2] - want[2])).toBeLessThan(1e-14 * Math.hypot(want[0], want[1], want[2]));
    }
  });

  it('float32 state stays exactly representable in binary32 (IEEE 754 binary32)', () => {
    const K = kernelFor('float32');
    const c = new GameCraft(Math.fround);
    c.accel = K.centralGravity(c, MU);
    c.px = Math.fround(r0[0]);
    c.uy = Math.fround(v0[1]);
    for (const m of GAME_INTEGRATORS) K.advance(c, m, 0, Math.fround(1 / 60), 100);
    for (const x of [c.px, c.py, c.pz, c.ux, c.uy, c.uz]) expect(Math.fround(x)).toBe(x);
  });

  it('stops early at the floating-origin threshold and at the SOI radius', () => {
    const K = kernelFor('float64');
    const c = new GameCraft(noRound);
    c.ux = 10; // free drift, 10 m/s
    c.rebase2 = 100 * 100;
    expect(K.advance(c, 'verlet', 0, 1, 1000)).toBe(11); // |p| = 110 m > 100 m after 11 steps
    const d = new GameCraft(noRound);
    d.ox = 990;
    d.ux = 10;
    d.exit2 = 1000 * 1000;
    expect(K.advance(d, 'rk4', 0, 1, 1000)).toBe(2); // 990 + 20 > 1000
  });
});
