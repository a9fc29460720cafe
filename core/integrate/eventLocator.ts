/**
 * Event location between accepted steps: detects sign changes of each event function g from
 * the start to the end of a step, refines each on the step's interpolant with Brent's method
 * (core/math/roots.ts) to |Δt| ≤ EVENT_TIME_TOL·max(1, |t|), records the hits in time order and
 * reports the first terminal one (the scheme of Hairer, Nørsett & Wanner, Solving ODEs I, 2nd
 * ed., §II.6, "dense output and event location").
 *
 * The reported time is moved, within the tolerance, to the far side of the crossing (g there is
 * zero or already has its new sign), so a solve restarted from a terminal event's state does not
 * see the same crossing again.
 *
 * Crossing rule: rising when g goes from < 0 to ≥ 0, falling from > 0 to ≤ 0. A g that is exactly
 * zero at the start of a step (a hit on the previous step end, or the initial point) does not
 * count again, so a solve restarted from a terminal event does not stop at once. Two sign changes
 * of one g inside a single step cancel and are not seen.
 *
 * Allocation-free unless a crossing is found (then one state copy per hit).
 */
import { InputError, SolverError } from '../math/index.ts';
import { brent } from '../math/index.ts';
import { evalCoefficients, evalCoefficients8 } from './dense.ts';

export interface EventSpec {
  /** Event function; an event is a zero crossing of g along the solution. Do not keep `y`. */
  g: (t: number, y: Float64Array) => number;
  /** Stop integration at the first hit. */
  terminal?: boolean;
  /** 1: only rising crossings (− → +); −1: only falling; 0 (default): both. */
  direction?: 1 | -1 | 0;
  name?: string;
}

export interface EventHit {
  /** Index of the event in the list given to the solver. */
  index: number;
  name?: string;
  t: number;
  y: Float64Array;
  /** Direction of this crossing: 1 rising, −1 falling. */
  direction: 1 | -1;
}

/** Event times are refined on the interpolant to |Δt| ≤ EVENT_TIME_TOL·max(1, |t|). */
export const EVENT_TIME_TOL = 1e-12;

/** Checks a list of event specs; throws InputError naming the field. */
export function checkEvents(events: EventSpec[] | undefined, field = 'events'): EventSpec[] {
  if (events === undefined) return [];
  if (!Array.isArray(events)) throw new InputError(field, 'must be an array of event specs', events);
  for (let i = 0; i < events.length; i++) {
    const ev = events[i];
    if (!ev || typeof ev.g !== 'function') throw new InputError(`${field}[${i}].g`, 'must be a function', ev?.g);
    const d = ev.direction ?? 0;
    if (d !== 0 && d !== 1 && d !== -1) throw new InputError(`${field}[${i}].direction`, 'must be 1, -1 or 0', d);
  }
  return events;
}

interface Candidate {
  index: number;
  t: number;
  direction: 1 | -1;
}

export class EventLocator {
  readonly hits: EventHit[] = [];
  private gPrev: Float64Array;
  private gNew: Float64Array;
  private readonly ys: Float64Array;
  private readonly candidates: Candidate[] = [];

  constructor(
    private readonly events: EventSpec[],
    private readonly n: number,
    private readonly solver: string,
  ) {
    this.gPrev = new Float64Array(events.length);
    this.gNew = new Float64Array(events.length);
    this.ys = new Float64Array(n);
  }

  get active(): boolean {
    return this.events.length > 0;
  }

  /** Evaluates every g at the starting point. */
  begin(t: number, y: Float64Array): void {
    for (let i = 0; i < this.events.length; i++) this.gPrev[i] = this.value(i, t, y);
  }

  /** Evaluates every g at the end of a step; true when some g changed sign in a wanted direction. */
  detect(tB: number, yB: Float64Array): boolean {
    let any = false;
    for (let i = 0; i < this.events.length; i++) {
      const gn = this.value(i, tB, yB);
      this.gNew[i] = gn;
      if (this.crossing(i) !== 0) any = true;
    }
    return any;
  }

  /**
   * After detect() returned true: refines the crossings of the step [tA, tA + hs] on the
   * interpolant with coefficients rc (dense.ts layout, width 5 or 8 vectors), records hits in time order up to and
   * including the first terminal one, and returns that terminal hit's time (NaN if none).
   * yB is the state at the step end (used exactly for a hit there).
   */
  locate(tA: number, hs: number, tB: number, yB: Float64Array, rc: Float64Array, width: 5 | 8 = 5): number {
    const interp = width === 8 ? evalCoefficients8 : evalCoefficients;
    const n = this.n;
    const ys = this.ys;
    const cands = this.candidates;
    cands.length = 0;
    for (let i = 0; i < this.events.length; i++) {
      const d = this.crossing(i);
      if (d === 0) continue;
      const gA = this.gPrev[i];
      const gB = this.gNew[i];
      if (gB === 0) {
        cands.push({ index: i, t: tB, direction: d });
        continue;
      }
      const g = this.events[i].g;
      // g on the interpolant; the step ends give the values the crossing was detected with.
      const gs = (s: number): number => {
        if (s === tA) return gA;
        if (s === tB) return gB;
        interp(n, rc, 0, (s - tA) / hs, ys);
        const v = g(s, ys);
        if (typeof v !== 'number' || !Number.isFinite(v)) throw this.nonFinite(i, s, v);
        return v;
      };
      const tol = EVENT_TIME_TOL * Math.max(1, Math.abs(tA), Math.abs(tB));
      cands.push({ index: i, t: pastCrossing(gs, brent(gs, tA, tB, { tol }), tB, gB, tol), direction: d });
    }
    const dir = hs >= 0 ? 1 : -1;
    cands.sort((a, b) => (a.t - b.t) * dir);
    for (const c of cands) {
      const y = new Float64Array(n);
      if (c.t === tB) y.set(yB);
      else interp(n, rc, 0, (c.t - tA) / hs, y);
      const spec = this.events[c.index];
      const hit: EventHit = { index: c.index, t: c.t, y, direction: c.direction };
      if (spec.name !== undefined) hit.name = spec.name;
      this.hits.push(hit);
      if (spec.terminal) return c.t;
    }
    return NaN;
  }

  /** Moves to the next step: the end values become the start values. */
  advance(): void {
    const t = this.gPrev;
    this.gPrev = this.gNew;
    this.gNew = t;
  }

  /** Label of event i for messages. */
  label(i: number): string {
    const name = this.events[i].name;
    return name !== undefined ? `"${name}"` : `#${i}`;
  }

  // 1 rising, −1 falling, 0 none or filtered out by the event's direction.
  private crossing(i: number): 0 | 1 | -1 {
    const gp = this.gPrev[i];
    const gn = this.gNew[i];
    const want = this.events[i].direction ?? 0;
    if (gp < 0 && gn >= 0) return want === -1 ? 0 : 1;
    if (gp > 0 && gn <= 0) return want === 1 ? 0 : -1;
    return 0;
  }

  private value(i: number, t: number, y: Float64Array): number {
    const v = this.events[i].g(t, y);
    if (typeof v !== 'number' || !Number.isFinite(v)) throw this.nonFinite(i, t, v);
    return v;
  }

  private nonFinite(i: number, t: number, v: unknown): SolverError {
    return new SolverError(this.solver, 'non-finite', `event function ${this.label(i)} returned ${String(v)} at t=${t}`, { t, event: i });
  }
}

// From a root estimate x (within tol of the crossing), the nearest point toward tB where g is zero
// or has the sign of g(tB): the far side of the crossing.
function pastCrossing(g: (s: number) => number, x: number, tB: number, gB: number, tol: number): number {
  const dir = tB >= x ? 1 : -1;
  let step = 2 * (tol + 4 * Number.EPSILON * Math.abs(x));
  for (let k = 0; k < 60; k++) {
    const v = g(x);
    if (v === 0 || v > 0 === gB > 0) return x;
    const next = x + dir * step;
    if ((next - tB) * dir >= 0) return tB;
    x = next;
    step *= 2;
  }
  return tB;
}
