/**
 * One model of the ship's motion (core/dynamics/shipForces.ts): how far apart the same flight
 * lands when flown about different origin bodies, and when flown by the game-step reference and
 * by the n-body verification.
 *
 * Figures, each beside the earlier formulation computed here in a few plain lines:
 * - frame independence: the same span flown about Tessel and about Ilmar (RK45 through the
 *   front door at rtol 1e-13, atol 1e-16 of |x|), compared relative to the star — one hour
 *   before the demo's conic SOI exit, and the 1.8-day departure leg (the departure burn to the
 *   conic SOI exit). Before: "origin accelerated by gravity sums" — the origin's acceleration
 *   taken as the other bodies' pull on it, while the bodies move on their conics.
 * - model agreement: the game-step reference with 'all' gravity and the n-body verification,
 *   the same burns (open-loop), 5.9 days from the n-body SOI-exit state through the mid-course
 *   burn. Before: "star fixed, no indirect term" (the reference) against the gravity-sum
 *   formulation (the verification), both in the star frame of the cruise.
 * References: the n-body figures are also flown by odex (Hairer's ODEX, npm) on the star-centred
 * equations written plainly (test/core/dynamics/starCentred.ts).
 */
import { readFileSync } from 'node:fs';
import { ShipForces } from '../../core/dynamics/shipForces.ts';
import { evaluate } from '../../core/conic/evaluate.ts';
import { prepareGameStep } from '../../core/gamestep/prepare.ts';
import { ReferenceTrack, flyReference } from '../../core/gamestep/reference.ts';
import { propagate } from '../../core/integrate/propagate.ts';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { NBodyModel, burnActions, conicStart, flyNBody, type NBodyState } from '../../core/nbody/verify.ts';
import { bodyPosition, bodyState } from '../../core/system/ephemeris.ts';
import type { StarSystem } from '../../core/system/model.ts';
import { demoPlan } from '../fixtures/demoPlan.ts';
import { flyStarCentred } from '../core/dynamics/starCentred.ts';
import { printTable } from './table.ts';

const SYSTEM_PATH = new URL('../../assets/systems/ilmar.system.json', import.meta.url);
const DAY = 86400;
const RTOL = 1e-13;

type Accel = (t: number, x: Float64Array, v: Float64Array, out: Float64Array) => void;

/** Before: relative to o, ẍ = −μ_o x/|x|³ + Σ_{k≠o} μ_k [(p_k − x)/|p_k − x|³ − p_k/|p_k|³] (the origin pulled by the others). */
function gravitySums(sys: StarSystem, o: number): Accel {
  const p = [0, 0, 0];
  return (t, x, _v, out) => {
    const r3 = Math.hypot(x[0], x[1], x[2]) ** 3;
    for (let i = 0; i < 3; i++) out[i] = (-sys.bodies[o].mu * x[i]) / r3;
    for (const b of sys.bodies) {
      if (b.index === o) continue;
      bodyPosition(sys, b.index, t, p, o);
      const d3 = Math.hypot(p[0] - x[0], p[1] - x[1], p[2] - x[2]) ** 3;
      const p3 = Math.hypot(p[0], p[1], p[2]) ** 3;
      for (let i = 0; i < 3; i++) out[i] += b.mu * ((p[i] - x[i]) / d3 - p[i] / p3);
    }
  };
}

/** Before (game-step reference, star frame): every body pulls, the star fixed, no indirect term. */
function starFixed(sys: StarSystem): Accel {
  const p = [0, 0, 0];
  return (t, x, _v, out) => {
    out[0] = out[1] = out[2] = 0;
    for (const b of sys.bodies) {
      bodyPosition(sys, b.index, t, p, 0);
      const d3 = Math.hypot(p[0] - x[0], p[1] - x[1], p[2] - x[2]) ** 3;
      for (let i = 0; i < 3; i++) out[i] += (b.mu * (p[i] - x[i])) / d3;
    }
  };
}

/** Flies star-relative state s from t0 to t1 about body o with `accel`, adding impulses; returns the star-relative end position. */
function fly(
  sys: StarSystem,
  accel: Accel,
  o: number,
  t0: number,
  s: ArrayLike<number>,
  t1: number,
  impulses: { t: number; dv: ArrayLike<number> }[] = [],
): number[] {
  const b = new Float64Array(6);
  bodyState(sys, o, t0, b, 0);
  const x = Float64Array.from([0, 1, 2], (i) => s[i] - b[i]);
  const v = Float64Array.from([3, 4, 5], (i) => s[i] - b[i]);
  let t = t0;
  for (const stop of [...impulses.filter((q) => q.t > t0 && q.t < t1), { t: t1, dv: [0, 0, 0] }]) {
    const r = propagate({ accel, t0: t, x0: x, v0: v, tEnd: stop.t, rtol: RTOL, atol: 1e-16 * Math.hypot(x[0], x[1], x[2]) });
    x.set(r.x);
    v.set(r.v);
    for (let i = 0; i < 3; i++) v[i] += stop.dv[i];
    t = stop.t;
  }
  bodyState(sys, o, t1, b, 0);
  return [0, 1, 2].map((i) => x[i] + b[i]);
}

function toStar(sys: StarSystem, s: NBodyState): number[] {
  const b = new Float64Array(6);
  bodyState(sys, s.origin, s.t, b, 0);
  return [0, 1, 2, 3, 4, 5].map((i) => (i < 3 ? s.x[i] : s.v[i - 3]) + b[i]);
}

const dist = (a: ArrayLike<number>, b: ArrayLike<number>): number => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

export async function run(): Promise<void> {
  const { system: sys } = parseSystemFile(readFileSync(SYSTEM_PATH, 'utf8'));
  const tessel = sys.indexById.tessel;
  const conic = evaluate(sys, demoPlan, { samplesPerSegment: 0 });
  const tDep = conic.budget.rows[0].t;
  const tExit = conic.events.find((e) => e.kind === 'soi-exit')!.t;
  const { actions } = burnActions(demoPlan, conic);
  const model = new NBodyModel(sys, { rtol: 1e-12 });
  const start = conicStart(conic);
  const dep = toStar(
    sys,
    flyNBody(
      model,
      start,
      actions.filter((a) => a.t <= tDep),
      tDep,
    ).state,
  );
  const hour = toStar(sys, flyNBody(model, start, actions, tExit - 3600).state);
  const about = (o: number): Accel => {
    // one instance per origin (the model's origin is a field)
    const f = new ShipForces(sys);
    f.origin = o;
    return f.accel;
  };
  const rows: (string | number)[][] = [];
  for (const [name, t0, s0] of [
    ['1 h before Tessel SOI exit: about Tessel vs about Ilmar', tExit - 3600, hour],
    ['departure leg (1.8 d): about Tessel vs about Ilmar', tDep, dep],
  ] as const) {
    const before = dist(fly(sys, gravitySums(sys, tessel), tessel, t0, s0, tExit), fly(sys, gravitySums(sys, 0), 0, t0, s0, tExit));
    const aT = fly(sys, about(tessel), tessel, t0, s0, tExit);
    const aS = fly(sys, about(0), 0, t0, s0, tExit);
    const odex = flyStarCentred(sys, t0, s0, [], tExit, 1e-15);
    rows.push([name, before, dist(aT, aS), dist(aT, odex), before / dist(aT, aS)]);
  }
  printTable(['frame independence', 'before: origin accelerated by gravity sums, m', 'after, m', 'after about Tessel vs odex, m', 'before/after'], rows);

  // model agreement from the n-body SOI-exit state, 5.9 days with the mid-course burn
  const exit = flyNBody(model, start, [...actions, { kind: 'checkpoint', t: tExit, id: 'x' }], tExit).checkpoints.get('x')!;
  const s0 = toStar(sys, exit);
  const tEnd = tExit + 5.9 * DAY;
  const later = actions.filter((a) => a.t >= tExit).flatMap((a) => (a.kind === 'impulse' ? [{ t: a.t, dv: a.dv }] : []));
  const before = dist(fly(sys, starFixed(sys), 0, tExit, s0, tEnd, later), fly(sys, gravitySums(sys, 0), 0, tExit, s0, tEnd, later));
  const prep = prepareGameStep(sys, demoPlan, { gravity: 'all', guidance: 'open-loop', result: conic });
  const ref = new ReferenceTrack(sys, flyReference(prep.settings, tExit, Float64Array.from(s0), 0, tEnd, true));
  const r6 = new Float64Array(6);
  ref.at(tEnd, r6);
  const n = toStar(
    sys,
    flyNBody(
      model,
      exit,
      actions.filter((a) => a.t >= tExit),
      tEnd,
    ).state,
  );
  const after = dist(r6, n);
  const odex = flyStarCentred(sys, tExit, s0, later, tEnd, 1e-15);
  printTable(
    ['model agreement', 'before: star fixed, no indirect term (vs gravity sums), m', 'after, m', 'after n-body vs odex, m', 'before/after'],
    [["game-step 'all' reference vs n-body, 5.9 d from SOI exit", before, after, dist(n, odex), before / after]],
  );
}
