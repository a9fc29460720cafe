/**
 * The window calendar: for pairs of bodies over N calendar years, when each transfer window
 * opens and closes (total Δv within X % of that window's minimum), its best departure, Δv and
 * flight time.
 *
 * Δv: departure burn from the circular low orbit of the departure body plus the capture burn into
 * the circular low orbit of the arrival body (lowOrbitAltitude, ascent.ts), patched conics with
 * one Lambert arc (core/search's transfer, the porkchop's own cell: a calendar window and a
 * porkchop cell of the same date agree). Flight times span TOF_SPAN × the pair's Hohmann time t_H,
 * as the porkchop's default ranges do (core/io/defaults.ts; Curtis, Orbital Mechanics for
 * Engineering Students, §6.2 — from memory), cut to PHASE_SPAN periods of the arrival body
 * beyond the Hohmann times between the orbits' periapsis radii and between their apoapsis radii:
 * at one departure the cost over flight time has one valley per revolution of the arrival body
 * (its phase at arrival repeats), and a valley one more revolution away from the Hohmann times
 * only costs more (the arc strays further from a Hohmann ellipse), so a wider range adds valleys
 * that never win and makes the valleys narrow against the samples. The range is sampled at
 * TOF_SAMPLES_PER_PERIOD per period of the arrival body (MIN_TOF_SAMPLES..MAX_TOF_SAMPLES),
 * enough to land in every valley (a coarser sampling made the per-departure best of a pair
 * bound for an inner planet jump by more than 10 % between neighbouring departures).
 *
 * Method, per pair
 * 1. The departure curve: departures every synodic/resolution over the calendar, and for each the
 *    best total over the flight-time samples — porkchop rows (core/search computePorkchopRows)
 *    reduced to their row minimum, computed in blocks of BLOCK_ROWS rows.
 * 2. Windows: the curve's local minima (lower than the sample before, not higher than the sample
 *    after; a minimum at either end of the calendar counts). Merging, the curve's noise and the
 *    eccentric cases: minima are taken best first, and one whose window — the samples around it
 *    at or below (1 + within)·its value — holds a better minimum already taken is not a window
 *    of its own (the curve does not rise by `within` between them, so no one would call them two
 *    windows). This absorbs the row minimum's jitter (a column change in the sampled flight time
 *    is far below 10 %) and the double dips of eccentric pairs alike; the windows left never
 *    overlap (a window's span holding part of another's would hold its better minimum).
 * 3. The best of each window: the downhill simplex of core/search (refine.ts) over (departure,
 *    flight time), started at the sample, in a box of ±REFINE_BOX samples clipped to the calendar
 *    and the flight-time range, stopped at a spread of REFINE_FTOL.
 * 4. Opening and closing: the threshold is (1 + within)·best. The curve is now the exact best
 *    over flight time per departure: a 1-D minimisation (Brent, core/math minimize) over the
 *    flight times scanned at the grid's samples, then polished between the best sample's
 *    neighbours. The samples bracket the crossing: walking out from the best departure over the
 *    samples at or under the threshold (the sampled curve is never below the exact one, so these
 *    are inside), then on while the exact value stays under it; Brent's root finder (core/math
 *    brent, bisection-safeguarded) closes the bracket to OPEN_CLOSE_TOL. Two windows whose exact
 *    spans meet (a bump of about `within` hidden between samples) become one.
 *    The exact per-departure minimisation (rather than interpolating the samples) is used so the
 *    opening and closing dates are those of the continuous curve, not of the flight-time grid:
 *    a crossing read off the samples would move by the row minimum's error (a few m/s on the
 *    coarse flight-time grid, hours to days of date on a slow curve).
 * 5. A window still under the threshold at the calendar's start (end) opens (closes) there with
 *    opensCut (closesCut) set: its true opening lies outside the calendar and is not made up.
 *
 * Every Lambert solve (grid cells and probes) is counted in `solves`.
 */
import { brent, InputError, minimize, SolverError, requireFinite } from '../math/index.ts';
import { hohmann, synodicPeriod } from '../orbit/index.ts';
import {
  computePorkchopRows,
  createPlanes,
  evaluateTransfer,
  nelderMead,
  porkchopPair,
  prepareTransfer,
  SIBLINGS,
  transferMetric,
  type PorkchopRequest,
} from '../search/index.ts';
import type { StarSystem } from '../system/index.ts';
import { lowOrbitAltitude } from './ascent.ts';

/** One pair asked for, by body ids. */
export interface CalendarPairRequest {
  from: string;
  to: string;
}

/** What a calendar is asked to compute: plain data (structured-cloneable). */
export interface CalendarRequest {
  /** Pairs of body ids; default every ordered pair of the star's planets. */
  pairs?: CalendarPairRequest[];
  /** Calendar start, s from the epoch; default 0. */
  start?: number;
  /** Length in calendar years of the system (`system.calendar.yearLength`); default 20. */
  years?: number;
  /** A window is open while the total Δv is within this fraction of its minimum; default 0.10. */
  within?: number;
  /** Departure samples per synodic period; default 120. */
  resolution?: number;
}

export interface CalendarWindow {
  /** Opening and closing dates, s from the epoch. */
  opens: number;
  closes: number;
  /** The window was already open at the calendar's start (opens = start). */
  opensCut: boolean;
  /** The window is still open at the calendar's end (closes = end). */
  closesCut: boolean;
  /** The window's best transfer: departure (s from the epoch), flight time (s), Δv (m/s). */
  best: { depart: number; tof: number; dv: number; dvDepart: number; dvCapture: number };
}

export interface CalendarPair {
  /** Body ids and names asked for. */
  from: string;
  to: string;
  fromName: string;
  toName: string;
  /** null when the pair is its own leg; else which leg has the window, in words (core/search porkchopPair). */
  through: string | null;
  /** Synodic period of the leg, s. */
  synodic: number;
  windows: CalendarWindow[];
  /** The departure curve (best total Δv per departure, m/s), downsampled for a chart. */
  curve?: { t: Float64Array; dv: Float32Array };
  /** Lambert solves spent on the pair. */
  solves: number;
}

export interface Calendar {
  /** The system's name. */
  system: string;
  /** Calendar span, s from the epoch. */
  start: number;
  end: number;
  within: number;
  pairs: CalendarPair[];
}

export const CALENDAR_YEARS = 20;
export const MAX_CALENDAR_YEARS = 200;
export const CALENDAR_WITHIN = 0.1;
/** Bounds of `within` (fraction). */
export const MIN_WITHIN = 0.001;
export const MAX_WITHIN = 1;
export const CALENDAR_RESOLUTION = 120;
/** Bounds of `resolution`: at 400 a Kiln pair over 20 years is ~25 000 departures × TOF_SAMPLES. */
export const MIN_RESOLUTION = 16;
export const MAX_RESOLUTION = 400;
/** Flight times span these multiples of the pair's Hohmann time (as core/io/defaults.ts TOF_SPAN_HOHMANN) ... */
export const TOF_SPAN: readonly [number, number] = [0.5, 2];
/** ... and lie no farther than this many periods of the arrival body from the Hohmann times (see the file comment). */
export const PHASE_SPAN = 0.75;
/** Flight-time samples per period of the arrival body, and bounds of their number per departure. */
export const TOF_SAMPLES_PER_PERIOD = 40;
export const MIN_TOF_SAMPLES = 24;
export const MAX_TOF_SAMPLES = 128;
/** Rows per porkchop block (progress and cancellation step). */
export const BLOCK_ROWS = 256;
/** Half-width of the refinement box, in samples. */
export const REFINE_BOX = 2;
/** Spread of the total Δv at which the refinement stops, m/s (well under the 1 m/s shown). */
export const REFINE_FTOL = 0.01;
/** Tolerance of the opening and closing dates, s. */
export const OPEN_CLOSE_TOL = 1;
/** Largest number of points of the downsampled curve. */
export const CURVE_POINTS = 480;

export interface ResolvedPair {
  /** Body indices asked for. */
  from: number;
  to: number;
  /** The leg computed (porkchopPair). */
  legFrom: number;
  legTo: number;
  through: string | null;
  synodic: number;
  /** Flight-time range (s) and its samples per departure. */
  tofMin: number;
  tofMax: number;
  tofSamples: number;
  /** Departure samples over the calendar. */
  rows: number;
}

export interface ResolvedCalendar {
  start: number;
  end: number;
  within: number;
  resolution: number;
  pairs: ResolvedPair[];
}

export interface CalendarOptions {
  /** Progress in departure samples: (done, total); reaches (total, total) at the end. */
  onProgress?: (done: number, total: number) => void;
  /** Checked before each porkchop row and each window; when set, SolverError('calendar', 'cancelled'). */
  signal?: { readonly aborted: boolean };
  /** Keep the downsampled curve (default true). */
  curve?: boolean;
}

/** Every ordered pair of the star's planets, by id. */
export function planetPairs(system: StarSystem): CalendarPairRequest[] {
  const planets = system.bodies.filter((b) => b.parentIndex === 0);
  const out: CalendarPairRequest[] = [];
  for (const a of planets) for (const b of planets) if (a !== b) out.push({ from: a.id, to: b.id });
  return out;
}

function numberIn(field: string, value: unknown, lo: number, hi: number, what: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < lo || value > hi) {
    throw new InputError(field, `must be ${what}`, value);
  }
  return value;
}

/** Checks a request against the system and fills in its defaults; InputError names the field. */
export function resolveCalendarRequest(system: StarSystem, request: CalendarRequest = {}): ResolvedCalendar {
  if (request === null || typeof request !== 'object') throw new InputError('request', 'must be an object', request);
  const yearLength = system.calendar.yearLength;
  const start = request.start ?? 0;
  requireFinite('start', start);
  const years = request.years ?? CALENDAR_YEARS;
  if (typeof years !== 'number' || !(years > 0)) throw new InputError('years', 'must be a number of years > 0', years);
  numberIn('years', years, 0, MAX_CALENDAR_YEARS, `at most ${MAX_CALENDAR_YEARS} years`);
  const within = numberIn('within', request.within ?? CALENDAR_WITHIN, MIN_WITHIN, MAX_WITHIN, `a fraction from ${MIN_WITHIN} to ${MAX_WITHIN} (0.1 = 10 %)`);
  const resolution = request.resolution ?? CALENDAR_RESOLUTION;
  if (!Number.isInteger(resolution) || resolution < MIN_RESOLUTION || resolution > MAX_RESOLUTION) {
    throw new InputError('resolution', `must be a whole number of departures per synodic period from ${MIN_RESOLUTION} to ${MAX_RESOLUTION}`, resolution);
  }
  const end = start + years * yearLength;
  const asked = request.pairs ?? planetPairs(system);
  if (!Array.isArray(asked)) throw new InputError('pairs', 'must be a list of { from, to } body ids', asked);
  if (asked.length === 0) throw new InputError('pairs', 'must name at least one pair of bodies');
  const B = system.bodies;
  const pairs = asked.map((p, k): ResolvedPair => {
    const field = `pair ${k + 1}`;
    if (p === null || typeof p !== 'object') throw new InputError(field, 'must be { from, to } body ids', p);
    const ids = [p.from, p.to].map((id, e) => {
      const i = typeof id === 'string' && Object.hasOwn(system.indexById, id) ? system.indexById[id] : -1;
      const end_ = e === 0 ? 'from' : 'to';
      if (i < 0)
        throw new InputError(
          `${field} ${end_}`,
          `must name a body of ${system.name} (${B.slice(1)
            .map((b) => b.id)
            .join(', ')})`,
          id,
        );
      if (i === 0) throw new InputError(`${field} ${end_}`, `must name a body with an orbit, not the star ${B[0].name}`, id);
      return i;
    });
    const [from, to] = ids;
    if (from === to) throw new InputError(field, `must join two different bodies (${B[from].name} is paired with itself)`, `${p.from}:${p.to}`);
    const leg = porkchopPair(system, from, to);
    if (leg.kind !== SIBLINGS) {
      throw new InputError(
        field,
        `must join bodies that orbit side by side: ${B[from].name} and ${B[to].name} are a planet and its own moon, whose transfer cost does not wait for a window`,
        `${p.from}:${p.to}`,
      );
    }
    const A = B[leg.from];
    const C = B[leg.to];
    if (A.derived.period === C.derived.period) {
      throw new InputError(field, `must join bodies of different periods (${A.name} and ${C.name} never change phase)`, `${p.from}:${p.to}`);
    }
    const synodic = synodicPeriod(A.derived.period, C.derived.period);
    const tH = hohmann(B[A.parentIndex].mu, A.elements!.a, C.elements!.a).tof;
    const rows = Math.max(resolution, Math.ceil(((end - start) / synodic) * resolution)) + 1;
    const muC = B[A.parentIndex].mu;
    const ea = A.elements!;
    const ec = C.elements!;
    const tLow = hohmann(muC, ea.a * (1 - ea.e), ec.a * (1 - ec.e)).tof;
    const tHigh = hohmann(muC, ea.a * (1 + ea.e), ec.a * (1 + ec.e)).tof;
    const pTo = C.derived.period;
    const tofMin = Math.max(TOF_SPAN[0] * tH, Math.min(tLow, tHigh) - PHASE_SPAN * pTo);
    const tofMax = Math.min(TOF_SPAN[1] * tH, Math.max(tLow, tHigh) + PHASE_SPAN * pTo);
    const tofSamples = Math.min(MAX_TOF_SAMPLES, Math.max(MIN_TOF_SAMPLES, Math.ceil(((tofMax - tofMin) / pTo) * TOF_SAMPLES_PER_PERIOD) + 1));
    return { from, to, legFrom: leg.from, legTo: leg.to, through: leg.through, synodic, tofMin, tofMax, tofSamples, rows };
  });
  return { start, end, within, resolution, pairs };
}

/** The porkchop request of a pair's departure curve (core/search). */
export function pairPorkchopRequest(system: StarSystem, resolved: ResolvedCalendar, pair: ResolvedPair): PorkchopRequest {
  return {
    from: pair.legFrom,
    to: pair.legTo,
    depart: { start: resolved.start, end: resolved.end, n: pair.rows },
    secondAxis: 'tof',
    second: { start: pair.tofMin, end: pair.tofMax, n: pair.tofSamples },
    parkingAltitude: lowOrbitAltitude(system.bodies[pair.legFrom]),
    arrivalAltitude: lowOrbitAltitude(system.bodies[pair.legTo]),
    metric: 'total',
  };
}

const cancelled = (): SolverError => new SolverError('calendar', 'cancelled', 'calendar cancelled');

/** Stand-in for an unsolved transfer inside the 1-D searches (core/math's solvers refuse non-finite values). */
const UNSOLVED = 1e30;

/** The windows of one pair (request.pairs[pairIndex], or the default pairs): see the file comment. */
export function calendarPair(system: StarSystem, request: CalendarRequest, pairIndex: number, options: CalendarOptions = {}): CalendarPair {
  const resolved = resolveCalendarRequest(system, request);
  if (!Number.isInteger(pairIndex) || pairIndex < 0 || pairIndex >= resolved.pairs.length) {
    throw new InputError('pairIndex', `must be a pair number below ${resolved.pairs.length}`, pairIndex);
  }
  const pair = resolved.pairs[pairIndex];
  const { within } = resolved;
  const req = pairPorkchopRequest(system, resolved, pair);
  const setup = prepareTransfer(system, req);
  // the grid's axes (core/search request.ts: evenly spaced, both ends included)
  const n = req.depart.n;
  const m = req.second.n;
  const times = new Float64Array(n);
  for (let k = 0; k < n; k++) times[k] = req.depart.start + ((req.depart.end - req.depart.start) * k) / (n - 1);
  const tofs = new Float64Array(m);
  for (let k = 0; k < m; k++) tofs[k] = req.second.start + ((req.second.end - req.second.start) * k) / (m - 1);
  const signal = options.signal;

  // 1. The departure curve from porkchop rows, block by block.
  const curve = new Float64Array(n);
  const bestCol = new Int32Array(n);
  const block = createPlanes(0, Math.min(BLOCK_ROWS, n), m);
  for (let r0 = 0; r0 < n; r0 += BLOCK_ROWS) {
    const r1 = Math.min(n, r0 + BLOCK_ROWS);
    block.rowStart = r0;
    try {
      computePorkchopRows(system, setup, r0, r1, block, { signal });
    } catch (e) {
      if (e instanceof SolverError && e.reason === 'cancelled') throw cancelled();
      throw e;
    }
    const dv = block.dvTotal;
    for (let i = r0; i < r1; i++) {
      let best = Infinity;
      let at = 0;
      const base = (i - r0) * m;
      for (let j = 0; j < m; j++) {
        if (dv[base + j] < best) {
          best = dv[base + j];
          at = j;
        }
      }
      curve[i] = best;
      bestCol[i] = at;
    }
    options.onProgress?.(r1, n);
  }
  let solves = n * m;

  // 2. Windows: local minima, best first, merged by the within rule.
  const minima: number[] = [];
  for (let i = 0; i < n; i++) {
    const v = curve[i];
    if (!(v < Infinity)) continue;
    if ((i === 0 || v < curve[i - 1]) && (i === n - 1 || v <= curve[i + 1])) minima.push(i);
  }
  minima.sort((a, b) => curve[a] - curve[b] || a - b);
  const taken: number[] = [];
  for (const i of minima) {
    const thr = (1 + within) * curve[i];
    let lo = i;
    while (lo > 0 && curve[lo - 1] <= thr) lo--;
    let hi = i;
    while (hi < n - 1 && curve[hi + 1] <= thr) hi++;
    if (!taken.some((k) => k >= lo && k <= hi)) taken.push(i);
  }
  taken.sort((a, b) => a - b);

  // Exact best total over flight time at departure t: the flight-time samples scanned (the row's
  // best basin), then Brent's minimisation between the best sample's neighbours.
  const metric = (t: number, tof: number): number => {
    solves++;
    const v = transferMetric(system, setup, t, tof);
    return v < Infinity ? v : UNSOLVED;
  };
  const bestAt = (t: number): number => {
    let best = Infinity;
    let at = 0;
    for (let j = 0; j < m; j++) {
      const v = metric(t, tofs[j]);
      if (v < best) {
        best = v;
        at = j;
      }
    }
    const lo = Math.max(0, at - 1);
    const hi = Math.min(m - 1, at + 1);
    return Math.min(best, minimize((y) => metric(t, y), tofs[lo], tofs[hi], { tol: 1e-6 * (tofs[hi] - tofs[lo]) }).fx);
  };
  const exactCache = new Map<number, number>();
  const exactSample = (k: number): number => {
    let v = exactCache.get(k);
    if (v === undefined) {
      v = bestAt(times[k]);
      exactCache.set(k, v);
    }
    return v;
  };
  const dStep = n > 1 ? times[1] - times[0] : 0;
  const yStep = m > 1 ? tofs[1] - tofs[0] : 0;

  const windows: CalendarWindow[] = [];
  for (const i of taken) {
    if (signal?.aborted) throw cancelled();
    // 3. Refine the minimum over (departure, flight time).
    const j = bestCol[i];
    const r = nelderMead((x) => metric(x[0], x[1]), [times[i], tofs[j]], [dStep, yStep], {
      lower: [Math.max(resolved.start, times[i] - REFINE_BOX * dStep), Math.max(tofs[0], tofs[j] - REFINE_BOX * yStep)],
      upper: [Math.min(resolved.end, times[i] + REFINE_BOX * dStep), Math.min(tofs[m - 1], tofs[j] + REFINE_BOX * yStep)],
      fTol: REFINE_FTOL,
      xTol: 1e-3,
      maxEvaluations: 800,
    });
    const tBest = r.x[0];
    const cell = evaluateTransfer(system, setup, tBest, r.x[1]);
    solves++;
    if (!cell.solved) continue;
    const thr = (1 + within) * cell.dvTotal;
    // Sample index nearest the best departure, on each side.
    const below = Math.min(n - 1, Math.max(0, Math.floor((tBest - resolved.start) / dStep)));
    // 4. The crossing on one side (dir −1: opening, +1: closing), or null when the calendar cuts it.
    const crossing = (dir: -1 | 1): number | null => {
      // the first sample strictly beyond the best departure on that side
      let k = dir < 0 ? (times[below] < tBest ? below : below - 1) : times[below] > tBest ? below : below + 1;
      // the samples' curve is never below the exact one (the scan at a sample includes the grid's
      // columns), so samples at or under the threshold are inside: walk them cheaply, then check
      // the exact value beyond
      while (k >= 0 && k < n && curve[k] <= thr) k += dir;
      while (k >= 0 && k < n && exactSample(k) <= thr) k += dir;
      if (k < 0 || k >= n) return null;
      const inner = k - dir;
      const tIn = (dir < 0 ? inner >= 0 && times[inner] > tBest : inner < n && times[inner] < tBest) ? times[inner] : tBest;
      const g = (t: number): number => bestAt(t) - thr;
      // g(times[k]) > 0 by the walk; at the best departure the scan may miss the refined minimum by
      // the polish's tolerance, far below the threshold's margin, but a failed bracket leaves the
      // crossing at that end rather than throwing
      if (!(g(tIn) <= 0)) return tIn;
      return brent(g, Math.min(times[k], tIn), Math.max(times[k], tIn), { tol: OPEN_CLOSE_TOL });
    };
    const opens = crossing(-1);
    const closes = crossing(1);
    windows.push({
      opens: opens ?? resolved.start,
      closes: closes ?? resolved.end,
      opensCut: opens === null,
      closesCut: closes === null,
      best: { depart: tBest, tof: cell.tof, dv: cell.dvTotal, dvDepart: cell.dvDepart, dvCapture: cell.dvArrive },
    });
  }
  // Two windows whose exact spans touch (possible only where the samples hid a bump of about
  // `within`) are one: the span of both, the better best.
  windows.sort((a, b) => a.opens - b.opens);
  const merged: CalendarWindow[] = [];
  for (const w of windows) {
    const last = merged[merged.length - 1];
    if (last !== undefined && w.opens <= last.closes) {
      if (w.closes > last.closes) {
        last.closes = w.closes;
        last.closesCut = w.closesCut;
      }
      if (w.best.dv < last.best.dv) last.best = w.best;
    } else merged.push(w);
  }
  options.onProgress?.(n, n);

  const B = system.bodies;
  return {
    from: B[pair.from].id,
    to: B[pair.to].id,
    fromName: B[pair.from].name,
    toName: B[pair.to].name,
    through: pair.through,
    synodic: pair.synodic,
    windows: merged,
    curve: options.curve === false ? undefined : downsample(times, curve),
    solves,
  };
}

/** At most CURVE_POINTS points: the lowest sample of each run of samples (so no minimum is lost). */
function downsample(times: Float64Array, curve: Float64Array): { t: Float64Array; dv: Float32Array } {
  const n = times.length;
  const buckets = Math.min(n, CURVE_POINTS);
  const t = new Float64Array(buckets);
  const dv = new Float32Array(buckets);
  for (let b = 0; b < buckets; b++) {
    const i0 = Math.floor((b * n) / buckets);
    const i1 = Math.floor(((b + 1) * n) / buckets);
    let at = i0;
    for (let i = i0 + 1; i < i1; i++) if (curve[i] < curve[at]) at = i;
    t[b] = times[at];
    dv[b] = curve[at] < Infinity ? curve[at] : Number.MAX_VALUE;
  }
  return { t, dv };
}

/** The calendar's head (system, span, within) with the pairs given, e.g. computed by workers in any order. */
export function assembleCalendar(system: StarSystem, request: CalendarRequest, pairs: CalendarPair[]): Calendar {
  const r = resolveCalendarRequest(system, request);
  return { system: system.name, start: r.start, end: r.end, within: r.within, pairs };
}

/** The whole calendar in the calling thread: every pair in turn (calendarPair). */
export function windowCalendar(system: StarSystem, request: CalendarRequest = {}, options: CalendarOptions = {}): Calendar {
  const resolved = resolveCalendarRequest(system, request);
  const total = resolved.pairs.reduce((s, p) => s + p.rows, 0);
  let before = 0;
  const pairs: CalendarPair[] = [];
  for (let k = 0; k < resolved.pairs.length; k++) {
    const base = before;
    pairs.push(
      calendarPair(system, request, k, {
        ...options,
        onProgress: options.onProgress ? (done) => options.onProgress!(base + done, total) : undefined,
      }),
    );
    before += resolved.pairs[k].rows;
  }
  return { system: system.name, start: resolved.start, end: resolved.end, within: resolved.within, pairs };
}
