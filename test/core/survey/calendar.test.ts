import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { computePorkchop, computePorkchopRows, gridMinimum } from '../../../core/search/porkchop.ts';
import { createPlanes } from '../../../core/search/planes.ts';
import { prepareTransfer } from '../../../core/search/transfer.ts';
import { lowOrbitAltitude } from '../../../core/survey/ascent.ts';
import {
  calendarPair,
  OPEN_CLOSE_TOL,
  planetPairs,
  resolveCalendarRequest,
  windowCalendar,
  type Calendar,
  type CalendarWindow,
} from '../../../core/survey/calendar.ts';
import type { StarSystem } from '../../../core/system/model.ts';
import { circularSystem, demoSystem } from '../search/fixtures.ts';

const DAY = 86400;
const MU = 1.32712440018e20;
const A1 = 0.5 * 149.6e9;
const A2 = 0.8 * 149.6e9;
const LON1 = 10;
const LON2 = 75;

/** Two planets on circular coplanar orbits (periods about 129 and 261 days; synodic about 255 days). */
function twoPlanets(): StarSystem {
  return circularSystem(
    [
      { id: 'inner', a: A1, mu: 3.986e14, radius: 6378e3, lonDeg: LON1 },
      { id: 'outer', a: A2, mu: 4.2828e13, radius: 3396e3, lonDeg: LON2 },
    ],
    MU,
  );
}

/**
 * The best total over flight time at departure t, computed apart from the calendar: one porkchop
 * row of core/search with 4001 flight times over the calendar's range. The row minimum lies above
 * the true one by at most ½·f''·(step/2)², under 1e-3 m/s for these rows (checked against a row of
 * twice the samples in the first test).
 */
function denseBest(system: StarSystem, from: number, to: number, t: number, tofMin: number, tofMax: number, n = 4001): number {
  const req = {
    from,
    to,
    depart: { start: t, end: t, n: 1 },
    secondAxis: 'tof' as const,
    second: { start: tofMin, end: tofMax, n },
    parkingAltitude: lowOrbitAltitude(system.bodies[from]),
    arrivalAltitude: lowOrbitAltitude(system.bodies[to]),
  };
  const out = createPlanes(0, 1, n);
  computePorkchopRows(system, prepareTransfer(system, req), 0, 1, out);
  let best = Infinity;
  for (const v of out.dvTotal) best = Math.min(best, v);
  return best;
}

describe('window calendar: two planets on circular coplanar orbits', () => {
  const sys = twoPlanets();
  const years = 4;
  const request = { pairs: [{ from: 'inner', to: 'outer' }], years, within: 0.1 };
  const resolved = resolveCalendarRequest(sys, request);
  const rp = resolved.pairs[0];
  const pair = calendarPair(sys, request, 0);
  const n1 = Math.sqrt(MU / A1 ** 3);
  const n2 = Math.sqrt(MU / A2 ** 3);
  // synodic period 2π/|n1 − n2| (Curtis, Orbital Mechanics for Engineering Students, 3rd ed., §8.3)
  const synodic = (2 * Math.PI) / Math.abs(n1 - n2);
  const inner = pair.windows.filter((w) => !w.opensCut && !w.closesCut);
  const dStep = (resolved.end - resolved.start) / (rp.rows - 1);

  it('finds one window per synodic period, successive best departures one synodic period apart within the window width', () => {
    // the system's periods use μ_star + μ_planet (two-body): relative difference μ_p/μ ≈ 3e-6
    expect(Math.abs(pair.synodic / synodic - 1)).toBeLessThan(1e-5);
    // 4 years of 360 days over a 255-day synodic period: 5 or 6 windows
    expect(pair.windows.length).toBeGreaterThanOrEqual(5);
    expect(inner.length).toBeGreaterThanOrEqual(4);
    for (let k = 1; k < inner.length; k++) {
      const gap = inner[k].best.depart - inner[k - 1].best.depart;
      expect(Math.abs(gap - synodic)).toBeLessThan(inner[k].closes - inner[k].opens);
    }
  });

  it('puts each best departure at the Hohmann phase-angle date (target leads by π − n2·t_H)', () => {
    // Hohmann transfer time π·√(((a1 + a2)/2)³/μ) and lead angle (Curtis, 3rd ed., §6.2 and §8.3 — from memory)
    const tH = Math.PI * Math.sqrt(((A1 + A2) / 2) ** 3 / MU);
    const lead = Math.PI - n2 * tH;
    const lead0 = ((LON2 - LON1) * Math.PI) / 180;
    // θ2 − θ1 = lead0 + (n2 − n1)·t ≡ lead (mod 2π)
    const dates: number[] = [];
    for (let k = -10; k <= 10; k++) dates.push((lead - lead0 + 2 * Math.PI * k) / (n2 - n1));
    for (const w of inner) {
      const nearest = dates.reduce((a, b) => (Math.abs(b - w.best.depart) < Math.abs(a - w.best.depart) ? b : a));
      // the refinement starts on the grid (one sample off at most) and stops when the simplex spans
      // 0.01 m/s within 1e-3 of a sample; on this flat minimum that leaves the date within 1 % of a
      // departure sample (measured ≤ 0.2 %) and the flight time within 1 % of a flight-time
      // sample (measured ≤ 0.05 %)
      expect(Math.abs(w.best.depart - nearest)).toBeLessThan(0.01 * dStep);
      expect(Math.abs(w.best.tof - tH)).toBeLessThan((0.01 * (rp.tofMax - rp.tofMin)) / (rp.tofSamples - 1));
      expect(w.best.dv).toBeCloseTo(w.best.dvDepart + w.best.dvCapture, 6);
    }
  });

  it('opens before and closes after the best departure, where the curve is (1 + within)·min', () => {
    for (const w of inner) {
      expect(w.opens).toBeLessThan(w.best.depart);
      expect(w.best.depart).toBeLessThan(w.closes);
      const thr = 1.1 * w.best.dv;
      for (const t of [w.opens, w.closes]) {
        const v = denseBest(sys, 1, 2, t, rp.tofMin, rp.tofMax);
        // the root is found to OPEN_CLOSE_TOL (1 s) in date: the curve moves by |slope|·1 s, under
        // 0.01 m/s on these curves (they change by ~10 % of 10 km/s over days); plus the dense
        // row's own error (< 1e-3 m/s) and its float32 storage (~1e-3 m/s at 12 km/s)
        const slope = Math.abs(denseBest(sys, 1, 2, t + 3600, rp.tofMin, rp.tofMax) - denseBest(sys, 1, 2, t - 3600, rp.tofMin, rp.tofMax)) / 7200;
        expect(Math.abs(v - thr)).toBeLessThan(slope * OPEN_CLOSE_TOL + 0.01);
      }
    }
  });

  it('the dense row used as the reference is converged: twice the samples move it by under 1e-3 m/s', () => {
    const w = inner[0];
    const a = denseBest(sys, 1, 2, w.opens, rp.tofMin, rp.tofMax);
    const b = denseBest(sys, 1, 2, w.opens, rp.tofMin, rp.tofMax, 8001);
    expect(Math.abs(a - b)).toBeLessThan(1e-3);
  });

  it('reports windows cut by the calendar as cut, never with a made-up opening', () => {
    // a calendar that starts in the middle of the second window
    const mid = inner[1].best.depart;
    const cut = calendarPair(sys, { ...request, start: mid, years: 1 }, 0);
    expect(cut.windows[0].opensCut).toBe(true);
    expect(cut.windows[0].opens).toBe(mid);
    const last = cut.windows[cut.windows.length - 1];
    if (last.closesCut) expect(last.closes).toBe(mid + 360 * DAY);
  });
});

describe('window calendar of the demo system', () => {
  const sys = demoSystem();
  let progress = 0;
  const cal: Calendar = windowCalendar(sys, {}, { onProgress: (d, t) => (progress = d / t) });

  it('covers every ordered planet pair over 20 calendar years with progress to the end', () => {
    expect(cal.pairs.length).toBe(planetPairs(sys).length);
    expect(cal.pairs.length).toBe(20);
    expect(cal.end - cal.start).toBeCloseTo(20 * sys.calendar.yearLength, 3);
    expect(progress).toBe(1);
  });

  it('lists each pair’s windows in time order, not overlapping, each bracketing its minimum', () => {
    for (const p of cal.pairs) {
      expect(p.windows.length).toBeGreaterThan(0);
      let prev: CalendarWindow | null = null;
      for (const w of p.windows) {
        expect(w.opens).toBeLessThanOrEqual(w.best.depart);
        expect(w.best.depart).toBeLessThanOrEqual(w.closes);
        expect(w.opens).toBeGreaterThanOrEqual(cal.start);
        expect(w.closes).toBeLessThanOrEqual(cal.end);
        for (const v of [w.opens, w.closes, w.best.dv, w.best.tof, w.best.dvDepart, w.best.dvCapture]) expect(Number.isFinite(v)).toBe(true);
        if (prev) expect(w.opens).toBeGreaterThan(prev.closes);
        prev = w;
      }
    }
  });

  it('finds no window whose best is beaten by the porkchop grid of the same period (core/search)', () => {
    const resolved = resolveCalendarRequest(sys, {});
    let checked = 0;
    cal.pairs.forEach((p, k) => {
      const rp = resolved.pairs[k];
      // a few windows per pair, spread over the calendar
      const step = Math.max(1, Math.floor(p.windows.length / 3));
      for (let i = 0; i < p.windows.length; i += step) {
        const w = p.windows[i];
        if (!(w.closes > w.opens)) continue;
        const grid = computePorkchop(sys, {
          from: rp.legFrom,
          to: rp.legTo,
          depart: { start: w.opens, end: w.closes, n: 40 },
          secondAxis: 'tof',
          second: { start: rp.tofMin, end: rp.tofMax, n: 40 },
          parkingAltitude: lowOrbitAltitude(sys.bodies[rp.legFrom]),
          arrivalAltitude: lowOrbitAltitude(sys.bodies[rp.legTo]),
        });
        const min = gridMinimum(grid)!;
        // the window's best is a refined local minimum; the grid's cells are samples of the same
        // cost stored in float32 (≤ 2e-3 m/s at 30 km/s), and the refinement stops at a spread of
        // 0.01 m/s
        expect(w.best.dv).toBeLessThanOrEqual(min.value + 0.02);
        checked++;
      }
    });
    expect(checked).toBeGreaterThan(40);
  });
});

describe('window calendar requests', () => {
  const sys = demoSystem();
  const fails = (req: object, field: string): void => {
    let err: unknown;
    try {
      resolveCalendarRequest(sys, req);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).field).toBe(field);
  };

  it('refuses an unknown body, a body paired with itself, and years ≤ 0 or too many, naming the field', () => {
    fails({ pairs: [{ from: 'tessel', to: 'nowhere' }] }, 'pair 1 to');
    fails({ pairs: [{ from: 'ilmar', to: 'tessel' }] }, 'pair 1 from');
    fails(
      {
        pairs: [
          { from: 'tessel', to: 'ochre' },
          { from: 'ochre', to: 'ochre' },
        ],
      },
      'pair 2',
    );
    fails({ pairs: [{ from: 'tessel', to: 'quill' }] }, 'pair 1');
    fails({ years: 0 }, 'years');
    fails({ years: -3 }, 'years');
    fails({ years: 1000 }, 'years');
    fails({ within: 0 }, 'within');
    fails({ resolution: 3 }, 'resolution');
    fails({ pairs: [] }, 'pairs');
  });
});
