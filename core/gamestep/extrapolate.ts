/**
 * Extrapolation of a long coast in the game-step check (check.ts): the region of a span away
 * from burns, too long to fly at the game's step, and its error carried and generated.
 *
 * Spans flown and spans extrapolated. A game steps at e.g. 1/60 s; a months-long cruise is
 * then ~10⁹ steps. Spans of at most `maxStepsPerSpan` steps are flown at the game's step
 * ('flown'). In a longer span, the part away from burns (the region) is either
 * - flown as a long-step coast at the step `warpDt` (mode 'warp', measured), or
 * - 'extrapolated': (1) the error the game brought into the region is carried through it
 *   exactly, by flying the game's state at the region's start with the reference dynamics;
 *   (2) the error the game's step generates in the region is measured on flights of the whole
 *   region, from the reference state at its start, with the game's method and precision at two
 *   coarse steps H and 2H (within the step budget), and scaled to the game's step with the
 *   measured order p = log2(e(2H)/e(H)): e(dt) = e(H)·(dt/H)^p, as vectors at every sample time
 *   (step-size extrapolation, the reasoning of Richardson extrapolation; Hairer, Nørsett &
 *   Wanner, Solving ODEs I, 2nd ed., §II.9). This is accepted when p is near the method's order;
 *   otherwise (typically float32 rounding, which grows as the step shrinks, or errors below the
 *   reference's own accuracy) a window at the game's step is flown and its growth fitted as
 *   e(τ) ≈ A·τ^q (fit.ts), the direction taken from the window's last error in the RTN
 *   frame. In float32 the window is always flown, and replaces step scaling when it measures
 *   more than twice the scaled error. (3) The error at a sample is carried + generated; the game
 *   resumes at the region's end from the carried state plus the generated error, so later spans
 *   propagate it. Series points carry a basis code: measured, extrapolated, or measured after an
 *   extrapolated region.
 * Checked against flying the demo cruise whole (test/core/gamestep/extrapolate.test.ts: step
 * scaling within 2 % of the flown arrival miss; at 1/60 s semi-implicit Euler 2,243 m
 * extrapolated against 2,250 m flown whole). The window fit is cruder: a power law over a
 * window much shorter than an orbit can miss growth that sets in later. With `warpDt`, or
 * `maxStepsPerSpan` above the region's steps, nothing is extrapolated.
 */
import { SolverError } from '../math/index.ts';
import { bodyState } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import { GameFlight } from './flight.ts';
import { fitPowerLaw, powerLawAt, trendSlope } from './fit.ts';
import { METHOD_ORDER } from './kernel.ts';
import { ReferenceTrack, flyReference, frameAt } from './reference.ts';
import type { PreparedGameStep, SpanDef } from './prepare.ts';
import {
  BASIS_EXTRAPOLATED,
  MAX_WINDOW_FRACTION,
  WINDOW_POINTS,
  type GameExtrapolation,
  type GameExtrapolationWindow,
  type GamePhysics,
  type GameStepPoint,
} from './types.ts';
import { energyOf, energyScale, fromRtn, interpolateNorm, norm3, toRtn } from './measure.ts';
import { fmtM, fmtS } from './format.ts';

/** The span being extrapolated. */
export interface ExtrapolatedSpan {
  readonly def: SpanDef;
  region: { t0: number; t1: number; dt: number } | null;
  extrapolation: GameExtrapolation | null;
}

/** What the extrapolation reads and updates of a game-step run (check.ts). */
export interface ExtrapolationRun {
  readonly system: StarSystem;
  readonly prep: PreparedGameStep;
  readonly physics: GamePhysics;
  readonly flight: GameFlight;
  readonly ref: ReferenceTrack;
  readonly hs: number;
  readonly o: { readonly samples: number; readonly maxSteps: number; readonly windowSteps: number; readonly signal?: { aborted: boolean } };
  readonly notes: string[];
  windowSteps: number;
  status: 'done' | 'diverged';
  divergedAt: number | null;
  firstExceed: (GameStepPoint & { resolution: number }) | null;
  arrival: (GameStepPoint & { body: number }) | null;
  end: GameStepPoint | null;
  offP: number;
  extrapolatedBefore: boolean;
  progress(steps: number): void;
  record(t: number, g: Float64Array, basis: number, forceSample: boolean, addP: number, addV: number, addE: number, part?: number): void;
}

/** The extrapolated region of span s, from the game's state at ta (see the module comment). */
export function extrapolate(run: ExtrapolationRun, s: ExtrapolatedSpan, ta: number): void {
  const prep = run.prep;
  const system = run.system;
  const region = s.region as { t0: number; t1: number; dt: number };
  const tb = region.t1;
  const T = tb - ta;
  const hs = run.hs;
  const order = METHOD_ORDER[run.physics.integrator];
  const n = Math.max(2, Math.ceil((run.o.samples * T) / (s.def.t1 - s.def.t0)));
  const times: number[] = [];
  for (let j = 1; j <= n; j++) times.push(j === n ? tb : ta + (j * T) / n);
  const r0 = new Float64Array(6);
  const c0 = run.ref.at(ta, r0);
  const startState = { r0, c0 };
  // (1) step scaling: coarse flights at H and 2H with 1.5·T/H ≤ the step budget
  let j = 1;
  while ((1.5 * T) / (hs * 2 ** j) > run.o.maxSteps) j++;
  const H = hs * 2 ** j;
  const e1 = regionFlight(run, startState, ta, tb, H, times);
  const e2 = e1.status === 'done' ? regionFlight(run, startState, ta, tb, 2 * H, times) : e1;
  let steps = e1.steps + (e2 === e1 ? 0 : e2.steps);
  const m1 = norm3(e1.end, 0);
  const m2 = norm3(e2.end, 0);
  const p = m1 > 0 && m2 > 0 ? Math.log2(m2 / m1) : NaN;
  const pv = Math.log2(norm3(e2.end, 3) / norm3(e1.end, 3));
  let method: GameExtrapolation['method'] =
    e1.status === 'done' && e2.status === 'done' && p >= 0.6 * order && p <= 1.6 * order + 0.4 ? 'step-scaling' : 'window';
  const scale = method === 'step-scaling' ? (hs / H) ** p : 0;
  const scaleV = method === 'step-scaling' && Number.isFinite(pv) ? (hs / H) ** pv : scale;
  // (2) the window at the game's step: the method for 'window', and for float32 a check that
  // rounding at the game's step does not outgrow the scaled truncation error
  let win: GameExtrapolationWindow | null = null;
  let wDir: number[] | null = null;
  let energyRate = 0;
  if (method === 'window' || run.physics.precision === 'float32') {
    const w = windowFlight(run, startState, ta, Math.min(run.o.windowSteps * hs, MAX_WINDOW_FRACTION * T));
    steps += w.win.steps;
    if (w.status === 'diverged') {
      run.windowSteps += steps;
      run.status = 'diverged';
      run.divergedAt = w.t;
      run.notes.push(`span ${s.def.index}: the game's state became non-finite at t = ${w.t.toFixed(3)} s in the extrapolation window: the flight diverged`);
      return;
    }
    if (method === 'step-scaling') {
      // the scaled error at the window's end, against what the window measured
      const predicted = interpolateNorm(times, e1.dP, ta + w.win.length, ta) * scale;
      const measured = w.win.positionError[w.win.positionError.length - 1] ?? 0;
      if (measured > 2 * predicted) method = 'window';
    }
    win = w.win;
    wDir = w.dir;
    if (method === 'window') energyRate = w.energyRate;
  }
  run.windowSteps += steps;
  // (3) the carried error: the game's state at ta flown with the reference dynamics
  const g = new Float64Array(6);
  run.flight.state(g);
  const carried = flyReference(prep.settings, ta, g, run.flight.central, tb, true);
  const ctrack = new ReferenceTrack(system, carried);
  // (4) the generated error at each sample time, as a vector (step scaling) or laid along the
  // window's last error direction (window)
  const r = new Float64Array(6);
  const B = new Float64Array(6);
  const gen = (k: number, out: number[]): number => {
    const t = times[k];
    if (method === 'step-scaling') {
      for (let c = 0; c < 3; c++) {
        out[c] = e1.dP[k][c] * scale;
        out[3 + c] = e1.dP[k][3 + c] * scaleV;
      }
      return e1.dE[k] * scale;
    }
    const tau = t - ta;
    const w = win as GameExtrapolationWindow;
    const gp = powerLawAt(w.position, tau);
    const gv = powerLawAt(w.velocity, tau);
    const d = wDir as number[];
    const pw = Math.hypot(d[0], d[1], d[2]);
    const vw = Math.hypot(d[3], d[4], d[5]);
    const rc = run.ref.at(t, r);
    bodyState(system, run.physics.gravity === 'central' ? rc : frameAt(prep.settings.frames, t), t, B);
    const dd = [0, 0, 0, 0, 0, 0];
    for (let c = 0; c < 3; c++) {
      dd[c] = pw > 0 ? (d[c] * gp) / pw : 0;
      dd[3 + c] = vw > 0 ? (d[3 + c] * gv) / vw : 0;
    }
    const tmp = new Float64Array(6);
    fromRtn(r, B, dd, tmp);
    for (let c = 0; c < 6; c++) out[c] = tmp[c];
    return energyRate * tau;
  };
  const c6 = new Float64Array(6);
  const gv6 = [0, 0, 0, 0, 0, 0];
  const point = new Float64Array(6);
  let prevT = ta;
  let genEnd = 0;
  let genVEnd = 0;
  for (let k = 0; k < times.length; k++) {
    const t = times[k];
    ctrack.at(t, c6);
    const dE = gen(k, gv6);
    for (let c = 0; c < 6; c++) point[c] = c6[c] + gv6[c];
    const before = run.firstExceed;
    run.record(t, point, BASIS_EXTRAPOLATED, true, 0, 0, dE, Math.hypot(gv6[0], gv6[1], gv6[2]));
    if (!before && run.firstExceed) (run.firstExceed as GameStepPoint & { resolution: number }).resolution = t - prevT;
    const arr = prep.arrival;
    if (arr && !run.arrival && arr.t > prevT && arr.t <= t) {
      run.arrival = { ...(run.end as GameStepPoint), t: arr.t, body: arr.body };
    }
    prevT = t;
    genEnd = Math.hypot(gv6[0], gv6[1], gv6[2]);
    genVEnd = Math.hypot(gv6[3], gv6[4], gv6[5]);
  }
  if (method === 'step-scaling') energyRate = (e1.dE[times.length - 1] * scale) / T;
  ctrack.at(tb, c6);
  run.ref.at(tb, r);
  const carriedError = Math.hypot(c6[0] - r[0], c6[1] - r[1], c6[2] - r[2]);
  run.offP += genEnd;
  run.extrapolatedBefore = true;
  s.extrapolation = {
    method,
    region: T,
    coarseDt: [H, 2 * H],
    coarseError: [m1, m2],
    order: method === 'step-scaling' ? p : (win as GameExtrapolationWindow).position.order,
    window: win,
    energyRate,
    carriedError,
    generatedError: genEnd,
    generatedVelocityError: genVEnd,
    steps,
  };
  // (5) resume the game at tb from the carried state plus the generated error
  for (let c = 0; c < 6; c++) point[c] = c6[c] + gv6[c];
  run.flight.reset(tb, point, carried.central);
  run.notes.push(
    `span ${s.def.index}: ${(T / 86400).toFixed(2)} days extrapolated (${method === 'step-scaling' ? `coarse steps ${fmtS(H)} and ${fmtS(2 * H)}, measured order ${p.toFixed(2)}` : `window of ${fmtS((win as GameExtrapolationWindow).length)}, error ∝ τ^${(win as GameExtrapolationWindow).position.order.toFixed(2)}`}): ` +
      `${fmtM(genEnd)} generated, ${fmtM(carriedError)} carried at the region's end; the game resumes from the carried state plus the generated error`,
  );
}

/** The region flown at step H with the game's physics from the reference state at ta; error vectors at the sample times. */
export function regionFlight(run: ExtrapolationRun, start: { r0: Float64Array; c0: number }, ta: number, tb: number, H: number, times: number[]) {
  const f = new GameFlight({ ...run.flight.setup, burns: [] });
  f.reset(ta, start.r0, start.c0);
  const dP: number[][] = times.map(() => [0, 0, 0, 0, 0, 0]);
  const dE: number[] = times.map(() => 0);
  const g = new Float64Array(6);
  const r = new Float64Array(6);
  const B = new Float64Array(6);
  let k = 0;
  const st = f.fly(tb, H, {
    land: true,
    checkEvery: Number.MAX_SAFE_INTEGER,
    checkpoints: times,
    onCheck: (t) => {
      while (k < times.length - 1 && times[k] < t - 0.5 * H) k++;
      f.state(g);
      const rc = run.ref.at(t, r);
      for (let c = 0; c < 6; c++) dP[k][c] = g[c] - r[c];
      const b = run.physics.gravity === 'central' ? rc : frameAt(run.prep.settings.frames, t);
      bodyState(run.system, b, t, B);
      const mu = run.system.bodies[b].mu;
      const er = energyOf(r, B, mu);
      dE[k] = (energyOf(g, B, mu) - er) / energyScale(er, r, B, mu);
    },
    onSteps: (n) => run.progress(n),
    signal: run.o.signal,
  });
  if (st === 'cancelled') throw new SolverError('game-step', 'cancelled', `cancelled at t = ${f.t} s`, { t: f.t });
  return { status: st, steps: f.steps, dP, dE, end: dP[times.length - 1] };
}

/** The game's step flown for `length` from the reference state at ta; the window's fits and last error direction (RTN). */
export function windowFlight(run: ExtrapolationRun, start: { r0: Float64Array; c0: number }, ta: number, length: number) {
  const hs = run.hs;
  const wf = new GameFlight({ ...run.flight.setup, burns: [] });
  wf.reset(ta, start.r0, start.c0);
  const wT: number[] = [];
  const wP: number[] = [];
  const wV: number[] = [];
  const wE: number[] = [];
  const g = new Float64Array(6);
  const r = new Float64Array(6);
  const B = new Float64Array(6);
  const dir = [0, 0, 0, 0, 0, 0];
  const st = wf.fly(ta + length, hs, {
    land: true,
    checkEvery: Math.max(1, Math.floor(length / hs / WINDOW_POINTS)),
    onCheck: (t) => {
      wf.state(g);
      const rc = run.ref.at(t, r);
      const b = run.physics.gravity === 'central' ? rc : frameAt(run.prep.settings.frames, t);
      bodyState(run.system, b, t, B);
      const mu = run.system.bodies[b].mu;
      const er = energyOf(r, B, mu);
      wT.push(t - ta);
      wP.push(Math.hypot(g[0] - r[0], g[1] - r[1], g[2] - r[2]));
      wV.push(Math.hypot(g[3] - r[3], g[4] - r[4], g[5] - r[5]));
      wE.push((energyOf(g, B, mu) - er) / energyScale(er, r, B, mu));
      toRtn(r, B, g, dir);
    },
    onSteps: (n) => run.progress(n),
    signal: run.o.signal,
  });
  if (st === 'cancelled') throw new SolverError('game-step', 'cancelled', `cancelled at t = ${wf.t} s`, { t: wf.t });
  const win: GameExtrapolationWindow = {
    length,
    steps: wf.steps,
    position: fitPowerLaw(wT, wP),
    velocity: fitPowerLaw(wT, wV),
    t: Float64Array.from(wT),
    positionError: Float64Array.from(wP),
  };
  return { status: st, t: wf.t, win, dir, energyRate: trendSlope(wT, wE) };
}
