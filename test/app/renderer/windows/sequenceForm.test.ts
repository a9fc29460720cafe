import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { chainChanged, departureSpan, initialSequenceForm, nextChoices, sequenceRequest } from '../../../../app/renderer/windows/sequenceForm.ts';
import { runAnalysisJob } from '../../../../app/renderer/analysis/runJob.ts';
import { parsePlanFile } from '../../../../core/io/index.ts';
import { demoSystem } from '../../../core/search/fixtures.ts';

const system = demoSystem();
const body = (id: string) => system.bodies[system.indexById[id]];
const plan = parsePlanFile(readFileSync(new URL('../../../../assets/plans/tessel-to-ochre.plan.json', import.meta.url), 'utf8'), { system }).plan;

describe('Windows sequence form', () => {
  it("starts from the plan: its start body, the heaviest sister between, its target; departures over one synodic period from the plan's epoch", () => {
    const f = initialSequenceForm(system, plan);
    // Tessel (a = 110 Gm) to Ochre (170 Gm): no planet orbits between them
    expect(f.bodies).toEqual(['tessel', 'ochre']);
    expect(f.departStart).toBe(plan.start.epoch);
    // synodic period 1/|1/P1 − 1/P2| (Curtis, Orbital Mechanics for Engineering Students, eq. 8.10, from memory);
    // 1e-9 relative: the same formula rounded in another order
    const P1 = body('tessel').derived.period;
    const P2 = body('ochre').derived.period;
    expect(Math.abs(f.departEnd - f.departStart - 1 / Math.abs(1 / P1 - 1 / P2)) / (f.departEnd - f.departStart)).toBeLessThan(1e-9);
    expect(f.parkingAlt).toBeGreaterThanOrEqual(body('tessel').safeAlt);
    expect(f.captureAlt).toBeGreaterThanOrEqual(body('ochre').safeAlt);
    expect(f.powered).toBe(true);
  });

  it('for a plan to Fennick the chain goes by the giant Moravel', () => {
    const f = initialSequenceForm(system, { ...plan, target: plan.target ? { ...plan.target, body: 'fennick' } : plan.target });
    expect(f.bodies).toEqual(['tessel', 'moravel', 'fennick']);
  });

  it('offers the sisters of the first body, never the last body again; a moon chain stays among moons', () => {
    const planets = nextChoices(system, ['tessel', 'moravel']).map((b) => b.id);
    expect(planets).toEqual(['kiln', 'tessel', 'ochre', 'fennick']);
    expect(nextChoices(system, ['skerry']).map((b) => b.id)).toEqual(['lough']);
    expect(nextChoices(system, []).length).toBe(system.bodies.length - 1);
  });

  it('a chain change moves the departure end and the capture orbit to the new bodies', () => {
    const f = chainChanged(system, { ...initialSequenceForm(system, plan), bodies: ['tessel', 'moravel', 'fennick'] });
    expect(f.departEnd - f.departStart).toBe(departureSpan(system, ['tessel', 'moravel']));
    expect(f.captureAlt).toBe(body('fennick').safeAlt + 100e3); // 100 km above the safe altitude (core/io/defaults.ts)
  });

  it('the request, or what is missing in words', () => {
    const f = initialSequenceForm(system, plan);
    expect(sequenceRequest(system, { ...f, bodies: ['tessel'] })).toMatch(/at least two bodies/);
    expect(sequenceRequest(system, { ...f, departEnd: f.departStart })).toMatch(/must end after it starts/);
    expect(sequenceRequest(system, { ...f, bodies: ['tessel', 'nowhere'] })).toMatch(/nowhere is not a body/);
    const r = sequenceRequest(system, { ...f, capture: false, powered: false });
    if (typeof r === 'string') throw new Error(r);
    expect(r.arriveE).toBeNull();
    expect(r.powered).toBe(false);
    expect(r.bodies).toEqual(f.bodies);
  });

  it("the analysis worker's job runs the search and reports progress up to the end", () => {
    const f = chainChanged(system, { ...initialSequenceForm(system, plan), bodies: ['tessel', 'moravel', 'fennick'] });
    const request = sequenceRequest(system, f);
    if (typeof request === 'string') throw new Error(request);
    const fractions: number[] = [];
    const out = runAnalysisJob({ kind: 'sequence', system, request: { ...request, keep: 2 } }, (fr) => fractions.push(fr));
    if (out.kind !== 'sequence') throw new Error(out.kind);
    expect(out.sequence.solutions.length).toBeGreaterThan(0);
    expect(out.sequence.solutions.length).toBeLessThanOrEqual(2);
    expect(fractions.length).toBeGreaterThan(1);
    for (let k = 1; k < fractions.length; k++) expect(fractions[k]).toBeGreaterThanOrEqual(fractions[k - 1]);
    expect(fractions[fractions.length - 1]).toBeLessThanOrEqual(1);
  });
});
