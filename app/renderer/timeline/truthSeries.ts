/**
 * The Timeline of the plan in its truth model (DESIGN.md, "The plan's truth model"), read off the
 * truth report (analysis/truthStore.ts) once per report, never per frame:
 * - patched conics: the plan's evaluation (series.ts).
 * - finite burns: the report's patched-conic flight with every burn finite; the impulsive
 *   evaluation's distance to the target beside it as the comparison.
 * - n-body: burns, propellant and Δv left from the schedule's patched-conic evaluation (the same
 *   burns at the same times with the same masses); the sphere-of-influence spans from the n-body
 *   flight's own SOI changes; the events: the schedule's burns and staging at their times, the
 *   n-body flight's SOI entries and exits, its arrival periapsis at the target (its closest
 *   approach when it has none) and an impact; the distance to the target from the n-body samples,
 *   with the schedule's patched-conic distance beside it as the comparison.
 * Reading the report is all this does: no flight is computed here.
 */
import type { NBodyResult } from '../../../core/nbody/index.ts';
import type { Plan, PlanResult, TrajectoryEventKind, TruthModel } from '../../../core/plan/index.ts';
import { planTruthModel, truthModelLabel } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { findBodyIndex } from '../../../core/system/index.ts';
import type { TruthReport } from '../../../core/target/index.ts';
import type { TruthState } from '../analysis/truthStore.ts';
import { distance as km } from '../format/format.ts';
import { bodyColour } from '../scene/palette.ts';
import { CONIC_LABEL, DISTANCE_POINTS, conicDistance, timelineData, type EventMark, type Series, type SoiSpan, type TimelineData } from './series.ts';

/** Short words for the model the lanes show (the Timeline's corner is narrow). */
const SHORT: Readonly<Record<TruthModel, string>> = { conic: CONIC_LABEL, finite: 'finite burns', nbody: 'n-body' };

/** The Timeline's word for a model ("n-body"; "finite burns" for patched conics with every burn finite). */
export function timelineModelLabel(model: TruthModel): string {
  return SHORT[model];
}

/**
 * The truth report the Timeline shows: the last report of the plan's truth model for this document
 * (even while a newer one is computed, as the System view draws it), or null in patched conics and
 * before the first report.
 */
export function timelineReport(plan: Plan, truth: TruthState): TruthReport | null {
  const model = planTruthModel(plan);
  const r = truth.report;
  if (model === 'conic' || !r || r.model !== model || truth.generation !== truth.docGeneration) return null;
  return r;
}

/**
 * Sphere-of-influence spans of an n-body flight: the start body from t0, then the body each SOI
 * change leads into (an exit into the parent of the body left, an entry into the body entered),
 * up to t1 (the end of the flight or its impact). Changes at the same time leave no empty span.
 */
export function nbodySoiSpans(system: StarSystem, changes: NBodyResult['soiChanges'], start: number, t0: number, t1: number): SoiSpan[] {
  const spans: SoiSpan[] = [];
  const open = (central: number, t: number) => {
    const b = system.bodies[central];
    spans.push({ central, name: b.name, colour: bodyColour(b.colour, b.index), t0: t, t1 });
  };
  open(start, t0);
  for (const c of changes) {
    if (!(c.t < t1)) break;
    const next = c.kind === 'exit' ? system.bodies[c.body].parentIndex : c.body;
    if (next < 0) continue;
    const last = spans[spans.length - 1];
    if (next === last.central) continue;
    last.t1 = Math.max(last.t0, c.t);
    if (last.t1 <= last.t0) spans.pop();
    const prev = spans[spans.length - 1];
    if (prev && prev.central === next) prev.t1 = t1;
    else open(next, Math.max(c.t, t0));
  }
  return spans;
}

/**
 * Distance from the ship to the target over the n-body samples (positions relative to the target,
 * xyz interleaved), at most `maxPoints` points: past that each run of samples keeps its nearest
 * and its farthest point in time order, so a periapsis passage stays in the series whatever the
 * decimation. Empty without samples relative to a target.
 */
export function nbodyDistance(samples: { t: Float64Array; target: Float64Array | null } | null, maxPoints = DISTANCE_POINTS): Series {
  const target = samples?.target;
  const ts = samples?.t;
  if (!ts || !target || ts.length === 0) return { t: new Float64Array(0), v: new Float64Array(0) };
  const n = ts.length;
  const r = (k: number) => Math.hypot(target[3 * k], target[3 * k + 1], target[3 * k + 2]);
  if (n <= maxPoints) {
    const v = new Float64Array(n);
    for (let k = 0; k < n; k++) v[k] = r(k);
    return { t: Float64Array.from(ts), v };
  }
  const run = Math.ceil(n / Math.max(1, Math.floor((maxPoints - 2) / 2)));
  const t = new Float64Array(maxPoints + 2);
  const v = new Float64Array(maxPoints + 2);
  let m = 0;
  const push = (k: number, d: number) => {
    t[m] = ts[k];
    v[m] = d;
    m++;
  };
  push(0, r(0));
  for (let a = 1; a < n - 1; a += run) {
    const b = Math.min(n - 1, a + run);
    let kMin = a;
    let kMax = a;
    let dMin = Infinity;
    let dMax = -Infinity;
    for (let k = a; k < b; k++) {
      const d = r(k);
      if (d < dMin) {
        dMin = d;
        kMin = k;
      }
      if (d > dMax) {
        dMax = d;
        kMax = k;
      }
    }
    if (kMin === kMax) push(kMin, dMin);
    else if (kMin < kMax) {
      push(kMin, dMin);
      push(kMax, dMax);
    } else {
      push(kMax, dMax);
      push(kMin, dMin);
    }
  }
  push(n - 1, r(n - 1));
  return { t: t.slice(0, m), v: v.slice(0, m) };
}

/** Events of the schedule that are the same in every model: when the burns fire and the stages drop. */
const SCHEDULE_KINDS: ReadonlySet<TrajectoryEventKind> = new Set<TrajectoryEventKind>(['start', 'burn-start', 'burn', 'burn-end', 'stage', 'end']);

/**
 * The events of an n-body flight (see the module comment): the schedule's burns and staging from
 * `schedule` (the patched-conic evaluation of the burn schedule flown), and the flight's own SOI
 * changes, arrival periapsis (else closest approach, from `distance`), and impact; in time order.
 */
export function nbodyEvents(
  system: StarSystem,
  schedule: Pick<PlanResult, 'events'>,
  nb: Pick<NBodyResult, 't1' | 'impact' | 'soiChanges' | 'nbodyArrival'>,
  targetIndex: number,
  distance: Series,
): EventMark[] {
  const tEnd = nb.impact ? nb.impact.t : nb.t1;
  const marks: EventMark[] = [];
  for (const e of schedule.events) {
    if (!SCHEDULE_KINDS.has(e.kind) || e.t > tEnd) continue;
    if (e.kind === 'end' && nb.impact) continue;
    marks.push({ t: e.t, kind: e.kind, label: e.label });
  }
  const name = (k: number) => system.bodies[k]?.name ?? 'a body';
  for (const c of nb.soiChanges) {
    marks.push(
      c.kind === 'exit'
        ? { t: c.t, kind: 'soi-exit', label: `leaves ${name(c.body)}'s sphere of influence` }
        : { t: c.t, kind: 'soi-entry', label: `enters ${name(c.body)}'s sphere of influence` },
    );
  }
  if (targetIndex >= 0) {
    const a = nb.nbodyArrival;
    if (a) marks.push({ t: a.t, kind: 'periapsis', label: `arrival periapsis at ${name(targetIndex)}, ${km(a.altitude)} altitude` });
    else if (distance.t.length > 0) {
      let k = 0;
      for (let j = 1; j < distance.v.length; j++) if (distance.v[j] < distance.v[k]) k = j;
      marks.push({ t: distance.t[k], kind: 'closest-approach', label: `closest approach to ${name(targetIndex)}, ${km(distance.v[k])} from its centre` });
    }
  }
  if (nb.impact) marks.push({ t: nb.impact.t, kind: 'impact', label: `impact on ${name(nb.impact.body)}` });
  return marks.sort((x, y) => x.t - y.t);
}

/**
 * What the Timeline draws for the plan: its evaluation in patched conics (or until a report of its
 * truth model is there), else the report's flight in that model (see the module comment).
 */
export function truthTimelineData(system: StarSystem, plan: Plan, evaluation: PlanResult, report: TruthReport | null): TimelineData {
  if (!report || report.model === 'conic') return timelineData(system, plan, evaluation);
  const targetIndex = plan.target ? findBodyIndex(system, plan.target.body) : -1;
  if (report.model === 'finite') {
    const d = timelineData(system, report.plan, report.conic, SHORT.finite);
    const impulsive = conicDistance(system, evaluation, targetIndex);
    return { ...d, comparison: impulsive.t.length > 0 ? { label: CONIC_LABEL, distance: impulsive } : null };
  }
  const nb = report.nbody;
  if (!nb) return timelineData(system, plan, evaluation);
  const base = timelineData(system, report.plan, report.conic, SHORT.nbody);
  const start = nb.samples && nb.samples.origin.length > 0 ? nb.samples.origin[0] : (report.conic.segments[0]?.central ?? 0);
  const tEnd = nb.impact ? nb.impact.t : nb.t1;
  const distance = nbodyDistance(nb.samples);
  return {
    ...base,
    soi: nbodySoiSpans(system, nb.soiChanges, start, nb.t0, tEnd),
    events: nbodyEvents(system, report.conic, nb, targetIndex, distance),
    distance,
    comparison: base.distance.t.length > 0 ? { label: CONIC_LABEL, distance: base.distance } : null,
  };
}

/** A title for the Timeline's model label: the model's full words, and whether the figures are of an earlier version of the plan. */
export function timelineModelTitle(model: TruthModel, shown: TruthModel, stale: boolean): string {
  if (shown !== model) return `The plan's truth model is ${truthModelLabel(model)}: its flight is being computed; the lanes show patched conics until then`;
  const words = `The lanes show the flight in the plan's truth model: ${truthModelLabel(model)}`;
  return stale ? `${words} (for the plan before the last edit; updating)` : words;
}
