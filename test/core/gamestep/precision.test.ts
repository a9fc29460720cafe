import { describe, expect, it } from 'vitest';
import { gameStepCheck } from '../../../core/gamestep/check.ts';
import { float32Table, type SpanExtent } from '../../../core/gamestep/precision.ts';
import { AU, MU_SUN, plan, stateStart, testSystem } from '../plan/helpers.ts';

// Spacing of binary32 values at x read from the exponent field of x's binary64 bit pattern
// (IEEE 754: 11 exponent bits, bias 1023; binary32 keeps 23 fraction bits): an independent
// route to ulp32 for normal values.
function spacingFromBits(x: number): number {
  const dv = new DataView(new ArrayBuffer(8));
  dv.setFloat64(0, x);
  const e = ((dv.getUint32(0) >>> 20) & 0x7ff) - 1023;
  return 2 ** (e - 23);
}

const span = (index: number, dist: number, speed: number, accel: number): SpanExtent => ({ def: { index }, dist, speed, accel });

describe('float32 spacing table', () => {
  it('gives the binary32 spacing of the distance and speed, and how a step compares with them', () => {
    // 1 AU at 29.8 km/s with the star's pull, a low orbit, a moon's distance (values of the order of Curtis, Table A.1, from memory)
    const spans = [span(0, 1.496e11, 29.78e3, 5.9e-3), span(1, 6.6e6, 7.8e3, 9.1), span(2, 3.844e8, 1.02e3, 2.7e-3)];
    const hs = 1 / 60;
    const rows = float32Table(spans, hs, null);
    expect(rows.map((r) => r.span)).toEqual([0, 1, 2]);
    for (const [k, r] of rows.entries()) {
      const s = spans[k];
      expect(r.distance).toBe(s.dist);
      expect(r.spacing).toBe(spacingFromBits(s.dist));
      expect(r.speed).toBe(s.speed);
      expect(r.speedSpacing).toBe(spacingFromBits(s.speed));
      expect(r.stepMove).toBe(s.speed * hs);
      expect(r.stepMoveToSpacing).toBe((s.speed * hs) / r.spacing);
      expect(r.stepKick).toBe(s.accel * hs);
      expect(r.stepKickToSpacing).toBe((s.accel * hs) / r.speedSpacing);
      expect(r.rebasedSpacing).toBeNull();
    }
    // worked by hand: 2^37 ≤ 1.496e11 < 2^38 → 2^14 m; 2^14 ≤ 29,780 < 2^15 → 2^−9 m/s; 2^22 ≤ 6.6e6 < 2^23 → 0.5 m
    expect(rows[0].spacing).toBe(16384);
    expect(rows[0].speedSpacing).toBe(2 ** -9);
    expect(rows[1].spacing).toBe(0.5);
    // at 1 AU a 1/60 s step moves 496 m: 3 % of the spacing, rounded away
    expect(rows[0].stepMoveToSpacing).toBeLessThan(0.031);
  });

  it('gives the spacing at the floating-origin distance when rebasing, and clamps beyond the binary32 range', () => {
    const rows = float32Table([span(4, 1e40, 1, 1)], 2, { distance: 1000, velocity: false });
    expect(rows[0].rebasedSpacing).toBe(2 ** -14); // 2^9 ≤ 1000 < 2^10
    expect(rows[0].spacing).toBe(2 ** 104); // the largest binary32 binade, [2^127, 2^128)
    expect(rows[0].stepMove).toBe(2);
  });
});

describe('float32 at interplanetary distances (common practice: floating origins)', () => {
  // a heliocentric coast at 1 AU for 10 days, a quarter orbit ahead of loam: binary32 spacing there is 16 km
  const sys = testSystem();
  const v = Math.sqrt(MU_SUN / AU);
  const p = plan(stateStart('sun', [0, AU, 0], [-v, 0, 0]), [{ type: 'coast', id: 'c', name: 'cruise', until: { kind: 'duration', dt: 10 * 86400 } }]);
  it('without rebasing the position cannot follow the motion; a floating origin restores it', () => {
    const physics = { integrator: 'verlet' as const, dt: 1 };
    const f64 = gameStepCheck(sys, p, { physics });
    const raw = gameStepCheck(sys, p, { physics: { ...physics, precision: 'float32' } });
    const reb = gameStepCheck(sys, p, { physics: { ...physics, precision: 'float32', rebase: { distance: 1000, velocity: true } } });
    const row = raw.float32[0];
    expect(row.spacing).toBe(16384); // ulp32(1.496e11) = 2^14 m
    expect(row.stepMoveToSpacing).toBeLessThan(2); // ~30 km per step against 16 km spacing
    expect(raw.end!.positionError).toBeGreaterThan(1e6);
    expect(reb.end!.positionError).toBeLessThan(0.01 * raw.end!.positionError);
    expect(f64.end!.positionError).toBeLessThan(reb.end!.positionError);
    expect(reb.stats.rebases).toBeGreaterThan(100);
  });
});
