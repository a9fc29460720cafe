import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import type { Plan } from '../../../../core/plan/plan.ts';
import { truthReport } from '../../../../core/target/index.ts';
import type { TruthState } from '../../../../app/renderer/analysis/truthStore.ts';
import { timelineData, valueAt } from '../../../../app/renderer/timeline/series.ts';
import { nbodyDistance, nbodyEvents, nbodySoiSpans, timelineReport, truthTimelineData } from '../../../../app/renderer/timeline/truthSeries.ts';
import { demoPlan } from '../../../fixtures/demoPlan.ts';
import { demoSystem } from '../../../core/plan/helpers.ts';

const system = demoSystem();
/** The crossing state (relative to the body) is not read by the timeline; a zero placeholder. */
const AT: [number, number, number, number, number, number] = [0, 0, 0, 0, 0, 0];
const index = (id: string) => system.bodies.findIndex((b) => b.id === id);
const tessel = index('tessel');
const ochre = index('ochre');
const quill = index('quill');
const DAY = 86400;

function minOf(v: Float64Array): number {
  let m = Infinity;
  for (const x of v) m = Math.min(m, x);
  return m;
}

describe('sphere-of-influence spans of an n-body flight', () => {
  it('start body, then the parent of each body left and each body entered, up to the end', () => {
    const spans = nbodySoiSpans(
      system,
      [
        { t: 2 * DAY, kind: 'exit', body: tessel, state: AT },
        { t: 240 * DAY, kind: 'entry', body: ochre, state: AT },
      ],
      tessel,
      0,
      243 * DAY,
    );
    expect(spans.map((s) => [s.name, s.t0 / DAY, s.t1 / DAY])).toEqual([
      ['Tessel', 0, 2],
      ['Ilmar', 2, 240],
      ['Ochre', 240, 243],
    ]);
  });

  it('leaves no empty span for changes at the same time, and nothing after the end', () => {
    // into Quill's sphere and straight out again: back in Tessel's, one span; a change after the end is ignored
    const spans = nbodySoiSpans(
      system,
      [
        { t: 0, kind: 'entry', body: quill, state: AT },
        { t: DAY, kind: 'entry', body: quill, state: AT },
        { t: DAY, kind: 'exit', body: quill, state: AT },
        { t: 5 * DAY, kind: 'exit', body: tessel, state: AT },
        { t: 9 * DAY, kind: 'entry', body: ochre, state: AT },
      ],
      tessel,
      0,
      8 * DAY,
    );
    expect(spans.map((s) => [s.name, s.t0 / DAY, s.t1 / DAY])).toEqual([
      ['Quill', 0, 1],
      ['Tessel', 1, 5],
      ['Ilmar', 5, 8],
    ]);
  });
});

describe('distance to the target over n-body samples', () => {
  /** A straight pass at speed v, nearest (d from the target) at t = 0, sampled every dt from −n/2·dt: r(t) = √(d² + (v t)²). */
  function pass(n: number, d: number, v: number, dt: number) {
    const t = new Float64Array(n);
    const target = new Float64Array(3 * n);
    for (let k = 0; k < n; k++) {
      t[k] = (k - Math.floor(n / 2)) * dt;
      target.set([v * t[k], d, 0], 3 * k);
    }
    return { t, target };
  }

  it('is |r| at every sample when they are few', () => {
    const s = pass(101, 4e6, 3e3, 60);
    const d = nbodyDistance(s, 3000);
    expect(d.t.length).toBe(101);
    for (let k = 0; k < 101; k++) expect(d.v[k]).toBe(Math.hypot(3e3 * s.t[k], 4e6, 0));
  });

  it('past the point budget keeps the first, the last, the nearest and the farthest samples, in time order', () => {
    const n = 50_001;
    const s = pass(n, 4e6, 3e3, 60);
    const d = nbodyDistance(s, 1000);
    expect(d.t.length).toBeLessThanOrEqual(1002);
    expect(d.t.length).toBeGreaterThan(900);
    expect(d.t[0]).toBe(s.t[0]);
    expect(d.t[d.t.length - 1]).toBe(s.t[n - 1]);
    for (let k = 1; k < d.t.length; k++) expect(d.t[k]).toBeGreaterThan(d.t[k - 1]);
    // the closest approach of the pass is the sample at t = 0, exactly d
    expect(minOf(d.v)).toBe(4e6);
    expect(d.t[d.v.indexOf(4e6)]).toBe(0);
    expect(Math.max(...d.v)).toBe(Math.hypot(3e3 * s.t[0], 4e6, 0));
  });

  it('is empty without samples relative to a target', () => {
    expect(nbodyDistance(null).t.length).toBe(0);
    expect(nbodyDistance({ t: Float64Array.from([0, 1]), target: null }).t.length).toBe(0);
  });
});

describe('events of an n-body flight', () => {
  const schedule = {
    events: [
      { kind: 'start' as const, t: 0, label: 'start about Tessel' },
      { kind: 'burn' as const, t: 100, label: 'burn: Departure' },
      { kind: 'periapsis' as const, t: 100, label: 'periapsis at Tessel (the conic path)' },
      { kind: 'closest-approach' as const, t: 200 * DAY, label: 'closest approach (the conic path)' },
      { kind: 'burn' as const, t: 241 * DAY, label: 'burn: Capture' },
      { kind: 'end' as const, t: 242 * DAY, label: 'end of plan' },
    ].map((e) => ({ ...e, central: 0, body: -1, distance: 0, altitude: 0, planEventId: null })),
  };
  const soiChanges = [
    { t: 2 * DAY, kind: 'exit' as const, body: tessel, state: AT },
    { t: 239 * DAY, kind: 'entry' as const, body: ochre, state: AT },
  ];
  const none = { t: new Float64Array(0), v: new Float64Array(0) };

  it("the schedule's burns and ends, the flight's SOI changes and its arrival periapsis, in time order; none of the conic path's own", () => {
    const marks = nbodyEvents(
      system,
      schedule,
      { t1: 242 * DAY, impact: null, soiChanges, nbodyArrival: { t: 241 * DAY - 60, altitude: 443e3, e: 1.6, i: 0.4 } },
      ochre,
      none,
    );
    expect(marks.map((m) => m.kind)).toEqual(['start', 'burn', 'soi-exit', 'soi-entry', 'periapsis', 'burn', 'end']);
    expect(marks[2].label).toBe("leaves Tessel's sphere of influence");
    expect(marks[3].label).toBe("enters Ochre's sphere of influence");
    expect(marks[4].label).toMatch(/^arrival periapsis at Ochre, 443 km altitude$/);
  });

  it('without an arrival: the closest approach of the distance series; an impact ends the flight', () => {
    const distance = { t: Float64Array.from([0, 100 * DAY, 150 * DAY, 200 * DAY]), v: Float64Array.from([9e10, 2e10, 8e9, 1e10]) };
    const marks = nbodyEvents(system, schedule, { t1: 242 * DAY, impact: { t: 220 * DAY, body: ochre }, soiChanges, nbodyArrival: null }, ochre, distance);
    expect(marks.map((m) => m.kind)).toEqual(['start', 'burn', 'soi-exit', 'closest-approach', 'impact', 'soi-entry']);
    expect(marks[3].t).toBe(150 * DAY);
    expect(marks[3].label).toMatch(/Ochre, 8\.000 Gm/);
    expect(marks[4].label).toBe('impact on Ochre');
  });
});

describe('the Timeline in the plan’s truth model', () => {
  const state = (plan: Plan, report: TruthState['report'], generation = 1): TruthState => ({
    model: plan.truthModel ?? 'conic',
    report,
    revision: 1,
    generation,
    pending: false,
    progress: 1,
    ms: 0,
    refreshMs: 0,
    error: null,
    docRevision: 1,
    docGeneration: 1,
  });

  it('shows the plan’s evaluation in patched conics', () => {
    const evaluation = evaluate(system, demoPlan);
    expect(timelineReport(demoPlan, state(demoPlan, null))).toBeNull();
    const d = truthTimelineData(system, demoPlan, evaluation, null);
    expect(d.model).toBe('patched conics');
    expect(d.comparison).toBeNull();
    expect(d.soi.map((s) => s.name)).toEqual(timelineData(system, demoPlan, evaluation).soi.map((s) => s.name));
  });

  it('n-body: the lanes follow the n-body flight, which misses Ochre, with the patched-conic distance, which reaches it, as the comparison', () => {
    // the demo's impulsive burns flown through n-body gravity miss Ochre by millions of km (issue 12)
    const plan: Plan = { ...demoPlan, truthModel: 'nbody' };
    const evaluation = evaluate(system, plan);
    const report = truthReport(system, plan);
    expect(timelineReport(plan, state(plan, report))).toBe(report);
    expect(timelineReport(plan, state(plan, report, 0))).toBeNull(); // a report of another document
    expect(timelineReport(demoPlan, state(demoPlan, report))).toBeNull(); // a report of another model
    const d = truthTimelineData(system, plan, evaluation, report);
    expect(d.model).toBe('n-body');
    // SOI: Tessel, then the star for good (the conic flight ends about Ochre)
    expect(d.soi.map((s) => s.name)).toEqual(['Tessel', 'Ilmar']);
    expect(timelineData(system, plan, evaluation).soi.at(-1)!.name).toBe('Ochre');
    expect(d.soi[1].t0).toBe(report.nbody!.soiChanges[0].t);
    // distance: the samples' own |r − r_Ochre|, never inside Ochre's sphere of influence
    const tg = report.nbody!.samples!.target!;
    let nearest = Infinity;
    for (let k = 0; k < tg.length; k += 3) nearest = Math.min(nearest, Math.hypot(tg[k], tg[k + 1], tg[k + 2]));
    expect(minOf(d.distance.v)).toBe(nearest);
    expect(nearest).toBeGreaterThan(system.bodies[ochre].derived.soiRadius);
    // the comparison: the patched-conic flight reaches a 400 km periapsis (within 10 km tolerance, the plan's own)
    const cmp = d.comparison!;
    expect(cmp.label).toBe('patched conics');
    expect(minOf(cmp.distance.v)).toBeLessThan(system.bodies[ochre].radius + 410e3);
    // events: the flight's own, with its closest approach where it has no arrival
    expect(d.events.some((e) => e.kind === 'soi-entry')).toBe(false);
    expect(d.events.find((e) => e.kind === 'closest-approach')!.label).toMatch(/closest approach to Ochre/);
    // the burns, propellant and Δv left are the schedule's
    const schedule = timelineData(system, report.plan, report.conic);
    expect(d.burns).toEqual(schedule.burns);
    expect(valueAt(d.dvLeft, d.t1)).toBe(valueAt(schedule.dvLeft, d.t1));
  });

  it('finite burns: the lanes are the finite-burn flight, the impulsive distance the comparison', () => {
    // the plan's burns as written (impulsive) are its evaluation; the report flies every burn finite
    const plan: Plan = { ...demoPlan, truthModel: 'finite' };
    const evaluation = evaluate(system, plan);
    const report = truthReport(system, plan);
    const d = truthTimelineData(system, plan, evaluation, report);
    expect(d.model).toBe('finite burns');
    const finite = timelineData(system, report.plan, report.conic);
    expect(d.soi).toEqual(finite.soi);
    expect(d.burns).toEqual(finite.burns);
    // finite burns start and end as events of the flight; the impulsive evaluation has none
    expect(d.events.some((e) => e.kind === 'burn-start')).toBe(true);
    expect(evaluation.events.some((e) => e.kind === 'burn-start')).toBe(false);
    expect(Array.from(d.comparison!.distance.v)).toEqual(Array.from(timelineData(system, plan, evaluation).distance.v));
  });
});
