/**
 * Differential correction in the n-body model: adjusts chosen burns so that the n-body flight
 * arrives at the target as the patched-conic plan does.
 *
 * Unknowns: the inertial Δv components of the chosen burns (default: the mid-course burn — the
 * last burn before the conic arrival flown outside the target's sphere of influence),
 * optionally the first chosen burn's time. Targets (default aim 'periapsis'): the conic
 * arrival's periapsis altitude and inclination at the target, and (matchTime, default on) its
 * periapsis time, so the later burns — flown at their conic times — fire where they were
 * planned. Overrides: `desired`.
 *
 * Residual: periapsis altitude and inclination are poor Newton variables far from the solution
 * (the altitude folds where the miss passes through the target's centre), so the residual is
 * taken in the B-plane (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed.,
 * §12.4, from memory): the B vector of the n-body osculating hyperbola at the conic periapsis
 * time, minus the aim point that gives the desired periapsis and inclination with the n-body
 * hyperbola's own v∞ and asymptote — |B*| = r_p √(1 + 2μ/(r_p v∞²)) and the B-plane angle θ
 * with cos i = −cos θ · R̂_z (T̂ in the reference plane, R̂ = Ŝ × T̂). Reaching the aim point
 * reaches r_p and i exactly; the residual is nearly linear in the burn components even when
 * the first n-body flight misses by millions of kilometres. With aim 'bplane' the aim point is
 * the conic hyperbola's B·T, B·R instead. Residual components are divided by their tolerances.
 *
 * Iteration: Newton with a forward-difference Jacobian (one n-body flight per unknown) and
 * Levenberg–Marquardt damping (Nocedal & Wright, Numerical Optimization, 2nd ed., §10.3;
 * core/math/linalg.ts dampedLeastSquares): a step is kept only when it lowers the residual
 * norm; otherwise the damping grows tenfold and the step is retried. Every flight starts from
 * the n-body state just before the first chosen burn (the flight before it does not change).
 *
 * The corrected plan (a new Plan): the chosen burns become 'fixed' inertial burns with the
 * corrected vectors at explicit times; every later burn is frozen the same way to its conic
 * vector and time, and every later coast whose end is a condition (periapsis, apoapsis, node,
 * altitude) becomes a coast until the time the conic flight met it; later "until SOI change"
 * coasts are dropped (in a timed schedule they end nothing; the burns' own times hold the
 * schedule, and later duration coasts then end no later than before). Why freeze: a solved burn
 * after the correction point would be re-solved by the patched-conic model against a conic
 * trajectory that — once the corrected burn is in — no longer passes where the n-body ship
 * does; frozen, the corrected plan flies the same burn schedule in both models, and its n-body
 * verification arrives where the correction put it. The patched-conic evaluation of the
 * corrected plan then no longer reaches the target (expected: the correction undoes the conic
 * model's own error); its budget and margin are exact, since they depend only on the burns.
 *
 * Limits: impulsive chosen burns only; the time unknown needs the burn to follow a coast that
 * ends at it (the coast becomes a timed coast) and is kept within ±timeWindow. Only the arrival
 * periapsis altitude, inclination and time are matched, not v∞: later burns keep their conic
 * inertial vectors, so the orbit after them differs from the conic one by what the n-body v∞
 * differs (demo: e 1.636 vs 1.621 at arrival; final orbit 406 × 2,689 km at 30.6° instead of
 * 400 × 2,000 km at 30°). Re-solving those burns in the n-body model is not done.
 */
import { InputError, SolverError, WaymarkError, requireFinite } from '../math/index.ts';
import { dampedLeastSquares } from '../math/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';
import { evaluate } from '../conic/index.ts';
import {
  NBodyModel,
  bPlane,
  bPlaneAxes,
  burnActions,
  compareArrival,
  conicArrival,
  conicStart,
  flyNBody,
  probePeriapsis,
  stateRelativeTo,
  type ArrivalComparison,
  type NBodyAction,
  type NBodyModelOptions,
  type NBodyState,
  type PeriapsisReport,
  type Vec3Tuple,
} from './verify.ts';
import type { BurnEvent, CoastEvent, Plan } from '../plan/index.ts';
import type { PlanResult } from '../plan/index.ts';
import { conicInfo, createConicInfo } from '../conic/index.ts';

export interface CorrectTolerance {
  /** Periapsis altitude, m (default 100). */
  altitude?: number;
  /** Inclination, rad (default 1e-3°). */
  i?: number;
  /** Periapsis time, s (default 1). */
  t?: number;
  /** B-plane components for aim 'bplane', m (default 100). */
  b?: number;
}

export interface CorrectOptions extends NBodyModelOptions {
  /** Ids of the impulsive burns to correct (default: the mid-course burn, see the module comment). */
  burns?: string[];
  /** Also correct the first chosen burn's time (default false). */
  time?: boolean;
  /** Largest time shift of the burn, s (default DEFAULT_TIME_WINDOW). */
  timeWindow?: number;
  /** 'periapsis' (default): reach the periapsis altitude and inclination; 'bplane': the conic B·T, B·R. */
  aim?: 'periapsis' | 'bplane';
  /** Also reach the conic periapsis time (default true). */
  matchTime?: boolean;
  /** Override the desired arrival (default: the conic arrival's values). */
  desired?: { periapsisAltitude?: number; i?: number; t?: number };
  tolerance?: CorrectTolerance;
  /** Newton iterations at most (default DEFAULT_MAX_ITERATIONS). */
  maxIterations?: number;
  /** Called after each iteration with (iteration, maxIterations, scaled residual norm). */
  onProgress?: (iteration: number, maxIterations: number, norm: number) => void;
  signal?: { aborted: boolean };
}

export const DEFAULT_MAX_ITERATIONS = 15;
export const DEFAULT_TIME_WINDOW = 6 * 3600;
/** Forward-difference steps: Δv components (m/s) and burn time (s). */
export const FD_STEP_DV = 1e-3;
export const FD_STEP_T = 1;
/** Largest Newton step in one Δv component, m/s (longer steps are scaled down). */
export const MAX_STEP_DV = 500;
/** Levenberg–Marquardt damping: start, floor, and the most retries of one iteration. */
export const LM_START = 1e-9;
export const LM_FLOOR = 1e-15;
export const LM_RETRIES = 10;

const DEG = Math.PI / 180;

export interface ResidualRecord {
  iteration: number;
  /** n-body − desired: periapsis altitude (m), inclination (rad), periapsis time (s). */
  altitude: number;
  i: number;
  t: number;
  /** B-plane residual components (m) as used by the iteration. */
  bt: number;
  br: number;
  /** Norm of the tolerance-scaled residual. */
  norm: number;
  /** LM damping used for the step that led here (0 for the start). */
  lambda: number;
}

export interface BurnCorrection {
  planEventId: string;
  tBefore: number;
  tAfter: number;
  dvBefore: Vec3Tuple;
  dvAfter: Vec3Tuple;
  /** dvAfter − dvBefore, m/s. */
  change: Vec3Tuple;
  changeMagnitude: number;
}

export interface CorrectResult {
  plan: Plan;
  iterations: number;
  /** Residual after each iteration (the start first). */
  history: ResidualRecord[];
  burns: BurnCorrection[];
  /** Σ |change| over the corrected burns: the correction Δv, m/s. */
  correctionDv: number;
  /** Margin of the plan before and of the corrected plan (re-evaluated), m/s. */
  margin: { before: number; after: number };
  /** Patched-conic evaluation of the corrected plan. */
  result: PlanResult;
  /** The desired n-body arrival and the one reached (e of `desired`: the conic's, NaN without a conic arrival). */
  desired: PeriapsisReport;
  achieved: PeriapsisReport;
  /** n-body vs conic arrival before correcting (null when the conic flight does not arrive). */
  initial: ArrivalComparison | null;
  /** n-body flights flown. */
  flights: number;
  notes: string[];
}

interface Unknown {
  burn: number; // index into chosen
  kind: 'dv' | 't';
  axis: number;
  h: number;
}

/** The burn a mid-course correction is: the last burn before the conic arrival flown outside the target's SOI. */
export function defaultCorrectionBurn(system: StarSystem, plan: Plan, result: PlanResult, arrival: { target: number; t: number }): string | null {
  let id: string | null = null;
  for (const ev of result.events) {
    if (ev.kind !== 'burn' || ev.planEventId === null || ev.t >= arrival.t) continue;
    if (ev.central === arrival.target) continue;
    id = ev.planEventId;
  }
  void system;
  void plan;
  return id;
}

function positive(field: string, x: number | undefined, fallback: number): number {
  if (x === undefined) return fallback;
  requireFinite(field, x);
  if (!(x > 0)) throw new InputError(field, 'must be > 0', x);
  return x;
}

const oscScratch = createConicInfo();

/** Differential correction (see the module comment). Throws SolverError('correct', 'no-convergence') with the last residual. */
export function correctPlan(system: StarSystem, plan: Plan, options: CorrectOptions = {}): CorrectResult {
  if (!options || typeof options !== 'object') throw new InputError('options', 'must be an object', options);
  const conic = evaluate(system, plan, { samplesPerSegment: 0 });
  if (!plan.target) throw new InputError('plan.target', 'is required: the correction aims at the target arrival');
  const conicArr = conicArrival(system, plan, conic);
  const d = options.desired;
  if (!conicArr && !(d && d.t !== undefined && d.periapsisAltitude !== undefined && d.i !== undefined)) {
    const name = system.bodies.find((b) => b.id === plan.target!.body)?.name ?? plan.target.body;
    throw new InputError(
      'plan.target',
      `the patched-conic flight never reaches ${name}'s sphere of influence, so there is no arrival to aim the correction at: change the plan's burns (or the arrival time of its transfer burn) until the plan reaches ${name}, then correct it`,
    );
  }
  const target = findBodyIndex(system, plan.target.body);
  // when to take the n-body state: the conic periapsis time, else the desired one
  const arrival = { target, t: conicArr ? conicArr.t : (d!.t as number) };
  const tol = {
    altitude: positive('options.tolerance.altitude', options.tolerance?.altitude, 100),
    i: positive('options.tolerance.i', options.tolerance?.i, 1e-3 * DEG),
    t: positive('options.tolerance.t', options.tolerance?.t, 1),
    b: positive('options.tolerance.b', options.tolerance?.b, 100),
  };
  const aim = options.aim ?? 'periapsis';
  if (aim !== 'periapsis' && aim !== 'bplane') throw new InputError('options.aim', "must be 'periapsis' or 'bplane'", aim);
  const matchTime = options.matchTime ?? true;
  const maxIter = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  if (!Number.isInteger(maxIter) || maxIter < 1) throw new InputError('options.maxIterations', 'must be an integer >= 1', maxIter);
  const timeWindow = positive('options.timeWindow', options.timeWindow, DEFAULT_TIME_WINDOW);
  const tb = system.bodies[target];
  const desired: PeriapsisReport = {
    t: d?.t ?? conicArr!.t,
    altitude: d?.periapsisAltitude ?? conicArr!.periapsisAltitude,
    e: conicArr ? conicArr.e : NaN,
    i: d?.i ?? conicArr!.i,
  };
  requireFinite('options.desired.t', desired.t);
  requireFinite('options.desired.periapsisAltitude', desired.altitude);
  requireFinite('options.desired.i', desired.i);
  if (!(desired.altitude > -tb.radius)) throw new InputError('options.desired.periapsisAltitude', `must be > −${tb.radius} m`, desired.altitude);

  // chosen burns
  const ids = options.burns ?? [defaultCorrectionBurn(system, plan, conic, arrival)].filter((x): x is string => x !== null);
  if (!Array.isArray(ids) || ids.length === 0)
    throw new InputError('options.burns', 'names no burn: the plan has no burn before the arrival outside the target’s sphere of influence');
  const { actions: baseActions, notes } = burnActions(plan, conic);
  const chosen: { id: string; index: number; eventIndex: number; t: number; dv: Vec3Tuple }[] = [];
  for (const id of ids) {
    const eventIndex = plan.events.findIndex((e) => e.type === 'burn' && e.id === id);
    if (eventIndex < 0) throw new InputError('options.burns', `names no burn of the plan ("${id}")`, id);
    const ev = plan.events[eventIndex] as BurnEvent;
    const index = baseActions.findIndex((a) => a.id === id);
    if (index < 0) throw new InputError('options.burns', `"${id}" is not flown by the patched-conic evaluation (the flight ended earlier)`, id);
    const a = baseActions[index];
    if (a.kind !== 'impulse' || ev.mode !== 'impulsive')
      throw new InputError('options.burns', `"${id}" is a finite burn; only impulsive burns can be corrected`, id);
    if (!(a.t < arrival.t)) throw new InputError('options.burns', `"${id}" comes after the arrival at ${tb.name}; it cannot change the arrival`, id);
    if (chosen.some((c) => c.id === id)) throw new InputError('options.burns', `names "${id}" twice`, id);
    chosen.push({ id, index, eventIndex, t: a.t, dv: [a.dv[0], a.dv[1], a.dv[2]] });
  }
  chosen.sort((p, q) => p.t - q.t || p.eventIndex - q.eventIndex);
  const first = chosen[0];
  const firstEv = plan.events[first.eventIndex] as BurnEvent;
  let timeCoastIndex = -1;
  if (options.time) {
    const prev = plan.events[first.eventIndex - 1];
    if (firstEv.t === null && !(prev && prev.type === 'coast')) {
      throw new InputError('options.time', `the time of "${first.id}" cannot change: it is not timed and does not follow a coast`);
    }
    if (firstEv.t === null) timeCoastIndex = first.eventIndex - 1;
  }
  const unknowns: Unknown[] = [];
  chosen.forEach((_c, b) => {
    for (let axis = 0; axis < 3; axis++) unknowns.push({ burn: b, kind: 'dv', axis, h: FD_STEP_DV });
  });
  if (options.time) unknowns.push({ burn: 0, kind: 't', axis: 0, h: FD_STEP_T });
  const n = unknowns.length;
  const m = matchTime ? 3 : 2;

  // the n-body flight up to the first chosen burn, once
  const model = new NBodyModel(system, options);
  const start = conicStart(conic);
  const prevAction = baseActions.filter((a) => a.t < first.t || (a.t === first.t && baseActions.indexOf(a) < first.index));
  const tPrev = prevAction.length > 0 ? Math.max(...prevAction.map((a) => a.t)) : start.t;
  const tRestart = options.time ? Math.max(tPrev, start.t, first.t - timeWindow) : first.t;
  const tLo = options.time ? tRestart : first.t;
  const nominal = flyNBody(model, start, [...baseActions.filter((a) => a.t < tRestart), { kind: 'checkpoint', t: tRestart, id: '@restart' }], tRestart, {
    signal: options.signal,
  });
  let flights = 1;
  const restart = nominal.checkpoints.get('@restart');
  if (!restart) {
    throw new SolverError('correct', 'no-convergence', `the n-body flight ends before the burn "${first.id}" (${nominal.notes.join('; ')})`, {});
  }
  const laterActions = baseActions.filter((a) => a.t >= tRestart && !chosen.some((c) => c.id === a.id));

  const x = new Float64Array(n); // offsets: Δv (m/s) per burn axis, then time (s)
  const tNew = (xx: Float64Array): number => (options.time ? Math.min(Math.max(first.t + xx[n - 1], tLo), first.t + timeWindow) : first.t);

  interface Eval {
    r: Float64Array;
    norm: number;
    peri: PeriapsisReport;
    at: NBodyState;
    rec: Omit<ResidualRecord, 'iteration' | 'lambda'>;
  }
  const conicAxes = conicArr ? bPlaneAxes(conicInfo(tb.mu, conicArr.state, createConicInfo())) : null;
  const conicB = conicArr && conicAxes ? bPlane(conicInfo(tb.mu, conicArr.state, createConicInfo()), conicAxes) : null;
  const thetaRef = conicB ? Math.atan2(conicB.br, conicB.bt) : NaN;
  if (aim === 'bplane' && !conicB) throw new InputError('options.aim', "'bplane' needs a hyperbolic conic arrival");

  const evaluateAt = (xx: Float64Array): Eval | null => {
    if (options.signal?.aborted) throw new SolverError('correct', 'cancelled', 'correction cancelled', {});
    const acts: NBodyAction[] = [...laterActions];
    chosen.forEach((c, b) => {
      acts.push({ kind: 'impulse', t: b === 0 ? tNew(xx) : c.t, id: c.id, dv: [c.dv[0] + xx[3 * b], c.dv[1] + xx[3 * b + 1], c.dv[2] + xx[3 * b + 2]] });
    });
    acts.push({ kind: 'checkpoint', t: arrival.t, id: '@arrival' });
    flights++;
    let at: NBodyState | undefined;
    try {
      const f = flyNBody(model, restart, acts, arrival.t, { signal: options.signal });
      at = f.checkpoints.get('@arrival');
    } catch (e) {
      if (e instanceof SolverError && e.reason === 'cancelled') throw e;
      if (!(e instanceof WaymarkError)) throw e;
      return null;
    }
    if (!at) return null; // impact before the arrival
    // B-plane residual at the conic periapsis time; the periapsis itself by the probe
    const st = stateRelativeTo(model, at, target);
    const peri = probePeriapsis(model, at.t, st, target, options.signal).report;
    const osc = conicInfo(tb.mu, st, oscScratch);
    let bt: number, br: number;
    if (aim === 'bplane') {
      const bn = bPlane(osc, conicAxes);
      if (!bn || !conicB) return null;
      bt = bn.bt - conicB.bt;
      br = bn.br - conicB.br;
    } else {
      const axes = bPlaneAxes(osc);
      const own = axes ? bPlane(osc, axes) : null;
      if (!axes || !own) return null;
      const rp = tb.radius + desired.altitude;
      const vinf2 = -tb.mu * osc.alpha;
      const bStar = rp * Math.sqrt(1 + (2 * tb.mu) / (rp * vinf2));
      // B-plane angle for the desired inclination: cos i = −cos θ · R_z
      let c = axes.R[2] !== 0 ? -Math.cos(desired.i) / axes.R[2] : 2;
      c = Math.max(-1, Math.min(1, c));
      const th = Math.acos(c);
      const ref = Number.isFinite(thetaRef) ? thetaRef : Math.atan2(own.br, own.bt);
      const theta = Math.abs(wrap(th - ref)) <= Math.abs(wrap(-th - ref)) ? th : -th;
      bt = own.bt - bStar * Math.cos(theta);
      br = own.br - bStar * Math.sin(theta);
    }
    const sB = aim === 'bplane' ? tol.b : tol.altitude;
    const r = new Float64Array(m);
    r[0] = bt / sB;
    r[1] = br / sB;
    if (matchTime) r[2] = (peri.t - desired.t) / tol.t;
    let norm = 0;
    for (let i = 0; i < m; i++) norm += r[i] * r[i];
    return {
      r,
      norm: Math.sqrt(norm),
      peri,
      at,
      rec: { altitude: peri.altitude - desired.altitude, i: peri.i - desired.i, t: peri.t - desired.t, bt, br, norm: Math.sqrt(norm) },
    };
  };

  const converged = (ev: Eval): boolean => {
    const okT = !matchTime || Math.abs(ev.rec.t) <= tol.t;
    if (aim === 'bplane') return Math.abs(ev.rec.bt) <= tol.b && Math.abs(ev.rec.br) <= tol.b && okT;
    return Math.abs(ev.rec.altitude) <= tol.altitude && Math.abs(ev.rec.i) <= tol.i && okT;
  };

  let cur = evaluateAt(x);
  if (!cur)
    throw new SolverError(
      'correct',
      'no-convergence',
      `the uncorrected n-body flight does not reach the conic arrival time at ${tb.name} (it ends in an impact)`,
      {},
    );
  const initial = conicArr ? compareArrival(model, cur.at, conicArr, options.signal).comparison : null;
  const history: ResidualRecord[] = [{ iteration: 0, ...cur.rec, lambda: 0 }];
  let nu = LM_START;
  let iterations = 0;
  const J = new Float64Array(m * n);
  const rhs = new Float64Array(m);
  while (!converged(cur)) {
    if (iterations >= maxIter) break;
    iterations++;
    // forward-difference Jacobian
    for (let j = 0; j < n; j++) {
      const xp = Float64Array.from(x);
      xp[j] += unknowns[j].h;
      const ep = evaluateAt(xp);
      if (!ep) throw new SolverError('correct', 'no-convergence', `a Jacobian flight failed at iteration ${iterations} (unknown ${j})`, { history });
      for (let i = 0; i < m; i++) J[i * n + j] = (ep.r[i] - cur.r[i]) / unknowns[j].h;
    }
    let colMax = 0;
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let i = 0; i < m; i++) s += J[i * n + j] ** 2;
      colMax = Math.max(colMax, s);
    }
    for (let i = 0; i < m; i++) rhs[i] = -cur.r[i];
    let accepted = false;
    for (let retry = 0; retry < LM_RETRIES && !accepted; retry++) {
      const lambda = nu * colMax;
      let step: Float64Array;
      try {
        step = dampedLeastSquares(J, rhs, m, n, lambda) as Float64Array;
      } catch (e) {
        if (!(e instanceof WaymarkError)) throw e;
        nu = Math.max(nu * 10, 1e-6);
        continue;
      }
      // keep steps within bounds
      let scale = 1;
      for (let j = 0; j < n; j++) {
        if (unknowns[j].kind === 'dv' && Math.abs(step[j]) > MAX_STEP_DV) scale = Math.min(scale, MAX_STEP_DV / Math.abs(step[j]));
      }
      const xt = Float64Array.from(x);
      for (let j = 0; j < n; j++) xt[j] += scale * step[j];
      if (options.time) xt[n - 1] = Math.min(Math.max(xt[n - 1], tLo - first.t), timeWindow);
      const et = evaluateAt(xt);
      if (et && et.norm < cur.norm) {
        x.set(xt);
        cur = et;
        accepted = true;
        history.push({ iteration: iterations, ...cur.rec, lambda });
        nu = Math.max(nu / 10, LM_FLOOR);
      } else {
        nu *= 10;
      }
    }
    options.onProgress?.(iterations, maxIter, cur.norm);
    if (!accepted) break;
  }
  if (!converged(cur)) {
    const r = cur.rec;
    throw new SolverError(
      'correct',
      'no-convergence',
      `no convergence after ${iterations} iteration${iterations === 1 ? '' : 's'}: the n-body periapsis at ${tb.name} is off by ` +
        `${(r.altitude / 1e3).toFixed(3)} km in altitude, ${(r.i / DEG).toFixed(4)}° in inclination` +
        (matchTime ? ` and ${r.t.toFixed(1)} s in time` : '') +
        ` (tolerances ${(tol.altitude / 1e3).toFixed(3)} km, ${(tol.i / DEG).toFixed(4)}°${matchTime ? `, ${tol.t} s` : ''})`,
      { history, iterations },
    );
  }

  // the corrected plan
  const burns: BurnCorrection[] = chosen.map((c, b) => {
    const after: Vec3Tuple = [c.dv[0] + x[3 * b], c.dv[1] + x[3 * b + 1], c.dv[2] + x[3 * b + 2]];
    const change: Vec3Tuple = [x[3 * b], x[3 * b + 1], x[3 * b + 2]];
    return {
      planEventId: c.id,
      tBefore: c.t,
      tAfter: b === 0 ? tNew(x) : c.t,
      dvBefore: c.dv,
      dvAfter: after,
      change,
      changeMagnitude: Math.hypot(change[0], change[1], change[2]),
    };
  });
  // the corrected plan arrives in n-body, not in patched conics: n-body is its truth model
  const corrected: Plan = { ...freezePlan(system, plan, conic, burns, first.eventIndex, timeCoastIndex), truthModel: 'nbody' };
  const result = evaluate(system, corrected, { samplesPerSegment: 0 });
  if (result.target && !result.target.reached) {
    notes.push(
      'the patched-conic evaluation of the corrected plan does not reach the target: expected, the correction undoes the conic model’s own arrival error; verify it in the n-body model',
    );
  }
  if (plan.target) {
    notes.push(
      'the burns after the correction keep their patched-conic vectors, so the final orbit differs from the target by what the n-body arrival does; targeting the plan in n-body (waymark target --model nbody) meets the target orbit too',
    );
  }
  return {
    plan: corrected,
    iterations,
    history,
    burns,
    correctionDv: burns.reduce((s, b) => s + b.changeMagnitude, 0),
    margin: { before: conic.budget.margin, after: result.budget.margin },
    result,
    desired,
    achieved: cur.peri,
    initial,
    flights,
    notes,
  };
}

function wrap(a: number): number {
  return Math.atan2(Math.sin(a), Math.cos(a));
}

/**
 * The corrected plan (see the module comment): from event `firstEventIndex` on, burns are
 * 'fixed' inertial at explicit times (the corrections' vectors and times, else the conic
 * result's) and condition coasts become coasts until the time the conic flight met them. With
 * no corrections and index 0 this freezes the whole plan into a burn schedule (disperse.ts).
 */
export function freezePlan(system: StarSystem, plan: Plan, conic: PlanResult, burns: BurnCorrection[], firstEventIndex: number, timeCoastIndex: number): Plan {
  const out: Plan = structuredClone(plan);
  const rows = new Map(conic.budget.rows.map((r) => [r.planEventId, r]));
  const byId = new Map(burns.map((b) => [b.planEventId, b]));
  const drop = new Set<number>();
  for (let k = firstEventIndex; k < out.events.length; k++) {
    const ev = out.events[k];
    if (ev.type === 'burn') {
      const row = rows.get(ev.id);
      if (!row) continue;
      const c = byId.get(ev.id);
      const dv = c ? c.dvAfter : row.dvInertial;
      ev.t = c ? c.tAfter : row.t;
      ev.frame = 'inertial';
      ev.dv = [dv[0], dv[1], dv[2]];
      ev.solve = { kind: 'fixed' };
    } else if (ev.type === 'coast' && isCondition(ev)) {
      // an SOI change ends nothing in a timed schedule (and a timed coast ending exactly on the
      // crossing would leave the evaluation on the old conic): drop it
      if (ev.until.kind === 'soi-change') drop.add(k);
      else ev.until = { kind: 'time', t: coastEnd(system, plan, k) };
    }
  }
  if (timeCoastIndex >= 0) {
    const ev = out.events[timeCoastIndex] as CoastEvent;
    const first = burns[0];
    ev.until = { kind: 'time', t: Math.min(first.tAfter, coastEnd(system, plan, timeCoastIndex)) };
  }
  if (drop.size > 0) out.events = out.events.filter((_e, k) => !drop.has(k));
  return out;
}

function isCondition(ev: CoastEvent): boolean {
  return ev.until.kind !== 'time' && ev.until.kind !== 'duration';
}

/** When the conic flight of `plan` ends its event k (a coast): the end of the plan cut after it. */
function coastEnd(system: StarSystem, plan: Plan, k: number): number {
  const cut: Plan = { ...plan, events: plan.events.slice(0, k + 1), end: null };
  return evaluate(system, cut, { samplesPerSegment: 0 }).t1;
}
