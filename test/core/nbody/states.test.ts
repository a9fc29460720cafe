import { describe, expect, it } from 'vitest';
import { massAt, nbodyStatesToEphemeris } from '../../../core/nbody/states.ts';
import type { PlanResult, TrajectorySegment } from '../../../core/plan/result.ts';

function seg(kind: 'coast' | 'burn', t0: number, t1: number, mass0: number, mass1: number, central = 1): TrajectorySegment {
  const z = new Float64Array(0);
  return { kind, central, t0, t1, state0: new Float64Array(6), mu: 1, sampleT: z, samples: z, mass0, mass1 };
}

const result = { segments: [seg('coast', 0, 10, 100, 100), seg('burn', 10, 20, 100, 80), seg('coast', 20, 30, 80, 80)] } as unknown as PlanResult;

describe('n-body states as an ephemeris', () => {
  it('takes the mass of the patched-conic segment, linear across a finite burn (constant mass flow)', () => {
    expect(massAt(result, -5)).toBe(100);
    expect(massAt(result, 5)).toBe(100);
    expect(massAt(result, 15)).toBe(90);
    expect(massAt(result, 25)).toBe(80);
    expect(massAt(result, 99)).toBe(80);
  });
  it('groups consecutive states with the same origin into spans, keeping every state', () => {
    const t = Float64Array.from([0, 1, 2, 3, 4]);
    const origin = Int32Array.from([1, 1, 0, 0, 2]);
    const state = Float64Array.from({ length: 30 }, (_, i) => i);
    const eph = nbodyStatesToEphemeris({ t, origin, state }, result, 1);
    expect(eph.spans.map((s) => [s.center, s.t.length])).toEqual([
      [1, 2],
      [0, 2],
      [2, 1],
    ]);
    expect(Array.from(eph.spans[1].states.slice(0, 6))).toEqual([12, 13, 14, 15, 16, 17]);
  });
});
