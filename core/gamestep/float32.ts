/**
 * Single-precision arithmetic as a game engine does it, emulated in double precision.
 *
 * - `fround` (Math.fround) rounds a double to the nearest IEEE 754 binary32 value (ties to
 *   even). Rounding after every +, −, ×, ÷ and √ of binary32 operands gives exactly the binary32
 *   result: the double result has 53 ≥ 2·24 + 2 bits, so the double rounding is innocuous
 *   (Figueroa, "When is double rounding innocuous?", ACM SIGNUM Newsletter 30(3), 1995).
 * - `ulp32(x)`: the spacing of binary32 values at |x| (IEEE 754-2019, binary32: 24-bit
 *   significand): 2^(e−23) for |x| ∈ [2^e, 2^(e+1)), e ≥ −126; 2^−149 below (subnormals).
 *   A position stored in binary32 at distance x from its origin moves in steps of ulp32(x), and
 *   rounding puts it up to ulp32(x)/2 off.
 */
import { InputError, requireFinite } from '../math/index.ts';

/** Largest finite binary32 value, (2 − 2^−23)·2^127. */
export const FLOAT32_MAX = 3.4028234663852886e38;
/** Smallest positive normal binary32 value, 2^−126. */
export const FLOAT32_MIN_NORMAL = 2 ** -126;
/** Spacing of the subnormal binary32 values, 2^−149. */
export const FLOAT32_MIN_SPACING = 2 ** -149;
/** Significand bits after the binary point in binary32. */
export const FLOAT32_FRACTION_BITS = 23;

/** Rounds to the nearest binary32 value (Math.fround). */
export const fround = Math.fround;

/** Identity rounding: double precision arithmetic unchanged. */
export function noRound(x: number): number {
  return x;
}

/** Binary exponent e with 2^e ≤ |x| < 2^(e+1), for finite x ≠ 0. */
export function binaryExponent(x: number): number {
  const a = Math.abs(x);
  let e = Math.floor(Math.log2(a));
  // log2 may round across a power of two: fix the bracket exactly (powers of two are exact).
  if (2 ** e > a) e--;
  else if (2 ** (e + 1) <= a) e++;
  return e;
}

/** Spacing of binary32 values at |x| (see the module comment). Throws beyond the binary32 range. */
export function ulp32(x: number): number {
  requireFinite('x', x);
  const a = Math.abs(x);
  if (a > FLOAT32_MAX) throw new InputError('x', `must be within the binary32 range (|x| <= ${FLOAT32_MAX})`, x);
  if (a < FLOAT32_MIN_NORMAL) return FLOAT32_MIN_SPACING;
  return 2 ** (binaryExponent(a) - FLOAT32_FRACTION_BITS);
}
