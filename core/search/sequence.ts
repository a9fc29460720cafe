/**
 * Multi-leg gravity-assist sequence search (e.g. Tessel → Moravel → Fennick): every leg a
 * Lambert arc about the common parent, each intermediate body a flyby (powered or unpowered)
 * joining the arriving and the departing v∞, minimising the total Δv = departure burn from the
 * parking orbit + flyby burns + capture burn.
 *
 * Method: a grid over departure date × first leg's time of flight; for each cell each later
 * leg's time of flight is scanned on a 1-D grid given the arrival time of the leg before, keeping
 * the time that minimises the flyby cost there (plus the capture cost on the last leg) — exact on
 * the grid for two legs, greedy leg by leg beyond. The grid's local minima are then refined over
 * all times at once by the downhill simplex (Nelder & Mead 1965, core/search/refine.ts).
 * Lambert arcs by Izzo's method through core/orbit's allocation-free lambertSingleRev /
 * lambertBest; flyby costs by core/orbit/flyby.ts flybyCostInto (patched conics: Curtis,
 * Orbital Mechanics for Engineering Students, §8.9); departure and capture burns tangential at
 * periapsis (Curtis §8.7–8.8, core/orbit/hyperbolic.ts). The grid loop allocates nothing.
 *
 * Resonant returns: a leg from a body back to itself (bodies [..., 'b', 'b', ...]) is a
 * multi-revolution Lambert arc (lambertBest up to ⌈tof / period⌉ revolutions) choosing the
 * solution with the cheapest flyby at its start; a tof of an exact multiple of the body's period
 * puts both ends at the same point and has no Lambert solution (the grid steps past it).
 */
import { InputError } from '../math/index.ts';
import {
  FLYBY_DV_TOTAL,
  FLYBY_SLOTS,
  flybyCostInto,
  hyperbolaPeriapsisSpeed,
  lambertBest,
  lambertSingleRev,
  orbitPeriapsisSpeed,
  poweredFlyby,
  unpoweredFlybyMatch,
} from '../orbit/index.ts';
import { conicState, findBodyIndex } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import { nelderMead } from './refine.ts';

export interface SequenceRequest {
  /** Body ids in order, e.g. ['tessel','moravel','fennick'] (≥ 2; repeats allowed for resonant returns). All siblings (same parent). */
  bodies: string[];
  /** Departure date range, s from the system epoch. */
  departFrom: number;
  departTo: number;
  /** Time-of-flight bounds per leg, s (length bodies.length − 1); omitted: from the Hohmann time of each pair (0.4×–2×; for a resonant return 1–3 periods of the body). */
  legTof?: [number, number][];
  /** Parking orbit altitude at the first body, m; target orbit at the last: periapsis altitude m and e (e ≥ 1 or null: flyby / no capture). */
  departAltitude: number;
  arriveAltitude: number;
  arriveE: number | null;
  /** Only unpowered flybys (a mismatch in |v∞| is paid as dvExtra), or powered (default). */
  powered?: boolean;
  /** How many distinct solutions to return (default 5). */
  keep?: number;
  /** Grid points over the departure range (default 64). */
  departSteps?: number;
  /** Grid points over each leg's time of flight (default 40). */
  tofSteps?: number;
}
export interface SequenceLeg {
  from: string;
  to: string;
  depart: number;
  arrive: number;
  tof: number;
  vInfDepart: number;
  vInfArrive: number;
}
export interface SequenceFlyby {
  body: string;
  t: number;
  vInfIn: number;
  vInfOut: number;
  periapsisAltitude: number;
  bAngle: number;
  turn: number;
  dv: number;
  limited: boolean;
  /** |Δv∞| heliocentric: |v∞out − v∞in| vector difference, m/s. */
  freeDv: number;
  /** Δv at periapsis (powered), m/s; dv = dvPeriapsis + dvExtra. */
  dvPeriapsis: number;
  /** Δv not reachable by the pass (turn beyond the minimum periapsis, or |v∞| mismatch when unpowered), m/s. */
  dvExtra: number;
}
export interface SequenceSolution {
  depart: number;
  arrive: number;
  legs: SequenceLeg[];
  flybys: SequenceFlyby[];
  dvDepart: number;
  dvFlybys: number;
  dvCapture: number;
  dvTotal: number;
}
export interface SequenceResult {
  solutions: SequenceSolution[];
  lambertSolves: number;
  evaluations: number;
  method: string;
  /* best direct transfer first→last over the same departures, for comparison */
  direct: { depart: number; arrive: number; dvTotal: number } | null;
}

export const SEQUENCE_METHOD =
  'grid over departure × first-leg time of flight, later legs scanned in 1-D, local minima refined by the downhill simplex (Nelder & Mead 1965) over all times; Lambert by Izzo (2015)';

const DEFAULT_DEPART_STEPS = 64;
const DEFAULT_TOF_STEPS = 40;
const MAX_STEPS = 2000;
const MAX_LEGS = 8;

/** Everything the cost of a chain needs, resolved once per request. */
interface Chain {
  system: StarSystem;
  ids: string[];
  idx: Int32Array;
  /** μ of the common parent. */
  mu: number;
  bodyMu: Float64Array;
  /** Minimum flyby periapsis radius per body of the sequence, m. */
  rpMin: Float64Array;
  radius: Float64Array;
  period: Float64Array;
  legs: number;
  resonant: Uint8Array;
  lo: Float64Array;
  hi: Float64Array;
  rPark: number;
  vPark: number;
  capture: boolean;
  rArrive: number;
  vTarget: number;
  powered: boolean;
}

// ---------------------------------------------------------------------------------------------
// Allocation-free chain evaluation (module scratch).

const S_DEP = new Float64Array(6);
const S_ARR = new Float64Array(6);
const V1 = new Float64Array(3);
const V2 = new Float64Array(3);
/** v∞ leaving the start of leg k at [3k..3k+2], v∞ arriving at its end likewise. */
const VDEP = new Float64Array(3 * MAX_LEGS);
const VARR = new Float64Array(3 * MAX_LEGS);
const FB = new Float64Array(FLYBY_SLOTS);
const VIN = new Float64Array(3);
const VOUT = new Float64Array(3);
const counters = { lambert: 0, evaluations: 0 };

// lambertBest's cost for a resonant leg: the flyby at its start against the incoming v∞ (VIN).
let costChain: Chain | null = null;
let costBody = 0;
const resonantCost = (v1x: number, v1y: number, v1z: number): number => {
  const c = costChain as Chain;
  VOUT[0] = v1x - S_DEP[3];
  VOUT[1] = v1y - S_DEP[4];
  VOUT[2] = v1z - S_DEP[5];
  return flybyCostInto(c.bodyMu[costBody], VIN, VOUT, c.rpMin[costBody], c.powered, FB) ? FB[FLYBY_DV_TOTAL] : Infinity;
};

// Numbers handed to and from the hot helpers through typed arrays (a double passed to or returned
// from a call that is not inlined is boxed, i.e. allocated): TT = [leave time, time of flight],
// RES[0] = the Δv a helper computed.
const TT = new Float64Array(2);
const RES = new Float64Array(1);

/** Lambert leg k leaving at t with time of flight tof: v∞ vectors into VDEP/VARR slot k. False when unsolved. */
function solveLeg(c: Chain, k: number, t: number, tof: number): boolean {
  // small enough to be inlined, so t and tof reach TT unboxed
  TT[0] = t;
  TT[1] = tof;
  return solveLegAt(c, k);
}

function solveLegAt(c: Chain, k: number): boolean {
  const t = TT[0];
  const tof = TT[1];
  if (!(tof > 0)) return false;
  const eph = c.system.ephemeris;
  conicState(eph, c.idx[k], t, S_DEP);
  conicState(eph, c.idx[k + 1], t + tof, S_ARR);
  counters.lambert++;
  if (c.resonant[k] === 1 && k > 0) {
    VIN[0] = VARR[3 * k - 3];
    VIN[1] = VARR[3 * k - 2];
    VIN[2] = VARR[3 * k - 1];
    costChain = c;
    costBody = k;
    const revs = Math.ceil(tof / c.period[k]);
    const code = lambertBest(c.mu, S_DEP, S_ARR, tof, revs, false, resonantCost, V1, V2);
    costChain = null;
    if (code < 0) return false;
  } else if (c.resonant[k] === 1) {
    const revs = Math.ceil(tof / c.period[k]);
    costChain = c;
    // first leg: no incoming v∞; choose the cheapest departure (VIN unused by departCost)
    const code = lambertBest(c.mu, S_DEP, S_ARR, tof, revs, false, departCost, V1, V2);
    costChain = null;
    if (code < 0) return false;
  } else if (lambertSingleRev(c.mu, S_DEP[0], S_DEP[1], S_DEP[2], S_ARR[0], S_ARR[1], S_ARR[2], tof, false, V1, V2) < 0) {
    return false;
  }
  const o = 3 * k;
  VDEP[o] = V1[0] - S_DEP[3];
  VDEP[o + 1] = V1[1] - S_DEP[4];
  VDEP[o + 2] = V1[2] - S_DEP[5];
  VARR[o] = V2[0] - S_ARR[3];
  VARR[o + 1] = V2[1] - S_ARR[4];
  VARR[o + 2] = V2[2] - S_ARR[5];
  return true;
}

const departCost = (v1x: number, v1y: number, v1z: number): number => {
  const c = costChain as Chain;
  const dx = v1x - S_DEP[3];
  const dy = v1y - S_DEP[4];
  const dz = v1z - S_DEP[5];
  return hyperbolaPeriapsisSpeed(c.bodyMu[0], dx * dx + dy * dy + dz * dz, c.rPark);
};

/** Departure burn of leg 0 into RES[0]. */
function departDvAt(c: Chain): void {
  const w2 = VDEP[0] * VDEP[0] + VDEP[1] * VDEP[1] + VDEP[2] * VDEP[2];
  RES[0] = Math.sqrt(w2 + (2 * c.bodyMu[0]) / c.rPark) - c.vPark;
}

/** Capture burn at the end of the last leg into RES[0] (0 without capture). */
function captureDvAt(c: Chain): void {
  if (!c.capture) {
    RES[0] = 0;
    return;
  }
  const o = 3 * (c.legs - 1);
  const w2 = VARR[o] * VARR[o] + VARR[o + 1] * VARR[o + 1] + VARR[o + 2] * VARR[o + 2];
  RES[0] = Math.sqrt(w2 + (2 * c.bodyMu[c.legs]) / c.rArrive) - c.vTarget;
}

/** Flyby cost at body j of the sequence (1 ≤ j ≤ legs − 1) from VARR[j−1] and VDEP[j] into RES[0] (Infinity when unusable). */
function flybyDvAt(c: Chain, j: number): void {
  VIN[0] = VARR[3 * j - 3];
  VIN[1] = VARR[3 * j - 2];
  VIN[2] = VARR[3 * j - 1];
  VOUT[0] = VDEP[3 * j];
  VOUT[1] = VDEP[3 * j + 1];
  VOUT[2] = VDEP[3 * j + 2];
  RES[0] = flybyCostInto(c.bodyMu[j], VIN, VOUT, c.rpMin[j], c.powered, FB) ? FB[FLYBY_DV_TOTAL] : Infinity;
}

function departDv(c: Chain): number {
  departDvAt(c);
  return RES[0];
}

function captureDv(c: Chain): number {
  captureDvAt(c);
  return RES[0];
}

function flybyDv(c: Chain, j: number): number {
  flybyDvAt(c, j);
  return RES[0];
}

/** Total Δv of the chain for the times in x = [t0, tof1, …, tofN] (Infinity when any leg is unsolved). */
function chainCost(c: Chain, x: ArrayLike<number>): number {
  counters.evaluations++;
  let t = x[0];
  for (let k = 0; k < c.legs; k++) {
    const tof = x[k + 1];
    if (!solveLeg(c, k, t, tof)) return Infinity;
    t += tof;
  }
  let total = departDv(c) + captureDv(c);
  for (let j = 1; j < c.legs; j++) total += flybyDv(c, j);
  return Math.abs(total) < Infinity ? total : Infinity;
}

// ---------------------------------------------------------------------------------------------

function prepareChain(system: StarSystem, req: SequenceRequest): Chain {
  const ids = req.bodies;
  if (!Array.isArray(ids) || ids.length < 2) throw new InputError('bodies', 'must name at least two bodies', ids);
  if (ids.length > MAX_LEGS + 1) throw new InputError('bodies', `must name at most ${MAX_LEGS + 1} bodies`, ids.length);
  const n = ids.length;
  const idx = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const b = findBodyIndex(system, ids[i]);
    if (b < 0) throw new InputError(`bodies[${i}]`, 'must name a body of the system', ids[i]);
    if (b === 0) throw new InputError(`bodies[${i}]`, 'must name a body with an orbit (not the star)', ids[i]);
    idx[i] = b;
  }
  const parent = system.bodies[idx[0]].parentIndex;
  for (let i = 1; i < n; i++) {
    if (system.bodies[idx[i]].parentIndex !== parent) {
      throw new InputError(`bodies[${i}]`, `must orbit the same body as ${ids[0]}`, ids[i]);
    }
  }
  for (const f of ['departFrom', 'departTo'] as const) {
    if (!Number.isFinite(req[f])) throw new InputError(f, 'must be a finite number', req[f]);
  }
  if (!(req.departTo >= req.departFrom)) throw new InputError('departTo', 'must be ≥ departFrom', req.departTo);
  if (!(req.departAltitude >= 0 && req.departAltitude < Infinity)) throw new InputError('departAltitude', 'must be a finite number ≥ 0', req.departAltitude);
  if (!(req.arriveAltitude >= 0 && req.arriveAltitude < Infinity)) throw new InputError('arriveAltitude', 'must be a finite number ≥ 0', req.arriveAltitude);
  if (req.arriveE !== null && !(req.arriveE >= 0 && req.arriveE < Infinity)) throw new InputError('arriveE', 'must be ≥ 0 or null', req.arriveE);
  const legs = n - 1;
  const mu = system.bodies[parent].mu;
  const bodyMu = new Float64Array(n);
  const rpMin = new Float64Array(n);
  const radius = new Float64Array(n);
  const period = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const b = system.bodies[idx[i]];
    bodyMu[i] = b.mu;
    radius[i] = b.radius;
    rpMin[i] = b.radius + b.safeAlt;
    period[i] = b.derived.period;
  }
  const resonant = new Uint8Array(legs);
  const lo = new Float64Array(legs);
  const hi = new Float64Array(legs);
  if (req.legTof !== undefined && (!Array.isArray(req.legTof) || req.legTof.length !== legs)) {
    throw new InputError('legTof', `must give ${legs} [min, max] pairs (one per leg)`, req.legTof);
  }
  for (let k = 0; k < legs; k++) {
    resonant[k] = idx[k] === idx[k + 1] ? 1 : 0;
    if (req.legTof) {
      const [a, b] = req.legTof[k];
      if (!(a > 0 && b >= a && b < Infinity)) throw new InputError(`legTof[${k}]`, 'must be [min, max] with 0 < min ≤ max', req.legTof[k]);
      lo[k] = a;
      hi[k] = b;
    } else if (resonant[k]) {
      lo[k] = period[k];
      hi[k] = 3 * period[k];
    } else {
      const a1 = system.bodies[idx[k]].elements?.a ?? 0;
      const a2 = system.bodies[idx[k + 1]].elements?.a ?? 0;
      const th = Math.PI * Math.sqrt(((a1 + a2) / 2) ** 3 / mu);
      lo[k] = 0.4 * th;
      hi[k] = 2 * th;
    }
  }
  const first = system.bodies[idx[0]];
  const last = system.bodies[idx[legs]];
  const rPark = first.radius + req.departAltitude;
  const capture = req.arriveE !== null && req.arriveE < 1;
  const rArrive = last.radius + req.arriveAltitude;
  return {
    system,
    ids: ids.slice(),
    idx,
    mu,
    bodyMu,
    rpMin,
    radius,
    period,
    legs,
    resonant,
    lo,
    hi,
    rPark,
    vPark: orbitPeriapsisSpeed(first.mu, rPark, 0),
    capture,
    rArrive,
    vTarget: capture ? orbitPeriapsisSpeed(last.mu, rArrive, req.arriveE as number) : 0,
    powered: req.powered !== false,
  };
}

function steps(field: string, v: number | undefined, dflt: number): number {
  const s = v ?? dflt;
  if (!Number.isInteger(s) || s < 2 || s > MAX_STEPS) throw new InputError(field, `must be an integer in [2, ${MAX_STEPS}]`, s);
  return s;
}

const gridValue = (lo: number, hi: number, n: number, i: number): number => (n === 1 ? lo : lo + ((hi - lo) * i) / (n - 1));

/** Spelled-out solution for the times x (allocates; call after the search). */
function describe(c: Chain, x: number[]): SequenceSolution | null {
  const total = chainCost(c, x);
  if (!(total < Infinity)) return null;
  const legs: SequenceLeg[] = [];
  let t = x[0];
  for (let k = 0; k < c.legs; k++) {
    const o = 3 * k;
    legs.push({
      from: c.ids[k],
      to: c.ids[k + 1],
      depart: t,
      arrive: t + x[k + 1],
      tof: x[k + 1],
      vInfDepart: Math.hypot(VDEP[o], VDEP[o + 1], VDEP[o + 2]),
      vInfArrive: Math.hypot(VARR[o], VARR[o + 1], VARR[o + 2]),
    });
    t += x[k + 1];
  }
  const flybys: SequenceFlyby[] = [];
  let dvFlybys = 0;
  for (let j = 1; j < c.legs; j++) {
    const vin = [VARR[3 * j - 3], VARR[3 * j - 2], VARR[3 * j - 1]];
    const vout = [VDEP[3 * j], VDEP[3 * j + 1], VDEP[3 * j + 2]];
    const f = c.powered ? poweredFlyby(c.bodyMu[j], vin, vout, c.rpMin[j]) : unpoweredFlybyMatch(c.bodyMu[j], vin, vout, c.rpMin[j]);
    dvFlybys += f.dvTotal;
    flybys.push({
      body: c.ids[j],
      t: legs[j].depart,
      vInfIn: Math.hypot(vin[0], vin[1], vin[2]),
      vInfOut: Math.hypot(vout[0], vout[1], vout[2]),
      periapsisAltitude: f.rp - c.radius[j],
      bAngle: f.bAngle,
      turn: f.turn,
      dv: f.dvTotal,
      limited: f.limited,
      freeDv: f.freeDv,
      dvPeriapsis: f.dvPeriapsis,
      dvExtra: f.dvExtra,
    });
  }
  const dvDepart = departDv(c);
  const dvCapture = captureDv(c);
  return { depart: x[0], arrive: t, legs, flybys, dvDepart, dvFlybys, dvCapture, dvTotal: dvDepart + dvFlybys + dvCapture };
}

/** Best direct transfer first → last over the departures (grid then simplex), or null when first = last. */
function bestDirect(system: StarSystem, c: Chain, req: SequenceRequest, nDep: number, nTof: number): SequenceResult['direct'] {
  if (c.idx[0] === c.idx[c.legs]) return null;
  const direct = prepareChain(system, {
    ...req,
    bodies: [c.ids[0], c.ids[c.legs]],
    legTof: undefined,
  });
  let best = Infinity;
  const x = [0, 0];
  const bx = [0, 0];
  for (let i = 0; i < nDep; i++) {
    x[0] = gridValue(req.departFrom, req.departTo, nDep, i);
    for (let j = 0; j < nTof; j++) {
      x[1] = gridValue(direct.lo[0], direct.hi[0], nTof, j);
      const v = chainCost(direct, x);
      if (v < best) {
        best = v;
        bx[0] = x[0];
        bx[1] = x[1];
      }
    }
  }
  if (!(best < Infinity)) return null;
  const r = refine(direct, bx, req, nDep, nTof);
  return { depart: r.x[0], arrive: r.x[0] + r.x[1], dvTotal: r.fx };
}

// The grid cell being solved: [departure, first-leg time of flight, total Δv (out)].
const GRID = new Float64Array(3);

/**
 * One grid cell (departure GRID[0], first-leg time GRID[1]): leg 0, then each later leg's time
 * scanned on its 1-D grid keeping the cheapest flyby there (plus capture on the last leg), the
 * chosen times into `later` at cell·(legs − 1). Total into GRID[2]; false when some leg has no
 * solution. Allocates nothing of its own (numbers pass through GRID, TT and RES).
 */
function gridCell(c: Chain, nTof: number, later: Float64Array, cell: number): boolean {
  counters.evaluations++;
  const legs = c.legs;
  const t0 = GRID[0];
  const tof1 = GRID[1];
  if (!solveLeg(c, 0, t0, tof1)) return false;
  departDvAt(c);
  let total = RES[0];
  if (legs === 1) {
    captureDvAt(c);
    total += RES[0];
  }
  let t = t0 + tof1;
  for (let k = 1; k < legs; k++) {
    let bestK = Infinity;
    let bestTof = 0;
    const lo = c.lo[k];
    const span = c.hi[k] - lo;
    for (let m = 0; m < nTof; m++) {
      const tof = lo + (span * m) / (nTof - 1);
      if (!solveLeg(c, k, t, tof)) continue;
      flybyDvAt(c, k);
      let v = RES[0];
      if (k === legs - 1) {
        captureDvAt(c);
        v += RES[0];
      }
      if (v < bestK) {
        bestK = v;
        bestTof = tof;
      }
    }
    if (!(bestK < Infinity)) return false;
    // leave the chosen leg's v∞ in VDEP/VARR for the next leg's flyby (resonant legs read VARR)
    solveLeg(c, k, t, bestTof);
    later[cell * (legs - 1) + k - 1] = bestTof;
    total += bestK;
    t += bestTof;
  }
  GRID[2] = total;
  return total < Infinity;
}

function refine(c: Chain, x0: number[], req: SequenceRequest, nDep: number, nTof: number): { x: number[]; fx: number } {
  const dim = c.legs + 1;
  const lower = [req.departFrom];
  const upper = [req.departTo];
  const step = [(req.departTo - req.departFrom) / Math.max(1, nDep - 1)];
  for (let k = 0; k < c.legs; k++) {
    lower.push(c.lo[k]);
    upper.push(c.hi[k]);
    step.push((c.hi[k] - c.lo[k]) / Math.max(1, nTof - 1));
  }
  // a zero-width range keeps that coordinate fixed
  for (let k = 0; k < dim; k++) if (!(step[k] > 0)) step[k] = 0;
  try {
    const r = nelderMead((x) => chainCost(c, x), x0, step, { lower, upper, fTol: 1e-3, xTol: 1e-5, maxEvaluations: 150 * dim });
    const f0 = chainCost(c, x0);
    return r.fx <= f0 ? { x: r.x, fx: r.fx } : { x: x0.slice(), fx: f0 };
  } catch {
    return { x: x0.slice(), fx: chainCost(c, x0) };
  }
}

/** Solutions costing more than this many times the best found are not listed (edge-of-range minima far above the best). */
export const SEQUENCE_KEEP_FACTOR = 2;

/**
 * Multi-leg sequence search: the best `keep` distinct solutions for the body sequence over the
 * departure range, with the best direct first → last transfer for comparison. See the header
 * for the method. onProgress receives the fraction of the grid done.
 */
export function searchSequence(system: StarSystem, req: SequenceRequest, onProgress?: (fraction: number) => void): SequenceResult {
  const c = prepareChain(system, req);
  const nDep = req.departTo > req.departFrom ? steps('departSteps', req.departSteps, DEFAULT_DEPART_STEPS) : 1;
  const nTof = steps('tofSteps', req.tofSteps, DEFAULT_TOF_STEPS);
  const keep = req.keep ?? 5;
  if (!Number.isInteger(keep) || keep < 1 || keep > 100) throw new InputError('keep', 'must be an integer in [1, 100]', keep);
  counters.lambert = 0;
  counters.evaluations = 0;

  // Grid: cell (i, j) = departure i × first-leg tof j; later legs' tofs chosen per cell.
  const cells = nDep * nTof;
  const cost = new Float64Array(cells).fill(Infinity);
  const later = new Float64Array(cells * Math.max(1, c.legs - 1));
  const legs = c.legs;
  for (let i = 0; i < nDep; i++) {
    GRID[0] = gridValue(req.departFrom, req.departTo, nDep, i);
    for (let j = 0; j < nTof; j++) {
      GRID[1] = gridValue(c.lo[0], c.hi[0], nTof, j);
      if (gridCell(c, nTof, later, i * nTof + j)) cost[i * nTof + j] = GRID[2];
    }
    if (onProgress) onProgress((0.8 * (i + 1)) / nDep);
  }

  // Local minima of the grid (each ≤ its 8 neighbours), cheapest first.
  const minima: number[] = [];
  for (let i = 0; i < nDep; i++) {
    for (let j = 0; j < nTof; j++) {
      const v = cost[i * nTof + j];
      if (!(v < Infinity)) continue;
      let isMin = true;
      for (let di = -1; di <= 1 && isMin; di++) {
        for (let dj = -1; dj <= 1; dj++) {
          const a = i + di;
          const b = j + dj;
          if ((di === 0 && dj === 0) || a < 0 || a >= nDep || b < 0 || b >= nTof) continue;
          if (cost[a * nTof + b] < v) {
            isMin = false;
            break;
          }
        }
      }
      if (isMin) minima.push(i * nTof + j);
    }
  }
  minima.sort((a, b) => cost[a] - cost[b]);
  const nRefine = Math.min(minima.length, Math.max(2 * keep, 8));
  const refined: { x: number[]; fx: number }[] = [];
  for (let r = 0; r < nRefine; r++) {
    const cell = minima[r];
    const i = Math.floor(cell / nTof);
    const j = cell % nTof;
    const x0 = [gridValue(req.departFrom, req.departTo, nDep, i), gridValue(c.lo[0], c.hi[0], nTof, j)];
    for (let k = 1; k < legs; k++) x0.push(later[cell * (legs - 1) + k - 1]);
    refined.push(refine(c, x0, req, nDep, nTof));
    if (onProgress) onProgress(0.8 + (0.15 * (r + 1)) / nRefine);
  }
  refined.sort((a, b) => a.fx - b.fx);

  // Distinct: another solution counts when some time differs by more than half a grid step.
  const tol = [(0.5 * (req.departTo - req.departFrom)) / Math.max(1, nDep - 1)];
  for (let k = 0; k < legs; k++) tol.push((0.5 * (c.hi[k] - c.lo[k])) / Math.max(1, nTof - 1));
  const chosen: number[][] = [];
  const solutions: SequenceSolution[] = [];
  for (const r of refined) {
    if (solutions.length >= keep) break;
    if (!(r.fx < Infinity)) continue;
    // a local minimum at the edge of the ranges costing several times the best is no option a designer weighs
    if (refined.length > 0 && r.fx > SEQUENCE_KEEP_FACTOR * refined[0].fx) break;
    const same = chosen.some((x) => x.every((v, k) => Math.abs(v - r.x[k]) <= tol[k]));
    if (same) continue;
    const s = describe(c, r.x);
    if (s === null) continue;
    chosen.push(r.x);
    solutions.push(s);
  }
  const direct = bestDirect(system, c, req, nDep, nTof);
  if (onProgress) onProgress(1);
  return { solutions, lambertSolves: counters.lambert, evaluations: counters.evaluations, method: SEQUENCE_METHOD, direct };
}
