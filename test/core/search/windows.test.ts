import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { hohmann } from '../../../core/orbit/hohmann.ts';
import { synodicPeriod } from '../../../core/orbit/synodic.ts';
import { computePorkchop } from '../../../core/search/porkchop.ts';
import type { PorkchopRequest } from '../../../core/search/request.ts';
import { prepareTransfer, transferMetric } from '../../../core/search/transfer.ts';
import { defaultSeparation, findWindows, localMinima, REFINE_FTOL, REFINE_XTOL } from '../../../core/search/windows.ts';
import { circularSystem, demoSystem } from './fixtures.ts';

const DAY = 86400;
const MU_SUN = 1.32712440018e20;
const R1 = 149.6e9;
const R2 = 227.9e9;

describe('transfer windows', () => {
  it('successive windows are one synodic period apart (1/|1/T1 − 1/T2|, Curtis, 3rd ed., §8.3)', () => {
    const sys = circularSystem([
      { id: 'inner', a: R1, mu: 3.986e14, radius: 6378e3 },
      { id: 'outer', a: R2, mu: 4.2828e13, radius: 3396e3, lonDeg: 100 },
    ]);
    const T1 = sys.bodies[1].derived.period;
    const T2 = sys.bodies[2].derived.period;
    const syn = synodicPeriod(T1, T2);
    const tH = hohmann(MU_SUN, R1, R2).tof;
    const req: PorkchopRequest = {
      from: 1,
      to: 2,
      depart: { start: 0, end: 3.3 * syn, n: 150 },
      secondAxis: 'tof',
      second: { start: 0.5 * tH, end: 1.6 * tH, n: 40 },
      parkingAltitude: 300e3,
      arrivalAltitude: 300e3,
    };
    const grid = computePorkchop(sys, req);
    const ws = findWindows(sys, grid, { count: 10 });
    expect(ws.length).toBeGreaterThanOrEqual(3);
    const inner = ws.filter((w) => !w.atEdge);
    expect(inner.length).toBeGreaterThanOrEqual(3);
    // each refined departure lies within the refinement's last simplex, REFINE_XTOL of a grid
    // step (2.2e-5 of the synodic period), so a gap within twice that (measured 2.1e-6)
    const dStep = (req.depart.end - req.depart.start) / (req.depart.n - 1);
    for (let k = 1; k < inner.length; k++) {
      const gap = inner[k].departure - inner[k - 1].departure;
      expect(Math.abs(gap - syn)).toBeLessThan(2 * REFINE_XTOL * dStep);
      // the same geometry recurs: the same cost, to what the cost changes over that simplex
      // (at most 1.9e-4 m/s on this grid, measured with transferMetric; the costs differ by 2.2e-6 m/s)
      expect(Math.abs(inner[k].dvTotal - inner[k - 1].dvTotal)).toBeLessThan(5e-4);
    }
  });

  it('refines each grid minimum to the local minimum: a fine scan around it finds nothing lower by REFINE_FTOL (0.01 m/s)', () => {
    const sys = demoSystem();
    const req: PorkchopRequest = {
      from: sys.indexById.tessel,
      to: sys.indexById.ochre,
      depart: { start: 0, end: 900 * DAY, n: 60 },
      secondAxis: 'tof',
      second: { start: 80 * DAY, end: 420 * DAY, n: 40 },
      parkingAltitude: 200e3,
      arrivalAltitude: 200e3,
    };
    const grid = computePorkchop(sys, req);
    const ws = findWindows(sys, grid, { count: 5 });
    expect(ws.length).toBeGreaterThan(0);
    const setup = prepareTransfer(sys, req);
    const dD = (req.depart.end - req.depart.start) / (req.depart.n - 1);
    const dT = (req.second.end - req.second.start) / (req.second.n - 1);
    for (const w of ws) {
      expect(w.converged).toBe(true);
      expect(w.dvTotal).toBeLessThanOrEqual(w.grid.value + 1e-3);
      expect(w.dvTotal).toBeCloseTo(w.dvDepart + w.dvArrive, 9);
      if (w.atEdge) continue;
      let lowest = Infinity;
      for (let a = -20; a <= 20; a++) {
        for (let b = -20; b <= 20; b++) {
          lowest = Math.min(lowest, transferMetric(sys, setup, w.departure + (a / 20) * dD, w.tof + (b / 20) * dT));
        }
      }
      // the refinement stops when its simplex spans at most REFINE_FTOL within REFINE_XTOL of a
      // cell; a scan at 1/20 of a cell finds nothing lower than that (measured: nothing lower at all)
      expect(lowest).toBeGreaterThan(w.dvTotal - REFINE_FTOL);
    }
  });

  it('lists the next K windows of a span in departure order, one per departure period', () => {
    const sys = demoSystem();
    const req: PorkchopRequest = {
      from: sys.indexById.tessel,
      to: sys.indexById.ochre,
      depart: { start: 0, end: 2500 * DAY, n: 120 },
      secondAxis: 'tof',
      second: { start: 80 * DAY, end: 420 * DAY, n: 30 },
      parkingAltitude: 200e3,
      arrivalAltitude: 200e3,
    };
    const grid = computePorkchop(sys, req);
    const all = findWindows(sys, grid, { count: 100 });
    const sep = defaultSeparation(sys, req);
    expect(sep).toBeCloseTo(0.5 * synodicPeriod(sys.bodies[req.from].derived.period, sys.bodies[req.to].derived.period), 6);
    for (let k = 1; k < all.length; k++) expect(all[k].departure - all[k - 1].departure).toBeGreaterThanOrEqual(sep);
    const two = findWindows(sys, grid, { count: 2 });
    expect(two.map((w) => w.departure)).toEqual(all.slice(0, 2).map((w) => w.departure));
    const later = findWindows(sys, grid, { count: 2, span: { start: all[1].departure, end: 2500 * DAY } });
    expect(later[0].departure).toBe(all[1].departure);
    const raw = findWindows(sys, grid, { count: 100, refine: false });
    for (const w of raw) expect(w.evaluations).toBe(0);
    expect(() => findWindows(sys, grid, { count: 0 })).toThrow(InputError);
  });
  it('with multi-revolution arcs, keeps one window per departure period for each revolution count', () => {
    const sys = demoSystem();
    const req: PorkchopRequest = {
      from: sys.indexById.tessel,
      to: sys.indexById.ochre,
      depart: { start: 0, end: 1100 * DAY, n: 80 },
      secondAxis: 'tof',
      second: { start: 100 * DAY, end: 1500 * DAY, n: 60 },
      parkingAltitude: 200e3,
      arrivalAltitude: 200e3,
      maxRevs: 2,
    };
    const grid = computePorkchop(sys, req);
    const ws = findWindows(sys, grid, { count: 100 });
    const sep = defaultSeparation(sys, req);
    expect(new Set(ws.map((w) => w.revs)).size).toBeGreaterThan(1);
    for (const a of ws) {
      expect(a.revs === 0 ? a.branch === 'single' : a.branch === 'left' || a.branch === 'right').toBe(true);
      for (const b of ws) if (a !== b && a.revs === b.revs) expect(Math.abs(a.departure - b.departure)).toBeGreaterThanOrEqual(sep);
    }
  });
});

describe('localMinima', () => {
  it('finds the minima of a sampled analytic surface with known minima (8-neighbourhood)', () => {
    // f = −exp(−|x − a|²) − 0.5 exp(−|x − b|²): two basins, minima at a and b (to grid resolution)
    const n = 41;
    const plane = new Float32Array(n * n);
    const g = (i: number, j: number, ci: number, cj: number): number => Math.exp(-((i - ci) ** 2 + (j - cj) ** 2) / 20);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) plane[i * n + j] = -g(i, j, 10, 12) - 0.5 * g(i, j, 30, 25);
    const m = localMinima(plane, n, n);
    expect(m.map((p) => [p.i, p.j])).toEqual([
      [10, 12],
      [30, 25],
    ]);
  });

  it('gives one candidate for a flat-bottomed basin and skips unsolved cells', () => {
    const plane = Float32Array.from([5, 5, 5, 5, 1, 1, 5, 5, 5, Infinity, Infinity, Infinity]);
    expect(localMinima(plane, 3, 4)).toEqual([{ i: 1, j: 0, value: 1 }]);
  });
});
