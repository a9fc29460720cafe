import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { issuesInWords } from '../../../core/io/issueWords.ts';
import { parsePlanFile, serializePlanFile, type PlanSystemRef } from '../../../core/io/planFile.ts';
import { resolveBurns, staleResolvedIssues } from '../../../core/io/resolvedBurns.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { ValidationError } from '../../../core/math/errors.ts';
import type { Plan } from '../../../core/plan/plan.ts';
import { findBodyIndex } from '../../../core/system/index.ts';
import { truthReport } from '../../../core/target/truth.ts';
import { clonePlan, demoPlan } from '../../fixtures/demoPlan.ts';

const system = parseSystemFile(readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
const REF: PlanSystemRef = { kind: 'path', path: '../systems/ilmar.system.json' };

type Json = Record<string, any>;
const saved = (plan: Plan): string => serializePlanFile(plan, REF, resolveBurns(system, plan));
const burnsOf = (text: string): Json[] => (JSON.parse(text).events as Json[]).filter((e) => e.type === 'burn');

/** Reads a saved text back and runs the check a loader runs with the system at hand. */
function reopen(text: string) {
  const parsed = parsePlanFile(text);
  return { parsed, issues: staleResolvedIssues(system, parsed.plan, parsed.resolved) };
}

// Independent frame axes, by plain cross products (not core/math/frames.ts).
const cross = (a: number[], b: number[]): number[] => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const unit = (a: number[]): number[] => {
  const n = Math.hypot(a[0], a[1], a[2]);
  return [a[0] / n, a[1] / n, a[2] / n];
};
const combine = (c: number[], axes: number[][]): number[] => [0, 1, 2].map((k) => c[0] * axes[0][k] + c[1] * axes[1][k] + c[2] * axes[2][k]);

/** A ship in a low inclined orbit of Tessel given as a state, one fixed burn at the start time. */
function burnAtStart(frame: 'vnb' | 'rtn', dv: [number, number, number]): { plan: Plan; r: number[]; v: number[] } {
  const tessel = system.bodies[findBodyIndex(system, 'tessel')];
  const rMag = tessel.radius + 320e3;
  const vc = Math.sqrt(tessel.mu / rMag);
  const s = Math.sin((24 * Math.PI) / 180);
  const c = Math.cos((24 * Math.PI) / 180);
  const r = [rMag * 0.8, rMag * 0.6, 0];
  // circular speed, tilted 24° out of the reference plane, with a small radial part (so V ≠ T)
  const v = [-0.6 * vc * c + 40, 0.8 * vc * c + 30, vc * s];
  const plan: Plan = {
    name: 'Frame check',
    description: '',
    vehicle: { name: 'Probe', payloadMass: 500, stages: [{ name: 'Only', dryMass: 300, propellantMass: 900, isp: 310, thrust: 4000 }] },
    start: { kind: 'state', body: 'tessel', epoch: 1.5e7, r: [r[0], r[1], r[2]], v: [v[0], v[1], v[2]] },
    events: [
      { type: 'burn', id: 'kick', name: 'Kick', t: 1.5e7, frame, dv, solve: { kind: 'fixed' }, mode: 'impulsive', pointing: 'velocity' },
      { type: 'coast', id: 'wait', name: 'Wait', until: { kind: 'duration', dt: 1800 } },
    ],
    target: null,
    reserve: { percent: 0, absolute: 0 },
    end: null,
  };
  return { plan, r, v };
}

describe('resolved burns written on save', () => {
  it("the demo's blocks are the patched-conic evaluation's budget rows, every burn, figure for figure", () => {
    const rows = evaluate(system, demoPlan).budget.rows;
    const burns = burnsOf(saved(demoPlan));
    expect(burns.length).toBe(rows.length);
    expect(rows.length).toBeGreaterThan(3);
    burns.forEach((b, k) => {
      const row = rows[k];
      expect(b.id).toBe(row.planEventId);
      const r = b.resolved as Json;
      expect(r.note).toMatch(/^derived: written by Waymark/);
      expect(r.model).toBe('conic');
      expect(r.frame).toBe(b.frame);
      // the file holds the shortest decimal of each double, which reads back to the same double
      expect(r.dv_frame_mps).toEqual(row.dvFrame);
      expect(r.dv_inertial_mps).toEqual(row.dvInertial);
      expect(r.dv_magnitude_mps).toBe(row.dv);
      expect(r.t_start_s).toBe(row.tStart);
      expect(r.t_end_s).toBe(row.tEnd);
      expect(r.duration_s).toBe(row.duration);
      expect(r.propellant_kg).toBe(row.propellantUsed);
      expect(r.mass_after_kg).toBe(row.massAfter);
    });
    // the solved burns are what the file lacked before: a transfer with dv_mps [0, 0, 0] now has its Δv
    const solved = burns.find((b) => b.solve?.kind === 'transfer');
    expect(solved?.dv_mps).toEqual([0, 0, 0]);
    expect(solved?.resolved.dv_magnitude_mps).toBeGreaterThan(1000);
  });

  it('an n-body plan writes the schedule figures its truth report budgets; a finite one the finite evaluation', () => {
    const { plan } = burnAtStart('vnb', [150, -20, 35]);
    for (const model of ['nbody', 'finite'] as const) {
      const p = { ...clonePlan(plan), truthModel: model };
      const truth = truthReport(system, p, { samples: false });
      const burns = burnsOf(saved(p));
      expect(burns.length).toBe(truth.budget.rows.length);
      burns.forEach((b, k) => {
        const row = truth.budget.rows[k];
        expect(b.resolved.model).toBe(model);
        expect(b.resolved.frame).toBe(row.frame);
        expect(b.resolved.dv_inertial_mps).toEqual(row.dvInertial);
        expect(b.resolved.t_start_s).toBe(row.tStart);
        expect(b.resolved.t_end_s).toBe(row.tEnd);
        expect(b.resolved.propellant_kg).toBe(row.propellantUsed);
        expect(b.resolved.mass_after_kg).toBe(row.massAfter);
      });
      // the n-body schedule's burns are fixed inertial vectors
      if (model === 'nbody') expect(burns[0].resolved.frame).toBe('inertial');
    }
  });

  it('the inertial Δv is the frame Δv rotated by VNB and RTN axes built from r and v by cross products', () => {
    const dv: [number, number, number] = [120, -35, 18];
    for (const frame of ['vnb', 'rtn'] as const) {
      const { plan, r, v } = burnAtStart(frame, dv);
      const b = burnsOf(saved(plan))[0].resolved as Json;
      // the evaluation rotates the inertial Δv back into the frame: the same to rounding (1e-12 m/s on 127 m/s)
      for (let k = 0; k < 3; k++) expect(Math.abs(b.dv_frame_mps[k] - dv[k])).toBeLessThan(1e-12);
      const h = unit(cross(r, v));
      // VNB: V along v, N along r × v, B = V × N; RTN: R along r, N along r × v, T = N × R
      const axes = frame === 'vnb' ? [unit(v), h, cross(unit(v), h)] : [unit(r), cross(h, unit(r)), h];
      const expected = combine(dv, axes);
      // 1e-9 m/s on a 127 m/s vector: a few parts in 1e12, what two orders of rounding in a 3×3 rotation give
      for (let k = 0; k < 3; k++) expect(Math.abs(b.dv_inertial_mps[k] - expected[k])).toBeLessThan(1e-9);
      expect(b.dv_magnitude_mps).toBeCloseTo(Math.hypot(...dv), 9);
      // rocket equation (Tsiolkovsky): m1 = m0 · exp(−Δv / (Isp · g0)), g0 = 9.80665 m/s² (standard gravity)
      const m0 = 500 + 300 + 900;
      expect(b.mass_after_kg).toBeCloseTo(m0 * Math.exp(-Math.hypot(...dv) / (310 * 9.80665)), 6);
      expect(b.propellant_kg).toBeCloseTo(m0 - b.mass_after_kg, 9);
    }
  });
});

describe('resolved burns checked on open', () => {
  it('a saved plan reopens with no warning and the same text when saved again', () => {
    const text = saved(demoPlan);
    const { parsed, issues } = reopen(text);
    expect(issues).toEqual([]);
    expect(parsed.plan).toEqual(demoPlan);
    expect(serializePlanFile(parsed.plan, parsed.system, parsed.resolved)).toBe(text);
    expect(parsed.resolved.size).toBe(burnsOf(text).length);
  });

  it("a burn's Δv edited by hand in the file makes its block stale: a warning naming the burn as its card does", () => {
    const doc = JSON.parse(saved(demoPlan));
    // the second burn (the mid-course correction): its dv_mps is a correction added to the solved Δv
    const burnIndices = (doc.events as Json[]).flatMap((e, j) => (e.type === 'burn' ? [j] : []));
    const k = burnIndices[1];
    const burn = doc.events[k];
    burn.dv_mps = [burn.dv_mps[0] + 5, burn.dv_mps[1], burn.dv_mps[2]];
    const { parsed, issues } = reopen(JSON.stringify(doc));
    // later burns may move too (less propellant left): this one is flagged whatever they do
    const own = issues.find((i) => i.path === `events[${k}].resolved`);
    expect(own?.severity).toBe('warning');
    expect(own?.rule).toMatch(/out of date.*Δv in its frame/);
    expect(issues.every((i) => i.severity === 'warning')).toBe(true);
    const words = issuesInWords([own!], parsed.plan, system)[0].words;
    // the card's words: the event's kind, its number from 1 among the plan's events, its name
    expect(words.startsWith(`Burn ${k + 1} '${burn.name}': figures saved with the plan are out of date`)).toBe(true);
  });

  it('an edited figure is stale beyond 1 mm/s and passes within it', () => {
    const doc = JSON.parse(saved(demoPlan));
    const k = (doc.events as Json[]).findIndex((e) => e.type === 'burn');
    doc.events[k].resolved.dv_inertial_mps[0] += 0.0004;
    expect(reopen(JSON.stringify(doc)).issues).toEqual([]);
    doc.events[k].resolved.dv_inertial_mps[0] += 0.002;
    const { issues } = reopen(JSON.stringify(doc));
    expect(issues.map((i) => i.path)).toEqual([`events[${k}].resolved`]);
    expect(issues[0].rule).toMatch(/inertial Δv/);
    // a time 2 ms off and a mass 2 g off are stale too
    const d2 = JSON.parse(saved(demoPlan));
    d2.events[k].resolved.t_end_s += 0.002;
    d2.events[k].resolved.mass_after_kg -= 0.002;
    const rule = reopen(JSON.stringify(d2)).issues[0].rule;
    expect(rule).toMatch(/end .* s, now/);
    expect(rule).toMatch(/mass after/);
  });

  it('a block solved in another model than the truth model now named is stale', () => {
    const doc = JSON.parse(saved(demoPlan));
    doc.truth_model = 'finite';
    const { issues } = reopen(JSON.stringify(doc));
    expect(issues.length).toBe(burnsOf(JSON.stringify(doc)).length);
    expect(issues[0].rule).toMatch(/solved in the conic model, the plan's truth model is now finite/);
  });

  it('a file without the blocks loads unchanged and gives no warning', () => {
    const text = serializePlanFile(demoPlan, REF);
    expect(text).not.toContain('"resolved"');
    const { parsed, issues } = reopen(text);
    expect(parsed.resolved.size).toBe(0);
    expect(issues).toEqual([]);
    expect(parsed.plan).toEqual(demoPlan);
    expect(serializePlanFile(parsed.plan, parsed.system)).toBe(text);
  });

  it('the schema checks the blocks: a model it does not know and a field it does not declare are refused', () => {
    const doc = JSON.parse(saved(demoPlan));
    const k = (doc.events as Json[]).findIndex((e) => e.type === 'burn');
    doc.events[k].resolved.model = 'guess';
    doc.events[k].resolved.extra = 1;
    let issues: { path: string }[] = [];
    try {
      parsePlanFile(JSON.stringify(doc));
    } catch (e) {
      if (e instanceof ValidationError) issues = e.issues;
    }
    const paths = issues.map((i) => i.path);
    expect(paths).toContain(`events[${k}].resolved.model`);
    expect(paths.some((p) => p.startsWith(`events[${k}].resolved`) && p !== `events[${k}].resolved.model`)).toBe(true);
  });
});
