/**
 * Bytes of a file to text, strictly: a plan or system file that is not valid UTF-8 is refused
 * with the offset of the first bad byte ("not valid UTF-8 at byte 1,234") instead of having the
 * bad bytes silently replaced by U+FFFD (which would change names and could hide a damaged file).
 * A leading byte-order mark is dropped. Pure: the command line, the desktop app's main process
 * and the browser host call it on the bytes they read.
 */
import { InputError } from '../math/index.ts';

/**
 * Offset of the first byte that does not start (or continue) a well-formed UTF-8 sequence, or
 * -1 when every byte does. Well-formed sequences as in The Unicode Standard, Table 3-7
 * ("Well-Formed UTF-8 Byte Sequences"; RFC 3629 §4): no overlong forms, no surrogates, nothing
 * above U+10FFFF. A sequence cut short (by a bad byte or the end) is reported at its lead byte.
 */
export function invalidUtf8Offset(bytes: Uint8Array): number {
  const n = bytes.length;
  let i = 0;
  while (i < n) {
    const b = bytes[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    let len: number;
    let lo = 0x80; // allowed range of the second byte (Table 3-7)
    let hi = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) len = 2;
    else if (b >= 0xe0 && b <= 0xef) {
      len = 3;
      if (b === 0xe0) lo = 0xa0;
      else if (b === 0xed) hi = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      len = 4;
      if (b === 0xf0) lo = 0x90;
      else if (b === 0xf4) hi = 0x8f;
    } else return i;
    if (i + len > n) return i;
    const b1 = bytes[i + 1];
    if (b1 < lo || b1 > hi) return i;
    for (let k = 2; k < len; k++) {
      const c = bytes[i + k];
      if (c < 0x80 || c > 0xbf) return i;
    }
    i += len;
  }
  return -1;
}

// One strict decoder (WHATWG Encoding: fatal mode throws instead of inserting U+FFFD).
const strict = new TextDecoder('utf-8', { fatal: true });

/**
 * The text the bytes encode. InputError(`field`, "is not valid UTF-8 at byte 1,234 (…)") when
 * they are not UTF-8; the caller names the file.
 */
export function decodeUtf8(bytes: Uint8Array, field = 'file'): string {
  try {
    return strict.decode(bytes);
  } catch {
    const at = invalidUtf8Offset(bytes);
    throw new InputError(field, `is not valid UTF-8 at byte ${Math.max(0, at).toLocaleString('en-US')} (save it as UTF-8 text)`);
  }
}
