import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import {
  inertialToRtn,
  inertialToVnb,
  mat3Mul,
  mat3MulVec,
  mat3TMulVec,
  perifocalToInertial,
  rotX,
  rotZ,
  rtnMatrix,
  rtnToInertial,
  vnbMatrix,
  vnbToInertial,
} from '../../../core/math/frames.ts';
import { cross, dot, norm, type V3 } from '../../fuzz/vec.ts';

const finite = fc.double({ min: -1e8, max: 1e8, noNaN: true });
const vec = fc.tuple(finite, finite, finite).filter((v) => norm(v) > 1);
// states with r and v far from parallel
const state = fc.tuple(vec, vec).filter(([r, v]) => norm(cross(r, v)) > 1e-3 * norm(r) * norm(v));

function expectClose(a: ArrayLike<number>, b: ArrayLike<number>, tol: number): void {
  for (let k = 0; k < b.length; k++) expect(Math.abs(a[k] - b[k])).toBeLessThanOrEqual(tol);
}

function det3(m: ArrayLike<number>): number {
  return m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
}

function expectRotation(m: ArrayLike<number>): void {
  const mtm = mat3Mul([m[0], m[3], m[6], m[1], m[4], m[7], m[2], m[5], m[8]], m);
  expectClose(mtm, [1, 0, 0, 0, 1, 0, 0, 0, 1], 1e-14);
  expect(det3(m)).toBeCloseTo(1, 14);
}

describe('VNB and RTN frames', () => {
  // Circular prograde orbit in the xy plane: analytic axes.
  const r = [7.0e6, 0, 0];
  const v = [0, 7.5e3, 0];

  it('VNB axes of a circular equatorial orbit are V = +y, N = +z, B = +x (analytic)', () => {
    expect(vnbToInertial(r, v, [1, 0, 0])).toEqual([0, 1, 0]);
    expect(vnbToInertial(r, v, [0, 1, 0])).toEqual([0, 0, 1]);
    expect(vnbToInertial(r, v, [0, 0, 1])).toEqual([1, 0, 0]);
  });

  it('RTN axes of a circular equatorial orbit are R = +x, T = +y, N = +z (analytic)', () => {
    expect(rtnToInertial(r, v, [1, 0, 0])).toEqual([1, 0, 0]);
    expect(rtnToInertial(r, v, [0, 1, 0])).toEqual([0, 1, 0]);
    expect(rtnToInertial(r, v, [0, 0, 1])).toEqual([0, 0, 1]);
  });

  it('a prograde burn in VNB is along velocity; a radial one in RTN is along r (analytic)', () => {
    const r1: V3 = [1e7, 2e6, -3e6];
    const v1: V3 = [-1e3, 6e3, 2e3];
    const dv = vnbToInertial(r1, v1, [10, 0, 0]);
    expectClose(
      dv,
      v1.map((x) => (10 * x) / norm(v1)),
      1e-12,
    );
    const dr = rtnToInertial(r1, v1, [5, 0, 0]);
    expectClose(
      dr,
      r1.map((x) => (5 * x) / norm(r1)),
      1e-12,
    );
    // N is along r × v in both frames
    const h = cross(r1, v1);
    expectClose(
      vnbToInertial(r1, v1, [0, 1, 0]),
      h.map((x) => x / norm(h)),
      1e-15,
    );
    expectClose(
      rtnToInertial(r1, v1, [0, 0, 1]),
      h.map((x) => x / norm(h)),
      1e-15,
    );
  });

  it('frame matrices are proper rotations and the inverse maps round-trip (property)', () => {
    fc.assert(
      fc.property(state, vec, ([r1, v1], x) => {
        expectRotation(vnbMatrix(r1, v1));
        expectRotation(rtnMatrix(r1, v1));
        const s = norm(x);
        expectClose(vnbToInertial(r1, v1, inertialToVnb(r1, v1, x)), x, 1e-14 * s);
        expectClose(rtnToInertial(r1, v1, inertialToRtn(r1, v1, x)), x, 1e-14 * s);
        // matrix form agrees with the function form
        expectClose(mat3MulVec(vnbMatrix(r1, v1), [1, 2, 3]), vnbToInertial(r1, v1, [1, 2, 3]), 1e-14 * 4);
        expectClose(mat3TMulVec(rtnMatrix(r1, v1), x), inertialToRtn(r1, v1, x), 1e-14 * s);
        // B ⟂ r×v and T·v > 0 (T is on the side of motion)
        const t = rtnToInertial(r1, v1, [0, 1, 0]);
        expect(dot(t, v1)).toBeGreaterThan(0);
      }),
      { numRuns: 300 },
    );
  });

  it('allows out to alias the input vector', () => {
    const x = [1, 2, 3];
    const y = inertialToVnb(r, v, x, x);
    expect(y).toBe(x);
    expect(x).toEqual([2, 3, 1]);
  });

  it('rejects zero r, zero v, r ∥ v and non-finite components with InputError naming the field', () => {
    const err = (f: () => unknown): InputError => {
      try {
        f();
      } catch (e) {
        return e as InputError;
      }
      throw new Error('did not throw');
    };
    expect(err(() => vnbToInertial([0, 0, 0], v, [1, 0, 0]))).toBeInstanceOf(InputError);
    expect(err(() => vnbToInertial([0, 0, 0], v, [1, 0, 0])).field).toBe('r');
    expect(err(() => rtnToInertial(r, [0, 0, 0], [1, 0, 0])).field).toBe('v');
    expect(err(() => rtnToInertial(r, [3, 0, 0], [1, 0, 0])).field).toBe('r, v');
    expect(err(() => inertialToRtn([1, NaN, 0], v, [1, 0, 0])).field).toBe('r');
    expect(err(() => inertialToVnb(r, v, [1, Infinity, 0])).field).toBe('vec');
  });
});

describe('rotations', () => {
  it('rotX/rotZ are active right-handed rotations (analytic)', () => {
    expectClose(mat3MulVec(rotZ(Math.PI / 2), [1, 0, 0]), [0, 1, 0], 1e-16);
    expectClose(mat3MulVec(rotX(Math.PI / 2), [0, 1, 0]), [0, 0, 1], 1e-16);
    expectRotation(rotX(0.7));
    expectRotation(rotZ(-2.1));
  });

  it('perifocalToInertial equals Rz(Ω)·Rx(i)·Rz(ω) composed from the elementary rotations', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -7, max: 7, noNaN: true }),
        fc.double({ min: 0, max: Math.PI, noNaN: true }),
        fc.double({ min: -7, max: 7, noNaN: true }),
        (O, i, w) => {
          const q = perifocalToInertial(O, i, w);
          const ref = mat3Mul(rotZ(O), mat3Mul(rotX(i), rotZ(w)));
          expectClose(q, ref, 1e-15);
          expectRotation(q);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('perifocal normal column is the orbit normal (sin i sin Ω, −sin i cos Ω, cos i) (Curtis §4.6)', () => {
    const O = 0.3,
      i = 1.1;
    const q = perifocalToInertial(O, i, 0.9);
    expectClose([q[2], q[5], q[8]], [Math.sin(i) * Math.sin(O), -Math.sin(i) * Math.cos(O), Math.cos(i)], 1e-16);
  });
});
