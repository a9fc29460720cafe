import { describe, expect, it } from 'vitest';
import { fmtM, fmtS } from '../../../core/gamestep/format.ts';

// Expected strings worked by hand (common practice: SI units, milliseconds below a second,
// kilometres from 1,000 m on).
describe("game-step notes' number formatting", () => {
  it('writes times to 4 significant digits, in ms below 1 s', () => {
    expect(fmtS(1)).toBe('1 s');
    expect(fmtS(123.456)).toBe('123.5 s');
    expect(fmtS(86400)).toBe('86400 s');
    expect(fmtS(0.25)).toBe('250 ms');
    expect(fmtS(1 / 60)).toBe('16.67 ms');
    expect(fmtS(0.999)).toBe('999 ms');
  });

  it('writes distances to the millimetre, in km from 1,000 m', () => {
    expect(fmtM(0)).toBe('0.000 m');
    expect(fmtM(12.3456)).toBe('12.346 m');
    expect(fmtM(999.9994)).toBe('999.999 m');
    expect(fmtM(1000)).toBe('1.000 km');
    expect(fmtM(2243.4)).toBe('2.243 km');
    expect(fmtM(1.5e9)).toBe('1500000.000 km');
  });
});
