import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { SolverError } from '../../../core/math/errors.ts';
import { findWindows, gridMinimum } from '../../../core/search/index.ts';
import { computePorkchop } from '../../../core/search/porkchop.ts';
import { ascentFigures } from '../../../core/survey/ascent.ts';
import { type DeltaVMap, deltaVMap, mapPath, mapTransferRequest } from '../../../core/survey/deltaVMap.ts';
import { buildStarSystem } from '../../../core/system/build.ts';
import type { StarSystem } from '../../../core/system/model.ts';
import { planet, smallDocument } from '../system/fixtures.ts';

const MU_STAR = 1e20;
const R1 = 1e11;
const R2 = 1.6e11;
const MU_A = 3e14;
const MU_B = 4e13;
const RAD_A = 6e6;
const RAD_B = 3e6;
const SAFE = 1e5; // the fixture planet's minimum safe altitude
const R_LOW_A = RAD_A + SAFE + 10e3;
const R_LOW_B = RAD_B + SAFE + 10e3;

// Kepler's third law in its two-body form (μ_star + μ_planet), as the system model takes it.
const nA = Math.sqrt((MU_STAR + MU_A) / R1 ** 3);
const nB = Math.sqrt((MU_STAR + MU_B) / R2 ** 3);
// Hohmann phase angle (Curtis, Orbital Mechanics for Engineering Students, §6.2, §8.3 — from memory):
// the target leads by φ = π − n_B·t_H at departure, t_H = π√(a_t³/μ).
const A_T = (R1 + R2) / 2;
const T_H = Math.PI * Math.sqrt(A_T ** 3 / MU_STAR);
const PHI_H = Math.PI - nB * T_H;
// Start B leading A by φ_H + π so the Hohmann departure falls mid-way through the synodic period.
const THETA_B0 = PHI_H + Math.PI;

/** Two planets on circular coplanar orbits about a star of μ 1e20 m³/s², airless, no rotation. */
function twoPlanets(): StarSystem {
  const doc = smallDocument(
    [
      planet('a', { a_m: R1 }, { mu_m3_s2: MU_A, radius_m: RAD_A }),
      planet('b', { a_m: R2, mean_anomaly_deg: (THETA_B0 * 180) / Math.PI }, { mu_m3_s2: MU_B, radius_m: RAD_B }),
    ],
    MU_STAR,
  );
  return buildStarSystem(doc);
}

/** The patched-conic Hohmann a → b low orbit to low orbit, by hand from vis-viva. */
function handHohmann(): number {
  const v1 = Math.sqrt(MU_STAR / R1);
  const v2 = Math.sqrt(MU_STAR / R2);
  const vt1 = Math.sqrt(MU_STAR * (2 / R1 - 1 / A_T));
  const vt2 = Math.sqrt(MU_STAR * (2 / R2 - 1 / A_T));
  const vInf1 = vt1 - v1;
  const vInf2 = v2 - vt2;
  const dep = Math.sqrt(vInf1 ** 2 + (2 * MU_A) / R_LOW_A) - Math.sqrt(MU_A / R_LOW_A);
  const cap = Math.sqrt(vInf2 ** 2 + (2 * MU_B) / R_LOW_B) - Math.sqrt(MU_B / R_LOW_B);
  return dep + cap;
}

const edgeOf = (map: DeltaVMap, id: string) => {
  const e = map.edges.find((x) => x.id === id);
  if (!e) throw new Error(`no edge ${id}`);
  return e;
};

describe('deltaVMap: two planets on circular coplanar orbits (analytic)', () => {
  const sys = twoPlanets();
  const map = deltaVMap(sys);
  const e = edgeOf(map, 'a:low-orbit>b:low-orbit');

  it('finds the best window within 2e-5 of the Hohmann figure computed by hand', () => {
    const hand = handHohmann();
    // The grid alone (80 × 80) would leave up to a few per cent; the window is its best cell refined by a
    // downhill simplex to 0.01 m/s and 1e-3 grid steps, and the patched-conic optimum of two circular
    // coplanar orbits is the Hohmann geometry. Measured 2e-6; the bound is ten times that.
    expect(Math.abs(e.dv - hand) / hand).toBeLessThan(2e-5);
    // The Hohmann estimate is the same vis-viva formula: equal to rounding.
    expect(Math.abs((e.hohmann as number) - hand) / hand).toBeLessThan(1e-12);
    expect(e.dvAero).toBeNull(); // airless
  });

  it('departs at the Hohmann phase angle (within a hundredth of the departure spacing of the grid) after the Hohmann flight time', () => {
    const w = e.window!;
    const synodic = (2 * Math.PI) / (nA - nB);
    expect(w.synodic).toBeCloseTo(synodic, 3);
    // Phase of B ahead of A falls at (n_A − n_B) per second from θ_B0: it is φ_H at t = (θ_B0 − φ_H)/(n_A − n_B).
    const tHohmann = (THETA_B0 - PHI_H) / (nA - nB);
    // Default 80 samples over the period, both ends included. The simplex stops at 1e-3 grid steps;
    // the bound is ten times that (measured 1e-4 of a step).
    const spacing = synodic / 79;
    expect(Math.abs(w.depart - tHohmann)).toBeLessThan(0.01 * spacing);
    // The flight time is the Hohmann half period: the tof grid step is 1.9 % of t_H, so 1e-4 is 0.005 steps (measured 2e-6).
    expect(Math.abs(w.tof - T_H) / T_H).toBeLessThan(1e-4);
    expect(w.range.min).toBeLessThanOrEqual(e.dv);
    expect(w.range.max).toBeGreaterThan(w.range.median);
    expect(w.range.median).toBeGreaterThanOrEqual(w.range.min);
  });

  it('gives escape = capture = the vis-viva burn from the low orbit to the ellipse reaching the Laplace SOI (1e-9)', () => {
    const rSoi = R1 * (MU_A / MU_STAR) ** 0.4; // Laplace sphere of influence
    const hand = Math.sqrt(MU_A * (2 / R_LOW_A - 2 / (R_LOW_A + rSoi))) - Math.sqrt(MU_A / R_LOW_A);
    expect(Math.abs(edgeOf(map, 'a:low-orbit>a:soi-edge').dv - hand) / hand).toBeLessThan(1e-9);
    expect(edgeOf(map, 'a:soi-edge>a:low-orbit').dv).toBe(edgeOf(map, 'a:low-orbit>a:soi-edge').dv);
    expect(map.nodes.find((n) => n.id === 'a:soi-edge')!.altitude).toBeCloseTo(rSoi, 0);
  });
});

describe('deltaVMap: the demo system', () => {
  let sys: StarSystem;
  let map: DeltaVMap;
  const progress: [number, number][] = [];
  beforeAll(() => {
    sys = parseSystemFile(readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
    map = deltaVMap(sys, { onProgress: (d, t) => progress.push([d, t]) });
  });

  it('gives every body its nodes (no surface for Moravel) and only finite figures', () => {
    for (const b of sys.bodies.slice(1)) {
      const kinds = map.nodes.filter((n) => n.body === b.index).map((n) => n.kind);
      expect(kinds).toEqual(b.id === 'moravel' ? ['low-orbit', 'soi-edge'] : ['surface', 'low-orbit', 'soi-edge']);
    }
    for (const e of map.edges) {
      expect(Number.isFinite(e.dv) && e.dv >= 0).toBe(true);
      if (e.dvAero !== null) expect(Number.isFinite(e.dvAero) && e.dvAero < e.dv).toBe(true);
      expect(e.how.length).toBeGreaterThan(20);
    }
    expect(map.nodes.find((n) => n.id === 'tessel:low-orbit')!.label).toBe('low orbit 100 km');
    expect(progress.at(-1)).toEqual([28, 28]); // 5 planets: 20 ordered pairs; Tessel ⇄ Quill 2; Moravel ⇄ 2 moons 4; Skerry ⇄ Lough 2
  });

  it('links a moon and its parent both ways, and lands on Tessel by aerobraking more cheaply', () => {
    expect(edgeOf(map, 'tessel:low-orbit>quill:low-orbit').kind).toBe('transfer');
    expect(edgeOf(map, 'quill:low-orbit>tessel:low-orbit').kind).toBe('transfer');
    expect(edgeOf(map, 'moravel:low-orbit>lough:low-orbit').window).not.toBeNull();
    const land = edgeOf(map, 'tessel:low-orbit>tessel:surface');
    expect(land.dv).toBe(ascentFigures(sys.bodies[sys.indexById.tessel]).total);
    expect(land.dvAero).toBe(ascentFigures(sys.bodies[sys.indexById.tessel]).aeroLanding);
  });

  it("takes each transfer's best window from core/search on the same request, within the grid's minimum and its range", () => {
    for (const e of map.edges.filter((x) => x.kind === 'transfer')) {
      const [from, to] = [e.from, e.to].map((id) => sys.indexById[id.split(':')[0]]);
      const { request } = mapTransferRequest(sys, from, to);
      const grid = computePorkchop(sys, request);
      const best = findWindows(sys, grid, { count: request.depart.n }).reduce((x, y) => (y.dvTotal < x.dvTotal ? y : x));
      expect(e.dv).toBe(best.dvTotal); // same core, same request: the same bits
      const gmin = gridMinimum(grid)!.value;
      // the refined window is at most the grid's best cell (stored as float32: 6e-8 relative rounding)
      expect(e.dv).toBeLessThanOrEqual(gmin * (1 + 1e-7));
      const w = e.window!;
      expect(w.range.min).toBeLessThanOrEqual(e.dv);
      expect(w.range.max).toBeGreaterThanOrEqual(e.dv);
      expect(w.dvDepart + w.dvCapture).toBeCloseTo(e.dv, 6);
    }
  });

  it('finds the cheapest way from the surface of Tessel to the surface of Ochre, its Δv the sum of its edges', () => {
    const p = mapPath(map, 'tessel:surface', 'ochre:surface')!;
    expect(p.edges.map((e) => e.id)).toEqual(['tessel:surface>tessel:low-orbit', 'tessel:low-orbit>ochre:low-orbit', 'ochre:low-orbit>ochre:surface']);
    expect(p.dv).toBeCloseTo(
      p.edges.reduce((s, e) => s + e.dv, 0),
      9,
    );
    const aero = mapPath(map, 'tessel:surface', 'ochre:surface', true)!;
    expect(aero.dv).toBeCloseTo(
      aero.edges.reduce((s, e) => s + (e.dvAero ?? e.dv), 0),
      9,
    );
    expect(aero.dv).toBeLessThan(p.dv);
    expect(mapPath(map, 'tessel:surface', 'moravel:surface')).toBeNull();
  });
});

describe('deltaVMap: edge cases', () => {
  it('gives an empty map for a system with only a star', () => {
    const map = deltaVMap(buildStarSystem(smallDocument([])));
    expect(map.nodes).toEqual([]);
    expect(map.edges).toEqual([]);
    expect(mapPath(map, 'a:surface', 'b:surface')).toBeNull();
  });

  it('stops between transfers when cancelled, with SolverError', () => {
    const signal = { aborted: false };
    let calls = 0;
    const run = () =>
      deltaVMap(twoPlanets(), {
        samples: 20,
        signal,
        onProgress: (done) => {
          calls++;
          if (done === 1) signal.aborted = true;
        },
      });
    expect(run).toThrow(SolverError);
    expect(calls).toBe(2); // (0, 2) then (1, 2): the second transfer never started
  });
});
