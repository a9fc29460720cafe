import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import {
  MAX_BODIES,
  MAX_DISPERSION_SAMPLES,
  MAX_EVENTS,
  MAX_GAME_STEPS,
  MAX_STABILITY_BODIES,
  MAX_STABILITY_STEPS,
  MAX_STABILITY_WORK,
  MAX_STAGES,
  overLimitRule,
  requireWithinLimit,
} from '../../../core/system/limits.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem } from '../plan/helpers.ts';

describe('limits: messages', () => {
  it('overLimitRule names the value and the limit with thousands separators (en-US grouping, common practice)', () => {
    expect(overLimitRule(10_000, 2_000, 'bodies')).toBe('is 10,000 bodies, more than the 2,000 Waymark handles');
    expect(overLimitRule(1_234_567, 1_000, 'events')).toContain('1,234,567 events');
  });

  it('requireWithinLimit passes a value at the limit through and refuses one past it with InputError(field, rule)', () => {
    expect(requireWithinLimit('bodies', MAX_BODIES, MAX_BODIES, 'bodies')).toBe(MAX_BODIES);
    expect(requireWithinLimit('bodies', 0, MAX_BODIES, 'bodies')).toBe(0);
    let err: unknown;
    try {
      requireWithinLimit('plan.events', MAX_EVENTS + 1, MAX_EVENTS, 'events');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    const ie = err as InputError;
    expect(ie.field).toBe('plan.events');
    expect(ie.rule).toBe(overLimitRule(MAX_EVENTS + 1, MAX_EVENTS, 'events'));
    expect(ie.message).toMatch(/^plan\.events is 1,001 events, more than the 1,000 Waymark handles/);
  });
});

// The module's own rule (common practice): each bound an order of magnitude or more above the
// largest real case. Checked here against the demo inputs, counted from the files.
describe('limits: room above the demo inputs', () => {
  const sys = demoSystem();
  const bodies = sys.bodies.length - 1; // the star is not counted
  it('bodies, events and stages: at least ten times the demo system and plan', () => {
    expect(bodies).toBeGreaterThan(0);
    expect(MAX_BODIES).toBeGreaterThanOrEqual(10 * bodies);
    expect(MAX_STABILITY_BODIES).toBeGreaterThanOrEqual(10 * bodies);
    expect(MAX_EVENTS).toBeGreaterThanOrEqual(10 * demoPlan.events.length);
    expect(MAX_STAGES).toBeGreaterThanOrEqual(10 * demoPlan.vehicle.stages.length);
    expect(() => requireWithinLimit('bodies', bodies, MAX_BODIES, 'bodies')).not.toThrow();
  });

  it('run budgets hold the figures the module states for the demo runs with room (6.5·10⁶ stability steps, 3·10⁸ pair evaluations, 10⁸ game steps)', () => {
    expect(MAX_STABILITY_STEPS).toBeGreaterThanOrEqual(10 * 6.5e6);
    expect(MAX_STABILITY_WORK).toBeGreaterThanOrEqual(10 * 3e8);
    expect(MAX_GAME_STEPS).toBeGreaterThanOrEqual(10 * 1e8);
    // a dispersion of the largest size resolves a probability near 1/2 to 2σ = 2·√(p(1−p)/N) ≈ 0.3 % (binomial standard error)
    expect(2 * Math.sqrt(0.25 / MAX_DISPERSION_SAMPLES)).toBeLessThan(0.0032);
  });
});
