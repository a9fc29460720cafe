/**
 * The Δv map of a whole system: for every body its surface, low orbit and sphere-of-influence
 * edge as nodes, and the Δv of every move between them as directed edges, plus the transfers
 * between sibling bodies and between a planet and its moons. A graph the diagram, the table and
 * `waymark map` read; `mapPath` finds the cheapest way between two nodes (Dijkstra).
 *
 * Methods (each edge's `how` says which, with its inputs):
 * - surface ⇄ low orbit: the rule of thumb of ascent.ts (stated there and in `rules`);
 * - low orbit → SOI edge (escape): the burn from the circular speed at r_low to the periapsis
 *   speed of the ellipse r_low × r_SOI (vis-viva; Curtis, Orbital Mechanics for Engineering
 *   Students, section 2.7); SOI edge → low orbit (capture) the same burn reversed. With air the
 *   capture is aerobraked (`dvAero`): passes through the air at a periapsis of half the
 *   atmosphere's height bring the apoapsis down to r_low, then one burn there raises the
 *   periapsis to r_low (vis-viva);
 * - transfers: core/search's porkchop (patched conics, Izzo's Lambert) over one synodic period
 *   of departures from the epoch (the moon's period for a planet ⇄ moon pair: its geometry
 *   repeats once per orbit of the moon) × flight times from TOF_SPAN × the pair's Hohmann time,
 *   parking and arrival orbits the low orbits, circular target orbit, metric 'total'. The best
 *   window is the grid's lowest local minimum refined by core/search findWindows (downhill
 *   simplex); the range is, over the departure rows, each row's best over flight times: their
 *   lowest (never above the best window), median and highest. With air at the arriving body,
 *   `dvAero` = the departure burn + the aerobraked capture (the air takes the arrival hyperbola
 *   to an ellipse with apoapsis at r_low; the periapsis-raise burn there as above);
 * - Hohmann estimate: circular coplanar Hohmann between the semi-major axes (core/orbit
 *   hohmann), patched to the low orbits at each end by the hyperbola's periapsis speed
 *   √(v∞² + 2μ/r) (core/orbit hyperbolaPeriapsisSpeed); for a planet ⇄ moon pair the Hohmann
 *   ellipse runs about the planet from its low orbit to the moon's orbit.
 */
import { SolverError } from '../math/index.ts';
import { hohmann, hyperbolaPeriapsisSpeed, synodicPeriod } from '../orbit/index.ts';
import { computePorkchopRows, createGrid, findWindows, FROM_PARENT, porkchopPair, SIBLINGS } from '../search/index.ts';
import type { PorkchopRequest } from '../search/index.ts';
import type { Body, StarSystem } from '../system/index.ts';
import { apoapsisBurn, ASCENT_RULES, ascentFigures, lowOrbitAltitude } from './ascent.ts';

/** A place in the system a ship can be. */
export type MapNodeKind = 'surface' | 'low-orbit' | 'soi-edge';

export interface MapNode {
  /** `${bodyId}:${kind}`, e.g. 'tessel:low-orbit'. */
  id: string;
  /** Body index in system.bodies, its id and name. */
  body: number;
  bodyId: string;
  bodyName: string;
  kind: MapNodeKind;
  /** Words for the diagram: "surface", "low orbit 100 km", "SOI edge 924 000 km". */
  label: string;
  /** Altitude above the mean radius for 'low-orbit' (m); SOI radius for 'soi-edge' (m); 0 for 'surface'. */
  altitude: number;
}

export type MapEdgeKind = 'ascent' | 'landing' | 'escape' | 'capture' | 'transfer';

/** One directed edge: the Δv to go from → to. Both directions of every link are listed. */
export interface MapEdge {
  /** `${from}>${to}`. */
  id: string;
  from: string;
  to: string;
  kind: MapEdgeKind;
  /** The edge's Δv, m/s (for a transfer: the best window's total, departure burn + capture burn, low orbit to low orbit). */
  dv: number;
  /** With aerobraking at the arriving end (capture or landing where the arriving body has air), m/s; null where there is no air to use. */
  dvAero: number | null;
  /** Transfers only (else null): the best window found over one synodic period of departures from the system's epoch. */
  window: {
    /** Departure time, s from the epoch, and time of flight, s. */
    depart: number;
    tof: number;
    /** Departure and capture burns of the best window, m/s (dv = depart + capture). */
    dvDepart: number;
    dvCapture: number;
    /** Over the synodic period: for each departure date the best total over flight times; of those, the lowest, median and highest, m/s. */
    range: { min: number; median: number; max: number };
    /** Synodic period of the pair, s. */
    synodic: number;
  } | null;
  /** Circular coplanar estimate where one applies (transfers between siblings or a parent and its moon: Hohmann between the orbits' semi-major axes, patched to the low orbits), m/s; else null. */
  hohmann: number | null;
  /** How the number was computed, in words for the hover (method, assumptions, inputs with units). */
  how: string;
}

export interface DeltaVMap {
  system: string;
  nodes: MapNode[];
  edges: MapEdge[];
  /** The rules used (ascent losses, low-orbit altitude, aerobraking), in words, for the diagram's footnote and the table. */
  rules: string[];
}

export interface DeltaVMapOptions {
  /** Porkchop samples per axis for transfers (default DEFAULT_MAP_SAMPLES). */
  samples?: number;
  onProgress?: (done: number, total: number) => void;
  signal?: { aborted: boolean };
}

/**
 * Porkchop samples per axis of a transfer (departures over one synodic period × flight times):
 * 80 puts the grid's minimum within a few per cent of the refined window on the demo, and the
 * refinement closes the rest; the whole demo map takes well under two seconds on one core.
 */
export const DEFAULT_MAP_SAMPLES = 80;
/** Flight times searched: these multiples of the pair's Hohmann flight time (common practice; brackets the single-revolution minimum of a near-circular pair). */
export const MAP_TOF_SPAN: readonly [number, number] = [0.5, 2];

const km = (m: number): string => `${groupDigits(Math.round(m / 1000))} km`;
const mps = (v: number): string => `${groupDigits(Math.round(v))} m/s`;
const days = (s: number): string => `${(s / 86400).toFixed(1)} d`;

/** 924000 → "924 000" (a space between groups of three, as the diagram writes them). */
function groupDigits(n: number): string {
  const s = String(Math.abs(n));
  const out = s.replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
  return n < 0 ? `-${out}` : out;
}

/** Circular speed at r: √(μ/r). */
function circular(mu: number, r: number): number {
  return Math.sqrt(mu / r);
}

/** Burn from the circular orbit r to the periapsis of the ellipse r × rFar (vis-viva); 0 when rFar ≤ r. */
export function escapeBurn(mu: number, r: number, rFar: number): number {
  if (!(rFar > r)) return 0;
  return Math.sqrt(mu * (2 / r - 2 / (r + rFar))) - circular(mu, r);
}

/** Periapsis-raise burn at r_low after an aerobraked capture (periapsis at half the air's height); null without air. */
function aeroCapture(b: Body): number | null {
  if (!(b.atmosphereHeight > 0)) return null;
  return apoapsisBurn(b.mu, b.radius + lowOrbitAltitude(b), b.radius + b.atmosphereHeight / 2);
}

const nodeId = (b: Body, kind: MapNodeKind): string => `${b.id}:${kind}`;

function edge(from: string, to: string, kind: MapEdgeKind, dv: number, dvAero: number | null, how: string): MapEdge {
  return { id: `${from}>${to}`, from, to, kind, dv, dvAero, window: null, hohmann: null, how };
}

/** The porkchop request of the transfer A → B as the map searches it (exported for the tests' consistency check). */
export function mapTransferRequest(
  system: StarSystem,
  from: number,
  to: number,
  samples = DEFAULT_MAP_SAMPLES,
): { request: PorkchopRequest; synodic: number; hohmannTof: number } {
  const pair = porkchopPair(system, from, to);
  const A = system.bodies[from];
  const B = system.bodies[to];
  const parkingAltitude = lowOrbitAltitude(A);
  const arrivalAltitude = lowOrbitAltitude(B);
  let synodic: number;
  let hohmannTof: number;
  if (pair.kind === SIBLINGS) {
    synodic = A.derived.period === B.derived.period ? A.derived.period : synodicPeriod(A.derived.period, B.derived.period);
    hohmannTof = hohmann(system.bodies[A.parentIndex].mu, A.elements!.a, B.elements!.a).tof;
  } else if (pair.kind === FROM_PARENT) {
    synodic = B.derived.period;
    hohmannTof = hohmann(A.mu, A.radius + parkingAltitude, B.elements!.a).tof;
  } else {
    synodic = A.derived.period;
    hohmannTof = hohmann(B.mu, A.elements!.a, B.radius + arrivalAltitude).tof;
  }
  const request: PorkchopRequest = {
    from,
    to,
    depart: { start: 0, end: synodic, n: samples },
    secondAxis: 'tof',
    second: { start: MAP_TOF_SPAN[0] * hohmannTof, end: MAP_TOF_SPAN[1] * hohmannTof, n: samples },
    parkingAltitude,
    arrivalAltitude,
    arrivalEccentricity: 0,
    metric: 'total',
  };
  return { request, synodic, hohmannTof };
}

/** Circular coplanar Hohmann estimate of the transfer A → B patched to the low orbits, m/s. */
export function hohmannEstimate(system: StarSystem, from: number, to: number): number {
  const pair = porkchopPair(system, from, to);
  const A = system.bodies[from];
  const B = system.bodies[to];
  const rA = A.radius + lowOrbitAltitude(A);
  const rB = B.radius + lowOrbitAltitude(B);
  // Burn at periapsis r of the hyperbola with excess speed v∞, from or to the circular orbit r.
  const patched = (mu: number, vInf: number, r: number): number => hyperbolaPeriapsisSpeed(mu, vInf * vInf, r) - circular(mu, r);
  if (pair.kind === SIBLINGS) {
    const h = hohmann(system.bodies[A.parentIndex].mu, A.elements!.a, B.elements!.a);
    return patched(A.mu, Math.abs(h.dv1), rA) + patched(B.mu, Math.abs(h.dv2), rB);
  }
  if (pair.kind === FROM_PARENT) {
    const h = hohmann(A.mu, rA, B.elements!.a);
    return Math.abs(h.dv1) + patched(B.mu, Math.abs(h.dv2), rB);
  }
  const h = hohmann(B.mu, A.elements!.a, rB);
  return patched(A.mu, Math.abs(h.dv1), rA) + Math.abs(h.dv2);
}

/** The ordered pairs the map links by transfers: siblings, and each planet ⇄ each of its moons. */
function transferPairs(system: StarSystem): [number, number][] {
  const out: [number, number][] = [];
  const B = system.bodies;
  for (let a = 1; a < B.length; a++) {
    for (let b = 1; b < B.length; b++) {
      if (a === b) continue;
      const A = B[a];
      const C = B[b];
      if (A.parentIndex === C.parentIndex || C.parentIndex === a || A.parentIndex === b) out.push([a, b]);
    }
  }
  return out;
}

function median(sorted: number[]): number {
  const n = sorted.length;
  return n % 2 === 1 ? sorted[(n - 1) / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
}

/** The transfer edge A → B, or null when no cell of the grid solved. */
function transferEdge(system: StarSystem, from: number, to: number, samples: number): MapEdge | null {
  const A = system.bodies[from];
  const B = system.bodies[to];
  const { request, synodic, hohmannTof } = mapTransferRequest(system, from, to, samples);
  const { grid, setup } = createGrid(system, request);
  grid.unsolved = computePorkchopRows(system, setup, 0, grid.planes.nRows, grid.planes);
  const { nRows, nCols } = grid.planes;
  const total = grid.planes.dvTotal;
  const rowBest: number[] = [];
  for (let i = 0; i < nRows; i++) {
    let m = Infinity;
    for (let k = i * nCols; k < (i + 1) * nCols; k++) if (total[k] < m) m = total[k];
    if (Number.isFinite(m)) rowBest.push(m);
  }
  if (rowBest.length === 0) return null;
  rowBest.sort((x, y) => x - y);
  const windows = findWindows(system, grid, { count: nRows, refine: true }).filter((w) => w.solved && Number.isFinite(w.dvTotal));
  if (windows.length === 0) return null;
  const best = windows.reduce((x, y) => (y.dvTotal < x.dvTotal ? y : x));
  const pair = porkchopPair(system, from, to);
  const est = hohmannEstimate(system, from, to);
  const capAero = aeroCapture(B);
  const dvAero = capAero === null ? null : best.dvDepart + capAero;
  const period =
    pair.kind === SIBLINGS
      ? `one synodic period of ${A.name} and ${B.name} (${days(synodic)})`
      : `one orbit of ${pair.kind === FROM_PARENT ? B.name : A.name} (${days(synodic)}: a planet–moon geometry repeats once per orbit of the moon)`;
  const how = [
    `Porkchop (patched conics, Lambert arcs) over ${period} of departures from the epoch × flight times ${days(request.second.start)}–${days(request.second.end)} (${MAP_TOF_SPAN[0]}–${MAP_TOF_SPAN[1]} × the Hohmann time ${days(hohmannTof)}), ${samples} × ${samples} samples, best cell refined by a downhill simplex.`,
    `From a circular low orbit of ${km(request.parkingAltitude)} at ${A.name} to a circular low orbit of ${km(request.arrivalAltitude)} at ${B.name}: departure burn ${mps(best.dvDepart)} + capture burn ${mps(best.dvArrive)}.`,
    `Range over the period: for each departure date the best over flight times.`,
    capAero === null
      ? ''
      : `Aerobraked: the best window's departure burn + ${mps(capAero)} (the air at half its ${km(B.atmosphereHeight)} height takes the arrival to an ellipse with apoapsis at the low orbit; one burn there raises the periapsis).`,
    `Hohmann estimate ${mps(est)}: circular coplanar orbits at the semi-major axes, patched to the low orbits.`,
  ]
    .filter((s) => s !== '')
    .join(' ');
  const e = edge(nodeId(A, 'low-orbit'), nodeId(B, 'low-orbit'), 'transfer', best.dvTotal, dvAero, how);
  e.window = {
    depart: best.departure,
    tof: best.tof,
    dvDepart: best.dvDepart,
    dvCapture: best.dvArrive,
    range: { min: Math.min(rowBest[0], best.dvTotal), median: median(rowBest), max: rowBest[rowBest.length - 1] },
    synodic,
  };
  e.hohmann = est;
  return e;
}

/** The Δv map of a system: see the file comment. */
export function deltaVMap(system: StarSystem, options: DeltaVMapOptions = {}): DeltaVMap {
  const samples = options.samples ?? DEFAULT_MAP_SAMPLES;
  const nodes: MapNode[] = [];
  const edges: MapEdge[] = [];
  for (const b of system.bodies.slice(1)) {
    const alt = lowOrbitAltitude(b);
    const rLow = b.radius + alt;
    const rSoi = b.derived.soiRadius;
    const low = nodeId(b, 'low-orbit');
    const soi = nodeId(b, 'soi-edge');
    const base = { body: b.index, bodyId: b.id, bodyName: b.name };
    if (b.hasSurface) {
      const f = ascentFigures(b);
      const surf = nodeId(b, 'surface');
      nodes.push({ ...base, id: surf, kind: 'surface', label: 'surface', altitude: 0 });
      const parts = `ideal two-burn climb ${mps(f.ideal)} − rotation ${mps(f.rotation)} + gravity loss ${mps(f.gravityLoss)}${f.dragLoss > 0 ? ` + drag loss ${mps(f.dragLoss)}` : ''}`;
      edges.push(edge(surf, low, 'ascent', f.total, null, `Rule of thumb, surface to a ${km(alt)} circular orbit: ${parts}.`));
      edges.push(
        edge(
          low,
          surf,
          'landing',
          f.total,
          f.aeroLanding,
          `Powered landing taken equal to the ascent (${parts}).${
            f.deorbit === null
              ? ''
              : ` Aerobraked: deorbit burn ${mps(f.deorbit)} to a periapsis at half the ${km(b.atmosphereHeight)} air + terminal allowance ${mps((f.aeroLanding as number) - f.deorbit)}.`
          }`,
        ),
      );
    }
    nodes.push({ ...base, id: low, kind: 'low-orbit', label: `low orbit ${km(alt)}`, altitude: alt });
    nodes.push({ ...base, id: soi, kind: 'soi-edge', label: `SOI edge ${km(rSoi)}`, altitude: rSoi });
    const esc = escapeBurn(b.mu, rLow, rSoi);
    const escHow = `Vis-viva: from the circular speed ${mps(circular(b.mu, rLow))} at the ${km(alt)} low orbit to the periapsis speed of the ellipse reaching the SOI radius ${km(rSoi)}.`;
    edges.push(edge(low, soi, 'escape', esc, null, escHow));
    const capAero = aeroCapture(b);
    edges.push(
      edge(
        soi,
        low,
        'capture',
        esc,
        capAero,
        `The escape burn reversed: arriving from the SOI edge with about zero excess speed, one burn at periapsis into the ${km(alt)} circular orbit.${
          capAero === null
            ? ''
            : ` Aerobraked: periapsis at half the ${km(b.atmosphereHeight)} air until the apoapsis is down to the low orbit, then ${mps(capAero)} there to raise the periapsis.`
        }`,
      ),
    );
  }
  const pairs = transferPairs(system);
  options.onProgress?.(0, pairs.length);
  for (let k = 0; k < pairs.length; k++) {
    if (options.signal?.aborted) throw new SolverError('delta-v map', 'cancelled', `cancelled after ${k} of ${pairs.length} transfers`);
    const e = transferEdge(system, pairs[k][0], pairs[k][1], samples);
    if (e !== null) edges.push(e);
    options.onProgress?.(k + 1, pairs.length);
  }
  const rules = [
    ...ASCENT_RULES,
    'Escape and capture: vis-viva between the circular low orbit and an ellipse reaching the sphere-of-influence (SOI) radius (Laplace); capture with about zero excess speed.',
    "Aerobraking (with air): passes at a periapsis of half the atmosphere's height lower the apoapsis to the low orbit; one burn there raises the periapsis (the figure marked aerobraked).",
    'Transfers: the best window of a porkchop (patched conics, Lambert arcs) over one synodic period of departures from the epoch (one orbit of the moon for a planet–moon pair), low orbit to low orbit; range: each departure date’s best over flight times, lowest–median–highest.',
    'Hohmann: circular coplanar transfer between the semi-major axes, patched to the low orbits.',
  ];
  return { system: system.name, nodes, edges, rules };
}

/** Cheapest path between two nodes along the map's edges (Dijkstra), with or without aerobraking; null when unreachable. */
export function mapPath(map: DeltaVMap, from: string, to: string, aero = false): { edges: MapEdge[]; dv: number } | null {
  const known = new Set(map.nodes.map((n) => n.id));
  if (!known.has(from) || !known.has(to)) return null;
  const out = new Map<string, MapEdge[]>();
  for (const e of map.edges) {
    const list = out.get(e.from);
    if (list) list.push(e);
    else out.set(e.from, [e]);
  }
  const dist = new Map<string, number>([[from, 0]]);
  const via = new Map<string, MapEdge>();
  const done = new Set<string>();
  // Graphs of a system are small (a few hundred nodes): a linear scan for the nearest open node.
  for (;;) {
    let u: string | null = null;
    let du = Infinity;
    for (const [n, d] of dist) {
      if (!done.has(n) && d < du) {
        du = d;
        u = n;
      }
    }
    if (u === null) return null;
    if (u === to) break;
    done.add(u);
    for (const e of out.get(u) ?? []) {
      const w = aero ? (e.dvAero ?? e.dv) : e.dv;
      const d = du + w;
      if (d < (dist.get(e.to) ?? Infinity)) {
        dist.set(e.to, d);
        via.set(e.to, e);
      }
    }
  }
  const path: MapEdge[] = [];
  for (let n = to; n !== from; ) {
    const e = via.get(n)!;
    path.unshift(e);
    n = e.from;
  }
  return { edges: path, dv: dist.get(to)! };
}
