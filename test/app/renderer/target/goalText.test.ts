import { describe, expect, it } from 'vitest';
import { decimalsFor, goalValueText, goalWantedText, toleranceText } from '../../../../app/renderer/target/goalText.ts';

const N = '\u202f'; // digit-group space of format.ts
const DEG = Math.PI / 180;

describe('goal numbers for the targeting panel', () => {
  it('shows a value to about a tenth of its tolerance', () => {
    expect(decimalsFor(0.1)).toBe(2);
    expect(decimalsFor(0.13)).toBe(2);
    expect(decimalsFor(10 / 86400)).toBe(5); // 10 s in days: 1.16e-4
    expect(decimalsFor(0.001)).toBe(4);
    expect(decimalsFor(250)).toBe(0);
    expect(decimalsFor(0)).toBe(3);
  });

  it('writes wanted ± tolerance and values in the display unit', () => {
    expect(goalWantedText(7_808_352.84, 130, 'km', 1000)).toBe(`7${N}808.35 ± 0.13 km`);
    expect(goalValueText(400_000.2, 100, 'km', 1000)).toBe('400.00 km');
    expect(goalWantedText(30 * DEG, 0.001 * DEG, '°', DEG)).toBe('30.0000 ± 0.0010°');
    expect(goalValueText(0.1, 1e-5)).toBe('0.100000');
    expect(goalValueText(null, 1, 'km', 1000)).toBe('—');
    expect(toleranceText(10, 'days', 86400)).toBe('0.00012 days');
  });
});
