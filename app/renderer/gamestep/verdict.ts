/**
 * The game-step check and its sweep in plain words for the panel: the verdict, the arrival
 * miss, the energy drift per orbit, when the tolerance was first exceeded, what float32 would
 * do at the mission's distances, and the sweep's table with the cheapest pick. Read off the
 * core's results only; every number goes through a formatter that shows "—" for a value that
 * is not there, never NaN.
 */
import type { GameStepResult } from '../../../core/gamestep/index.ts';
import type { PrecisionVerdict, SweepResult } from '../../../core/gamestep/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { compactDate, duration, elapsed, grouped } from '../format/format.ts';
import { INTEGRATOR_NAMES } from './physicsForm.ts';

/** An error length: "4.77 mm", "3.67 m", "22.2 km", "1.21 Gm"; "—" when not finite; "diverged" for the core's overflow marker. */
export function errorLength(m: number | null | undefined): string {
  if (m === null || m === undefined || !Number.isFinite(m)) return '—';
  if (m >= 1e300) return 'diverged';
  const a = Math.abs(m);
  if (a === 0) return '0 m';
  if (a < 1e-3) return `${(m * 1e3).toPrecision(2)} mm`;
  if (a < 1) return `${(m * 1e3).toPrecision(3)} mm`;
  if (a < 1e3) return `${m.toPrecision(3)} m`;
  if (a < 1e9) return `${grouped(m / 1e3, a < 1e4 ? 2 : a < 1e5 ? 1 : 0)} km`;
  return `${(m / 1e9).toPrecision(3)} Gm`;
}

/** An error speed: "2.7 mm/s", "0.41 m/s". */
export function errorSpeed(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  if (v >= 1e300) return 'diverged';
  const a = Math.abs(v);
  if (a === 0) return '0 m/s';
  if (a < 1) return `${(v * 1e3).toPrecision(2)} mm/s`;
  if (a < 1e4) return `${v.toPrecision(3)} m/s`;
  return `${(v / 1e3).toPrecision(3)} km/s`;
}

/** A small dimensionless number: "1.5 × 10⁻¹²"-style as "1.5e−12"; "—" when absent. */
export function ratio(x: number | null | undefined, digits = 1): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  return x.toExponential(digits).replace('-', '\u2212');
}

/** A step: "16.7 ms", "8 s". */
export function stepText(s: number | null | undefined): string {
  if (s === null || s === undefined || !Number.isFinite(s)) return '—';
  return s < 1 ? `${Number((s * 1000).toPrecision(3))} ms` : `${Number(s.toPrecision(4))} s`;
}

export interface VerdictLine {
  key: string;
  label: string;
  value: string;
  /** Extra words after the value (muted). */
  note?: string;
  tone?: 'good' | 'bad' | 'warn';
}

/**
 * The headline word. 'passes': every detail shown is within its tolerance. 'arrival-only': the
 * core's criterion passes (arrival miss and energy drift within tolerance, what the sweep
 * judges) but the path exceeds the tolerance on the way, which the headline says. 'fails': the
 * core's criterion fails. 'diverged': the game's state stopped being finite.
 */
export type VerdictWord = 'passes' | 'arrival-only' | 'fails' | 'diverged';

/** The panel's headline word for each verdict. */
export const VERDICT_WORDS: Record<VerdictWord, string> = {
  passes: 'Passes',
  'arrival-only': 'Passes at arrival only',
  fails: 'Fails',
  diverged: 'Diverged',
};

/** Largest finite position error of the flight's series, m (null when none). */
export function maxPathError(r: GameStepResult): number | null {
  let m: number | null = null;
  for (const x of r.series.positionError) if (Number.isFinite(x) && (m === null || x > m)) m = x;
  return m;
}

export interface GameVerdict {
  word: VerdictWord;
  headline: string;
  lines: VerdictLine[];
  float32: { rows: { span: number; about: string; distance: string; spacing: string; moveRatio: string; rounded: boolean }[]; summary: string };
}

const bodyName = (system: StarSystem, k: number): string => system.bodies[k]?.name ?? `body ${k}`;

/** The verdict of one check (see the module comment). */
export function gameVerdict(system: StarSystem, r: GameStepResult): GameVerdict {
  const cal = system.calendar;
  // the core passes on the arrival and the drift; the path may still exceed the tolerance on the way
  const word: VerdictWord = r.status === 'diverged' ? 'diverged' : !r.passes ? 'fails' : r.firstExceed ? 'arrival-only' : 'passes';
  const pathMax = maxPathError(r);
  const lines: VerdictLine[] = [];
  const a = r.arrival;
  if (a) {
    const where = a.body >= 0 ? `closest approach to ${bodyName(system, a.body)}` : 'end of the plan';
    const basis =
      a.basis === 'extrapolated' || a.extrapolatedPart > 0
        ? `extrapolated${a.extrapolatedPart > 0 ? ` (${errorLength(a.extrapolatedPart)} of it)` : ''}`
        : 'measured';
    lines.push({
      key: 'miss',
      label: 'Arrival miss',
      value: errorLength(a.positionError),
      note: `at ${where}, ${basis}; tolerance ${errorLength(r.tolerance)}`,
      tone: a.positionError <= r.tolerance ? 'good' : 'bad',
    });
    lines.push({ key: 'miss-v', label: 'Speed error', value: errorSpeed(a.velocityError) });
  } else {
    lines.push({
      key: 'miss',
      label: 'Arrival miss',
      value: '—',
      note: r.status === 'diverged' ? 'the flight diverged before arriving' : 'not reached',
      tone: 'bad',
    });
  }
  if (r.maxDriftPerOrbit !== null) {
    lines.push({
      key: 'drift',
      label: 'Energy drift',
      value: `${ratio(r.maxDriftPerOrbit)} per orbit`,
      note: `largest over the spans; tolerance ${ratio(r.energyTolerance, 0)}`,
      tone: r.maxDriftPerOrbit <= r.energyTolerance ? 'good' : 'bad',
    });
  } else {
    lines.push({ key: 'drift', label: 'Energy drift', value: '—', note: 'no span was measured over a whole orbit' });
  }
  if (r.firstExceed) {
    lines.push({
      key: 'exceed',
      label: 'Over tolerance',
      value: elapsed(cal, r.firstExceed.t, r.t0),
      note: `first at ${compactDate(cal, r.firstExceed.t, false)} (${r.firstExceed.basis}, ±${duration(r.firstExceed.resolution)}); largest ${errorLength(pathMax)}; tolerance ${errorLength(r.tolerance)}`,
      tone: 'bad',
    });
  } else {
    lines.push({ key: 'exceed', label: 'Over tolerance', value: 'never', note: 'the position error stays within the tolerance', tone: 'good' });
  }
  if (r.status === 'diverged' && r.divergedAt !== null) {
    lines.push({ key: 'diverged', label: 'Diverged', value: elapsed(cal, r.divergedAt, r.t0), note: "the game's state stopped being finite", tone: 'bad' });
  }
  const st = r.stats;
  const flownParts = [`flown ${duration(st.flownTime)}`];
  if (st.warpTime > 0) flownParts.push(`long-step coast ${duration(st.warpTime)}`);
  if (st.extrapolatedTime > 0) flownParts.push(`extrapolated ${duration(st.extrapolatedTime)}`);
  lines.push({
    key: 'spans',
    label: 'Mission',
    value: flownParts.join(', '),
    note: `${grouped(st.gameSteps)} game steps flown (the whole mission at this step: ${grouped(st.missionSteps)})`,
  });
  lines.push({
    key: 'reference',
    label: 'Reference',
    value: `${INTEGRATOR_NAMES[r.reference.stats.method as keyof typeof INTEGRATOR_NAMES] ?? r.reference.stats.method}, rtol ${ratio(r.reference.rtol, 0)}`,
    note: `its own error ≈ ${errorLength(r.reference.errorEstimate)}`,
  });

  // float32 at the mission's distances
  const rows = r.float32.map((f) => {
    const span = r.spans.find((s) => s.index === f.span);
    const centre = r.physics.gravity === 'all' ? 0 : (span?.central ?? 0);
    return {
      span: f.span,
      about: bodyName(system, centre),
      distance: errorLength(f.distance),
      spacing: errorLength(f.spacing),
      moveRatio: Number.isFinite(f.stepMoveToSpacing) ? f.stepMoveToSpacing.toPrecision(2) : '—',
      rounded: f.stepMoveToSpacing < 1,
    };
  });
  let worst = r.float32[0];
  for (const f of r.float32) if (worst && f.spacing > worst.spacing) worst = f;
  let summary = '';
  if (worst) {
    const span = r.spans.find((s) => s.index === worst.span);
    const centre = r.physics.gravity === 'all' ? 0 : (span?.central ?? 0);
    summary = `In float32, positions ${worst.distance > 0 ? `${errorLength(worst.distance)} from ${bodyName(system, centre)}` : 'here'} move in steps of ${errorLength(worst.spacing)}`;
    summary +=
      worst.spacing > r.tolerance ? ` — more than the tolerance (${errorLength(r.tolerance)}).` : ` — within the tolerance (${errorLength(r.tolerance)}).`;
    if (rows.some((x) => x.rounded)) summary += ' Where a step moves the craft less than that spacing, float32 rounds the motion away.';
    if (r.physics.rebase)
      summary += ` With the floating origin at ${errorLength(r.physics.rebase.distance)} the spacing stays at or below ${errorLength(worst.rebasedSpacing)}.`;
    summary +=
      r.physics.precision === 'float32'
        ? ` This run flew in float32${r.physics.rebase ? ' with a floating origin' : ''}: it ${word === 'passes' ? 'passes' : word === 'arrival-only' ? 'passes at arrival only' : 'does not pass'}.`
        : ' Sweep flies the plan in float32 with and without a floating origin for the verdict.';
  }
  const headline =
    word === 'diverged'
      ? "The game's flight diverged."
      : word === 'passes'
        ? `The game flies this plan within tolerance.`
        : word === 'arrival-only' && r.firstExceed
          ? `The arrival is within tolerance (${errorLength(a?.positionError)} of ${errorLength(r.tolerance)}), but the path exceeds it on the way: up to ${errorLength(pathMax)}, first ${elapsed(cal, r.firstExceed.t, r.t0)}.`
          : `The game misses: ${a && a.positionError > r.tolerance ? `arrival off by ${errorLength(a.positionError)}` : r.maxDriftPerOrbit !== null && r.maxDriftPerOrbit > r.energyTolerance ? 'energy drifts more than allowed' : 'outside tolerance'}.`;
  return { word, headline, lines, float32: { rows, summary } };
}

export interface SweepView {
  rows: { integrator: string; name: string; step: string; cost: string; cheapest: boolean; passes: boolean }[];
  cheapest: string;
  precision: { verdict: PrecisionVerdict; words: string; rows: { label: string; miss: string; drift: string; passes: boolean }[] } | null;
  notes: string[];
}

export const PRECISION_WORDS: Record<PrecisionVerdict, string> = {
  float32: 'float32 suffices',
  'float32-rebase': 'float32 needs a floating origin',
  float64: 'float64 is needed (float32 fails even with a floating origin)',
  none: 'fails even in float64 at this step',
};

/** The sweep's table: per integrator the largest passing step and its cost, the cheapest marked. */
export function sweepView(s: SweepResult): SweepView {
  const rows = s.best.map((b) => ({
    integrator: b.integrator,
    name: INTEGRATOR_NAMES[b.integrator] ?? b.integrator,
    step: b.dt === null ? `none ≥ ${stepText(s.ladder[0])}` : stepText(b.dt),
    cost: b.missionEvals === null ? '—' : grouped(b.missionEvals),
    cheapest: s.cheapest !== null && s.cheapest.integrator === b.integrator && b.dt === s.cheapest.dt,
    passes: b.dt !== null,
  }));
  const cheapest = s.cheapest
    ? `Cheapest: ${INTEGRATOR_NAMES[s.cheapest.integrator]} at ${stepText(s.cheapest.dt)} (${grouped(s.cheapest.missionEvals)} gravity evaluations over the mission).`
    : `No integrator passes at any step from ${stepText(s.ladder[0])} to ${stepText(s.ladder[s.ladder.length - 1])}.`;
  const p = s.precision;
  return {
    rows,
    cheapest,
    precision: p
      ? {
          verdict: p.verdict,
          words: `At ${INTEGRATOR_NAMES[p.integrator]}, ${stepText(p.dt)}: ${PRECISION_WORDS[p.verdict]}.`,
          rows: p.rows.map((x) => ({
            label: x.precision + (x.rebase ? ` + floating origin ${errorLength(x.rebase.distance)}` : ''),
            miss: errorLength(x.arrivalMiss),
            drift: x.maxDriftPerOrbit === null ? '—' : `${ratio(x.maxDriftPerOrbit)}/orbit`,
            passes: x.passes,
          })),
        }
      : null,
    notes: s.notes.map((n) => n.replace(/ \(see gameStepCheck\)/, '')),
  };
}
