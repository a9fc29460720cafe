import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { Rng, createRng, splitmix64, stream } from '../../../core/math/random.ts';

const take = (r: Rng, n: number, f: (r: Rng) => number = (x) => x.nextUint32()): number[] => Array.from({ length: n }, () => f(r));

describe('xoshiro128** and SplitMix64 against their reference implementations', () => {
  it('matches the outputs of Blackman & Vigna’s xoshiro128starstar.c 1.1 from state {1, 2, 3, 4}', () => {
    expect(take(new Rng(1, 2, 3, 4), 10)).toEqual([11520, 0, 5927040, 70819200, 2031721883, 1637235492, 1287239034, 3734860849, 3729100597, 4258142804]);
  });

  it('matches the outputs of Vigna’s splitmix64.c for seed 1234567 and seed 0', () => {
    expect(splitmix64(1234567n, 5)).toEqual([6457827717110365317n, 3203168211198807973n, 9817491932198370423n, 4593380528125082431n, 16408922859458223821n]);
    expect(splitmix64(0n, 1)).toEqual([0xe220a8397b1dcdafn]);
  });

  it('seeds the xoshiro state from two SplitMix64 outputs, high word first', () => {
    const [a, b] = splitmix64(42n, 2);
    const ref = new Rng(Number(a >> 32n), Number(a & 0xffffffffn), Number(b >> 32n), Number(b & 0xffffffffn));
    expect(take(createRng(42), 8)).toEqual(take(ref, 8));
  });
});

describe('reproducibility and streams', () => {
  it('same seed gives the same sequence; different seeds differ', () => {
    expect(take(createRng(2024), 50, (r) => r.next())).toEqual(take(createRng(2024), 50, (r) => r.next()));
    expect(take(createRng(2024), 5)).not.toEqual(take(createRng(2025), 5));
    expect(take(createRng(-7), 5)).toEqual(take(createRng(2n ** 64n - 7n), 5)); // seeds are taken mod 2^64
  });

  it('jump is linear: it commutes with a step (property of the jump polynomial)', () => {
    const a = createRng(9);
    const b = createRng(9);
    a.nextUint32();
    a.jump();
    b.jump();
    b.nextUint32();
    expect(take(a, 5)).toEqual(take(b, 5));
  });

  it('stream(seed, k) is the seeded generator jumped k times; fork hands over the current sequence', () => {
    const s2 = stream(5, 2);
    const ref = createRng(5).jump().jump();
    expect(take(s2, 6)).toEqual(take(ref, 6));

    const parent = createRng(5);
    const child = parent.fork();
    expect(take(child, 6)).toEqual(take(createRng(5), 6));
    expect(take(parent, 6)).toEqual(take(stream(5, 1), 6));
    // long jump differs from jump
    expect(take(createRng(5).longJump(), 3)).not.toEqual(take(stream(5, 1), 3));
  });

  it('state round-trips through getState/fromState, including a held normal deviate and JSON', () => {
    const r = createRng(77);
    r.normal(); // leaves a spare deviate held
    const state = r.getState();
    expect(Number.isFinite(state[4])).toBe(true);
    const copy = Rng.fromState(state);
    const clone = r.clone();
    const a = take(r, 10, (x) => x.normal());
    expect(take(clone, 10, (x) => x.normal())).toEqual(a);
    expect(take(copy, 10, (x) => x.normal())).toEqual(a);
    // JSON keeps the words exactly; a NaN/null spare means "none held"
    const viaJson = Rng.fromState(JSON.parse(JSON.stringify([...state.slice(0, 4), NaN])));
    const fresh = Rng.fromState(state.slice(0, 4));
    expect(take(viaJson, 4)).toEqual(take(fresh, 4));
  });
});

describe('distributions (statistical bounds, fixed seed)', () => {
  const N = 200_000;

  it('next() lies in [0, 1) with mean 1/2 and variance 1/12 within 5 standard errors', () => {
    const r = createRng(1);
    let s = 0,
      s2 = 0,
      min = 1,
      max = 0;
    for (let k = 0; k < N; k++) {
      const u = r.next();
      s += u;
      s2 += u * u;
      min = Math.min(min, u);
      max = Math.max(max, u);
    }
    const mean = s / N;
    const variance = s2 / N - mean * mean;
    expect(min).toBeGreaterThanOrEqual(0);
    expect(max).toBeLessThan(1);
    expect(Math.abs(mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / N));
    // Var of u² estimator: E[u⁴] − E[u²]² = 1/5 − 1/9
    expect(Math.abs(variance - 1 / 12)).toBeLessThan(5 * Math.sqrt((1 / 5 - 1 / 9) / N));
  });

  it('normal() has mean 0, variance 1, skewness 0 and kurtosis 3 within statistical bounds', () => {
    const r = createRng(2);
    let s1 = 0,
      s2 = 0,
      s3 = 0,
      s4 = 0;
    for (let k = 0; k < N; k++) {
      const z = r.normal();
      s1 += z;
      s2 += z * z;
      s3 += z * z * z;
      s4 += z * z * z * z;
    }
    const m = s1 / N;
    expect(Math.abs(m)).toBeLessThan(5 / Math.sqrt(N));
    expect(Math.abs(s2 / N - 1)).toBeLessThan(5 * Math.sqrt(2 / N));
    expect(Math.abs(s3 / N)).toBeLessThan(5 * Math.sqrt(15 / N));
    expect(Math.abs(s4 / N - 3)).toBeLessThan(5 * Math.sqrt(96 / N));
    const r2 = createRng(3);
    const xs = take(r2, 1000, (x) => x.normal(10, 2));
    expect(xs.reduce((a, b) => a + b, 0) / 1000).toBeCloseTo(10, 0);
  });

  it('int(n) is uniform on [0, n): chi-square with 9 degrees of freedom below its 0.9999 quantile 33.7 (common practice)', () => {
    const r = createRng(4);
    const counts = new Array(10).fill(0);
    for (let k = 0; k < N; k++) counts[r.int(10)]++;
    const expected = N / 10;
    const chi2 = counts.reduce((acc, c) => acc + (c - expected) ** 2 / expected, 0);
    expect(chi2).toBeLessThan(33.7);
    expect(Math.min(...take(r, 1000, (x) => x.int(3)))).toBe(0);
    expect(Math.max(...take(r, 1000, (x) => x.int(3)))).toBe(2);
  });

  it('uniform(lo, hi) stays in range', () => {
    const r = createRng(5);
    for (const u of take(r, 1000, (x) => x.uniform(-3, 7))) {
      expect(u).toBeGreaterThanOrEqual(-3);
      expect(u).toBeLessThan(7);
    }
  });
});

describe('bad input', () => {
  it('rejects non-integer seeds, bad n, bad stream index and the all-zero state', () => {
    expect(() => createRng(1.5)).toThrow(InputError);
    expect(() => createRng(NaN)).toThrow(InputError);
    expect(() => createRng(1).int(0)).toThrow(InputError);
    expect(() => createRng(1).int(2.5)).toThrow(InputError);
    expect(() => stream(1, -1)).toThrow(InputError);
    expect(() => new Rng(0, 0, 0, 0)).toThrow(InputError);
    expect(() => Rng.fromState([1, 2, 3])).toThrow(InputError);
    expect(() => Rng.fromState([1, 2, 3, 2 ** 32])).toThrow(InputError);
  });
});
