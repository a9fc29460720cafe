import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decodeUtf8, invalidUtf8Offset } from '../../../core/io/utf8.ts';
import { InputError } from '../../../core/math/errors.ts';

const bytes = (...b: number[]): Uint8Array => Uint8Array.from(b);
const enc = new TextEncoder();

/** The platform's own strict decoder (WHATWG Encoding, fatal mode): the independent reference of validity. */
function platformAccepts(b: Uint8Array): boolean {
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(b);
    return true;
  } catch {
    return false;
  }
}

describe('strict UTF-8 decoding of file bytes', () => {
  it('decodes valid text unchanged, names with accents and Δ included', () => {
    const text = '{"name": "Ochre — Δv 5 km/s, Fénix, Ærø, 🚀"}';
    expect(decodeUtf8(enc.encode(text))).toBe(text);
    expect(invalidUtf8Offset(enc.encode(text))).toBe(-1);
  });

  it('refuses invalid bytes with the offset of the first bad one, with thousands separated', () => {
    const good = enc.encode('x'.repeat(1234));
    const bad = new Uint8Array(good.length + 3);
    bad.set(good);
    bad.set([0xff, 0x41, 0x42], 1234);
    expect(() => decodeUtf8(bad, 'plan.json')).toThrow(InputError);
    expect(() => decodeUtf8(bad, 'plan.json')).toThrow('plan.json is not valid UTF-8 at byte 1,234');
  });

  it('places the offset at the lead byte of the ill-formed sequences of Unicode Table 3-7 (from memory)', () => {
    expect(invalidUtf8Offset(bytes(0x41, 0xc0, 0x80))).toBe(1); // overlong 2-byte form
    expect(invalidUtf8Offset(bytes(0x41, 0x42, 0xe0, 0x80, 0x80))).toBe(2); // overlong 3-byte form
    expect(invalidUtf8Offset(bytes(0xed, 0xa0, 0x80))).toBe(0); // a surrogate, U+D800
    expect(invalidUtf8Offset(bytes(0xf4, 0x90, 0x80, 0x80))).toBe(0); // above U+10FFFF
    expect(invalidUtf8Offset(bytes(0x41, 0x80))).toBe(1); // a lone continuation byte
    expect(invalidUtf8Offset(bytes(0x41, 0xe2, 0x82))).toBe(1); // cut short by the end
    expect(invalidUtf8Offset(bytes(0xe2, 0x82, 0x41))).toBe(0); // cut short by an ASCII byte
    expect(invalidUtf8Offset(bytes(0xef, 0xbf, 0xbd))).toBe(-1); // U+FFFD itself is valid text
  });

  it('agrees with the platform decoder on validity, and the bytes before the offset decode while the bad sequence does not (fast-check)', () => {
    // Bytes biased towards UTF-8's interesting ranges so both valid and invalid inputs are common.
    const byte = fc.oneof(fc.integer({ min: 0x20, max: 0x7e }), fc.integer({ min: 0x80, max: 0xbf }), fc.integer({ min: 0xc0, max: 0xff }));
    const input = fc.oneof(
      fc.array(byte, { maxLength: 24 }).map((a) => Uint8Array.from(a)),
      fc.string({ unit: 'binary', maxLength: 12 }).map((s) => enc.encode(s)),
    );
    fc.assert(
      fc.property(input, (b) => {
        const at = invalidUtf8Offset(b);
        expect(at === -1).toBe(platformAccepts(b));
        if (at >= 0) {
          expect(platformAccepts(b.subarray(0, at))).toBe(true);
          // every longer prefix up to the longest sequence (4 bytes) still fails: the fault begins at `at`
          for (let j = 1; j <= Math.min(4, b.length - at); j++) expect(platformAccepts(b.subarray(0, at + j))).toBe(false);
        }
      }),
      { numRuns: 3000, seed: 11 },
    );
  });
});
