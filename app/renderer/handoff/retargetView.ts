/**
 * "Retarget for my game" in plain words for the panel, read off the core's RetargetResult
 * (core/handoff): the verdict with the reason and the recommendation (and what one click would
 * put in the physics form), the goals table (wanted, flying the plan's own burns in the game,
 * retargeted, tolerance, met), the burns table (step, calendar time, Δv in the VNB frame, change
 * from the plan), the verification in a line, and the notes. A time goal's wanted value is a
 * calendar date and the flights' values its offset from it ("−23 min 44 s", the dates in their
 * hover text), which reads at a glance in a narrow panel; every
 * number goes through a formatter that shows "—" for a value that is not there, never NaN.
 */
import type { RetargetGoal, RetargetResult } from '../../../core/handoff/index.ts';
import type { SystemCalendar } from '../../../core/system/index.ts';
import { compactDate, duration, grouped } from '../format/format.ts';
import { stepText } from '../gamestep/verdict.ts';

export interface GoalRow {
  leg: string;
  name: string;
  wanted: string;
  before: string;
  after: string;
  /** Hover text of the flights' values: the calendar date of a time goal's. */
  beforeTitle: string;
  afterTitle: string;
  tolerance: string;
  met: boolean;
  /** How far the retargeted value is from the wanted one, in tolerances (null when not read). */
  missInTolerances: number | null;
}

export interface BurnRow {
  /** Card number, as on the plan's cards. */
  n: number;
  name: string;
  step: string;
  time: string;
  /** Δv in the VNB frame, m/s, and its magnitude. */
  v: string;
  nrm: string;
  b: string;
  mag: string;
  /** |change from the plan's Δv|, m/s. */
  change: string;
}

/** One click that fills the physics form with what the recommendation found works. */
export interface RecommendedFix {
  label: string;
  dt: number | null;
  precision: 'float64' | null;
}

export interface RetargetView {
  met: boolean;
  word: 'Met' | 'Not met';
  /** The core's message: which goals, or why not (diverged, hits a body). */
  headline: string;
  reason: string | null;
  recommendation: string | null;
  fix: RecommendedFix | null;
  goals: GoalRow[];
  burns: BurnRow[];
  verification: string;
  notes: string[];
}

/** Reasons not met, in words. */
export const FAILURE_WORDS: Record<NonNullable<RetargetResult['failure']>, string> = {
  diverged: "the game's flight diverged: the step is too coarse for the orbit",
  impact: 'in the game the ship hits a body: the step is too coarse for the orbit',
  goals: 'the goals do not come within tolerance',
};

const isTime = (g: RetargetGoal): boolean => g.units === 'days';

/** A goal's value in its units: a calendar date for times, else the value with as many decimals as its tolerance needs. */
export function goalValue(cal: SystemCalendar, g: RetargetGoal, v: number | null): string {
  if (v === null || !Number.isFinite(v)) return '—';
  if (isTime(g)) return compactDate(cal, v, true);
  const scale = g.unitScale ?? 1;
  const units = g.units ?? '';
  const tol = g.tolerance / scale;
  const d = tol > 0 && Number.isFinite(tol) ? Math.min(6, Math.max(0, Math.ceil(-Math.log10(tol)) + 1)) : 3;
  return `${grouped(v / scale, d)}${units === '°' || units === '' ? '' : ' '}${units}`;
}

/** A flight's value of a goal: a time goal's as its offset from the wanted date ("+1.20 s", "−23 min 44 s"), else as goalValue. */
export function goalFlightValue(cal: SystemCalendar, g: RetargetGoal, v: number | null): string {
  if (!isTime(g) || v === null || !Number.isFinite(v)) return goalValue(cal, g, v);
  const d = v - g.wanted;
  return `${d >= 0 ? '+' : ''}${duration(d)}`;
}

/** A goal's tolerance: "± 60 s" for times, "± 1 km", "± 0.01°". */
export function goalTolerance(g: RetargetGoal): string {
  if (!Number.isFinite(g.tolerance)) return '—';
  if (isTime(g)) return `± ${Number(g.tolerance.toPrecision(3))} s`;
  const scale = g.unitScale ?? 1;
  const units = g.units ?? '';
  return `± ${Number((g.tolerance / scale).toPrecision(3))}${units === '°' || units === '' ? '' : ' '}${units}`;
}

const mps = (x: number): string => (Number.isFinite(x) ? (Math.abs(x) < 5e-4 ? 0 : x).toFixed(3) : '—');

/** The recommendation as one click, when it found a step or precision that works. */
export function recommendedFix(r: RetargetResult): RecommendedFix | null {
  const rec = r.recommendation;
  if (!rec) return null;
  if (rec.precision === 'float64') return { label: 'Use float64', dt: null, precision: 'float64' };
  if (rec.dt !== null && Number.isFinite(rec.dt) && rec.dt > 0) return { label: `Use a step of ${stepText(rec.dt)}`, dt: rec.dt, precision: null };
  return null;
}

/** The step as the physics form's step field takes it: "1/120" for a whole rate, else seconds. */
export function stepFieldText(dt: number): string {
  const hz = 1 / dt;
  return Math.abs(hz - Math.round(hz)) < 1e-9 && hz >= 1 ? `1/${Math.round(hz)}` : String(Number(dt.toPrecision(6)));
}

/** The panel's view of a retargeting. */
export function retargetView(cal: SystemCalendar, r: RetargetResult): RetargetView {
  const met = r.status === 'met';
  const goals: GoalRow[] = r.goals.map((g) => ({
    leg: g.leg,
    name: g.name,
    wanted: goalValue(cal, g, g.wanted),
    before: goalFlightValue(cal, g, g.before),
    after: goalFlightValue(cal, g, g.after),
    beforeTitle: goalValue(cal, g, g.before),
    afterTitle: goalValue(cal, g, g.after),
    tolerance: goalTolerance(g),
    met: g.met,
    missInTolerances: g.after === null || !(g.tolerance > 0) ? null : Math.abs(g.after - g.wanted) / g.tolerance,
  }));
  const burns: BurnRow[] = r.schedule.burns.map((b, k) => ({
    n: k + 1,
    name: b.name,
    step: grouped(b.step),
    time: compactDate(cal, b.t, true),
    v: mps(b.dvBurnFrame[0]),
    nrm: mps(b.dvBurnFrame[1]),
    b: mps(b.dvBurnFrame[2]),
    mag: mps(b.dvMag),
    change: mps(Math.hypot(b.change[0], b.change[1], b.change[2])),
  }));
  const v = r.verification;
  const scaled = v.regions.filter((x) => x.how === 'scaled');
  const days = scaled.reduce((s, x) => s + (x.t1 - x.t0), 0) / 86400;
  const verification =
    `${grouped(v.steps)} game steps flown` +
    (v.mode === 'every-step'
      ? ' — every step of the plan'
      : scaled.length > 0
        ? `; ${scaled.length} long coast${scaled.length === 1 ? '' : 's'} (${grouped(days, 1)} d) extrapolated by step scaling`
        : '; nothing extrapolated');
  return {
    met,
    word: met ? 'Met' : 'Not met',
    headline: r.message,
    reason: r.failure ? FAILURE_WORDS[r.failure] : null,
    recommendation: r.recommendation?.text ?? null,
    fix: recommendedFix(r),
    goals,
    burns,
    verification,
    notes: r.notes,
  };
}
