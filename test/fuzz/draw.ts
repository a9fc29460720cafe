/**
 * Random draws for the case builders, on top of fast-check's `fc.gen()` so every case is
 * reproducible from its seed and shrinks like any other fast-check value. Draws are unbiased
 * (fc.noBias), so probabilities mean what they say; the edge values worth hitting (0, 1 − 1e-16,
 * 1e308, exactly 180° ...) are listed explicitly by the case builders.
 */
import fc from 'fast-check';

const STEPS = 1 << 30;

/** Integers spread evenly over their range (fast-check's default favours small values and the ends). */
const unbiasedInt = (min: number, max: number): fc.Arbitrary<number> => fc.noBias(fc.integer({ min, max }));

export class Draw {
  constructor(private readonly g: fc.GeneratorValue) {}

  /** In [0, 1]. */
  unit(): number {
    return this.g(unbiasedInt, 0, STEPS) / STEPS;
  }

  uniform(lo: number, hi: number): number {
    return lo + (hi - lo) * this.unit();
  }

  /** 10^uniform(log10 lo, log10 hi): scale-free over many decades (lo, hi > 0). */
  log(lo: number, hi: number): number {
    return 10 ** this.uniform(Math.log10(lo), Math.log10(hi));
  }

  int(lo: number, hi: number): number {
    return this.g(unbiasedInt, lo, hi);
  }

  bool(p = 0.5): boolean {
    return this.unit() < p;
  }

  pick<T>(xs: readonly T[]): T {
    return xs[this.int(0, xs.length - 1)];
  }

  /** A unit vector, uniform on the sphere. */
  unitVector(): [number, number, number] {
    const z = this.uniform(-1, 1);
    const phi = this.uniform(0, 2 * Math.PI);
    const s = Math.sqrt(Math.max(0, 1 - z * z));
    return [s * Math.cos(phi), s * Math.sin(phi), z];
  }

  /** A printable or arbitrary string of up to `max` characters. */
  text(max: number): string {
    return this.g(fc.string, { maxLength: max, unit: 'binary' });
  }
}

/** An arbitrary of values built imperatively from draws. */
export function built<T>(build: (d: Draw) => T): fc.Arbitrary<T> {
  return fc.gen().map((g) => build(new Draw(g)));
}
