/**
 * What the Timeline draws, read off a PlanResult once per evaluation: lanes (burns, sphere-of-
 * influence spans, events) and three step/line series against time (propellant on board, Δv
 * left, distance to the target body). Nothing here is physics beyond reading the result: the
 * distance series adds the target body's ephemeris position to the result's own samples.
 *
 * Series are plain arrays of (t, value) with jumps written as two points at the same t, so a
 * d3 line draws steps, and `valueAt` reads the value at the cursor by binary search.
 * The lanes of a plan whose truth model is another (n-body) are built in truthSeries.ts.
 */
import type { Plan } from '../../../core/plan/index.ts';
import type { PlanResult, TrajectoryEventKind } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { bodyPosition } from '../../../core/system/index.ts';
import { findBodyIndex } from '../../../core/system/index.ts';
import { bodyColour } from '../scene/palette.ts';

export interface Series {
  t: Float64Array;
  v: Float64Array;
}

export interface BurnBar {
  id: string;
  name: string;
  t: number;
  tStart: number;
  tEnd: number;
  dv: number;
  flagged: 'error' | 'warning' | null;
}

export interface SoiSpan {
  central: number;
  name: string;
  colour: string;
  t0: number;
  t1: number;
}

export interface EventMark {
  t: number;
  kind: TrajectoryEventKind;
  label: string;
}

export interface TimelineData {
  t0: number;
  t1: number;
  burns: BurnBar[];
  soi: SoiSpan[];
  events: EventMark[];
  /** Propellant on board, kg. */
  propellant: Series;
  /** Δv the vehicle can still deliver, m/s. */
  dvLeft: Series;
  /** Distance from the ship to the target body's centre, m (empty without a target). */
  distance: Series;
  targetName: string | null;
  /** Words of the model the lanes show ("patched conics", "n-body"). */
  model: string;
  /** The distance to the target in another model, drawn faint as the comparison (or null). */
  comparison: { label: string; distance: Series } | null;
}

function series(points: [number, number][]): Series {
  const t = new Float64Array(points.length);
  const v = new Float64Array(points.length);
  points.forEach(([a, b], k) => {
    t[k] = a;
    v[k] = b;
  });
  return { t, v };
}

/** Value of a series at time t: linear between points, the later value at a jump, clamped at the ends; NaN when empty. */
export function valueAt(s: Series, t: number): number {
  const n = s.t.length;
  if (n === 0) return NaN;
  if (t <= s.t[0]) return s.v[0];
  if (t >= s.t[n - 1]) return s.v[n - 1];
  let lo = 0;
  let hi = n - 1;
  // Last index with s.t[idx] <= t.
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (s.t[mid] <= t) lo = mid;
    else hi = mid - 1;
  }
  if (lo >= n - 1) return s.v[n - 1];
  const ta = s.t[lo];
  const tb = s.t[lo + 1];
  if (tb <= ta) return s.v[lo + 1];
  return s.v[lo] + ((s.v[lo + 1] - s.v[lo]) * (t - ta)) / (tb - ta);
}

/** Largest number of points in the distance series. */
export const DISTANCE_POINTS = 3000;

/** Words of the model a patched-conic result was flown in (every burn finite or not). */
export const CONIC_LABEL = 'patched conics';

export function timelineData(system: StarSystem, plan: Plan, result: PlanResult, model = CONIC_LABEL): TimelineData {
  const { segments, events, budget } = result;

  const burns: BurnBar[] = budget.rows.map((r) => {
    const sev = r.flags.some((f) => f.severity === 'error') ? 'error' : r.flags.some((f) => f.severity === 'warning') ? 'warning' : null;
    return { id: r.planEventId, name: r.name, t: r.t, tStart: r.tStart, tEnd: r.tEnd, dv: r.dv, flagged: sev };
  });

  const soi: SoiSpan[] = [];
  for (const s of segments) {
    const last = soi[soi.length - 1];
    if (last && last.central === s.central && Math.abs(last.t1 - s.t0) <= 1e-6 * Math.max(1, Math.abs(s.t0))) last.t1 = s.t1;
    else {
      const b = system.bodies[s.central];
      soi.push({ central: s.central, name: b.name, colour: bodyColour(b.colour, b.index), t0: s.t0, t1: s.t1 });
    }
  }

  const marks: EventMark[] = events.map((e) => ({ t: e.t, kind: e.kind, label: e.label }));

  // Propellant on board = mass − payload − dry mass of the stages still attached; stages drop in
  // firing order, one per 'stage' event of the result (plan staging and automatic drops alike).
  const v = plan.vehicle;
  const stageTimes = events.filter((e) => e.kind === 'stage').map((e) => e.t);
  const dryAttached = (dropped: number): number => {
    let d = v.payloadMass;
    for (let k = Math.min(dropped, v.stages.length); k < v.stages.length; k++) d += v.stages[k].dryMass;
    return d;
  };
  const droppedBy = (t: number, inclusive: boolean): number => stageTimes.filter((ts) => (inclusive ? ts <= t : ts < t)).length;
  const prop: [number, number][] = [];
  for (const s of segments) {
    prop.push([s.t0, Math.max(0, s.mass0 - dryAttached(droppedBy(s.t0, true)))]);
    prop.push([s.t1, Math.max(0, s.mass1 - dryAttached(droppedBy(s.t1, false)))]);
  }

  // Δv left: the capacity before the first burn, each row's dvLeft after it (linear through a finite burn).
  const dv: [number, number][] = [[result.t0, budget.capacity]];
  let left = budget.capacity;
  for (const r of budget.rows) {
    dv.push([r.tStart, left]);
    left = r.dvLeft;
    dv.push([r.tEnd, left]);
  }
  dv.push([result.t1, left]);

  const targetIndex = plan.target ? findBodyIndex(system, plan.target.body) : -1;

  return {
    t0: result.t0,
    t1: result.t1,
    burns,
    soi,
    events: marks,
    propellant: series(prop),
    dvLeft: series(dv),
    distance: conicDistance(system, result, targetIndex),
    targetName: targetIndex >= 0 ? system.bodies[targetIndex].name : null,
    model,
    comparison: null,
  };
}

/** Distance from the ship to body `targetIndex` over a patched-conic result, from its own samples (empty for −1). */
export function conicDistance(system: StarSystem, result: PlanResult, targetIndex: number): Series {
  const { segments } = result;
  const ts: number[] = [];
  const ds: number[] = [];
  if (targetIndex >= 0) {
    let total = 0;
    for (const s of segments) total += s.sampleT.length;
    const stride = Math.max(1, Math.ceil(total / DISTANCE_POINTS));
    const c = new Float64Array(3);
    const g = new Float64Array(3);
    for (const s of segments) {
      const n = s.sampleT.length;
      for (let k = 0; k < n; k += k === n - 1 ? 1 : Math.min(stride, n - 1 - k)) {
        const t = s.sampleT[k];
        if (t > s.t1 + 1e-6) break; // a long coast's samples cover one revolution only
        bodyPosition(system, s.central, t, c, 0);
        bodyPosition(system, targetIndex, t, g, 0);
        const dx = c[0] + s.samples[3 * k] - g[0];
        const dy = c[1] + s.samples[3 * k + 1] - g[1];
        const dz = c[2] + s.samples[3 * k + 2] - g[2];
        ts.push(t);
        ds.push(Math.hypot(dx, dy, dz));
        if (k === n - 1) break;
      }
    }
  }
  // in time order (the segments come in time order: sorting is needed only when they do not)
  let ordered = true;
  for (let k = 1; k < ts.length && ordered; k++) ordered = ts[k - 1] <= ts[k];
  if (ordered) return { t: Float64Array.from(ts), v: Float64Array.from(ds) };
  return series(ts.map((t, k) => [t, ds[k]] as [number, number]).sort((a, b) => a[0] - b[0]));
}
