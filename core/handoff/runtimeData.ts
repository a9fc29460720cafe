/**
 * Runtime data for a game that flies a burn schedule: the system's bodies and the ship's path over
 * the plan's span as piecewise Chebyshev tracks (core/runtime), so the game puts planets and the
 * ship where the plan says with a few multiply-adds per frame.
 *
 * The ship's path is the plan's: its burns at their planned times flown in the reference dynamics of
 * the game's gravity model (core/gamestep reference.ts: RK45 at its tight tolerance; 'central'
 * gravity is the patched-conic model) — where the plan puts the ship. A game flying the retargeted
 * schedule with its own integrator strays from it by the retargeting's "after" curve; a game that
 * shows the ship on rails reads this path, a game that flies it reads the schedule. The path is cut
 * at every burn (velocity jumps there) and fitted finer (FINE_FRACTION of the tolerance) within
 * FINE_WINDOW of each burn and periapsis.
 */
import type { StarSystem } from '../system/index.ts';
import type { Plan } from '../plan/index.ts';
import { prepareGameStep, type GameBurn, type GamePhysics } from '../gamestep/index.ts';
import type { GameSchedule } from './schedule.ts';
import { runtimeEphemeris, type FineWindowInput, type RuntimeEphemeris, type ShipArcInput } from '../runtime/index.ts';

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

/**
 * Bodies and the ship's path of the plan, for a game with the given gravity and burn model (or a
 * schedule's: its physics) — see the module comment.
 */
export function gameRuntimeData(
  system: StarSystem,
  plan: Plan,
  game: Pick<GamePhysics, 'gravity' | 'burns'> | GameSchedule,
  options: GameRuntimeOptions = {},
): RuntimeEphemeris {
  const physics = 'physics' in game ? game.physics : game;
  const prep = prepareGameStep(system, plan, { gravity: physics.gravity, burns: physics.burns, guidance: 'open-loop' });
  const arcs: ShipArcInput[] = prep.reference.flight.pieces
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
  const spread = (b: GameBurn) => physics.burns === 'spread' && b.duration > 0;
  const breaks = prep.burns.flatMap((b) => (spread(b) ? [b.tStart, b.tStart + b.duration] : [b.t])).filter((t) => t > prep.t0 && t < prep.t1);
  const periapses = prep.result.events.filter((e) => e.kind === 'periapsis').map((e) => e.t);
  const fine: FineWindowInput[] = [...prep.burns.map((b) => b.t), ...periapses]
    .map((t) => ({ t0: Math.max(prep.t0, t - FINE_WINDOW), t1: Math.min(prep.t1, t + FINE_WINDOW) }))
    .filter((w) => w.t1 > w.t0);
  return runtimeEphemeris(system, {
    t0: prep.t0,
    t1: prep.t1,
    bodies: options.bodyTolerance !== undefined ? { tolerance: options.bodyTolerance } : undefined,
    ships: [{ name: options.shipName ?? 'ship', arcs, breaks, fine, tolerance: options.shipTolerance }],
  });
}
