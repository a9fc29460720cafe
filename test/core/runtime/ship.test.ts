/**
 * The ship's track (core/runtime/ship.ts) of the demo plan's patched-conic flight (core/conic
 * evaluate, through the test-only source demoShip.ts) against that flight at random times: the
 * whole span, and the 20-minute windows around burns and periapses held to a tenth of the
 * tolerance; velocities against the flight's and against central differences.
 */
import { describe, expect, it } from 'vitest';
import { InputError, stream } from '../../../core/math/index.ts';
import { FINE_FRACTION, SHIP_TOLERANCE, fitShipTrack, runtimeEphemeris, trackCenter, trackPosition, trackVelocity } from '../../../core/runtime/index.ts';
import type { RuntimeArc, ShipArcInput } from '../../../core/runtime/index.ts';
import { demoFlight, demoShipInput, ilmar, shipArcs } from './demoShip.ts';

const system = ilmar();
const flight = demoFlight(system);
const t0 = flight.segments[0].t0;
const t1 = flight.segments[flight.segments.length - 1].t1;
const input = demoShipInput(flight);
const data = runtimeEphemeris(system, { t0, t1, ships: [input] });
const ship = data.tracks.length - 1;
const track = data.tracks[ship];
const arcs = shipArcs(flight);

/** The flight's state at t relative to the arc's centre (the later arc at a shared boundary, as the reader). */
function truth(t: number, out6: Float64Array): ShipArcInput {
  let k = arcs.length - 1;
  while (k > 0 && arcs[k].t0 > t) k--;
  arcs[k].sample(t, out6);
  return arcs[k];
}

/** The piece of `arc` holding t: [a, b]. */
function pieceOf(arc: RuntimeArc, t: number): [number, number] {
  const br = arc.breaks!;
  let k = 0;
  while (k < arc.count - 1 && br[k + 1] <= t) k++;
  return [br[k], br[k + 1]];
}

/** The track's arc at t: the last one starting at or before t. */
function arcAt(t: number): RuntimeArc {
  let k = track.arcs.length - 1;
  while (k > 0 && track.arcs[k].t0 > t) k--;
  return track.arcs[k];
}

describe('the demo flight as a ship track', () => {
  it('one arc per stretch about one body (Tessel, the star, Ochre), contiguous; no piece spans a burn or a segment boundary', () => {
    expect(track.kind).toBe('ship');
    expect(track.arcs.map((a) => a.center)).toEqual(['tessel', 'ilmar', 'ochre']);
    expect(track.arcs.map((a) => a.centerIndex)).toEqual([system.indexById.tessel - 1, -1, system.indexById.ochre - 1]);
    for (let k = 1; k < track.arcs.length; k++) expect(track.arcs[k].t0).toBe(track.arcs[k - 1].t1);
    const burns = flight.events.filter((e) => e.kind === 'burn').map((e) => e.t);
    expect(burns).toHaveLength(5);
    for (const t of [...burns, ...input.breaks!]) {
      const arc = arcAt(t);
      if (t === arc.t0 || t === arc.t1) continue;
      expect([...arc.breaks!]).toContain(t);
    }
    // the centre changes at the sphere-of-influence crossings
    expect(trackCenter(data, ship, flight.segments[1].t1 - 1)).toBe(system.indexById.tessel - 1);
    expect(trackCenter(data, ship, flight.segments[1].t1)).toBe(-1);
  });

  it('positions at 2,000 random times over the flight are within the stated maxError, and maxError ≤ tolerance (10 m)', () => {
    expect(track.tolerance).toBe(SHIP_TOLERANCE);
    expect(track.maxError).toBeLessThanOrEqual(SHIP_TOLERANCE);
    const rng = stream(162, 0);
    const p = new Float64Array(3);
    const s = new Float64Array(6);
    for (let i = 0; i < 2000; i++) {
      const t = rng.uniform(t0, t1);
      trackPosition(data, ship, t, p);
      truth(t, s);
      expect(Math.hypot(p[0] - s[0], p[1] - s[1], p[2] - s[2])).toBeLessThanOrEqual(track.maxError);
    }
  });

  it('near burns and periapses (±10 min): 300 random times per window within its stated maxError ≤ its tolerance (a tenth of the track’s)', () => {
    const windows = flight.events.filter((e) => e.kind === 'burn' || e.kind === 'periapsis');
    expect(track.fine).toHaveLength(windows.length);
    const rng = stream(162, 1);
    const p = new Float64Array(3);
    const s = new Float64Array(6);
    for (const w of track.fine) {
      expect(w.tolerance).toBe(SHIP_TOLERANCE * FINE_FRACTION);
      expect(w.maxError).toBeLessThanOrEqual(w.tolerance);
      let worst = 0;
      for (let i = 0; i < 300; i++) {
        const t = Math.min(t1, Math.max(t0, rng.uniform(w.t0, w.t1)));
        trackPosition(data, ship, t, p);
        truth(t, s);
        worst = Math.max(worst, Math.hypot(p[0] - s[0], p[1] - s[1], p[2] - s[2]));
      }
      expect(worst).toBeLessThanOrEqual(w.maxError);
    }
  });

  it('at each burn the track gives the state after it: position continuous, velocity the flight’s after the burn (within the derivative bound below)', () => {
    const p = new Float64Array(3);
    const v = new Float64Array(3);
    const s = new Float64Array(6);
    for (const e of flight.events.filter((x) => x.kind === 'burn')) {
      trackPosition(data, ship, e.t, p);
      trackVelocity(data, ship, e.t, v);
      truth(e.t, s);
      const [a, b] = pieceOf(arcAt(e.t), e.t);
      expect(a).toBe(e.t); // the piece after the burn
      expect(Math.hypot(p[0] - s[0], p[1] - s[1], p[2] - s[2])).toBeLessThanOrEqual(track.maxError);
      const allowed = (track.degree + 1) ** 2 * (2 / (b - a)) * track.maxError;
      expect(Math.hypot(v[0] - s[3], v[1] - s[4], v[2] - s[5])).toBeLessThanOrEqual(allowed);
    }
  });

  it('velocity agrees with the flight’s within (N+1)²·(2/L)·maxError of its piece (Markov’s inequality for the error’s leading term)', () => {
    const rng = stream(162, 2);
    const v = new Float64Array(3);
    const s = new Float64Array(6);
    for (let i = 0; i < 2000; i++) {
      const t = rng.uniform(t0, t1);
      trackVelocity(data, ship, t, v);
      truth(t, s);
      const [a, b] = pieceOf(arcAt(t), t);
      const allowed = (track.degree + 1) ** 2 * (2 / (b - a)) * track.maxError;
      expect(Math.hypot(v[0] - s[3], v[1] - s[4], v[2] - s[5])).toBeLessThanOrEqual(allowed);
    }
  });

  it('velocity agrees with central differences of the fitted positions inside a piece: within h²/6·|r‴| + 4ε|r|/h', () => {
    const rng = stream(162, 3);
    const pp = new Float64Array(3);
    const pm = new Float64Array(3);
    const v = new Float64Array(3);
    const s = new Float64Array(6);
    for (let i = 0; i < 1000; i++) {
      const t = rng.uniform(t0, t1);
      const [a, b] = pieceOf(arcAt(t), t);
      const h = Math.min(1, (b - a) / 10);
      const tc = Math.min(b - h, Math.max(a + h, t));
      trackPosition(data, ship, tc + h, pp);
      trackPosition(data, ship, tc - h, pm);
      trackVelocity(data, ship, tc, v);
      const arc = truth(tc, s);
      const mu = system.bodies[arc.center].mu;
      const r = Math.hypot(s[0], s[1], s[2]);
      const speed = Math.hypot(s[3], s[4], s[5]);
      // third derivative: the coast's two-body jerk ≤ 4μ|v|/r³ plus the fit error's, (N+1)⁶(2/L)³·maxError
      // (Markov's inequality thrice); roundoff of the two positions ≲ 4ε|r| each, over 2h
      const jerk = (4 * mu * speed) / r ** 3 + (track.degree + 1) ** 6 * (2 / (b - a)) ** 3 * track.maxError;
      const allowed = (h * h * jerk) / 6 + (4 * Number.EPSILON * r) / h;
      for (let c = 0; c < 3; c++) expect(Math.abs((pp[c] - pm[c]) / (2 * h) - v[c])).toBeLessThanOrEqual(allowed);
    }
  });

  it('pieces are shorter near Ochre than in the cruise (bisection follows the bending)', () => {
    const lengths = (arc: RuntimeArc) => Array.from({ length: arc.count }, (_, k) => arc.breaks![k + 1] - arc.breaks![k]);
    const cruise = Math.min(...lengths(track.arcs[1]));
    const ochre = Math.max(...lengths(track.arcs[2]));
    expect(ochre).toBeLessThan(cruise);
  });
});

describe('bad input', () => {
  const good = () => demoShipInput(flight);
  it('names the field: tolerance ≤ 0, arcs not contiguous, an arc with t1 ≤ t0, a centre out of range, a fine window with t1 ≤ t0, no arcs', () => {
    expect(() => fitShipTrack(system, { ...good(), tolerance: 0 })).toThrow(/^ship\.tolerance must be > 0/);
    const gap = good();
    gap.arcs[1] = { ...gap.arcs[1], t0: gap.arcs[1].t0 + 1 };
    expect(() => fitShipTrack(system, gap)).toThrow(/^ship\.arcs\[1\]\.t0 must equal the previous arc's t1/);
    const back = good();
    back.arcs[0] = { ...back.arcs[0], t1: back.arcs[0].t0 };
    expect(() => fitShipTrack(system, back)).toThrow(/^ship\.arcs\[0\]\.t1 must be later than t0/);
    const centre = good();
    centre.arcs[2] = { ...centre.arcs[2], center: 99 };
    expect(() => fitShipTrack(system, centre)).toThrow(/^ship\.arcs\[2\]\.center must be a body index/);
    expect(() => fitShipTrack(system, { ...good(), fine: [{ t0: t0 + 10, t1: t0 }] })).toThrow(/^ship\.fine\[0\]\.t1 must be later than t0/);
    expect(() => fitShipTrack(system, { ...good(), fine: [{ t0, t1: t0 + 10, tolerance: -1 }] })).toThrow(/^ship\.fine\[0\]\.tolerance must be > 0/);
    expect(() => fitShipTrack(system, { ...good(), arcs: [] })).toThrow(InputError);
    expect(() => fitShipTrack(system, { ...good(), name: '' })).toThrow(/^ship\.name/);
  });
});
