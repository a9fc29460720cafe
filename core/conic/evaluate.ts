/**
 * evaluate(system, plan, options) → PlanResult: flies a plan with patched conics.
 *
 * Model: inside each sphere of influence the ship follows the two-body conic of its central body
 * (analytic Kepler arcs; Bate, Mueller & White, Fundamentals of Astrodynamics, ch. 7; Curtis,
 * Orbital Mechanics for Engineering Students, ch. 8). The ship's state is kept relative to its
 * central body. It leaves the SOI when |r| reaches the central body's SOI radius (the state is
 * re-expressed about the parent by adding the body's state relative to the parent) and enters a
 * child's SOI when its distance to that child drops below the child's SOI radius (subtracting
 * the child's state). Crossings are found as described in soiCrossing.ts.
 *
 * Plan events, in order:
 * - burn: at `t` (coasting there first) or, with t = null, at the end of the preceding event.
 *   Impulsive burns change the velocity at the instant; finite burns are integrated over their
 *   duration centred on the planned instant (finiteBurn.ts). A solved burn that fails flies a
 *   zero solved Δv (its correction `dv` still applies) and raises 'solve-failed'.
 * - coast: until a time, a duration, the next periapsis/apoapsis (optionally at a named body),
 *   an SOI change, an altitude or a node; "until" conditions are looked for on every conic flown
 *   (the first occurrence ends the coast).
 * - stage: drops the active stage.
 * - flyby: a marker; at the end the pass of its body nearest it is reported (flybyReport.ts) in
 *   `flybys` and the budget's `flybys` (free Δv beside the burns), with a 'flyby-low' warning when
 *   the periapsis is below the body's safe altitude and 'flyby-missed' when there was no pass.
 * The plan ends at the last event, or later at `plan.end`. An impact ends the flight there.
 *
 * Trajectory events: start, burn (impulsive; finite burns also burn-start/burn-end), stage,
 * soi-exit/soi-entry (for both, `central` is the body whose sphere is crossed and `body` its
 * parent, so `distance` is the SOI radius), periapsis/apoapsis passages on every coast leg (at
 * most MAX_APSIS_EVENTS per leg, not on circular orbits), node (when a coast ends there),
 * closest-approach to the target body (once, for the whole plan), atmosphere-entry (descending
 * through the central body's safe altitude; also a warning flag), impact (below the mean radius;
 * an error flag) and end.
 *
 * Budget rows follow result.ts (budget.ts sums them). Every flag of a row is also in
 * `PlanResult.flags`, with the plan-level ones (negative margin, target missed ...).
 *
 * Cost: allocation-light — per evaluation the result arrays, per segment its samples; the coast
 * search works in module scratch. With samplesPerSegment = 0 no drawing samples are made (what a
 * dispersion run wants).
 */
import { InputError, SolverError, WaymarkError, requireFinite } from '../math/index.ts';
import { propagateKepler } from '../orbit/index.ts';
import { elementsToState } from '../orbit/index.ts';
import { bodyStateRelativeToParent } from '../system/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';
import { burnToInertial, inertialToBurn } from '../plan/index.ts';
import { summarizeBudget } from '../plan/index.ts';
import { checkPlan } from '../plan/index.ts';
import { flyFiniteBurn } from './finiteBurn.ts';
import type { BurnEvent, CoastUntil, Plan } from '../plan/index.ts';
import type { BudgetRow, FlybyReport, Flag, PlanResult, TargetReport, TrajectoryEvent, TrajectoryEventKind, TrajectorySegment } from '../plan/index.ts';
import { sampleConic } from './sampleConic.ts';
import {
  CIRCULAR_E,
  MIN_EVENT_DT,
  conicInfo,
  createConicInfo,
  findSoiEntry,
  timeToApsis,
  timeToNode,
  timeToRadius,
  timeToTrueAnomaly,
  type ConicInfo,
  type EntryResult,
} from './soiCrossing.ts';
import { solveBurn } from './solveBurn.ts';
import { flybyReport, type FlybyMark } from './flybyReport.ts';
import { createBurnBook, createVehicleState, deltaVLeft, dropStage, spendBurn, type BurnBook, type VehicleState } from '../plan/index.ts';

export interface EvaluateOptions {
  /** Drawing samples per segment (default DEFAULT_SAMPLES_PER_SEGMENT; 0: none). */
  samplesPerSegment?: number;
  /** A burn longer than this fraction of the orbital period is flagged 'long-burn' (default 0.05). */
  longBurnFraction?: number;
  /** Longest flight the evaluation follows from the plan's start, s (default DEFAULT_MAX_DURATION). */
  maxDuration?: number;
}

export const DEFAULT_SAMPLES_PER_SEGMENT = 96;
export const DEFAULT_LONG_BURN_FRACTION = 0.05;
/** About 32 years. */
export const DEFAULT_MAX_DURATION = 1e9;
/** Periapsis + apoapsis events recorded per coast leg at most. */
export const MAX_APSIS_EVENTS = 8;
/** Orbits less eccentric than this get no periapsis/apoapsis events. */
export const APSIS_EVENT_MIN_E = 1e-6;

const EMPTY = new Float64Array(0);

function checkOptions(o: EvaluateOptions): { samples: number; longBurn: number; maxDuration: number } {
  if (!o || typeof o !== 'object') throw new InputError('options', 'must be an object', o);
  const samples = o.samplesPerSegment ?? DEFAULT_SAMPLES_PER_SEGMENT;
  if (!Number.isInteger(samples) || samples < 0 || samples === 1) {
    throw new InputError('options.samplesPerSegment', 'must be 0 or an integer >= 2', samples);
  }
  const longBurn = o.longBurnFraction ?? DEFAULT_LONG_BURN_FRACTION;
  requireFinite('options.longBurnFraction', longBurn);
  if (!(longBurn > 0)) throw new InputError('options.longBurnFraction', 'must be > 0', longBurn);
  const maxDuration = o.maxDuration ?? DEFAULT_MAX_DURATION;
  requireFinite('options.maxDuration', maxDuration);
  if (!(maxDuration > 0)) throw new InputError('options.maxDuration', 'must be > 0', maxDuration);
  return { samples, longBurn, maxDuration };
}

/** "12,345 km" (whole kilometres, thousands separated; toLocaleString is too slow for labels). */
function km(m: number): string {
  const k = Math.round(m / 1000);
  const digits = String(Math.abs(k));
  let out = '';
  for (let i = 0; i < digits.length; i++) {
    if (i > 0 && (digits.length - i) % 3 === 0) out += ',';
    out += digits[i];
  }
  return `${k < 0 ? '−' : ''}${out} km`;
}

/** Flies the plan (see the module comment). Throws InputError on bad plan data. */
export function evaluate(system: StarSystem, plan: Plan, options: EvaluateOptions = {}): PlanResult {
  const opts = checkOptions(options);
  checkPlan(system, plan);
  return new Flight(system, plan, opts).fly();
}

// Module scratch for the flight.
const tmp6 = new Float64Array(6);
const dvSolved = [0, 0, 0];
const dvCorr = [0, 0, 0];
const dvTot = [0, 0, 0];
const dvLocal = [0, 0, 0];
const rScratch = [0, 0, 0];
const vScratch = [0, 0, 0];
const legInfo = createConicInfo();
const entryRes: EntryResult = { t: Infinity, body: -1, caT: Infinity, caDistance: Infinity, evaluations: 0 };

type LegEnd = 'entry' | 'exit' | 'impact' | 'condition' | 'stop' | 'limit';

class Flight {
  readonly bodies: StarSystem['bodies'];
  t = 0;
  central = 0;
  mu = 0;
  readonly st = new Float64Array(6);
  // open coast segment
  segT0 = 0;
  readonly seg0 = new Float64Array(6);
  segMass0 = 0;
  segEventStart = 0;
  justLeft = -1;
  ended = false;
  readonly vs: VehicleState;
  readonly book: BurnBook;
  readonly segments: TrajectorySegment[] = [];
  readonly events: TrajectoryEvent[] = [];
  readonly flags: Flag[] = [];
  readonly rows: BudgetRow[] = [];
  readonly target: number;
  ca = { t: Infinity, distance: Infinity };
  readonly flybyMarks: FlybyMark[] = [];
  tLimit = Infinity;
  t0 = 0;

  constructor(
    readonly system: StarSystem,
    readonly plan: Plan,
    readonly opts: { samples: number; longBurn: number; maxDuration: number },
  ) {
    this.bodies = system.bodies;
    this.vs = createVehicleState(plan.vehicle);
    this.book = createBurnBook(plan.vehicle);
    this.target = plan.target ? findBodyIndex(system, plan.target.body) : -1;
  }

  fly(): PlanResult {
    const plan = this.plan;
    this.start();
    plan.events.forEach((ev, k) => {
      if (this.ended) return;
      if (ev.type === 'coast') this.coast(ev.until, ev.id, `events[${k}]`);
      else if (ev.type === 'stage') this.stage(ev.id, ev.name);
      else if (ev.type === 'flyby') this.flybyMarks.push({ id: ev.id, name: ev.name, body: findBodyIndex(this.system, ev.body), t: this.t });
      else this.burn(ev, `events[${k}]`);
    });
    if (!this.ended && plan.end !== null && plan.end > this.t) this.coast({ kind: 'time', t: plan.end }, null, 'end');
    this.closeSegment();
    this.event('end', this.t, -1, this.radius(), null, 'end of plan');
    return this.finish();
  }

  // --- bookkeeping helpers ----------------------------------------------------------------

  radius(): number {
    return Math.hypot(this.st[0], this.st[1], this.st[2]);
  }

  event(kind: TrajectoryEventKind, t: number, body: number, distance: number, planEventId: string | null, label: string, central = this.central): void {
    const ref = kind === 'closest-approach' ? body : central;
    this.events.push({
      kind,
      t,
      central,
      body,
      distance,
      altitude: distance - this.bodies[ref].radius,
      planEventId,
      label,
    });
  }

  flag(code: Flag['code'], severity: Flag['severity'], message: string, planEventId: string | null, into?: Flag[]): void {
    const f: Flag = { code, severity, message, planEventId };
    this.flags.push(f);
    if (into) into.push(f);
  }

  openSegment(): void {
    this.segT0 = this.t;
    this.seg0.set(this.st);
    this.segMass0 = this.vs.mass;
    this.segEventStart = this.events.length;
  }

  /** Ends the open coast segment at the current time (mass1: the mass at its end) and opens the next. */
  closeSegment(mass1 = this.vs.mass): void {
    const t1 = this.t;
    if (!(t1 > this.segT0)) {
      this.openSegment();
      return;
    }
    const n = this.opts.samples;
    let sampleT = EMPTY;
    let samples = EMPTY;
    if (n > 0) {
      sampleT = new Float64Array(n);
      samples = new Float64Array(3 * n);
      sampleConic(this.mu, this.seg0, this.segT0, t1 - this.segT0, n, sampleT, samples);
    }
    this.segments.push({
      kind: 'coast',
      central: this.central,
      t0: this.segT0,
      t1,
      state0: Float64Array.from(this.seg0),
      mu: this.mu,
      sampleT,
      samples,
      mass0: this.segMass0,
      mass1,
    });
    this.openSegment();
  }

  setCentral(k: number): void {
    this.central = k;
    this.mu = this.bodies[k].mu;
  }

  // --- start and SOI changes ----------------------------------------------------------------

  start(): void {
    const s = this.plan.start;
    const k = findBodyIndex(this.system, s.body);
    this.setCentral(k);
    this.t = s.epoch;
    this.t0 = s.epoch;
    this.tLimit = s.epoch + this.opts.maxDuration;
    if (s.kind === 'parking') {
      const b = this.bodies[k];
      const rp = b.radius + s.periapsisAltitude;
      elementsToState(this.mu, { p: rp * (1 + s.e), e: s.e, i: s.i, raan: s.raan, argp: s.argp, nu: s.nu }, this.st);
    } else {
      for (let i = 0; i < 3; i++) {
        this.st[i] = s.r[i];
        this.st[i + 3] = s.v[i];
      }
    }
    this.openSegment();
    this.event('start', this.t, -1, this.radius(), null, `start about ${this.bodies[k].name}`);
    this.settleSoi(null);
  }

  /** Moves the ship to the SOI it is actually in (after the start or a finite burn). */
  settleSoi(planEventId: string | null): void {
    for (let guard = 0; guard < 16; guard++) {
      const b = this.bodies[this.central];
      if (this.central !== 0 && this.radius() >= b.derived.soiRadius) {
        this.closeSegment();
        this.exitSoi(planEventId);
        continue;
      }
      let entered = -1;
      for (const c of b.children) {
        bodyStateRelativeToParent(this.system, c, this.t, tmp6);
        const d = Math.hypot(this.st[0] - tmp6[0], this.st[1] - tmp6[1], this.st[2] - tmp6[2]);
        if (d < this.bodies[c].derived.soiRadius && c !== this.justLeft) {
          entered = c;
          break;
        }
      }
      if (entered < 0) return;
      this.closeSegment();
      this.enterSoi(entered, planEventId);
    }
  }

  exitSoi(planEventId: string | null): void {
    const old = this.central;
    const parent = this.bodies[old].parentIndex;
    bodyStateRelativeToParent(this.system, old, this.t, tmp6);
    for (let i = 0; i < 6; i++) this.st[i] += tmp6[i];
    const R = this.bodies[old].derived.soiRadius;
    this.event('soi-exit', this.t, parent, R, planEventId, `leaves ${this.bodies[old].name}'s sphere of influence`, old);
    this.setCentral(parent);
    this.justLeft = old;
    this.openSegment();
  }

  enterSoi(k: number, planEventId: string | null): void {
    bodyStateRelativeToParent(this.system, k, this.t, tmp6);
    for (let i = 0; i < 6; i++) this.st[i] -= tmp6[i];
    const parent = this.central;
    this.setCentral(k);
    this.justLeft = -1;
    this.event('soi-entry', this.t, parent, this.radius(), planEventId, `enters ${this.bodies[k].name}'s sphere of influence`);
    this.openSegment();
  }

  // --- coasting -------------------------------------------------------------------------------

  /** Time (offset) at which the coast condition is met on the current conic, or Infinity. */
  conditionTime(until: CoastUntil, info: ConicInfo, dtMax: number): number {
    switch (until.kind) {
      case 'periapsis':
      case 'apoapsis':
        if (until.body !== undefined && findBodyIndex(this.system, until.body) !== this.central) return Infinity;
        // a periapsis below the surface comes after the impact (and on a fall from rest it is the
        // centre itself, where the conic is singular)
        if (until.kind === 'periapsis' && info.rp < this.bodies[this.central].radius) return Infinity;
        return timeToApsis(this.mu, this.st, until.kind, dtMax, MIN_EVENT_DT, info);
      case 'altitude':
        // below the surface: only after the impact
        if (!(until.altitude > 0) && info.rp < this.bodies[this.central].radius) return Infinity;
        return timeToRadius(this.mu, this.st, this.bodies[this.central].radius + until.altitude, 0, dtMax, MIN_EVENT_DT, info);
      case 'node':
        return timeToNode(this.mu, this.st, until.which, dtMax, MIN_EVENT_DT, info);
      default:
        return Infinity;
    }
  }

  coast(until: CoastUntil, planEventId: string | null, path: string): void {
    let tStop = Infinity;
    if (until.kind === 'time') tStop = until.t;
    else if (until.kind === 'duration') tStop = this.t + until.dt;
    if (tStop < this.t - 1e-6) {
      this.flag('out-of-order', 'error', `${path}: coast until ${tStop.toFixed(3)} s, but the ship is already at ${this.t.toFixed(3)} s`, planEventId);
      return;
    }
    const tEnd = Math.min(tStop, this.tLimit);
    for (let legs = 0; legs < 10_000; legs++) {
      const end = this.leg(until, tEnd, planEventId);
      if (end === 'impact' || end === 'condition' || end === 'stop') return;
      if (end === 'limit') {
        if (tEnd < tStop || !Number.isFinite(tStop)) {
          this.flag(
            'condition-not-met',
            'warning',
            `${path}: coast condition '${until.kind}' not met within ${this.opts.maxDuration} s of the start; the coast stops there`,
            planEventId,
          );
        }
        return;
      }
      if (until.kind === 'soi-change') return;
    }
  }

  /** Flies one conic leg up to the first of: SOI change, impact, condition, tEnd. */
  leg(until: CoastUntil, tEnd: number, planEventId: string | null): LegEnd {
    const dtMax = tEnd - this.t;
    if (!(dtMax > 0)) return until.kind === 'time' || until.kind === 'duration' ? 'stop' : 'limit';
    const mu = this.mu;
    const info = conicInfo(mu, this.st, legInfo);
    const body = this.bodies[this.central];
    // A crossing closer than the distance flown in MIN_EVENT_DT happens now: a coast that ends
    // at a crossing's time (e.g. a timed coast to exactly the SOI exit) leaves the ship on the
    // old conic a hair short of it, where the crossing estimate, behind by rounding, would be
    // missed (an open conic) or found a period later (an ellipse).
    const nearby = info.v * MIN_EVENT_DT;
    // immediate exit: on or beyond the SOI surface, moving out (moving in, it has just entered)
    if (this.central !== 0 && info.rv > 0 && info.r >= body.derived.soiRadius - nearby) {
      this.closeSegment();
      this.exitSoi(planEventId);
      return 'exit';
    }
    const dtExit = this.central !== 0 ? timeToRadius(mu, this.st, body.derived.soiRadius, 1, dtMax, 0, info) : Infinity;
    const dtCond = this.conditionTime(until, info, dtMax);
    // immediate impact: on the surface moving in
    const dtImpact =
      info.rv < 0 && info.r <= body.radius + nearby ? 0 : info.rp < body.radius ? timeToRadius(mu, this.st, body.radius, -1, dtMax, 0, info) : Infinity;
    const dtB = Math.min(dtMax, dtExit, dtCond, dtImpact);
    let tNext = this.t + dtB;
    let entered = -1;
    const track = this.target >= 0 && this.bodies[this.target].parentIndex === this.central ? this.target : -1;
    if (body.children.length > 0) {
      findSoiEntry({ system: this.system, central: this.central, mu, state0: this.st, t0: this.t, tEnd: tNext, justLeft: this.justLeft, track }, entryRes);
      if (entryRes.body >= 0 && entryRes.t <= tNext) {
        entered = entryRes.body;
        tNext = entryRes.t;
      }
      if (track >= 0 && entryRes.caDistance < this.ca.distance) {
        this.ca.distance = entryRes.caDistance;
        this.ca.t = entryRes.caT;
      }
    }
    const span = tNext - this.t;
    this.legEvents(info, span, planEventId);
    propagateKepler(mu, this.st, span, this.st);
    this.t = tNext;
    if (entered >= 0) {
      this.closeSegment();
      this.enterSoi(entered, planEventId);
      return 'entry';
    }
    if (dtB === dtImpact) {
      this.closeSegment();
      this.event('impact', this.t, -1, this.radius(), planEventId, `impact on ${body.name}`);
      this.flag('impact', 'error', `the ship hits ${body.name} at t = ${this.t.toFixed(0)} s; the flight ends there`, planEventId);
      this.ended = true;
      return 'impact';
    }
    if (dtB === dtCond) {
      const kind = until.kind;
      if (kind === 'periapsis' || kind === 'apoapsis') {
        this.event(kind, this.t, -1, this.radius(), planEventId, `${kind} at ${body.name}, ${km(this.radius() - body.radius)}`);
      } else if (kind === 'node') {
        const asc = this.st[5] > 0;
        this.event('node', this.t, -1, this.radius(), planEventId, `${asc ? 'ascending' : 'descending'} node at ${body.name}`);
      } else if (kind === 'altitude') {
        this.event('altitude', this.t, -1, this.radius(), planEventId, `${km(this.radius() - body.radius)} above ${body.name}`);
      }
      return 'condition';
    }
    if (dtB === dtExit) {
      this.closeSegment();
      this.exitSoi(planEventId);
      return 'exit';
    }
    return until.kind === 'time' || until.kind === 'duration' ? (this.t >= tEnd && tEnd < this.tLimit ? 'stop' : 'limit') : 'limit';
  }

  /** Apsis passages, atmosphere entry and the target's closest approach within (t, t + span). */
  legEvents(info: ConicInfo, span: number, planEventId: string | null): void {
    const body = this.bodies[this.central];
    const t = this.t;
    if (info.e >= APSIS_EVENT_MIN_E && span > 0) {
      // periapsis and apoapsis passages in time order, at most MAX_APSIS_EVENTS
      let dtP = timeToTrueAnomaly(info, 0, MIN_EVENT_DT);
      let dtA = info.e < 1 ? timeToTrueAnomaly(info, Math.PI, MIN_EVENT_DT) : Infinity;
      for (let count = 0; count < MAX_APSIS_EVENTS; count++) {
        const peri = dtP <= dtA;
        const dt = peri ? dtP : dtA;
        if (!(dt < span - MIN_EVENT_DT)) break;
        const r = peri ? info.rp : info.ra;
        const kind = peri ? 'periapsis' : 'apoapsis';
        this.event(kind, t + dt, -1, r, planEventId, `${kind} at ${body.name}, ${km(r - body.radius)}`);
        if (peri) dtP = Number.isFinite(info.period) ? dtP + info.period : Infinity;
        else dtA += info.period;
      }
    }
    const Ratm = body.radius + body.safeAlt;
    if (body.safeAlt > 0 && info.rp < Ratm && span > 0) {
      const dta = info.r > Ratm ? timeToRadius(this.mu, this.st, Ratm, -1, span, 0, info) : Infinity;
      if (dta <= span) {
        this.event('atmosphere-entry', t + dta, -1, Ratm, planEventId, `descends below ${km(body.safeAlt)} at ${body.name}`);
        this.flag(
          'atmosphere-entry',
          'warning',
          `the ship descends below ${body.name}'s safe altitude (${km(body.safeAlt)}) at t = ${(t + dta).toFixed(0)} s`,
          planEventId,
        );
      }
    }
    if (this.central === this.target && span > 0) {
      let dmin = info.r;
      let tmin = t;
      const dtp = info.e >= CIRCULAR_E ? timeToTrueAnomaly(info, 0, 0) : Infinity;
      if (dtp <= span) {
        dmin = info.rp;
        tmin = t + dtp;
      } else {
        propagateKepler(this.mu, this.st, span, tmp6);
        const d1 = Math.hypot(tmp6[0], tmp6[1], tmp6[2]);
        if (d1 < dmin) {
          dmin = d1;
          tmin = t + span;
        }
      }
      // the first of equal minima (repeated periapsis passages) is kept
      if (dmin < this.ca.distance * (1 - 1e-9)) {
        this.ca.distance = dmin;
        this.ca.t = tmin;
      }
    }
  }

  // --- staging ---------------------------------------------------------------------------------

  stage(planEventId: string, name: string): void {
    const vehicle = this.plan.vehicle;
    if (this.vs.stage >= vehicle.stages.length) {
      this.flag('no-stage-left', 'warning', `${name}: no stage left to drop`, planEventId);
      return;
    }
    // the mass changes here: end the segment so mass0/mass1 describe it
    this.closeSegment();
    const k = dropStage(vehicle, this.vs);
    this.segMass0 = this.vs.mass;
    this.event('stage', this.t, -1, this.radius(), planEventId, `drops ${vehicle.stages[k].name}`);
  }

  // --- burns -------------------------------------------------------------------------------------

  burn(ev: BurnEvent, path: string): void {
    const rowFlags: Flag[] = [];
    let tb = ev.t ?? this.t;
    if (tb < this.t - 1e-6) {
      this.flag(
        'out-of-order',
        'error',
        `${ev.name}: planned at ${tb.toFixed(3)} s, but the ship is already at ${this.t.toFixed(3)} s; flown now`,
        ev.id,
        rowFlags,
      );
      tb = this.t;
    } else if (tb > this.t) {
      this.coast({ kind: 'time', t: tb }, ev.id, path);
      if (this.ended) return;
      tb = this.t;
    }
    const st = this.st;
    rScratch[0] = st[0];
    rScratch[1] = st[1];
    rScratch[2] = st[2];
    vScratch[0] = st[3];
    vScratch[1] = st[4];
    vScratch[2] = st[5];
    // solved part
    dvSolved[0] = dvSolved[1] = dvSolved[2] = 0;
    if (ev.solve.kind !== 'fixed') {
      try {
        solveBurn({ system: this.system, central: this.central, t: tb, state: st }, ev.solve, dvSolved);
        if (!(Number.isFinite(dvSolved[0]) && Number.isFinite(dvSolved[1]) && Number.isFinite(dvSolved[2]))) {
          throw new SolverError('solve-burn', 'non-finite', 'solved Δv is not finite');
        }
      } catch (e) {
        if (!(e instanceof WaymarkError)) throw e;
        dvSolved[0] = dvSolved[1] = dvSolved[2] = 0;
        this.flag('solve-failed', 'error', `${ev.name}: ${ev.solve.kind} burn not solved (${e.message}); flown with zero solved Δv`, ev.id, rowFlags);
      }
    }
    // correction / fixed components in the burn frame
    let frameOk = true;
    try {
      if (ev.dv[0] === 0 && ev.dv[1] === 0 && ev.dv[2] === 0) dvCorr[0] = dvCorr[1] = dvCorr[2] = 0;
      else burnToInertial(ev.frame, rScratch, vScratch, ev.dv, dvCorr);
    } catch (e) {
      if (!(e instanceof WaymarkError)) throw e;
      frameOk = false;
      dvCorr[0] = dvCorr[1] = dvCorr[2] = 0;
      this.flag('solve-failed', 'error', `${ev.name}: the ${ev.frame} frame is undefined here (${e.message}); components ignored`, ev.id, rowFlags);
    }
    dvTot[0] = dvSolved[0] + dvCorr[0];
    dvTot[1] = dvSolved[1] + dvCorr[1];
    dvTot[2] = dvSolved[2] + dvCorr[2];
    const dv = Math.hypot(dvTot[0], dvTot[1], dvTot[2]);
    let dvFrame: [number, number, number] = [dvTot[0], dvTot[1], dvTot[2]];
    if (frameOk && ev.frame !== 'inertial') {
      try {
        inertialToBurn(ev.frame, rScratch, vScratch, dvTot, dvLocal);
        dvFrame = [dvLocal[0], dvLocal[1], dvLocal[2]];
      } catch (e) {
        if (!(e instanceof WaymarkError)) throw e; // frame undefined (r ∥ v): components left inertial
      }
    }
    const info = conicInfo(this.mu, st, legInfo);
    const period = info.period;
    // propellant
    const vehicle = this.plan.vehicle;
    const book = spendBurn(vehicle, this.vs, dv, this.book);
    const frac = dv > 0 ? book.delivered / dv : 0;
    const duration = book.duration;
    const tStart = tb - 0.5 * duration;
    let gravityLoss: number | null = null;
    let actualStart = tStart;
    const stageNames = book.stagesFired.map((k) => vehicle.stages[k].name);
    let finite = ev.mode === 'finite' && duration > 0;
    let centre: Float64Array | null = null;
    let res: ReturnType<typeof flyFiniteBurn> | null = null;
    if (finite) {
      // start half the duration before the centre, on the conic flown so far
      centre = Float64Array.from(st);
      if (actualStart < this.segT0) {
        actualStart = this.segT0;
        this.flag(
          'out-of-order',
          'info',
          `${ev.name}: the finite burn cannot start ${(0.5 * duration).toFixed(1)} s before its centre (the coast began later); it starts at ${actualStart.toFixed(1)} s`,
          ev.id,
          rowFlags,
        );
      }
      const startState = new Float64Array(6);
      propagateKepler(this.mu, this.seg0, actualStart - this.segT0, startState);
      try {
        res = flyFiniteBurn({
          mu: this.mu,
          state: startState,
          tStart: actualStart,
          dvImpulsive: [dvTot[0] * frac, dvTot[1] * frac, dvTot[2] * frac],
          centreState: centre,
          pointing: ev.pointing,
          book,
          samples: this.opts.samples,
        });
      } catch (e) {
        if (!(e instanceof WaymarkError)) throw e;
        this.flag('solve-failed', 'error', `${ev.name}: finite burn integration failed (${e.message}); flown as impulsive`, ev.id, rowFlags);
        finite = false;
      }
      if (res) {
        // drop conic events of this segment that the burn now pre-empts
        for (let i = this.events.length - 1; i >= this.segEventStart; i--) {
          const e = this.events[i];
          if (e.t > actualStart && (e.kind === 'periapsis' || e.kind === 'apoapsis' || e.kind === 'node' || e.kind === 'atmosphere-entry'))
            this.events.splice(i, 1);
        }
        // the coast segment ends at the burn start, at the mass before the burn
        this.t = actualStart;
        st.set(startState);
        this.closeSegment(book.massBefore);
        this.segments.push({
          kind: 'burn',
          central: this.central,
          t0: actualStart,
          t1: res.tEnd,
          state0: startState,
          mu: this.mu,
          sampleT: res.sampleT,
          samples: res.samples,
          mass0: book.massBefore,
          mass1: res.massEnd,
        });
        this.event('burn-start', actualStart, -1, this.radius(), ev.id, `burn start: ${ev.name}`);
        this.event('burn', tb, -1, Math.hypot(centre[0], centre[1], centre[2]), ev.id, `burn: ${ev.name} (${dv.toFixed(1)} m/s, finite)`);
        for (const d of book.dropped) {
          this.event('stage', actualStart + d.offset, -1, this.radius(), ev.id, `drops ${vehicle.stages[d.stage].name} (spent)`);
        }
        st.set(res.state);
        this.t = res.tEnd;
        this.event('burn-end', this.t, -1, this.radius(), ev.id, `burn end: ${ev.name}`);
        gravityLoss = res.gravityLoss;
        this.openSegment();
        this.settleSoi(ev.id);
      }
    }
    if (!finite) {
      this.closeSegment(book.massBefore);
      st[3] += dvTot[0] * frac;
      st[4] += dvTot[1] * frac;
      st[5] += dvTot[2] * frac;
      this.event('burn', tb, -1, this.radius(), ev.id, `burn: ${ev.name} (${dv.toFixed(1)} m/s)`);
      for (const d of book.dropped) {
        this.event('stage', tStart + d.offset, -1, this.radius(), ev.id, `drops ${vehicle.stages[d.stage].name} (spent)`);
      }
      this.openSegment();
    }
    // row flags
    if (book.dryMidBurn) {
      const names = book.dropped.filter((d) => d.offset > 0).map((d) => vehicle.stages[d.stage].name);
      this.flag(
        'stage-dry-mid-burn',
        'warning',
        `${ev.name}: ${names.length > 0 ? names.join(', ') : vehicle.stages[book.phaseStage[book.phases - 1]].name} ran dry during the burn`,
        ev.id,
        rowFlags,
      );
    }
    if (book.missing > 0) {
      this.flag(
        'out-of-propellant',
        'error',
        `${ev.name}: out of propellant, ${book.missing.toFixed(1)} m/s of ${dv.toFixed(1)} m/s not delivered`,
        ev.id,
        rowFlags,
      );
    }
    const periodFraction = Number.isFinite(period) ? duration / period : null;
    if (periodFraction !== null && periodFraction > this.opts.longBurn) {
      this.flag(
        'long-burn',
        'warning',
        `${ev.name}: lasts ${(100 * periodFraction).toFixed(1)} % of the orbital period (over ${(100 * this.opts.longBurn).toFixed(1)} %): the impulsive model is poor here`,
        ev.id,
        rowFlags,
      );
    }
    this.rows.push({
      planEventId: ev.id,
      name: ev.name,
      t: tb,
      tStart,
      tEnd: tb + 0.5 * duration,
      dv,
      frame: ev.frame,
      dvFrame,
      dvInertial: [dvTot[0], dvTot[1], dvTot[2]],
      duration,
      propellantUsed: book.propellantUsed,
      massBefore: book.massBefore,
      massAfter: book.massAfter,
      stages: stageNames,
      dvLeft: deltaVLeft(vehicle, this.vs),
      dvMissing: book.missing,
      gravityLoss,
      periodFraction,
      flags: rowFlags,
    });
  }

  // --- results ---------------------------------------------------------------------------------

  finish(): PlanResult {
    const plan = this.plan;
    const vehicle = plan.vehicle;
    const capacity = deltaVLeft(vehicle);
    const { budget, flags } = summarizeBudget(this.rows, { capacity, dvLeft: deltaVLeft(vehicle, this.vs), finalMass: this.vs.mass }, plan.reserve);
    for (const f of flags) this.flags.push(f);
    let flybys: FlybyReport[] | undefined;
    if (this.flybyMarks.length > 0) {
      flybys = [];
      budget.flybys = [];
      for (const m of this.flybyMarks) {
        const b = this.bodies[m.body];
        const rep = flybyReport(this.system, m, this.segments, this.events, this.rows);
        if (!rep) {
          this.flag('flyby-missed', 'warning', `${m.name}: the ship does not pass through ${b.name}'s sphere of influence`, m.id);
          continue;
        }
        flybys.push(rep);
        budget.flybys.push({ planEventId: m.id, name: m.name, freeDv: rep.freeDv });
        if (rep.periapsisAltitude < b.safeAlt) {
          this.flag(
            'flyby-low',
            'warning',
            `${m.name}: periapsis ${km(rep.periapsisAltitude)} above ${b.name} is below its minimum safe altitude (${km(b.safeAlt)})`,
            m.id,
          );
        }
      }
    }
    let target: TargetReport | null = null;
    if (plan.target) {
      const tg = plan.target;
      const k = this.target;
      const tb = this.bodies[k];
      let achieved: TargetReport['achieved'] = null;
      let reached = false;
      if (this.central === k && !this.ended) {
        const c = conicInfo(this.mu, this.st, legInfo);
        achieved = {
          periapsisAltitude: c.rp - tb.radius,
          apoapsisAltitude: Number.isFinite(c.ra) ? c.ra - tb.radius : null,
          e: c.e,
          i: c.i,
        };
        const tol = tg.tolerance;
        reached = Math.abs(achieved.periapsisAltitude - tg.periapsisAltitude) <= tol.periapsisAltitude;
        if (tg.e !== null) reached = reached && Math.abs(c.e - tg.e) <= tol.e;
        if (tg.apoapsisAltitude !== null) {
          reached = reached && achieved.apoapsisAltitude !== null && Math.abs(achieved.apoapsisAltitude - tg.apoapsisAltitude) <= tol.periapsisAltitude;
        }
        if (tg.i !== null) reached = reached && Math.abs(c.i - tg.i) <= tol.i;
      }
      const ca = Number.isFinite(this.ca.distance) ? { t: this.ca.t, distance: this.ca.distance, altitude: this.ca.distance - tb.radius } : null;
      target = {
        body: k,
        reached,
        achieved,
        desired: { periapsisAltitude: tg.periapsisAltitude, e: tg.e, apoapsisAltitude: tg.apoapsisAltitude, i: tg.i },
        closestApproach: ca,
      };
      if (ca) {
        this.events.push({
          kind: 'closest-approach',
          t: ca.t,
          central: this.centralAt(ca.t),
          body: k,
          distance: ca.distance,
          altitude: ca.altitude,
          planEventId: null,
          label: `closest approach to ${tb.name}, ${km(ca.altitude)}`,
        });
      }
      if (!reached) {
        const why = achieved
          ? `periapsis ${km(achieved.periapsisAltitude)}, e ${achieved.e.toFixed(4)}, i ${((achieved.i * 180) / Math.PI).toFixed(2)}°`
          : `the ship ends ${this.ended ? 'crashed' : `about ${this.bodies[this.central].name}`}`;
        this.flags.push({ code: 'target-missed', severity: 'error', message: `target orbit about ${tb.name} not reached: ${why}`, planEventId: null });
      }
    }
    this.events.sort((a, b) => a.t - b.t);
    return {
      t0: this.t0,
      t1: this.t,
      segments: this.segments,
      events: this.events,
      budget,
      target,
      flags: this.flags,
      ...(flybys ? { flybys } : {}),
      model: 'conic',
    };
  }

  /** Central body of the segment covering time t (the last one when past the end). */
  centralAt(t: number): number {
    for (const s of this.segments) if (t >= s.t0 && t <= s.t1) return s.central;
    return this.central;
  }
}
