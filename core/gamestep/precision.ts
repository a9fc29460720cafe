/**
 * Float32 precision table of the game-step check: per span, the mission's largest distance from
 * the game's frame centre and speed, their binary32 spacings (IEEE 754-2019 binary32), and how a
 * step's position and velocity increments compare with them (an increment below the spacing is
 * rounded away: the game cannot represent the motion).
 */
import { ulp32 } from './float32.ts';
import type { GameRebase } from './flight.ts';
import type { Float32Row } from './types.ts';

/** A span's largest distance (m), speed (m/s) and gravity (m/s²) in the game's frame. */
export interface SpanExtent {
  readonly def: { readonly index: number };
  readonly dist: number;
  readonly speed: number;
  readonly accel: number;
}

/** The binary32 spacing rows of the spans at the game's step hs (s). */
export function float32Table(spans: readonly SpanExtent[], hs: number, rebase: GameRebase | null): Float32Row[] {
  return spans.map((s) => {
    const spacing = ulp32(Math.min(s.dist, 3.4e38));
    const speedSpacing = ulp32(Math.min(s.speed, 3.4e38));
    const stepMove = s.speed * hs;
    const stepKick = s.accel * hs;
    return {
      span: s.def.index,
      distance: s.dist,
      spacing,
      speed: s.speed,
      speedSpacing,
      stepMove,
      stepMoveToSpacing: stepMove / spacing,
      stepKick,
      stepKickToSpacing: stepKick / speedSpacing,
      rebasedSpacing: rebase ? ulp32(rebase.distance) : null,
    };
  });
}
