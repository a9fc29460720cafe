import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { DEFAULT_ATOL_FACTOR, DEFAULT_NBODY_RTOL, NBodyModel } from '../../../core/nbody/model.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();

/** The InputError thrown by f, or a failure. */
function inputError(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('no error thrown');
}

describe('NBodyModel settings', () => {
  it('defaults: rtol DEFAULT_NBODY_RTOL, atol = rtol × DEFAULT_ATOL_FACTOR, method auto, no step budget, full n-body gravity', () => {
    const m = new NBodyModel(sys);
    expect(m.rtol).toBe(DEFAULT_NBODY_RTOL);
    expect(m.atol).toBe(DEFAULT_NBODY_RTOL * DEFAULT_ATOL_FACTOR);
    expect(m.method).toBe('auto');
    expect(m.maxSteps).toBeUndefined();
    expect(m.gravity).toBe('n-body');
    expect(m.system).toBe(sys);
  });

  it('an rtol given alone carries the atol with it; given values are kept', () => {
    const m = new NBodyModel(sys, { rtol: 1e-8 });
    expect(m.atol).toBe(1e-8 * DEFAULT_ATOL_FACTOR);
    const n = new NBodyModel(sys, { rtol: 1e-9, atol: 1e-3, method: 'rk45', maxSteps: 5000, gravity: 'two-body' });
    expect([n.rtol, n.atol, n.method, n.maxSteps, n.gravity]).toEqual([1e-9, 1e-3, 'rk45', 5000, 'two-body']);
  });

  it('refuses a tolerance that is not a positive finite number, naming the field', () => {
    for (const bad of [0, -1e-10, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(inputError(() => new NBodyModel(sys, { rtol: bad })).field).toBe('options.rtol');
      expect(inputError(() => new NBodyModel(sys, { atol: bad })).field).toBe('options.atol');
    }
    // a bad rtol is named even when atol is given
    expect(inputError(() => new NBodyModel(sys, { rtol: 0, atol: 1 })).field).toBe('options.rtol');
  });

  it('refuses an unknown pulling body (the force model beneath it)', () => {
    expect(() => new NBodyModel(sys, { pull: ['nowhere'] })).toThrow(InputError);
  });
});
