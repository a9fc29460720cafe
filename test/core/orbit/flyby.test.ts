import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { flybyBPlaneAngle, flybyTurnAngle, poweredFlyby, unpoweredFlyby, unpoweredFlybyMatch } from '../../../core/orbit/flyby.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';

const DEG = Math.PI / 180;
const norm = (v: ArrayLike<number>): number => Math.hypot(v[0], v[1], v[2]);
const dot = (a: ArrayLike<number>, b: ArrayLike<number>): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const angle = (a: ArrayLike<number>, b: ArrayLike<number>): number => Math.acos(Math.max(-1, Math.min(1, dot(a, b) / (norm(a) * norm(b)))));

/** Angle of the asymptote of a planar trajectory from periapsis (rp, 0) with speed vp along +y, by propagating far out (± t). */
function asymptoteVelocity(mu: number, rp: number, vp: number, t: number): number[] {
  return Array.from(propagateKepler(mu, [rp, 0, 0, 0, vp, 0], t)).slice(3);
}

describe('flybyTurnAngle', () => {
  it('is 2·asin(1/e), e = 1 + r_p·v∞²/μ, and equals the angle between the asymptotes of the propagated hyperbola (analytic)', () => {
    const mu = 3.7931e16; // a giant planet, m³/s²
    const rp = 7.5e7;
    const vInf = 6200;
    const e = 1 + (rp * vInf * vInf) / mu;
    expect(flybyTurnAngle(mu, rp, vInf)).toBeCloseTo(2 * Math.asin(1 / e), 14);
    // independent: Kepler propagation from periapsis to ±4e8 s; there the velocity's direction is
    // within ~1e-7 rad of the asymptote (it closes in as (r_p/r)²), hence 1e-6
    const vp = Math.sqrt(vInf * vInf + (2 * mu) / rp);
    const out = asymptoteVelocity(mu, rp, vp, 4e8);
    const back = asymptoteVelocity(mu, rp, vp, -4e8);
    expect(Math.abs(angle(out, back) - flybyTurnAngle(mu, rp, vInf))).toBeLessThan(1e-6);
  });

  it('matches Curtis, Orbital Mechanics for Engineering Students, 3rd ed., Example 8.6 (Venus flyby; δ from memory)', () => {
    // Book data (Tables A.1, A.2): μ_sun = 1.3271e11 km³/s², μ_Venus = 324 900 km³/s²,
    // R_earth = 149.6e6 km, R_Venus = 108.2e6 km, r_Venus = 6052 km; periapsis altitude 300 km;
    // the pre-flyby ellipse has aphelion at Earth and meets Venus at true anomaly −30°.
    const muSun = 1.3271e11;
    const muV = 324900;
    const rE = 149.6e6;
    const rV = 108.2e6;
    const e1 = (rE - rV) / (rE + rV * Math.cos(-30 * DEG));
    expect(e1).toBeCloseTo(0.1702, 4); // printed e1 = 0.1702
    const h1 = Math.sqrt(muSun * rE * (1 - e1));
    const vPerp = h1 / rV;
    const vRad = (muSun / h1) * e1 * Math.sin(-30 * DEG);
    const vVenus = Math.sqrt(muSun / rV);
    const vInf = Math.hypot(vPerp - vVenus, vRad);
    const delta = flybyTurnAngle(muV, 6052 + 300, vInf) / DEG;
    // the book prints δ = 103.6° (from memory), to 0.1°
    expect(Math.abs(delta - 103.6)).toBeLessThan(0.05 + 1e-9);
  });

  it('rejects bad input with InputError', () => {
    expect(() => flybyTurnAngle(0, 1, 1)).toThrow(InputError);
    expect(() => flybyTurnAngle(1, -1, 1)).toThrow(InputError);
    expect(() => flybyTurnAngle(1, 1, Number.NaN)).toThrow(InputError);
  });
});

describe('unpoweredFlyby', () => {
  const mu = 1.267e17;
  const vin = [3100, -4200, 900];
  const rp = 2.1e8;

  it('keeps |v∞|, turns by δ(r_p) toward −B̂, and the B-plane angle round-trips (analytic)', () => {
    for (const th of [0, 0.7, 2.4, 4.0, 5.9]) {
      const out = new Float64Array(3);
      unpoweredFlyby(mu, vin, rp, th, out);
      // |v∞ in| = |v∞ out| to a few ulps of the rotation
      expect(Math.abs(norm(out) - norm(vin)) / norm(vin)).toBeLessThan(1e-14);
      expect(Math.abs(angle(vin, out) - flybyTurnAngle(mu, rp, norm(vin)))).toBeLessThan(1e-12);
      // B̂ from the axes T = Ŝ×ẑ/|…|, R = Ŝ×T: the turn is toward −B̂ by sin δ
      const S = vin.map((x) => x / norm(vin));
      const tn = Math.hypot(S[1], S[0]);
      const T = [S[1] / tn, -S[0] / tn, 0];
      const R = [S[1] * T[2] - S[2] * T[1], S[2] * T[0] - S[0] * T[2], S[0] * T[1] - S[1] * T[0]];
      const B = [0, 1, 2].map((k) => Math.cos(th) * T[k] + Math.sin(th) * R[k]);
      const d = flybyTurnAngle(mu, rp, norm(vin));
      expect(dot(out, B) / norm(vin)).toBeCloseTo(-Math.sin(d), 12);
      const back = flybyBPlaneAngle(vin, out);
      expect(Math.abs(Math.atan2(Math.sin(back - th), Math.cos(back - th)))).toBeLessThan(1e-9);
    }
  });

  it('heliocentric Δv from the turn is 2·v∞·sin(δ/2) and the energy change is V·(v∞out − v∞in) (analytic)', () => {
    const V = [-12000, 9000, 150]; // the body's heliocentric velocity
    const out = new Float64Array(3);
    unpoweredFlyby(mu, vin, rp, 1.1, out);
    const d = flybyTurnAngle(mu, rp, norm(vin));
    const dv = [out[0] - vin[0], out[1] - vin[1], out[2] - vin[2]];
    expect(norm(dv)).toBeCloseTo(2 * norm(vin) * Math.sin(d / 2), 8);
    const vPlus = [V[0] + out[0], V[1] + out[1], V[2] + out[2]];
    const vMinus = [V[0] + vin[0], V[1] + vin[1], V[2] + vin[2]];
    // the heliocentric position is the body's at the pass (patched conics): the energy change is kinetic only
    const dE = 0.5 * (dot(vPlus, vPlus) - dot(vMinus, vMinus));
    // relative to |E| ~ 1e8 J/kg, round-off of the squares ~1e-8 relative
    expect(Math.abs(dE - dot(V, dv))).toBeLessThan(1e-8 * dot(vMinus, vMinus));
    const r = poweredFlyby(mu, vin, out, 1e6);
    expect(r.freeDv).toBeCloseTo(norm(dv), 8);
  });
});

describe('poweredFlyby', () => {
  const mu = 1.267e17;
  const rpMin = 7.2e7;

  it('equal speeds: no burn and r_p from the unpowered turn, reproducing v∞ out (analytic)', () => {
    const vin = [5000, 1000, -800];
    const out = new Float64Array(3);
    unpoweredFlyby(mu, vin, 3.3e8, 2.0, out);
    const p = poweredFlyby(mu, vin, out, rpMin);
    expect(p.limited).toBe(false);
    expect(p.dvPeriapsis).toBeLessThan(1e-9 * norm(vin));
    // r_p from δ = 2·asin(1/e) inverted: e = 1/sin(δ/2), rp = (e − 1)μ/v∞²; the turn itself is
    // recovered from the vectors through acos (≈1e-8 rad), hence 1e-7 relative
    expect(Math.abs(p.rp - 3.3e8) / 3.3e8).toBeLessThan(1e-7);
    expect(Math.abs(p.bAngle - 2.0)).toBeLessThan(1e-9);
    const again = new Float64Array(3);
    unpoweredFlyby(mu, vin, p.rp, p.bAngle, again);
    expect(norm([again[0] - out[0], again[1] - out[1], again[2] - out[2]])).toBeLessThan(1e-6);
  });

  it('different speeds: asin(1/e_in) + asin(1/e_out) = turn at the solution, the burn is the periapsis speed difference, and the propagated hyperbolas turn by that much (analytic)', () => {
    const vin = [4000, -3000, 500];
    const vout = [-1500, -5200, 300];
    const p = poweredFlyby(mu, vin, vout, rpMin);
    const vi = norm(vin);
    const vo = norm(vout);
    expect(p.turn).toBeCloseTo(angle(vin, vout), 12);
    expect(p.limited).toBe(false);
    const eIn = 1 + (p.rp * vi * vi) / mu;
    const eOut = 1 + (p.rp * vo * vo) / mu;
    expect(Math.abs(Math.asin(1 / eIn) + Math.asin(1 / eOut) - p.turn)).toBeLessThan(1e-12);
    const vpIn = Math.sqrt(vi * vi + (2 * mu) / p.rp);
    const vpOut = Math.sqrt(vo * vo + (2 * mu) / p.rp);
    expect(p.dvPeriapsis).toBeCloseTo(Math.abs(vpOut - vpIn), 9);
    expect(p.dvTotal).toBe(p.dvPeriapsis);
    // independent: the incoming hyperbola backward from periapsis and the outgoing one forward
    // (Kepler propagation to ±3e9 s: the direction is then ~1e-7 rad from the asymptotes, hence
    // 1e-6; the speed still exceeds v∞ by μ/(r·v∞²) ≈ 3e-4 relative, hence 1e-3)
    const back = asymptoteVelocity(mu, p.rp, vpIn, -3e9);
    const fwd = asymptoteVelocity(mu, p.rp, vpOut, 3e9);
    expect(Math.abs(angle(back, fwd) - p.turn)).toBeLessThan(1e-6);
    expect(Math.abs(norm(back) - vi) / vi).toBeLessThan(1e-3);
  });

  it('a turn beyond reach at rpMin flies at rpMin and pays |wanted − reached| as dvExtra (analytic)', () => {
    const vin = [9000, 0, 0];
    const vout = [-9000 * Math.cos(0.3), 9000 * Math.sin(0.3), 0]; // turn π − 0.3
    const p = poweredFlyby(mu, vin, vout, rpMin);
    expect(p.limited).toBe(true);
    expect(p.rp).toBe(rpMin);
    const maxTurn = flybyTurnAngle(mu, rpMin, 9000);
    expect(p.maxTurn).toBeCloseTo(maxTurn, 12);
    const reached = new Float64Array(3);
    unpoweredFlyby(mu, vin, rpMin, p.bAngle, reached);
    const miss = norm([vout[0] - reached[0], vout[1] - reached[1], vout[2] - reached[2]]);
    expect(p.dvExtra).toBeCloseTo(miss, 6);
    expect(p.dvExtra).toBeCloseTo(2 * 9000 * Math.sin((p.turn - maxTurn) / 2), 6);
    expect(p.dvPeriapsis).toBeLessThan(1e-9);
  });

  it('unpowered match pays the speed mismatch as dvExtra (analytic)', () => {
    const vin = [4000, -3000, 500];
    const vout = [-1500, -5200, 300];
    const u = unpoweredFlybyMatch(mu, vin, vout, rpMin);
    expect(u.dvPeriapsis).toBe(0);
    expect(u.limited).toBe(false);
    expect(u.dvExtra).toBeCloseTo(Math.abs(norm(vout) - norm(vin)), 9);
    expect(u.rp).toBeCloseTo(((1 / Math.sin(u.turn / 2) - 1) * mu) / dot(vin, vin), 0);
  });

  it('rejects zero or non-finite vectors with InputError', () => {
    expect(() => poweredFlyby(mu, [0, 0, 0], [1, 0, 0], rpMin)).toThrow(InputError);
    expect(() => poweredFlyby(mu, [1, Number.NaN, 0], [1, 0, 0], rpMin)).toThrow(InputError);
    expect(() => poweredFlyby(mu, [1, 0, 0], [1, 0, 0], 0)).toThrow(InputError);
  });
});
