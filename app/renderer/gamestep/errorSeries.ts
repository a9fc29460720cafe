/**
 * What the game-step error lanes draw, read off a GameStepResult: per lane (position error,
 * velocity error, |relative energy error|) the values, a log domain, and the series split into
 * runs by basis, so measured and extrapolated stretches are drawn differently.
 *
 * A stretch between two samples takes the weaker basis of its two ends (extrapolated, then
 * measured after an extrapolated region, then measured): a line is drawn solid only where
 * both of its ends were measured. Neighbouring runs share their boundary sample, so the curve
 * is continuous.
 */
import { BASIS_EXTRAPOLATED, BASIS_MEASURED_PLUS, type GameStepResult } from '../../../core/gamestep/index.ts';
import { logDomain, type LogDomain } from './logAxis.ts';

/** 'measured'; 'extrapolated'; 'carried': measured after an extrapolated region (the game resumed from a state holding its extrapolated error). */
export type RunStyle = 'measured' | 'extrapolated' | 'carried';

export interface Run {
  style: RunStyle;
  /** First and last sample index, inclusive. */
  from: number;
  to: number;
}

const RANK: Record<RunStyle, number> = { measured: 0, carried: 1, extrapolated: 2 };

export function styleOf(code: number): RunStyle {
  return code === BASIS_EXTRAPOLATED ? 'extrapolated' : code === BASIS_MEASURED_PLUS ? 'carried' : 'measured';
}

/** Runs of one style over the samples (see the module comment); one run for a single sample, none for none. */
export function splitByBasis(basis: ArrayLike<number>): Run[] {
  const n = basis.length;
  if (n === 0) return [];
  if (n === 1) return [{ style: styleOf(basis[0]), from: 0, to: 0 }];
  const runs: Run[] = [];
  for (let k = 0; k < n - 1; k++) {
    const a = styleOf(basis[k]);
    const b = styleOf(basis[k + 1]);
    const style = RANK[a] >= RANK[b] ? a : b;
    const last = runs[runs.length - 1];
    if (last && last.style === style) last.to = k + 1;
    else runs.push({ style, from: k, to: k + 1 });
  }
  return runs;
}

export type LaneKey = 'position' | 'velocity' | 'energy';

export interface ErrorLane {
  key: LaneKey;
  label: string;
  /** What the lane's hover text says about it. */
  title: string;
  /** Values drawn (≥ 0), one per sample. */
  values: Float64Array;
  domain: LogDomain | null;
  /** Horizontal reference lines: value and label. */
  lines: { value: number; label: string; kind: 'tolerance' | 'resolution' }[];
}

export interface ErrorLanes {
  t: Float64Array;
  runs: Run[];
  lanes: ErrorLane[];
  /** First time the position error exceeded the tolerance, s; null when it never did. */
  firstExceed: number | null;
  /** Where the game's flight diverged, s, or null. */
  divergedAt: number | null;
  /** Whether any sample is extrapolated or carries extrapolated error (the legend lists those styles only then). */
  hasExtrapolated: boolean;
  hasCarried: boolean;
}

/** The lanes of one game-step result. */
export function errorLanes(r: GameStepResult): ErrorLanes {
  const s = r.series;
  const energy = Float64Array.from(s.energyError, Math.abs);
  const runs = splitByBasis(s.basis);
  const tolerance = { value: r.tolerance, label: 'tolerance', kind: 'tolerance' as const };
  const refErr = r.reference.errorEstimate;
  const resolution = refErr > 0 ? [{ value: refErr, label: 'reference accuracy', kind: 'resolution' as const }] : [];
  return {
    t: s.t,
    runs,
    lanes: [
      {
        key: 'position',
        label: 'Position error',
        title:
          "|game − reference| position, m; the dashed line is the tolerance, the dotted one the reference flight's own accuracy (errors below it are not resolved)",
        values: s.positionError,
        domain: logDomain(s.positionError, [r.tolerance, ...resolution.map((x) => x.value)]),
        lines: [tolerance, ...resolution],
      },
      {
        key: 'velocity',
        label: 'Velocity error',
        title: '|game − reference| velocity, m/s',
        values: s.velocityError,
        domain: logDomain(s.velocityError),
        lines: [],
      },
      {
        key: 'energy',
        label: 'Energy drift',
        title: '|relative error of the specific orbital energy| about the central body: its growth over time is the drift',
        values: energy,
        domain: logDomain(energy),
        lines: [],
      },
    ],
    firstExceed: r.firstExceed ? r.firstExceed.t : null,
    divergedAt: r.status === 'diverged' ? r.divergedAt : null,
    hasExtrapolated: runs.some((x) => x.style === 'extrapolated'),
    hasCarried: runs.some((x) => x.style === 'carried'),
  };
}
