import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { solveLambert } from '../../../core/orbit/lambert.ts';
import type { PorkchopRequest } from '../../../core/search/request.ts';
import { FROM_PARENT, SIBLINGS, TO_PARENT, evaluateTransfer, prepareTransfer } from '../../../core/search/transfer.ts';
import { circularSystem } from './fixtures.ts';

// Hand computation (common practice; Curtis, Orbital Mechanics for Engineering Students, ch. 8,
// patched conics, from memory): the Lambert arc between the bodies' centres, v∞ = |v_arc − v_body|
// at each end, and a tangential burn at periapsis of the escape / capture hyperbola:
// Δv = √(v∞² + 2μ/r_p) − √(μ/r_p) from (or into) a circular orbit of radius r_p. The body
// positions are the analytic circular orbits, angle λ0 + n·t with n = √((μ_star + μ_body)/a³)
// (the two-body mean motion of a body of non-negligible mass).

const MU_STAR = 1.32712440018e20;
const DAY = 86400;
const inner = { id: 'inner', a: 1.5e11, mu: 4e14, radius: 6.4e6, lonDeg: 10 };
const outer = { id: 'outer', a: 2.3e11, mu: 4.3e13, radius: 3.4e6, lonDeg: 75 };
const moon = { id: 'moon', parent: 'inner', a: 3.8e8, mu: 4.9e12, radius: 1.7e6, lonDeg: 200 };
const sys = circularSystem([inner, outer, moon], MU_STAR);

function circ(b: { a: number; mu: number; lonDeg: number }, muParent: number, t: number): { r: number[]; v: number[] } {
  const n = Math.sqrt((muParent + b.mu) / b.a ** 3);
  const th = (b.lonDeg * Math.PI) / 180 + n * t;
  const w = n * b.a;
  return { r: [b.a * Math.cos(th), b.a * Math.sin(th), 0], v: [-w * Math.sin(th), w * Math.cos(th), 0] };
}
const norm = (a: number[], b: number[]): number => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
const hyperbolaBurn = (vinf: number, mu: number, rp: number): number => Math.sqrt(vinf * vinf + (2 * mu) / rp) - Math.sqrt(mu / rp);

function request(from: number, to: number, extra: Partial<PorkchopRequest> = {}): PorkchopRequest {
  return {
    from,
    to,
    depart: { start: 0, end: 100 * DAY, n: 3 },
    secondAxis: 'tof',
    second: { start: 100 * DAY, end: 300 * DAY, n: 3 },
    parkingAltitude: 300e3,
    arrivalAltitude: 500e3,
    ...extra,
  };
}

const I_INNER = sys.bodies.findIndex((b) => b.id === 'inner');
const I_OUTER = sys.bodies.findIndex((b) => b.id === 'outer');
const I_MOON = sys.bodies.findIndex((b) => b.id === 'moon');

describe('evaluateTransfer: one porkchop cell against the hand computation', () => {
  it('between two planets (siblings): v∞ at both ends and both burns from Lambert + the hyperbolic-excess formula', () => {
    const setup = prepareTransfer(sys, request(I_INNER, I_OUTER));
    expect(setup.kind).toBe(SIBLINGS);
    for (const [t0, tof] of [
      [20 * DAY, 160 * DAY],
      [55 * DAY, 230 * DAY],
    ]) {
      const cell = evaluateTransfer(sys, setup, t0, tof);
      expect(cell.solved).toBe(true);
      const d = circ(inner, MU_STAR, t0);
      const a = circ(outer, MU_STAR, t0 + tof);
      const arc = solveLambert(MU_STAR, d.r, a.r, tof)[0];
      const vinfD = norm(Array.from(arc.v1), d.v);
      const vinfA = norm(Array.from(arc.v2), a.v);
      const rp = inner.radius + 300e3;
      const ra = outer.radius + 500e3;
      // the cell and the reference share the Lambert solver but not the ephemeris (analytic
      // circles here): the conic ephemeris of a circle agrees to rounding (~1e-15 relative), so
      // speeds of a few km/s agree to ~1e-12 m/s (measured 4e-12); 1e-9 m/s is rounding with room
      expect(Math.abs(cell.vInfDepart - vinfD)).toBeLessThan(1e-9);
      expect(Math.abs(cell.vInfArrive - vinfA)).toBeLessThan(1e-9);
      expect(Math.abs(cell.c3 - vinfD * vinfD)).toBeLessThan(1e-6); // C3 = v∞² of ~1e7 m²/s²: ~1e-13 relative (measured 2e-8)
      expect(Math.abs(cell.dvDepart - hyperbolaBurn(vinfD, inner.mu, rp))).toBeLessThan(1e-9);
      expect(Math.abs(cell.dvArrive - hyperbolaBurn(vinfA, outer.mu, ra))).toBeLessThan(1e-9);
      expect(cell.dvTotal).toBe(cell.dvDepart + cell.dvArrive);
      expect(cell.metric).toBe(cell.dvTotal);
      expect([cell.revs, cell.branch]).toEqual([0, 'single']);
    }
  });

  it('flyby: no capture burn; metric departure / C3 pick those values', () => {
    const t0 = 30 * DAY;
    const tof = 200 * DAY;
    const fly = evaluateTransfer(sys, prepareTransfer(sys, request(I_INNER, I_OUTER, { arrivalEccentricity: 'flyby' })), t0, tof);
    expect(fly.dvArrive).toBe(0);
    const dep = evaluateTransfer(sys, prepareTransfer(sys, request(I_INNER, I_OUTER, { metric: 'departure' })), t0, tof);
    expect(dep.metric).toBe(dep.dvDepart);
    expect(fly.dvDepart).toBe(dep.dvDepart);
    const c3 = evaluateTransfer(sys, prepareTransfer(sys, request(I_INNER, I_OUTER, { metric: 'c3' })), t0, tof);
    expect(c3.metric).toBe(c3.c3);
  });

  it('planet to its moon on the Hohmann time of flight: the Hohmann burns (Curtis §6.3, from memory) and the arrival v∞ into the moon', () => {
    const mu = inner.mu;
    const r1 = inner.radius + 300e3;
    const r2 = moon.a;
    const tof = Math.PI * Math.sqrt(((r1 + r2) / 2) ** 3 / mu);
    const setup = prepareTransfer(sys, request(I_INNER, I_MOON, { depart: { start: 0, end: DAY, n: 2 }, second: { start: tof, end: tof, n: 1 } }));
    expect(setup.kind).toBe(FROM_PARENT);
    const cell = evaluateTransfer(sys, setup, 4 * DAY, tof);
    expect(cell.solved).toBe(true);
    const dv1 = Math.sqrt(mu / r1) * (Math.sqrt((2 * r2) / (r1 + r2)) - 1);
    // the moon moves on a circle at √((μ + μ_moon)/a), the Hohmann apoapsis speed is √(μ/r2)·√(2r1/(r1+r2))
    const vMoon = Math.sqrt((mu + moon.mu) / r2);
    const vApo = Math.sqrt(mu / r2) * Math.sqrt((2 * r1) / (r1 + r2));
    const vinfA = vMoon - vApo;
    // a 180° Lambert arc (the transfer plane comes from the parking orbit's sense): Izzo's
    // iteration converges to rounding; Δv of ~3 km/s agrees to ~1e-11 m/s (measured 5e-12)
    expect(Math.abs(cell.dvDepart - dv1)).toBeLessThan(1e-8);
    expect(Math.abs(cell.vInfArrive - vinfA)).toBeLessThan(1e-8);
    expect(Math.abs(cell.dvArrive - hyperbolaBurn(vinfA, moon.mu, moon.radius + 500e3))).toBeLessThan(1e-8);
    // C3 of the bound arc is its energy ×2, v1² − 2μ/r1 = −2μ/(r1 + r2): negative, so no departure v∞
    expect(Math.abs(cell.c3 - (-2 * mu) / (r1 + r2)) / ((2 * mu) / (r1 + r2))).toBeLessThan(1e-12); // rounding (measured 4e-14)
    expect(cell.vInfDepart).toBe(0);
  });

  it('moon to its planet: the mirror image, with the Hohmann capture burn', () => {
    const mu = inner.mu;
    const r1 = moon.a;
    const r2 = inner.radius + 500e3;
    const tof = Math.PI * Math.sqrt(((r1 + r2) / 2) ** 3 / mu);
    const setup = prepareTransfer(sys, request(I_MOON, I_INNER, { second: { start: tof, end: tof, n: 1 }, parkingAltitude: 100e3 }));
    expect(setup.kind).toBe(TO_PARENT);
    const cell = evaluateTransfer(sys, setup, 9 * DAY, tof);
    expect(cell.solved).toBe(true);
    const vPeri = Math.sqrt(mu / r2) * Math.sqrt((2 * r1) / (r1 + r2));
    const vinfD = Math.sqrt((mu + moon.mu) / r1) - Math.sqrt(mu / r1) * Math.sqrt((2 * r2) / (r1 + r2));
    // same 180° arc as above (measured 5e-13 m/s)
    expect(Math.abs(cell.dvArrive - (vPeri - Math.sqrt(mu / r2)))).toBeLessThan(1e-8);
    expect(Math.abs(cell.vInfDepart - vinfD)).toBeLessThan(1e-8);
    expect(Math.abs(cell.dvDepart - hyperbolaBurn(vinfD, moon.mu, moon.radius + 100e3))).toBeLessThan(1e-8);
  });
});

describe('evaluateTransfer: unsolved cells and refused pairs', () => {
  it('a time of flight ≤ 0 or not finite is unsolved: every value +Infinity, revs −1, no NaN', () => {
    const setup = prepareTransfer(sys, request(I_INNER, I_OUTER));
    for (const tof of [0, -DAY, Number.NaN]) {
      const cell = evaluateTransfer(sys, setup, 10 * DAY, tof);
      expect(cell.solved).toBe(false);
      expect([cell.dvDepart, cell.dvArrive, cell.dvTotal, cell.c3, cell.metric]).toEqual([Infinity, Infinity, Infinity, Infinity, Infinity]);
      expect([cell.revs, cell.branch]).toEqual([-1, 'none']);
    }
  });

  it('refuses the star, the same body twice, a pair that is neither siblings nor planet and moon, naming the field', () => {
    expect(() => prepareTransfer(sys, request(0, I_OUTER))).toThrow(/^from /);
    expect(() => prepareTransfer(sys, request(I_OUTER, I_OUTER))).toThrow(/^to /);
    expect(() => prepareTransfer(sys, request(I_MOON, I_OUTER))).toThrow(InputError);
    expect(() => prepareTransfer(sys, request(I_MOON, I_OUTER))).toThrow(/^to /);
    expect(() => prepareTransfer(sys, request(I_INNER, 99))).toThrow(/^to /);
  });
});
