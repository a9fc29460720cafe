/**
 * The flyby reports of a plan read in n-body: each flyby plan event's pass measured from the
 * n-body flight (core/nbody verifyNBody), through the same report builder as the patched-conic
 * reading (core/conic passReport), so the two models' rows mean the same thing.
 *
 * - The stay: the n-body entry into the body's sphere at or before the marker time, else the
 *   first after it, and the exit that follows. The marker time is the patched-conic reading's
 *   periapsis of that pass (inside its stay), or, when that reading found no pass, the last timed
 *   burn before the marker in plan order (the plan's start without one).
 * - v∞ in, the B-plane: the osculating hyperbola about the body at the n-body entry state; v∞ out:
 *   the one at the exit state (two-body asymptotes, Curtis, Orbital Mechanics for Engineering
 *   Students, §8.9 — from memory). freeDv = |v∞ out − v∞ in|.
 * - Periapsis: the approach flown on in n-body from the entry state without the stay's burns (as
 *   the patched-conic report takes the incoming hyperbola's) to the first x·v = 0, rising, about
 *   the body — 'probe'; when that flight finds none (it enters a moon's sphere first, or leaves),
 *   the osculating hyperbola's at entry — 'osculating'. The flight is not capped like the arrival
 *   probe (PROBE_MAX): a giant's sphere is crossed in months.
 * - dvBurned: the n-body burns (|Δv| as flown) between entry and exit.
 */
import type { StarSystem } from '../system/index.ts';
import type { FlybyReport, Plan, PlanResult } from '../plan/index.ts';
import { findBodyIndex } from '../system/index.ts';
import { conicInfo, createConicInfo, passReport } from '../conic/index.ts';
import { NBodyModel, flyNBody, type NBodyModelOptions, type NBodyResult } from '../nbody/index.ts';

/** The periapsis flight ends this long after the osculating periapsis time at entry, as a margin (× the time to it). */
const PERIAPSIS_MARGIN = 0.5;

const infoEntry = createConicInfo();

export interface NBodyFlybyOptions extends NBodyModelOptions {
  signal?: { aborted: boolean };
}

/** The flyby reports of `plan` measured from its n-body flight (see the module comment); `conic` is the patched-conic reading of the same plan. */
export function nbodyFlybyReports(
  system: StarSystem,
  plan: Pick<Plan, 'events'>,
  nbody: Pick<NBodyResult, 'soiChanges' | 'burns'>,
  conic: Pick<PlanResult, 't0' | 'flybys'>,
  options: NBodyFlybyOptions = {},
): FlybyReport[] {
  const out: FlybyReport[] = [];
  let model: NBodyModel | null = null;
  let lastBurn = conic.t0;
  for (const ev of plan.events) {
    if (ev.type === 'burn' && ev.t !== null) lastBurn = Math.max(lastBurn, ev.t);
    if (ev.type !== 'flyby') continue;
    const k = findBodyIndex(system, ev.body);
    if (k < 0) continue;
    const tMark = conic.flybys?.find((f) => f.planEventId === ev.id)?.tPeriapsis ?? lastBurn;
    // the stay: the last entry at or before the marker, else the first after it
    const changes = nbody.soiChanges;
    let entry = -1;
    for (let i = 0; i < changes.length; i++) {
      const c = changes[i];
      if (c.kind !== 'entry' || c.body !== k) continue;
      if (c.t <= tMark || entry < 0) entry = i;
      if (c.t > tMark) break;
    }
    if (entry < 0) continue;
    const inn = changes[entry];
    let exit = -1;
    for (let i = entry + 1; i < changes.length; i++) {
      if (changes[i].kind === 'exit' && changes[i].body === k) {
        exit = i;
        break;
      }
    }
    const tExit = exit >= 0 ? changes[exit].t : null;
    let dvBurned = 0;
    for (const b of nbody.burns)
      if (b.t >= inn.t && (tExit === null || b.t <= tExit)) dvBurned += Math.hypot(b.dvInertial[0], b.dvInertial[1], b.dvInertial[2]);
    // the periapsis of the approach: flown on from the entry without burns
    const mu = system.bodies[k].mu;
    const osc = conicInfo(mu, inn.state, infoEntry);
    const dtp = osc.n > 0 ? -osc.M / osc.n : Number.NaN;
    let periapsis: { t: number; radius: number; method: 'probe' | 'osculating' } = { t: inn.t + dtp, radius: osc.rp, method: 'osculating' };
    if (Number.isFinite(dtp) && dtp > 0) {
      model ??= new NBodyModel(system, options);
      const start = { t: inn.t, origin: k, x: Float64Array.from(inn.state.slice(0, 3)), v: Float64Array.from(inn.state.slice(3, 6)) };
      const fly = flyNBody(model, start, [], inn.t + dtp * (1 + PERIAPSIS_MARGIN), { periapsisOf: k, signal: options.signal });
      const p = fly.periapsis;
      if (p && p.origin === k) periapsis = { t: p.t, radius: Math.hypot(p.x[0], p.x[1], p.x[2]), method: 'probe' };
    }
    const rep = passReport(system, {
      planEventId: ev.id,
      name: ev.name,
      body: k,
      tEntry: inn.t,
      stateIn: inn.state,
      tExit,
      stateOut: exit >= 0 ? changes[exit].state : null,
      dvBurned,
      periapsis,
    });
    if (rep) out.push(rep);
  }
  return out;
}
