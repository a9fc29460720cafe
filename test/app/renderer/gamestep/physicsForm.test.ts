import { describe, expect, it } from 'vitest';
import { normalizePhysics } from '../../../../core/gamestep/check.ts';
import { DEFAULT_FORM, parseForm, parseKm, parseStep, physicsCaption } from '../../../../app/renderer/gamestep/physicsForm.ts';

describe("the game-step panel's form", () => {
  it('reads steps as seconds, fractions and durations with a unit', () => {
    expect(parseStep('1/60')).toBe(1 / 60);
    expect(parseStep(' 1 / 50 ')).toBe(0.02);
    expect(parseStep('0.02')).toBe(0.02);
    expect(parseStep('20 ms')).toBeCloseTo(0.02, 15);
    expect(parseStep('0.5 min')).toBe(30);
    expect(typeof parseStep('fast')).toBe('string');
    expect(typeof parseStep('0')).toBe('string');
    expect(typeof parseStep('1/0')).toBe('string');
  });

  it('reads lengths in km, or with a unit', () => {
    expect(parseKm('10')).toBe(10_000);
    expect(parseKm('500 m')).toBe(500);
    expect(typeof parseKm('-1')).toBe('string');
    expect(typeof parseKm('far')).toBe('string');
  });

  it("turns the default form into physics the core accepts (velocity Verlet at 1/60 s, float64, the plan's tolerance)", () => {
    const p = parseForm(DEFAULT_FORM);
    expect(p.errors).toEqual({});
    expect(p.options!.physics).toEqual({
      integrator: 'verlet',
      dt: 1 / 60,
      precision: 'float64',
      rebase: null,
      gravity: 'central',
      burns: 'impulsive',
      guidance: 'resolve',
    });
    expect(p.options!.tolerance).toBeUndefined();
    expect(p.options!.warpDt).toBeUndefined();
    expect(() => normalizePhysics(p.options!.physics)).not.toThrow();
    expect(physicsCaption(p.options!.physics)).toBe('velocity Verlet (leapfrog), 16.67 ms, float64');
  });

  it('passes a floating origin, a tolerance and a long-step coast step in SI', () => {
    const p = parseForm({
      ...DEFAULT_FORM,
      precision: 'float32',
      rebase: true,
      rebaseDistance: '2',
      rebaseVelocity: false,
      tolerance: '500 m',
      longCoasts: 'long-step',
      warpDt: '60',
      energyTolerance: '1e-8',
    });
    expect(p.options!.physics.rebase).toEqual({ distance: 2000, velocity: false });
    expect(p.options!.tolerance).toBe(500);
    expect(p.options!.warpDt).toBe(60);
    expect(p.options!.energyTolerance).toBe(1e-8);
    expect(physicsCaption(p.options!.physics)).toBe('velocity Verlet (leapfrog), 16.67 ms, float32, floating origin 2 km');
  });

  it('names each field that does not read and gives no options then', () => {
    const p = parseForm({ ...DEFAULT_FORM, dt: 'often', rebase: true, rebaseDistance: 'x', tolerance: '0', energyTolerance: 'small' });
    expect(p.options).toBeNull();
    expect(Object.keys(p.errors).sort()).toEqual(['dt', 'energyTolerance', 'rebaseDistance', 'tolerance']);
  });
});
