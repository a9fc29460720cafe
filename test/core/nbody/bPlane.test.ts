import { describe, expect, it } from 'vitest';
import { conicInfo } from '../../../core/conic/soiCrossing.ts';
import { bPlane, bPlaneAxes } from '../../../core/nbody/bPlane.ts';

// Hand-built hyperbolas (analytic two-body relations, Vallado, Fundamentals of Astrodynamics and
// Applications, 4th ed., §2.2 and §12.4, from memory): for excess speed v∞ and impact parameter b,
// a = −μ/v∞², e = √(1 + (b v∞²/μ)²), p = a(1 − e²); the state at true anomaly ν in the perifocal
// frame is r = p/(1 + e cos ν)·(cos ν, sin ν, 0), v = √(μ/p)·(−sin ν, e + cos ν, 0). The incoming
// asymptote lies at angle acos(1/e) from periapsis, so turning the perifocal frame by −acos(1/e)
// about z puts Ŝ on +x with h along +z. Then the asymptote passes the body at y = −b, which is
// B = b·T with T = Ŝ × k̂ = −ŷ: B·T = b, B·R = 0. Tilting the plane by i about x (Ŝ stays +x, T
// stays −ŷ, R = Ŝ × T = −ẑ) gives B·T = b cos i, B·R = b sin i; a further turn about the pole k̂
// changes neither.

const MU = 3.2e14;

type V3 = [number, number, number];
const rotZ = (a: number, p: V3): V3 => [Math.cos(a) * p[0] - Math.sin(a) * p[1], Math.sin(a) * p[0] + Math.cos(a) * p[1], p[2]];
const rotX = (a: number, p: V3): V3 => [p[0], Math.cos(a) * p[1] - Math.sin(a) * p[2], Math.sin(a) * p[1] + Math.cos(a) * p[2]];
const rotY = (a: number, p: V3): V3 => [Math.cos(a) * p[0] + Math.sin(a) * p[2], p[1], -Math.sin(a) * p[0] + Math.cos(a) * p[2]];

/** State on the hyperbola (v∞, b) at true anomaly nu, with Ŝ = +x, h = +z, then moved by `move`. */
function approach(vinf: number, b: number, nu: number, move: (p: V3) => V3 = (p) => p): number[] {
  const a = -MU / (vinf * vinf);
  const q = (b * vinf * vinf) / MU;
  const e = Math.sqrt(1 + q * q);
  const p = a * (1 - e * e);
  const r = p / (1 + e * Math.cos(nu));
  const k = Math.sqrt(MU / p);
  const turn = -Math.acos(1 / e);
  const x = move(rotZ(turn, [r * Math.cos(nu), r * Math.sin(nu), 0]));
  const v = move(rotZ(turn, [-k * Math.sin(nu), k * (e + Math.cos(nu)), 0]));
  return [...x, ...v];
}

// Rounding only: the B vector is a few dozen floating-point operations on inputs of ~1e7 m, and
// conicInfo's e and P, Q carry a few ulps each; 1e-11 relative leaves two decades for that.
const REL = 1e-11;

describe('bPlane against hand-built hyperbolas (analytic)', () => {
  it('in the reference plane, prograde: B·T = b, B·R = 0, |B| = b = |a|√(e² − 1) = h/v∞, at any point of the incoming leg', () => {
    const vinf = 3200;
    const b = 2.4e7;
    for (const nu of [-2.0, -1.0, 0, 0.8]) {
      const info = conicInfo(MU, approach(vinf, b, nu));
      const axes = bPlaneAxes(info)!;
      for (let i = 0; i < 3; i++) expect(axes.S[i]).toBeCloseTo([1, 0, 0][i], 12); // unit-vector components: 1e-12 is rounding
      expect(axes.T[0]).toBeCloseTo(0, 12);
      expect(axes.T[1]).toBeCloseTo(-1, 12);
      expect(axes.R[2]).toBeCloseTo(-1, 12);
      const B = bPlane(info, null)!;
      expect(Math.abs(B.b - b) / b).toBeLessThan(REL);
      expect(Math.abs(B.bt - b) / b).toBeLessThan(REL);
      expect(Math.abs(B.br) / b).toBeLessThan(REL);
      const a = MU / (vinf * vinf);
      expect(Math.abs(a * Math.sqrt(info.e * info.e - 1) - B.b) / b).toBeLessThan(REL);
    }
  });

  it('tilted by i about Ŝ: B·T = b cos i, B·R = b sin i; a turn about the pole changes neither; retrograde flips B·T', () => {
    const vinf = 5100;
    const b = 9.5e6;
    for (const inc of [0.3, 1.2, 2.6]) {
      for (const raan of [0, 0.9, -2.2]) {
        const info = conicInfo(
          MU,
          approach(vinf, b, -0.7, (p) => rotZ(raan, rotX(inc, p))),
        );
        const B = bPlane(info, null)!;
        expect(Math.abs(B.bt - b * Math.cos(inc)) / b).toBeLessThan(REL);
        expect(Math.abs(B.br - b * Math.sin(inc)) / b).toBeLessThan(REL);
        expect(Math.abs(B.b - b) / b).toBeLessThan(REL);
      }
    }
    // i = π: a retrograde pass in the reference plane, B = −b·T
    const retro = bPlane(
      conicInfo(
        MU,
        approach(vinf, b, -0.7, (p) => rotX(Math.PI, p)),
      ),
      null,
    )!;
    expect(Math.abs(retro.bt + b) / b).toBeLessThan(REL);
  });

  it('on given axes: the projections onto those axes (B·T on R̂ and −T̂ swap the coordinates)', () => {
    const info = conicInfo(
      MU,
      approach(4000, 1.5e7, -1.1, (p) => rotZ(0.4, rotX(0.5, p))),
    );
    const own = bPlaneAxes(info)!;
    const B = bPlane(info, null)!;
    const swapped = bPlane(info, { T: own.R, R: [-own.T[0], -own.T[1], -own.T[2]] })!;
    expect(Math.abs(swapped.bt - B.br) / B.b).toBeLessThan(REL);
    expect(Math.abs(swapped.br + B.bt) / B.b).toBeLessThan(REL);
    expect(swapped.b).toBe(B.b);
  });

  it('null for a closed orbit and for an asymptote along the pole (no T axis)', () => {
    // circular orbit: r = 7e6 m, v = √(μ/r)
    const r = 7e6;
    expect(bPlane(conicInfo(MU, [r, 0, 0, 0, Math.sqrt(MU / r), 0]), null)).toBeNull();
    expect(bPlaneAxes(conicInfo(MU, [r, 0, 0, 0, Math.sqrt(MU / r), 0]))).toBeNull();
    // Ŝ turned from +x onto +z
    const polar = conicInfo(
      MU,
      approach(3000, 1e7, -0.5, (p) => rotY(-Math.PI / 2, p)),
    );
    expect(polar.e).toBeGreaterThan(1);
    expect(bPlaneAxes(polar)).toBeNull();
    expect(bPlane(polar, null)).toBeNull();
  });
});
