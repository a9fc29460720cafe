/**
 * The game-step flight and its reference as paths for the System view: the check's track
 * (positions relative to the star at the series' sample times) re-expressed, span by span,
 * relative to the span's central body at each sample time, the way the plan's own path is
 * drawn (a parking orbit closes around its planet instead of smearing along the planet's
 * motion). Reading the ephemeris at the sample times is all this does.
 */
import type { GameStepResult } from '../../../core/gamestep/index.ts';
import { bodyPosition } from '../../../core/system/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { DIVERGED } from './logAxis.ts';

export interface TrackPath {
  /** Central body whose frame the positions are in. */
  central: number;
  /** Positions relative to the central body, m, 3 per point. */
  game: Float64Array;
  reference: Float64Array;
}

/** One path per span with at least two finite samples (a diverged tail is cut off). */
export function trackPaths(system: StarSystem, r: GameStepResult): TrackPath[] {
  const { t, game, reference } = r.track;
  const span = r.series.span;
  const out: TrackPath[] = [];
  const b = [0, 0, 0];
  let k = 0;
  while (k < t.length) {
    const s = span[k];
    let end = k;
    while (end < t.length && span[end] === s) end++;
    // a span's first sample repeats the previous span's last one, so the paths join
    const from = k > 0 ? k - 1 : k;
    const central = r.spans.find((x) => x.index === s)?.central ?? 0;
    const g: number[] = [];
    const ref: number[] = [];
    for (let i = from; i < end; i++) {
      const gx = game[3 * i];
      const gy = game[3 * i + 1];
      const gz = game[3 * i + 2];
      if (!(Math.abs(gx) < DIVERGED && Math.abs(gy) < DIVERGED && Math.abs(gz) < DIVERGED)) break;
      bodyPosition(system, central, t[i], b);
      g.push(gx - b[0], gy - b[1], gz - b[2]);
      ref.push(reference[3 * i] - b[0], reference[3 * i + 1] - b[1], reference[3 * i + 2] - b[2]);
    }
    if (g.length >= 6) out.push({ central, game: Float64Array.from(g), reference: Float64Array.from(ref) });
    k = end;
  }
  return out;
}
