import { describe, expect, it } from 'vitest';
import {
  InputError,
  SolverError,
  ValidationError,
  WaymarkError,
  requireFinite,
  requireFiniteVector,
  requireNonNegative,
  requireNonZeroVector,
  requirePositive,
} from '../../../core/math/errors.ts';

function caught(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('no error');
}

describe('error types', () => {
  it('InputError carries the field, the rule and the value, and says them in its message', () => {
    const e = new InputError('mu', 'must be > 0', -3);
    expect(e).toBeInstanceOf(WaymarkError);
    expect(e).toBeInstanceOf(Error);
    expect([e.name, e.field, e.rule, e.value]).toEqual(['InputError', 'mu', 'must be > 0', -3]);
    expect(e.message).toBe('mu must be > 0 (got -3)');
    expect(new InputError('plan', 'is empty').message).toBe('plan is empty');
    expect(new InputError('r', 'must be finite', new Float64Array([1, NaN, 2])).message).toBe('r must be finite (got [1, NaN, 2])');
    expect(new InputError('k', 'must be a string', { a: 1 }).message).toBe('k must be a string (got {"a":1})');
    const cyclic: Record<string, unknown> = {};
    cyclic.self = cyclic;
    expect(new InputError('x', 'bad', cyclic).message).toBe('x bad (got [object Object])');
  });

  it('ValidationError lists every issue with its path, the document itself as "(document)"', () => {
    const e = new ValidationError('system file', [
      { path: 'bodies[3].orbit.e', rule: 'must be < 1', severity: 'error' },
      { path: '', rule: 'is not JSON', severity: 'error' },
    ]);
    expect(e).toBeInstanceOf(WaymarkError);
    expect(e.name).toBe('ValidationError');
    expect(e.message).toBe('system file: 2 problems\n  bodies[3].orbit.e must be < 1\n  (document) is not JSON');
    expect(new ValidationError('plan file', [{ path: 'version', rule: 'is required', severity: 'error' }]).message).toBe(
      'plan file: 1 problem\n  version is required',
    );
  });

  it('SolverError carries the solver, the reason and the inputs', () => {
    const e = new SolverError('lambert', 'no-convergence', 'after 50 iterations', { tof: 3 });
    expect(e).toBeInstanceOf(WaymarkError);
    expect([e.name, e.solver, e.reason, e.inputs]).toEqual(['SolverError', 'lambert', 'no-convergence', { tof: 3 }]);
    expect(e.message).toBe('lambert: no-convergence: after 50 iterations');
    expect(new SolverError('kepler', 'non-finite', 'x').inputs).toEqual({});
  });
});

describe('argument guards', () => {
  it('requireFinite passes finite numbers through and refuses NaN, infinities and non-numbers', () => {
    expect(requireFinite('x', -0)).toBe(-0);
    expect(requireFinite('x', 1e308)).toBe(1e308);
    for (const bad of [NaN, Infinity, -Infinity, '1' as unknown as number, undefined as unknown as number]) {
      expect(caught(() => requireFinite('x', bad)).rule).toBe('must be a finite number');
    }
  });

  it('requirePositive and requireNonNegative draw the line at zero', () => {
    expect(requirePositive('m', 5e-324)).toBe(5e-324);
    expect(caught(() => requirePositive('m', 0)).rule).toBe('must be > 0');
    expect(caught(() => requirePositive('m', NaN)).rule).toBe('must be a finite number');
    expect(requireNonNegative('h', 0)).toBe(0);
    expect(requireNonNegative('h', -0)).toBe(-0);
    expect(caught(() => requireNonNegative('h', -1e-300)).rule).toBe('must be >= 0');
  });

  it('requireFiniteVector names the bad component; requireNonZeroVector refuses the zero vector', () => {
    requireFiniteVector('v', [1, 2, 3]);
    requireFiniteVector('q', new Float64Array(4), 4);
    expect(caught(() => requireFiniteVector('v', [1, 2])).field).toBe('v');
    expect(caught(() => requireFiniteVector('v', null as unknown as number[])).field).toBe('v');
    const e = caught(() => requireFiniteVector('v', [1, Infinity, 3]));
    expect([e.field, e.rule, e.value]).toEqual(['v[1]', 'must be a finite number', Infinity]);
    requireNonZeroVector('r', [0, 0, 1e-300]);
    expect(caught(() => requireNonZeroVector('r', [0, -0, 0])).rule).toBe('must not be the zero vector');
    expect(caught(() => requireNonZeroVector('r', [0, NaN, 0])).field).toBe('r[1]');
  });
});
