/**
 * One patched-conic transfer between two bodies for a departure time and a time of flight:
 * the Lambert arc about the central body, the departure burn from a parking orbit and the
 * capture burn into a target orbit (or a flyby). The porkchop grid and the window refinement
 * both evaluate transfers through this file, so a grid cell and a refined window agree.
 *
 * Method: Lambert arc by Izzo's method (core/orbit/lambert.ts); departure and capture burns
 * tangential at periapsis of the hyperbola, v_p = √(v∞² + 2μ/r_p), Δv = v_p − v_orbit
 * (Curtis, Orbital Mechanics for Engineering Students, §8.7–8.9), by the scalar,
 * allocation-free kernels of core/orbit/hyperbolic.ts that its departure() and arrival() use.
 *
 * Geometries (`TransferSetup.kind`)
 * - SIBLINGS: both bodies orbit the same parent (two planets of the star, or two moons of a
 *   planet). The arc runs about the parent with the parent's μ, from the departure body's
 *   centre to the arrival body's centre; v∞ = arc velocity − body velocity at each end.
 * - FROM_PARENT: a planet to one of its moons, inside the planet's sphere of influence. The arc
 *   runs about the planet with the planet's μ, from a point of the parking orbit to the moon's
 *   centre. The departure point is taken opposite the moon's arrival position (r1 = −r_park·r̂2,
 *   a 180° transfer — the Hohmann geometry), with the parking orbit in the transfer plane and
 *   in the same sense; the burn is |v1 − v_park|, C3 = v1² − 2μ/r_park (negative for a bound
 *   arc), v∞ departure = √max(0, C3). This assumes the parking orbit's phase can be chosen
 *   freely (any revolution of it), so for a circular moon orbit the cost depends only on the
 *   time of flight, not on the departure time.
 * - TO_PARENT: a moon to its planet, the mirror image: the arc ends on the target orbit opposite
 *   the moon's departure position (r2 = −r_target·r̂1); the capture burn is |v2 − v_target|
 *   (0 for a flyby), v∞ arrival = √max(0, v2² − 2μ/r_target).
 *
 * Conventions: velocities m/s, C3 m²/s²; all burns are positive magnitudes. A transfer that
 * cannot be solved (Lambert failure, coincident points, tof ≤ 0, non-finite result) is
 * "unsolved": every value is +Infinity and revs/branch are −1 — never NaN.
 */
import { InputError } from '../math/index.ts';
import { hyperbolaPeriapsisSpeed, lambertBest, lambertCodeRevs, lambertSingleRev, orbitPeriapsisSpeed } from '../orbit/index.ts';
import { conicState } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { PorkchopPlanes } from './planes.ts';
import { axisValue, normalizeRequest, type PorkchopMetric, type PorkchopRequest } from './request.ts';

export const SIBLINGS = 0;
export const FROM_PARENT = 1;
export const TO_PARENT = 2;

/** Metric codes used in the hot loop. */
export const METRIC_CODE: Readonly<Record<PorkchopMetric, number>> = { total: 0, departure: 1, arrival: 2, c3: 3 };

/** Everything a cell evaluation needs, resolved once per request. */
export interface TransferSetup {
  kind: typeof SIBLINGS | typeof FROM_PARENT | typeof TO_PARENT;
  /** Index of the body the arc runs about. */
  central: number;
  /** μ of the central body (the arc's μ), m³/s². */
  mu: number;
  from: number;
  to: number;
  /** μ of the departure body (the central body's for FROM_PARENT). */
  muFrom: number;
  /** Parking-orbit periapsis radius, m. */
  rPark: number;
  /** Parking-orbit speed at periapsis √(μ(1+e)/r_p), m/s. */
  vPark: number;
  /** μ of the arrival body (the central body's for TO_PARENT). */
  muTo: number;
  /** Arrival periapsis radius, m. */
  rArrive: number;
  /** Target-orbit speed at periapsis, m/s (unused for a flyby). */
  vTarget: number;
  flyby: boolean;
  maxRevs: number;
  retrograde: boolean;
  metric: number;
  /** The request with defaults filled in. */
  request: Required<PorkchopRequest>;
}

/** Resolves the bodies and orbits of a request; InputError when the pair or an orbit is unusable. */
export function prepareTransfer(system: StarSystem, request: PorkchopRequest): TransferSetup {
  const req = normalizeRequest(request);
  const n = system.bodies.length;
  for (const f of ['from', 'to'] as const) {
    if (req[f] >= n) throw new InputError(f, `must be a body index below ${n}`, req[f]);
    if (req[f] === 0) throw new InputError(f, 'must name a body with an orbit (not the star)', system.bodies[0].id);
  }
  if (req.from === req.to) throw new InputError('to', 'must differ from the departure body', system.bodies[req.to].id);
  const a = system.bodies[req.from];
  const b = system.bodies[req.to];
  let kind: TransferSetup['kind'];
  let central: number;
  if (a.parentIndex === b.parentIndex) {
    kind = SIBLINGS;
    central = a.parentIndex;
  } else if (b.parentIndex === a.index) {
    kind = FROM_PARENT;
    central = a.index;
  } else if (a.parentIndex === b.index) {
    kind = TO_PARENT;
    central = b.index;
  } else {
    throw new InputError('to', `must orbit the same body as ${a.id}, or be ${a.id}'s parent or moon`, b.id);
  }
  const mu = system.bodies[central].mu;
  const rPark = a.radius + req.parkingAltitude;
  const rArrive = b.radius + req.arrivalAltitude;
  const flyby = req.arrivalEccentricity === 'flyby';
  const eArr = flyby ? 0 : (req.arrivalEccentricity as number);
  return {
    kind,
    central,
    mu,
    from: req.from,
    to: req.to,
    muFrom: a.mu,
    rPark,
    vPark: orbitPeriapsisSpeed(a.mu, rPark, req.parkingEccentricity),
    muTo: b.mu,
    rArrive,
    vTarget: flyby ? 0 : orbitPeriapsisSpeed(b.mu, rArrive, eArr),
    flyby,
    maxRevs: req.maxRevs,
    retrograde: req.retrograde,
    metric: METRIC_CODE[req.metric],
    request: req,
  };
}

// ---------------------------------------------------------------------------------------------
// Allocation-free cell evaluation (module scratch).

/** Offsets into the result of the last cell solve (`lastCell`). */
export const CELL_DV_DEPART = 0;
export const CELL_DV_ARRIVE = 1;
export const CELL_DV_TOTAL = 2;
export const CELL_C3 = 3;
export const CELL_VINF_DEPART = 4;
export const CELL_VINF_ARRIVE = 5;
export const CELL_REVS = 6;
export const CELL_BRANCH = 7;
export const CELL_METRIC = 8;

/** Result of the last `solveCell`: the CELL_* slots above. */
export const lastCell = new Float64Array(9);

const R1 = new Float64Array(3);
const R2 = new Float64Array(3);
const VF = new Float64Array(3);
const VT = new Float64Array(3);
const V1 = new Float64Array(3);
const V2 = new Float64Array(3);
let current: TransferSetup | null = null;

function unsolved(): false {
  lastCell.fill(Infinity);
  lastCell[CELL_REVS] = -1;
  lastCell[CELL_BRANCH] = -1;
  return false;
}

/**
 * |v − v_orbit| at the point r (|r| = rOrbit) of an arc with velocity v: v_orbit is the speed
 * vOrbit along ĥ × r̂, h = r × v, i.e. an orbit through r in the arc's plane and sense, at its
 * periapsis there.
 */
function burnFromOrbitInPlane(r: Float64Array, vx: number, vy: number, vz: number, vOrbit: number, rOrbit: number): number {
  const hx = r[1] * vz - r[2] * vy;
  const hy = r[2] * vx - r[0] * vz;
  const hz = r[0] * vy - r[1] * vx;
  const k = vOrbit / (Math.sqrt(hx * hx + hy * hy + hz * hz) * rOrbit);
  const px = (hy * r[2] - hz * r[1]) * k;
  const py = (hz * r[0] - hx * r[2]) * k;
  const pz = (hx * r[1] - hy * r[0]) * k;
  return Math.sqrt((vx - px) * (vx - px) + (vy - py) * (vy - py) + (vz - pz) * (vz - pz));
}

// Fills lastCell from the arc's terminal velocities v1, v2 (read from arrays: a call with six
// number arguments would box them per cell); returns whether every value is finite (a boolean,
// not the metric: a number returned by a call that is not inlined is boxed per cell).
function finish(s: TransferSetup, v1: Float64Array, v2: Float64Array): boolean {
  const v1x = v1[0];
  const v1y = v1[1];
  const v1z = v1[2];
  const v2x = v2[0];
  const v2y = v2[1];
  const v2z = v2[2];
  let dvD: number;
  let c3: number;
  let vInfD: number;
  if (s.kind === FROM_PARENT) {
    // burn from the parking orbit at r1, in the arc's plane and sense
    dvD = burnFromOrbitInPlane(R1, v1x, v1y, v1z, s.vPark, s.rPark);
    c3 = v1x * v1x + v1y * v1y + v1z * v1z - (2 * s.mu) / s.rPark;
    vInfD = c3 > 0 ? Math.sqrt(c3) : 0;
  } else {
    const dx = v1x - VF[0];
    const dy = v1y - VF[1];
    const dz = v1z - VF[2];
    c3 = dx * dx + dy * dy + dz * dz;
    vInfD = Math.sqrt(c3);
    dvD = hyperbolaPeriapsisSpeed(s.muFrom, c3, s.rPark) - s.vPark;
  }
  let dvA: number;
  let vInfA: number;
  if (s.kind === TO_PARENT) {
    const e2 = v2x * v2x + v2y * v2y + v2z * v2z - (2 * s.mu) / s.rArrive;
    vInfA = e2 > 0 ? Math.sqrt(e2) : 0;
    dvA = s.flyby ? 0 : burnFromOrbitInPlane(R2, v2x, v2y, v2z, s.vTarget, s.rArrive);
  } else {
    const dx = v2x - VT[0];
    const dy = v2y - VT[1];
    const dz = v2z - VT[2];
    const w2 = dx * dx + dy * dy + dz * dz;
    vInfA = Math.sqrt(w2);
    dvA = s.flyby ? 0 : hyperbolaPeriapsisSpeed(s.muTo, w2, s.rArrive) - s.vTarget;
  }
  const total = dvD + dvA;
  const m = s.metric === 0 ? total : s.metric === 1 ? dvD : s.metric === 2 ? dvA : c3;
  lastCell[CELL_DV_DEPART] = dvD;
  lastCell[CELL_DV_ARRIVE] = dvA;
  lastCell[CELL_DV_TOTAL] = total;
  lastCell[CELL_C3] = c3;
  lastCell[CELL_VINF_DEPART] = vInfD;
  lastCell[CELL_VINF_ARRIVE] = vInfA;
  lastCell[CELL_METRIC] = m;
  // one test catches NaN and ±Infinity in any slot
  return Math.abs(total + c3 + vInfD + vInfA) < Infinity && !Number.isNaN(m);
}

const CV1 = new Float64Array(3);
const CV2 = new Float64Array(3);
const cost = (v1x: number, v1y: number, v1z: number, v2x: number, v2y: number, v2z: number): number => {
  CV1[0] = v1x;
  CV1[1] = v1y;
  CV1[2] = v1z;
  CV2[0] = v2x;
  CV2[1] = v2y;
  CV2[2] = v2z;
  return finish(current as TransferSetup, CV1, CV2) ? lastCell[CELL_METRIC] : Infinity;
};

/**
 * Solves one cell into `lastCell` from the departure body's state `dep6` and the arrival
 * body's state `arr6` (each relative to the central body; the central body's own end is
 * ignored) and the time of flight. Returns false (and an unsolved cell) when there is no
 * usable transfer. Allocates nothing.
 */
export function solveCell(s: TransferSetup, dep6: Float64Array, arr6: Float64Array, tof: number): boolean {
  // small enough to be inlined into the grid's loop, so tof reaches TOF unboxed
  TOF[0] = tof;
  return solveCellAt(s, dep6, arr6);
}

// The time of flight of the cell being solved (see solveCell).
const TOF = new Float64Array(1);

function solveCellAt(s: TransferSetup, dep6: Float64Array, arr6: Float64Array): boolean {
  const tof = TOF[0];
  if (!(tof > 0)) return unsolved();
  if (s.kind !== FROM_PARENT) {
    R1[0] = dep6[0];
    R1[1] = dep6[1];
    R1[2] = dep6[2];
    VF[0] = dep6[3];
    VF[1] = dep6[4];
    VF[2] = dep6[5];
  }
  if (s.kind !== TO_PARENT) {
    R2[0] = arr6[0];
    R2[1] = arr6[1];
    R2[2] = arr6[2];
    VT[0] = arr6[3];
    VT[1] = arr6[4];
    VT[2] = arr6[5];
  }
  if (s.kind === FROM_PARENT) {
    const k = -s.rPark / Math.sqrt(R2[0] * R2[0] + R2[1] * R2[1] + R2[2] * R2[2]);
    R1[0] = R2[0] * k;
    R1[1] = R2[1] * k;
    R1[2] = R2[2] * k;
  } else if (s.kind === TO_PARENT) {
    const k = -s.rArrive / Math.sqrt(R1[0] * R1[0] + R1[1] * R1[1] + R1[2] * R1[2]);
    R2[0] = R1[0] * k;
    R2[1] = R1[1] * k;
    R2[2] = R1[2] * k;
  }
  if (s.maxRevs === 0) {
    if (lambertSingleRev(s.mu, R1[0], R1[1], R1[2], R2[0], R2[1], R2[2], tof, s.retrograde, V1, V2) < 0) return unsolved();
    if (!finish(s, V1, V2)) return unsolved();
    lastCell[CELL_REVS] = 0;
    lastCell[CELL_BRANCH] = 0;
    return true;
  }
  current = s;
  const code = lambertBest(s.mu, R1, R2, tof, s.maxRevs, s.retrograde, cost, V1, V2);
  current = null;
  if (code < 0) return unsolved();
  if (!finish(s, V1, V2)) return unsolved();
  lastCell[CELL_REVS] = lambertCodeRevs(code);
  lastCell[CELL_BRANCH] = code === 0 ? 0 : code % 2 === 1 ? 1 : 2;
  return true;
}

const DEP6 = new Float64Array(6);
const ARR6 = new Float64Array(6);

/**
 * One row of a grid of SIBLINGS single-revolution cells (setup kind SIBLINGS, maxRevs 0), the
 * porkchop's common case: solveCell's work for that geometry written out in one loop — Lambert
 * arc, then finish's SIBLINGS branch with the same operations in the same order, so the same
 * bits — storing each cell straight into `out` at planeIndex, planeIndex + 1, ... . It leaves
 * out the per-cell calls, copies and lastCell round trip of solveCell, which cost a grid about a
 * tenth of its time.
 *
 * `dep6` is the departure body's state at tDep. Arrival states come from `arrCache` (6 numbers
 * per column, arrival-time mode: tof = column value − tDep) or, when it is null, from the
 * ephemeris per cell (time-of-flight mode: arrival at tDep + column value). Returns the number
 * of unsolved cells written. Allocates nothing.
 */
export function solveSiblingRow(
  system: StarSystem,
  s: TransferSetup,
  tDep: number,
  dep6: Float64Array,
  arrCache: Float64Array | null,
  out: PorkchopPlanes,
  planeIndex: number,
): number {
  const second = s.request.second;
  const nCols = second.n;
  const ephemeris = system.ephemeris;
  const mu = s.mu;
  const retrograde = s.retrograde;
  // 2μ/r_p of the two periapsis speeds (hyperbolaPeriapsisSpeed's operations)
  const twoMuFromRp = (2 * s.muFrom) / s.rPark;
  const twoMuToRp = (2 * s.muTo) / s.rArrive;
  const vPark = s.vPark;
  const vTarget = s.vTarget;
  const flyby = s.flyby;
  const r1x = dep6[0];
  const r1y = dep6[1];
  const r1z = dep6[2];
  const vfx = dep6[3];
  const vfy = dep6[4];
  const vfz = dep6[5];
  const { dvDepart, dvArrive, dvTotal, c3, vInfDepart, vInfArrive, revs, branch } = out;
  let bad = 0;
  let idx = planeIndex;
  for (let j = 0; j < nCols; j++, idx++) {
    let tof: number;
    if (arrCache !== null) {
      tof = axisValue(second, j) - tDep;
      for (let c = 0; c < 6; c++) ARR6[c] = arrCache[6 * j + c];
    } else {
      tof = axisValue(second, j);
      // stateAboutCentral's work, written here so that the call is inlined (t not boxed)
      const t = tDep + tof;
      if (!(Math.abs(t) < Infinity)) throw new InputError('t', 'must be a finite number', t);
      conicState(ephemeris, s.to, t, ARR6);
    }
    let ok = tof > 0 && lambertSingleRev(mu, r1x, r1y, r1z, ARR6[0], ARR6[1], ARR6[2], tof, retrograde, V1, V2) >= 0;
    if (ok) {
      let dx = V1[0] - vfx;
      let dy = V1[1] - vfy;
      let dz = V1[2] - vfz;
      const c3v = dx * dx + dy * dy + dz * dz;
      const vInfD = Math.sqrt(c3v);
      const dvD = Math.sqrt(c3v + twoMuFromRp) - vPark;
      dx = V2[0] - ARR6[3];
      dy = V2[1] - ARR6[4];
      dz = V2[2] - ARR6[5];
      const w2 = dx * dx + dy * dy + dz * dz;
      const vInfA = Math.sqrt(w2);
      const dvA = flyby ? 0 : Math.sqrt(w2 + twoMuToRp) - vTarget;
      const total = dvD + dvA;
      // finish's test: one sum catches NaN and ±Infinity in any value
      ok = Math.abs(total + c3v + vInfD + vInfA) < Infinity;
      if (ok) {
        dvDepart[idx] = dvD;
        dvArrive[idx] = dvA;
        dvTotal[idx] = total;
        c3[idx] = c3v;
        vInfDepart[idx] = vInfD;
        vInfArrive[idx] = vInfA;
        revs[idx] = 0;
        branch[idx] = 0;
      }
    }
    if (!ok) {
      bad++;
      dvDepart[idx] = Infinity;
      dvArrive[idx] = Infinity;
      dvTotal[idx] = Infinity;
      c3[idx] = Infinity;
      vInfDepart[idx] = Infinity;
      vInfArrive[idx] = Infinity;
      revs[idx] = -1;
      branch[idx] = -1;
    }
  }
  return bad;
}

/**
 * State of body `index` (the setup's departure or arrival body) relative to the setup's central
 * body at time t into out6 (zeros for the central body itself). InputError for a non-finite t.
 */
export function stateAboutCentral(system: StarSystem, s: TransferSetup, index: number, t: number, out6: Float64Array): Float64Array {
  if (!(Math.abs(t) < Infinity)) throw new InputError('t', 'must be a finite number', t);
  if (index === s.central) {
    out6.fill(0);
    return out6;
  }
  // the setup's other body orbits the central one (prepareTransfer): one conic, no chain
  conicState(system.ephemeris, index, t, out6);
  return out6;
}

/**
 * Metric of the transfer leaving at tDepart with time of flight tof (Infinity when unsolved);
 * leaves the whole cell in `lastCell`. Allocation-free; used by the window refinement.
 */
export function transferMetric(system: StarSystem, s: TransferSetup, tDepart: number, tof: number): number {
  if (!(tof > 0) || !Number.isFinite(tDepart) || !Number.isFinite(tof)) {
    unsolved();
    return Infinity;
  }
  stateAboutCentral(system, s, s.from, tDepart, DEP6);
  stateAboutCentral(system, s, s.to, tDepart + tof, ARR6);
  return solveCell(s, DEP6, ARR6, tof) ? lastCell[CELL_METRIC] : Infinity;
}

/** One transfer, spelled out (SI). Unsolved transfers carry Infinity and revs = branch = −1. */
export interface TransferCell {
  /** Departure time, s from the epoch. */
  departure: number;
  /** Arrival time, s from the epoch. */
  arrival: number;
  /** Time of flight, s. */
  tof: number;
  /** Departure burn, m/s. */
  dvDepart: number;
  /** Capture burn, m/s (0 for a flyby). */
  dvArrive: number;
  /** dvDepart + dvArrive, m/s. */
  dvTotal: number;
  /** Characteristic energy at departure, m²/s². */
  c3: number;
  /** Excess speed at departure, m/s. */
  vInfDepart: number;
  /** Excess speed at arrival, m/s. */
  vInfArrive: number;
  /** Complete revolutions on the arc (−1 unsolved). */
  revs: number;
  /** 'single', 'left', 'right' (Izzo's branches), or 'none' when unsolved. */
  branch: 'single' | 'left' | 'right' | 'none';
  /** Value of the setup's metric. */
  metric: number;
  solved: boolean;
}

const BRANCH_NAMES = ['single', 'left', 'right'] as const;

/** The whole transfer leaving at tDepart with time of flight tof, as a plain object (allocates). */
export function evaluateTransfer(system: StarSystem, s: TransferSetup, tDepart: number, tof: number): TransferCell {
  const m = transferMetric(system, s, tDepart, tof);
  const solved = m < Infinity;
  return {
    departure: tDepart,
    arrival: tDepart + tof,
    tof,
    dvDepart: lastCell[CELL_DV_DEPART],
    dvArrive: lastCell[CELL_DV_ARRIVE],
    dvTotal: lastCell[CELL_DV_TOTAL],
    c3: lastCell[CELL_C3],
    vInfDepart: lastCell[CELL_VINF_DEPART],
    vInfArrive: lastCell[CELL_VINF_ARRIVE],
    revs: lastCell[CELL_REVS],
    branch: solved ? BRANCH_NAMES[lastCell[CELL_BRANCH]] : 'none',
    metric: solved ? m : Infinity,
    solved,
  };
}
