/**
 * A draft flight that fails says so in the designer's words: the event by its name, not its
 * index in the plan, and what did not happen.
 */
import { describe, expect, it } from 'vitest';
import { SolverError } from '../../../core/math/index.ts';
import { situationAfter, type Draft } from '../../../core/route/draft.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();

describe('situationAfter', () => {
  it('a coast waiting for a periapsis at a moon the ship never reaches: named, in words', () => {
    const draft: Draft = {
      system: sys,
      vehicle: { name: 'Test ship', payloadMass: 1000, stages: [{ name: 'Main', dryMass: 1000, propellantMass: 1000, isp: 300, thrust: 1e4 }] },
      reserve: { percent: 5, absolute: 50 },
      start: { kind: 'parking', body: 'tessel', epoch: 0, periapsisAltitude: 300e3, e: 0, i: 0, raan: 0, argp: 0, nu: 0 },
      events: [{ type: 'coast', id: 'approach-quill', name: 'Approach Quill', until: { kind: 'periapsis', body: 'quill' } }],
    };
    let caught: unknown = null;
    try {
      situationAfter(draft);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(SolverError);
    const e = caught as SolverError;
    expect(e.reason).toBe('no-solution');
    expect(e.message).toMatch(/'Approach Quill' never reaches a periapsis at Quill/);
    expect(e.message).not.toMatch(/events\[/);
  });
});
