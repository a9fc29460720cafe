import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { createRng } from '../../../core/math/random.ts';
import { hohmann } from '../../../core/orbit/hohmann.ts';
import { arrival, departure } from '../../../core/orbit/hyperbolic.ts';
import { solveLambert } from '../../../core/orbit/lambert.ts';
import { hohmannPhaseAngle, nextHohmannDeparture } from '../../../core/orbit/synodic.ts';
import { mergeChunk, partitionRows } from '../../../core/search/chunks.ts';
import { createPlanes, FLOAT_PLANES, INT_PLANES, type PorkchopPlanes } from '../../../core/search/planes.ts';
import { cellTimes, computePorkchop, computePorkchopAsync, computePorkchopRows, gridCell, gridMinimum } from '../../../core/search/porkchop.ts';
import type { PorkchopRequest } from '../../../core/search/request.ts';
import { findWindows, REFINE_XTOL } from '../../../core/search/windows.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import type { StarSystem } from '../../../core/system/model.ts';
import { circularSystem, demoSystem } from './fixtures.ts';

const DAY = 86400;
const AU = 1.495978707e11;
const MU_SUN = 1.32712440018e20;
const MU_EARTH = 3.986e14; // Curtis's 398 600 km³/s²
const R_EARTH = 6378e3;
const MU_MARS = 4.2828e13; // Curtis's 42 828 km³/s²
const R_MARS = 3396e3;
// Curtis, Orbital Mechanics for Engineering Students, 3rd ed., Table A.1 (from memory): orbit radii.
const R1 = 149.6e9;
const R2 = 227.9e9;

/** Earth- and Mars-like bodies on circular coplanar orbits, phased for a Hohmann departure at tStar. */
function earthMars(tStar: number, muE: number, muM: number): StarSystem {
  const nE = Math.sqrt((MU_SUN + muE) / R1 ** 3);
  const nM = Math.sqrt((MU_SUN + muM) / R2 ** 3);
  const phase0 = hohmannPhaseAngle(MU_SUN, R1, R2) - (nM - nE) * tStar;
  return circularSystem([
    { id: 'earth', a: R1, mu: muE, radius: R_EARTH },
    { id: 'mars', a: R2, mu: muM, radius: R_MARS, lonDeg: (phase0 * 180) / Math.PI },
  ]);
}

function tofRequest(
  system: StarSystem,
  from: string,
  to: string,
  depart: [number, number, number],
  tof: [number, number, number],
  extra: Partial<PorkchopRequest> = {},
): PorkchopRequest {
  return {
    from: system.indexById[from],
    to: system.indexById[to],
    depart: { start: depart[0], end: depart[1], n: depart[2] },
    secondAxis: 'tof',
    second: { start: tof[0], end: tof[1], n: tof[2] },
    parkingAltitude: 300e3,
    arrivalAltitude: 300e3,
    ...extra,
  };
}

/**
 * How far a refined window's Δv may sit above the true minimum. The refinement stops once its
 * simplex fits in REFINE_XTOL (1e-3) of a grid cell per axis; over such a box about the Hohmann
 * point of the Earth–Mars grids below the cost rises by at most 1.3e-5 m/s, 2.3e-9 of it
 * (measured with transferMetric). Measured errors: 1e-10 and 7e-12.
 */
const REFINED_REL = 3e-9;
/** Binary32 storage of the planes rounds by at most 2^−24 (IEEE 754 round to nearest); the double computations agree to ~1e-15. */
const F32_REL = 2 ** -24 + 1e-12;

function samePlanes(a: PorkchopPlanes, b: PorkchopPlanes): void {
  for (const k of [...FLOAT_PLANES, ...INT_PLANES]) expect(Buffer.compare(Buffer.from(a[k].buffer), Buffer.from(b[k].buffer)), k).toBe(0);
}

describe('porkchop minimum between circular coplanar orbits', () => {
  const tH = hohmann(MU_SUN, R1, R2).tof;

  // The grid nodes avoid the Hohmann point itself, so the refinement has to find it.
  it('equals the Hohmann Δv (textbook: the Hohmann transfer is the cheapest two-burn transfer; Curtis, 3rd ed., §6.3) to 3e-9', () => {
    // Bodies of μ = 1 m³/s²: the departure and capture burns are the heliocentric v∞ plus
    // √(2μ/r) − √(μ/r) terms of 4e-4 m/s, kept in the reference through departure()/arrival().
    const tStar = 120 * DAY;
    const sys = earthMars(tStar, 1, 1);
    const req = tofRequest(sys, 'earth', 'mars', [tStar - 57 * DAY, tStar + 61 * DAY, 40], [0.77 * tH, 1.23 * tH, 40]);
    const grid = computePorkchop(sys, req);
    expect(grid.unsolved).toBe(0);
    const h = hohmann(MU_SUN, R1, R2);
    const ref =
      departure({ mu: 1, rPark: R_EARTH + 300e3, vInf: [h.dv1, 0, 0] }).dv + arrival({ mu: 1, vInf: h.dv2, rPeriapsis: R_MARS + 300e3, eTarget: 0 }).dv;
    expect(Math.abs(ref - h.dvTotal)).toBeLessThan(1e-3);
    const m = gridMinimum(grid)!;
    // the grid nodes miss the Hohmann point by up to half a cell (1.5 days, 0.6 % of the flight
    // time): measured 1.6e-4
    expect(Math.abs(m.value - ref) / ref).toBeLessThan(5e-4);
    const [w] = findWindows(sys, grid, { count: 1 });
    expect(Math.abs(w.dvTotal - ref) / ref).toBeLessThan(REFINED_REL);
    // nothing beats Hohmann: Lambert's x converges to 1e-11 (LAMBERT_DEFAULT_TOL), far below this
    expect(w.dvTotal).toBeGreaterThan(ref * (1 - 1e-10));
    // ... and it leaves at the Hohmann phase angle (Curtis §8.3) with the Hohmann flight time,
    // each within the refinement's last simplex, REFINE_XTOL of a cell: 261 s of departure and
    // 1.2e-5 of the flight time (measured 60 s and 1.0e-6)
    const dStep = (118 * DAY) / 39;
    const tofStep = (0.46 * tH) / 39;
    const tPhase = nextHohmannDeparture(
      MU_SUN,
      R1,
      R2,
      hohmannPhaseAngle(MU_SUN, R1, R2) - (Math.sqrt(MU_SUN / R2 ** 3) - Math.sqrt(MU_SUN / R1 ** 3)) * tStar,
    );
    expect(Math.abs(w.departure - tPhase)).toBeLessThan(REFINE_XTOL * dStep);
    expect(Math.abs(w.tof - tH)).toBeLessThan(REFINE_XTOL * tofStep);
  });

  it('equals the patched-conic Hohmann from and to 300 km orbits (Curtis, 3rd ed., §8.7–8.9, Examples 8.3–8.4 method) to 3e-9', () => {
    const tStar = 200 * DAY;
    const sys = earthMars(tStar, MU_EARTH, MU_MARS);
    const req = tofRequest(sys, 'earth', 'mars', [tStar - 57 * DAY, tStar + 61 * DAY, 40], [0.77 * tH, 1.23 * tH, 40]);
    const grid = computePorkchop(sys, req);
    const h = hohmann(MU_SUN, R1, R2);
    // v∞ against the planets' own speeds: they orbit with μ_sun + μ_planet (1.5e-6 faster than
    // with μ_sun alone for Earth, which would show as a 1e-2 m/s difference)
    const vInf1 = h.dv1 + Math.sqrt(MU_SUN / R1) - Math.sqrt((MU_SUN + MU_EARTH) / R1);
    const vInf2 = h.dv2 + Math.sqrt((MU_SUN + MU_MARS) / R2) - Math.sqrt(MU_SUN / R2);
    const dep = departure({ mu: MU_EARTH, rPark: R_EARTH + 300e3, vInf: [vInf1, 0, 0] });
    const arr = arrival({ mu: MU_MARS, vInf: vInf2, rPeriapsis: R_MARS + 300e3, eTarget: 0 });
    const ref = dep.dv + arr.dv;
    const [w] = findWindows(sys, grid, { count: 1 });
    expect(Math.abs(w.dvTotal - ref) / ref).toBeLessThan(REFINED_REL);
    // Curtis, 3rd ed., Example 8.3 (from memory): v∞ = 2.943 km/s and Δv = 3.590 km/s from a
    // 300 km Earth orbit, to the book's 4 digits: within half a unit of the last, 0.5 m/s
    // (measured 0.42 and 0.33 m/s)
    const [wd] = findWindows(sys, grid, { count: 1, metric: 'departure' });
    expect(Math.abs(wd.vInfDepart - 2943)).toBeLessThan(0.5);
    expect(Math.abs(wd.dvDepart - 3590)).toBeLessThan(0.5);
  });

  // Planet–moon transfers from or to a parking orbit about the planet: the cost depends on the
  // flight time only, and the refinement's last simplex (REFINE_XTOL of a cell, 1.3e-5 of the
  // flight time) costs at most 8e-8 m/s, 2e-11 of it, on the parabola about the Hohmann time
  // (measured errors 1e-15).
  it('planet to moon: the Hohmann from the parking orbit plus the capture at the moon (Curtis, 3rd ed., §6.3 and §8.9) to 1e-10', () => {
    const muMoon = 4.903e12;
    const aMoon = 384.4e6;
    const sys = circularSystem([
      { id: 'earth', a: AU, mu: MU_EARTH, radius: R_EARTH },
      { id: 'moon', parent: 'earth', a: aMoon, mu: muMoon, radius: 1737e3, lonDeg: 30 },
    ]);
    const rPark = R_EARTH + 300e3;
    const h = hohmann(MU_EARTH, rPark, aMoon);
    const req = tofRequest(sys, 'earth', 'moon', [0, 10 * DAY, 11], [0.67 * h.tof, 1.31 * h.tof, 50], { arrivalAltitude: 100e3 });
    const grid = computePorkchop(sys, req);
    // arrival v∞: the moon's speed (its orbit μ is μ_earth + μ_moon) minus the transfer's apoapsis speed
    const vMoon = Math.sqrt((MU_EARTH + muMoon) / aMoon);
    const vApo = Math.sqrt(MU_EARTH * (2 / aMoon - 1 / h.aTransfer));
    const ref = h.dv1 + arrival({ mu: muMoon, vInf: vMoon - vApo, rPeriapsis: 1737e3 + 100e3, eTarget: 0 }).dv;
    const [w] = findWindows(sys, grid, { count: 1 });
    expect(Math.abs(w.dvTotal - ref) / ref).toBeLessThan(1e-10);
    expect(Math.abs(w.dvDepart - h.dv1) / h.dv1).toBeLessThan(1e-10);
    expect(w.c3).toBeLessThan(0); // a bound transfer arc
  });

  it('moon to planet: the mirror image (departure from the moon, Hohmann down to the target orbit) to 1e-10', () => {
    const muMoon = 4.903e12;
    const aMoon = 384.4e6;
    const sys = circularSystem([
      { id: 'earth', a: AU, mu: MU_EARTH, radius: R_EARTH },
      { id: 'moon', parent: 'earth', a: aMoon, mu: muMoon, radius: 1737e3 },
    ]);
    const rTarget = R_EARTH + 300e3;
    const h = hohmann(MU_EARTH, aMoon, rTarget);
    const req = tofRequest(sys, 'moon', 'earth', [0, 10 * DAY, 11], [0.67 * h.tof, 1.31 * h.tof, 50], { parkingAltitude: 100e3 });
    const grid = computePorkchop(sys, req);
    const vMoon = Math.sqrt((MU_EARTH + muMoon) / aMoon);
    const vApo = Math.sqrt(MU_EARTH * (2 / aMoon - 1 / h.aTransfer));
    const ref = departure({ mu: muMoon, rPark: 1737e3 + 100e3, vInf: [vMoon - vApo, 0, 0] }).dv + Math.abs(h.dv2);
    const [w] = findWindows(sys, grid, { count: 1 });
    expect(Math.abs(w.dvTotal - ref) / ref).toBeLessThan(1e-10);
  });
});

describe('grid cells against solveLambert + hyperbolic.ts, computed independently', () => {
  const sys = demoSystem();
  const from = sys.indexById.tessel;
  const to = sys.indexById.ochre;
  const muStar = sys.bodies[0].mu;
  const A = sys.bodies[from];
  const B = sys.bodies[to];

  /** The cell recomputed with the allocating library functions; best solution by total Δv. */
  function reference(req: PorkchopRequest, tDep: number, tof: number) {
    const s1 = bodyState(sys, from, tDep, new Float64Array(6));
    const s2 = bodyState(sys, to, tDep + tof, new Float64Array(6));
    const sols = solveLambert(muStar, s1.subarray(0, 3), s2.subarray(0, 3), tof, { revs: req.maxRevs ?? 0, retrograde: req.retrograde ?? false });
    let best: { dvD: number; dvA: number; c3: number; vD: number; vA: number; revs: number } | null = null;
    for (const s of sols) {
      const vInfD = [s.v1[0] - s1[3], s.v1[1] - s1[4], s.v1[2] - s1[5]];
      const vInfA = [s.v2[0] - s2[3], s.v2[1] - s2[4], s.v2[2] - s2[5]];
      const d = departure({ mu: A.mu, rPark: A.radius + req.parkingAltitude, ePark: req.parkingEccentricity ?? 0, vInf: vInfD });
      const a = arrival({ mu: B.mu, vInf: vInfA, rPeriapsis: B.radius + req.arrivalAltitude, eTarget: req.arrivalEccentricity ?? 0 });
      const c = { dvD: d.dv, dvA: a.dv, c3: d.c3, vD: d.vInfMag, vA: Math.hypot(vInfA[0], vInfA[1], vInfA[2]), revs: s.revs };
      if (best === null || c.dvD + c.dvA < best.dvD + best.dvA) best = c;
    }
    return best!;
  }

  const cases: [string, Partial<PorkchopRequest>][] = [
    ['single revolution, circular orbits', {}],
    ['elliptic parking and target orbits', { parkingEccentricity: 0.1, arrivalEccentricity: 0.3 }],
    ['flyby (no capture burn)', { arrivalEccentricity: 'flyby' }],
    ['up to 2 revolutions, best of all branches', { maxRevs: 2 }],
  ];
  for (const [caseIndex, [name, extra]] of cases.entries()) {
    it(`agree at random cells: ${name}`, () => {
      const req = tofRequest(sys, 'tessel', 'ochre', [0, 800 * DAY, 30], [60 * DAY, 1200 * DAY, 30], {
        parkingAltitude: 250e3,
        arrivalAltitude: 400e3,
        ...extra,
      });
      const grid = computePorkchop(sys, req);
      const rng = createRng(1000 + caseIndex);
      let checked = 0;
      for (let n = 0; n < 40; n++) {
        const i = Math.floor(rng.uniform(0, 30));
        const j = Math.floor(rng.uniform(0, 30));
        const k = i * 30 + j;
        const { departure: t, tof } = cellTimes(grid, i, j);
        let ref: ReturnType<typeof reference>;
        try {
          ref = reference(req, t, tof);
        } catch (e) {
          if (e instanceof SolverError) continue; // the allocating solver refused this cell
          throw e;
        }
        const p = grid.planes;
        const rel = (x: number, y: number): number => Math.abs(x - y) / Math.max(1, Math.abs(y));
        // the planes hold binary32: measured at most 5.3e-8 against F32_REL = 6.0e-8
        expect(rel(p.dvDepart[k], ref.dvD)).toBeLessThan(F32_REL);
        if (extra.arrivalEccentricity === 'flyby') expect(p.dvArrive[k]).toBe(0);
        else expect(rel(p.dvArrive[k], ref.dvA)).toBeLessThan(F32_REL);
        expect(rel(p.c3[k], ref.c3)).toBeLessThan(F32_REL);
        expect(rel(p.vInfDepart[k], ref.vD)).toBeLessThan(F32_REL);
        expect(rel(p.vInfArrive[k], ref.vA)).toBeLessThan(F32_REL);
        expect(p.revs[k]).toBe(ref.revs);
        // the double-precision re-evaluation of the cell agrees to rounding: the same formulas
        // in another order (measured 2.4e-16; 1e-14 leaves room for last-bit differences of
        // Math functions amplified by the Lambert problem)
        const cell = gridCell(sys, grid, i, j);
        expect(rel(cell.dvTotal, ref.dvD + ref.dvA)).toBeLessThan(1e-14);
        checked++;
      }
      expect(checked).toBeGreaterThan(30);
    });
  }
});

describe('grid conventions', () => {
  const sys = demoSystem();
  const base = tofRequest(sys, 'tessel', 'ochre', [0, 600 * DAY, 24], [50 * DAY, 500 * DAY, 20]);

  it('arrival-time mode gives the same cells as time-of-flight mode; arrivals before departure are unsolved and counted', () => {
    // departure step 25 d, arrivals every 25 d: cell (i, j) of the arrival grid is tof = arrival − departure
    const arr = { ...base, secondAxis: 'arrival' as const, second: { start: 0, end: 1200 * DAY, n: 49 } };
    const g = computePorkchop(sys, arr);
    let expectedUnsolved = 0;
    for (let i = 0; i < 24; i++) {
      for (let j = 0; j < 49; j++) {
        const { departure: t, tof } = cellTimes(g, i, j);
        const k = i * 49 + j;
        if (!(tof > 0)) {
          expectedUnsolved++;
          expect(g.planes.dvTotal[k]).toBe(Infinity);
          expect(g.planes.revs[k]).toBe(-1);
          continue;
        }
        if (i % 4 === 0 && j % 5 === 0) {
          const c = gridCell(sys, g, i, j);
          const single = computePorkchop(sys, { ...base, depart: { start: t, end: t, n: 1 }, second: { start: tof, end: tof, n: 1 } });
          expect(single.planes.dvTotal[0]).toBe(g.planes.dvTotal[k]);
          expect(Math.abs(c.dvTotal - g.planes.dvTotal[k]) / c.dvTotal).toBeLessThan(F32_REL); // binary32 plane against double: measured 4.6e-8
        }
      }
    }
    expect(expectedUnsolved).toBeGreaterThan(0);
    expect(g.unsolved).toBe(expectedUnsolved);
  });

  it('never holds NaN; unsolved cells are +Infinity in every float plane and counted', () => {
    const arr = computePorkchop(sys, { ...base, secondAxis: 'arrival', second: { start: 0, end: 900 * DAY, n: 30 } });
    expect(arr.unsolved).toBeGreaterThan(0);
    for (const k of FLOAT_PLANES) for (const v of arr.planes[k]) expect(Number.isNaN(v)).toBe(false);
    for (let k = 0; k < arr.planes.dvTotal.length; k++) {
      if (arr.planes.revs[k] < 0) for (const f of FLOAT_PLANES) expect(arr.planes[f][k]).toBe(Infinity);
    }
    const full = computePorkchop(sys, { ...base, maxRevs: 1 });
    for (const k of FLOAT_PLANES) for (const v of full.planes[k]) expect(Number.isNaN(v)).toBe(false);
    let inf = 0;
    for (let k = 0; k < full.planes.dvTotal.length; k++) if (full.planes.dvTotal[k] === Infinity) inf++;
    expect(full.unsolved).toBe(inf);
  });

  it('the row loop for two bodies of one parent at one revolution gives the cells of the cell-by-cell evaluation (gridCell) exactly, in both axis modes, flyby, retrograde and unsolved cells included', () => {
    const variants: PorkchopRequest[] = [
      base,
      { ...base, arrivalEccentricity: 'flyby', parkingEccentricity: 0.2 },
      { ...base, retrograde: true },
      { ...base, secondAxis: 'arrival', second: { start: 0, end: 1200 * DAY, n: 49 } },
    ];
    let unsolved = 0;
    for (const req of variants) {
      const g = computePorkchop(sys, req);
      const p = g.planes;
      for (let i = 0; i < p.nRows; i++) {
        for (let j = 0; j < p.nCols; j++) {
          const k = i * p.nCols + j;
          const c = gridCell(sys, g, i, j);
          // the planes hold binary32 roundings of the cell's doubles
          const want = [c.dvDepart, c.dvArrive, c.dvTotal, c.c3, c.vInfDepart, c.vInfArrive].map(Math.fround);
          expect([p.dvDepart[k], p.dvArrive[k], p.dvTotal[k], p.c3[k], p.vInfDepart[k], p.vInfArrive[k]]).toEqual(want);
          expect([p.revs[k], p.branch[k]]).toEqual(c.solved ? [0, 0] : [-1, -1]);
          if (!c.solved) unsolved++;
        }
      }
    }
    expect(unsolved).toBeGreaterThan(0);
  });

  it('rows computed in chunks and merged equal the whole grid bit for bit; the async path too', async () => {
    const whole = computePorkchop(sys, base);
    const merged = createPlanes(0, 24, 20);
    for (const c of partitionRows(24, 5)) {
      const chunk = createPlanes(c.rowStart, c.rowEnd - c.rowStart, 20);
      computePorkchopRows(sys, base, c.rowStart, c.rowEnd, chunk);
      mergeChunk(merged, chunk);
    }
    samePlanes(merged, whole.planes);
    const later = await computePorkchopAsync(sys, base);
    samePlanes(later.planes, whole.planes);
    expect(later.unsolved).toBe(whole.unsolved);
  });

  it('reports progress up to 100% and stops at a raised cancellation flag', () => {
    const seen: number[] = [];
    computePorkchop(sys, base, { onProgress: (d, t) => seen.push(d / t) });
    expect(seen.length).toBe(24);
    expect(seen[seen.length - 1]).toBe(1);
    for (let k = 1; k < seen.length; k++) expect(seen[k]).toBeGreaterThan(seen[k - 1]);

    const flag = { aborted: false };
    let rows = 0;
    let err: unknown;
    try {
      computePorkchop(sys, base, {
        signal: flag,
        onProgress: () => {
          if (++rows === 3) flag.aborted = true;
        },
      });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SolverError);
    expect((err as SolverError).reason).toBe('cancelled');
    expect(rows).toBe(3);
  });

  it('refuses unusable requests with InputError naming the field', () => {
    const bad = (r: Partial<PorkchopRequest>, field: string): void => {
      let err: unknown;
      try {
        computePorkchop(sys, { ...base, ...r });
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(InputError);
      expect((err as InputError).field).toBe(field);
    };
    bad({ to: sys.indexById.skerry }, 'to'); // a moon of another planet
    bad({ to: base.from }, 'to');
    bad({ from: 0 }, 'from');
    bad({ from: 99 }, 'from');
    bad({ depart: { start: 10, end: 5, n: 3 } }, 'depart.end');
    bad({ second: { start: 0, end: 5 * DAY, n: 3 } }, 'second.start');
    bad({ parkingAltitude: -1 }, 'parkingAltitude');
    bad({ arrivalEccentricity: 1 }, 'arrivalEccentricity');
    bad({ maxRevs: 1.5 }, 'maxRevs');
    bad({ metric: 'cheapest' as never }, 'metric');
  });
});
