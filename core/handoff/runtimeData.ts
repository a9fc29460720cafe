/**
 * Runtime data for a game that flies a burn schedule: the system's bodies and the ship's path over
 * the plan's span as piecewise Chebyshev tracks (core/runtime), so the game puts planets and the
 * ship where the plan says with a few multiply-adds per frame.
 *
 * The ship's path is the schedule flown in the reference dynamics of the game's gravity model
 * (core/gamestep reference.ts: RK45 at its tight tolerance, the same burns at the same steps) —
 * where the plan puts the ship. The game's own integration strays from it by its step error (the
 * retargeting's "after" curve); a game that shows the ship on rails reads this path, a game that
 * flies it reads the schedule. The path is cut at every burn (velocity jumps there) and fitted
 * finer (FINE_FRACTION of the tolerance) within FINE_WINDOW of each burn and periapsis.
 */
import { InputError } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { Plan } from '../plan/index.ts';
import { flyReference, prepareGameStep, type GameBurn } from '../gamestep/index.ts';
import { runtimeEphemeris, type FineWindowInput, type RuntimeEphemeris, type ShipArcInput } from '../runtime/index.ts';
import type { GameSchedule } from './schedule.ts';

/** Half-width of the finer windows around burns and periapses, s. */
export const FINE_WINDOW = 600;

export interface GameRuntimeOptions {
  /** Position tolerance of the bodies' tracks, m (default core/runtime BODY_TOLERANCE, 1 m). */
  bodyTolerance?: number;
  /** Position tolerance of the ship's track, m (default core/runtime SHIP_TOLERANCE, 10 m). */
  shipTolerance?: number;
  /** The ship's track name (default "ship"). */
  shipName?: string;
}

/** Bodies and the ship's path of a schedule for the plan it was made from (see the module comment). */
export function gameRuntimeData(system: StarSystem, plan: Plan, schedule: GameSchedule, options: GameRuntimeOptions = {}): RuntimeEphemeris {
  const p = schedule.physics;
  const prep = prepareGameStep(system, plan, { gravity: p.gravity, burns: p.burns, guidance: 'open-loop' });
  const byId = new Map(schedule.burns.map((b) => [b.id, b]));
  const burns: GameBurn[] = prep.burns.map((b) => {
    const s = byId.get(b.id);
    if (!s) throw new InputError('schedule.burns', `must hold the plan's burn "${b.name}"`, b.id);
    const dv: [number, number, number] = [s.dv[0], s.dv[1], s.dv[2]];
    const spread = p.burns === 'spread' && b.duration > 0;
    return { ...b, dv, dvMag: s.dvMag, t: spread ? s.t + 0.5 * b.duration : s.t, tStart: spread ? s.t : s.t - 0.5 * b.duration, event: null };
  });
  const names = system.bodies.map((b) => b.name);
  const c0 = names.indexOf(schedule.start.central);
  if (c0 < 0) throw new InputError('schedule.start.central', 'must name a body of the system', schedule.start.central);
  if (schedule.t0 !== prep.t0) throw new InputError('schedule.t0', "must be the plan's start (the schedule is made for another plan)", schedule.t0);
  const flight = flyReference({ ...prep.settings, burns, guidance: 'open-loop' }, prep.t0, prep.start.abs, c0, prep.t1, true);
  const arcs: ShipArcInput[] = flight.pieces
    .filter((pc) => pc.t1 > pc.t0 && pc.dense)
    .map((pc) => {
      const dense = pc.dense;
      return {
        t0: pc.t0,
        t1: pc.t1,
        center: pc.central,
        sample: (t: number, out6: Float64Array) => {
          dense?.at(t, out6);
        },
      };
    });
  const breaks = burns
    .flatMap((b) => (p.burns === 'spread' && b.duration > 0 ? [b.tStart, b.tStart + b.duration] : [b.t]))
    .filter((t) => t > prep.t0 && t < prep.t1);
  const events = prep.result.events.filter((e) => e.kind === 'periapsis').map((e) => e.t);
  const fine: FineWindowInput[] = [...burns.map((b) => b.t), ...events]
    .map((t) => ({ t0: Math.max(prep.t0, t - FINE_WINDOW), t1: Math.min(prep.t1, t + FINE_WINDOW) }))
    .filter((w) => w.t1 > w.t0);
  return runtimeEphemeris(system, {
    t0: prep.t0,
    t1: prep.t1,
    bodies: options.bodyTolerance !== undefined ? { tolerance: options.bodyTolerance } : undefined,
    ships: [{ name: options.shipName ?? 'ship', arcs, breaks, fine, tolerance: options.shipTolerance }],
  });
}
