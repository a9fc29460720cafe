/**
 * How the game-step check obtains each burn's Δv when the burn is flown.
 *
 * - 'resolve' (default): a game executing the plan solves its burns from its own state, as
 *   Waymark does when it evaluates the plan: the solved part (transfer, capture, plane, apsis;
 *   core/conic/solveBurn.ts) is computed at the burn from the flight's state relative to the
 *   plan's central body of the burn, plus the plan's frame components (burnFrame.ts), scaled by
 *   the fraction the vehicle could deliver. So a mid-course 'transfer' removes the error the
 *   departure left, as it would in the game. A spread burn is solved at its start for the
 *   burn's centre: the state is carried there on the central body's conic (universal-variable
 *   Kepler, core/orbit/kepler.ts), as an autopilot plans the burn from its current orbit.
 * - 'open-loop': the inertial Δv of the plan's evaluation, as recorded in its budget rows.
 * The reference flight uses the same guidance with its own state, so the two differ only by
 * the game's integration, precision and step-grid timing.
 *
 * A solve that fails falls back to the plan's inertial Δv (and the caller says so).
 */
import { WaymarkError } from '../math/index.ts';
import { propagateKepler } from '../orbit/index.ts';
import { bodyState } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import { burnToInertial } from '../plan/index.ts';
import type { GameBurn } from './burns.ts';
import { solveBurn } from '../conic/index.ts';

export type GameGuidance = 'resolve' | 'open-loop';

const b6 = new Float64Array(6);
const s6 = new Float64Array(6);
const dvS = [0, 0, 0];
const dvC = [0, 0, 0];
const r3 = [0, 0, 0];
const v3 = [0, 0, 0];

/**
 * The Δv (inertial, m/s) of `burn` applied at time t from absolute (star-frame) state abs6,
 * into out. `atStart`: a spread burn starting now (solved for its centre). Returns false when
 * a solve failed and the plan's Δv was used.
 */
export function burnDv(
  system: StarSystem,
  burn: GameBurn,
  guidance: GameGuidance,
  t: number,
  abs6: ArrayLike<number>,
  atStart: boolean,
  out: [number, number, number] | Float64Array,
): boolean {
  const ev = burn.event;
  if (guidance === 'open-loop' || !ev) {
    out[0] = burn.dv[0];
    out[1] = burn.dv[1];
    out[2] = burn.dv[2];
    return true;
  }
  const c = burn.central;
  bodyState(system, c, t, b6);
  for (let i = 0; i < 6; i++) s6[i] = abs6[i] - b6[i];
  let tSolve = t;
  try {
    if (atStart && burn.t !== t) {
      propagateKepler(system.bodies[c].mu, s6, burn.t - t, s6);
      tSolve = burn.t;
    }
    solveBurn({ system, central: c, t: tSolve, state: s6 }, ev.solve, dvS);
    r3[0] = s6[0];
    r3[1] = s6[1];
    r3[2] = s6[2];
    v3[0] = s6[3];
    v3[1] = s6[4];
    v3[2] = s6[5];
    burnToInertial(ev.frame, r3, v3, ev.dv, dvC);
  } catch (e) {
    if (!(e instanceof WaymarkError)) throw e;
    out[0] = burn.dv[0];
    out[1] = burn.dv[1];
    out[2] = burn.dv[2];
    return false;
  }
  const f = burn.fraction;
  out[0] = (dvS[0] + dvC[0]) * f;
  out[1] = (dvS[1] + dvC[1]) * f;
  out[2] = (dvS[2] + dvC[2]) * f;
  if (!(Number.isFinite(out[0]) && Number.isFinite(out[1]) && Number.isFinite(out[2]))) {
    out[0] = burn.dv[0];
    out[1] = burn.dv[1];
    out[2] = burn.dv[2];
    return false;
  }
  return true;
}

/** Duration of a spread burn delivering |Δv| = dv at the burn's thrust and propellant flow (Tsiolkovsky), s. */
export function spreadDuration(burn: GameBurn, dv: number): number {
  if (burn.mdot > 0 && burn.thrust > 0) {
    const m1 = burn.mass0 * Math.exp((-dv * burn.mdot) / burn.thrust);
    return (burn.mass0 - m1) / burn.mdot;
  }
  return burn.dvMag > 0 && burn.duration > 0 ? (dv * burn.duration) / burn.dvMag : 0;
}
