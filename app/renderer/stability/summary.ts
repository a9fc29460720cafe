/**
 * The stability check in plain words for the panel: the run's trustworthiness (energy error),
 * the flags, the note when moons were merged, the pair table with each closest approach placed
 * on a log bar against the 3-mutual-Hill-radius flag threshold, and how long a run of N years
 * will take (from the measured step rate of analysis/checkJobs.ts's estimate; the merge rule is
 * the core's own: with mergeMoons 'auto' moons are merged when flying them needs more than the
 * step budget, core/checks/stability.ts).
 */
import type { StarSystem } from '../../../core/system/index.ts';
import { CLOSE_ENCOUNTER_HILL, GLADMAN_SPACING, type StabilityFlagCode, type StabilityResult } from '../../../core/checks/index.ts';
import type { StabilityEstimate } from '../analysis/checkJobs.ts';
import { grouped } from '../format/format.ts';
import { integratorName } from '../../../core/io/index.ts';

export const FLAG_WORDS: Record<StabilityFlagCode, string> = {
  'hill-criterion': 'Too close for Hill stability',
  'close-encounter': 'Close encounter',
  'crossing-orbits': 'Orbits cross',
  ejection: 'Ejected',
  collision: 'Collision',
};

/** Relative energy errors below this say the run is trustworthy for these checks (a judgement, common practice for symplectic runs). */
export const ENERGY_GOOD = 1e-6;

export interface StabilitySummary {
  /** "No flags", or "2 flags". */
  headline: string;
  ok: boolean;
  energy: string;
  energyOk: boolean;
  run: string;
  merged: string | null;
  flags: { words: string; message: string; severity: 'warning' | 'error'; when: string | null }[];
}

function years(y: number): string {
  return `${grouped(y, y < 10 ? 2 : 0)} year${y === 1 ? '' : 's'}`;
}

export function stabilitySummary(system: StarSystem, r: StabilityResult): StabilitySummary {
  const Y = system.calendar.yearLength;
  const e = r.energy.maxRelativeError;
  const energyOk = Number.isFinite(e) && e < ENERGY_GOOD;
  const flags = r.flags.map((f) => ({
    words: FLAG_WORDS[f.code] ?? f.code,
    message: f.message,
    severity: f.severity,
    when: f.t === null ? 'at the epoch' : `after ${years(f.t / Y)}`,
  }));
  const n = flags.length;
  return {
    headline:
      n === 0
        ? `No flags over ${years(r.years)}: no crossing orbits, no close encounters (under ${CLOSE_ENCOUNTER_HILL} mutual Hill radii), no ejections or collisions.`
        : `${n} flag${n === 1 ? '' : 's'} over ${years(r.span / Y)}${r.status === 'collision' ? ' (the run stopped at a collision)' : ''}.`,
    ok: n === 0,
    energy: `largest ${Number.isFinite(e) ? e.toExponential(1).replace('-', '\u2212') : '—'}, at the end ${Number.isFinite(r.energy.finalRelativeError) ? r.energy.finalRelativeError.toExponential(1).replace('-', '\u2212') : '—'}`,
    energyOk,
    run: `${integratorName(r.method)}, step ${grouped(r.h / system.calendar.dayLength, 3)} days, ${grouped(r.steps)} steps`,
    merged: r.mergedMoons ? r.mergeReason : null,
    flags,
  };
}

export interface PairRow {
  names: string;
  spacing: string;
  closest: string;
  /** Bar: closest approach as a fraction of the bar's width on a log scale from 1 R_H to `maxHill`, and the 3-R_H threshold's place. */
  bar: number;
  threshold: number;
  flagged: boolean;
  /** Epoch spacing under Gladman's 2√3. */
  hill: boolean;
}

/** The pairs, closest first, on a shared log scale (1 to the largest closest approach, at least 10 R_H). */
export function pairRows(system: StarSystem, r: StabilityResult): { rows: PairRow[]; maxHill: number } {
  const name = (k: number) => system.bodies[k]?.name ?? `body ${k}`;
  const finite = r.pairs.map((p) => p.minHill).filter((v) => Number.isFinite(v));
  const maxHill = Math.max(10, ...finite);
  const pos = (v: number) => (Number.isFinite(v) && v > 1 ? Math.min(1, Math.log(v) / Math.log(maxHill)) : 0);
  const rows = [...r.pairs]
    .sort((a, b) => a.minHill - b.minHill)
    .map((p) => ({
      names: `${name(p.a)} – ${name(p.b)}`,
      spacing: Number.isFinite(p.spacing) ? grouped(p.spacing, 1) : '—',
      closest: Number.isFinite(p.minHill) ? grouped(p.minHill, 1) : '—',
      bar: pos(p.minHill),
      threshold: pos(CLOSE_ENCOUNTER_HILL),
      flagged: p.minHill < CLOSE_ENCOUNTER_HILL,
      hill: p.spacing < GLADMAN_SPACING,
    }));
  return { rows, maxHill };
}

export interface RunEstimate {
  seconds: number;
  steps: number;
  merged: boolean;
  /** The core would refuse this span (more steps than its budget even with moons merged). */
  refused: boolean;
  text: string;
}

/** How long `years` will take with this estimate and merge choice. */
export function runEstimate(est: StabilityEstimate, yearsWanted: number, mergeMoons: boolean | 'auto'): RunEstimate | null {
  if (!(yearsWanted > 0) || !Number.isFinite(yearsWanted)) return null;
  const span = yearsWanted * est.yearLength;
  const stepsMoons = Math.ceil(span / est.moons.h);
  const merged = est.hasMoons && (mergeMoons === true || (mergeMoons === 'auto' && stepsMoons > est.maxSteps));
  const mode = merged ? est.merged : est.moons;
  const steps = merged ? Math.ceil(span / est.merged.h) : stepsMoons;
  const seconds = steps / Math.max(1, mode.stepsPerSecond);
  const refused = steps > est.maxSteps;
  const words = refused
    ? `too long: ${grouped(steps)} steps, more than the budget of ${grouped(est.maxSteps)}${merged ? ' even with moons merged' : ''}`
    : `${seconds < 1 ? 'under a second' : `about ${durationWords(seconds)}`} here (${stepsText(steps)} steps${merged ? ', moons merged into their planets' : ''})`;
  return { seconds, steps, merged, refused, text: words };
}

function stepsText(n: number): string {
  if (n >= 1e6) return `${(n / 1e6).toPrecision(2)} million`;
  return grouped(n);
}

/** "under a second", "6 s", "2 min". */
export function durationWords(s: number): string {
  if (!Number.isFinite(s)) return '—';
  if (s < 1) return 'under a second';
  if (s < 90) return `${Math.round(s)} s`;
  if (s < 5400) return `${Math.round(s / 60)} min`;
  return `${(s / 3600).toFixed(1)} h`;
}
