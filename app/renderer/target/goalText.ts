/**
 * A goal's numbers as the targeting panel and the target readout show them: in its display unit
 * (value / unitScale, e.g. km, °, days), to about a tenth of its tolerance; the tolerance to two
 * significant digits.
 */
import { grouped } from '../format/format.ts';

/** Decimals that show a quantity to about a tenth of `tolerance` (same units), 0..8. */
export function decimalsFor(tolerance: number): number {
  if (!(tolerance > 0) || !Number.isFinite(tolerance)) return 3;
  return Math.min(8, Math.max(0, 1 - Math.floor(Math.log10(tolerance))));
}

/** The unit after a number: none for a bare number, "°" touching it, else a space. */
function withUnit(text: string, units: string | undefined): string {
  if (!units) return text;
  return units === '°' ? `${text}°` : `${text} ${units}`;
}

/** A tolerance to two significant digits ("0.10", "0.00012"). */
export function toleranceText(tolerance: number, units?: string, unitScale = 1): string {
  const x = tolerance / unitScale;
  if (!(x > 0) || !Number.isFinite(x)) return withUnit(grouped(x), units);
  return withUnit(grouped(x, Math.min(8, Math.max(0, 1 - Math.floor(Math.log10(x))))), units);
}

/** A goal's value ("7 808.35 km", "30.0000°"), or "—". */
export function goalValueText(value: number | null, tolerance: number, units?: string, unitScale = 1): string {
  if (value === null || !Number.isFinite(value)) return '—';
  return withUnit(grouped(value / unitScale, decimalsFor(tolerance / unitScale)), units);
}

/** What a goal asks: "7 808.35 ± 0.10 km". */
export function goalWantedText(wanted: number, tolerance: number, units?: string, unitScale = 1): string {
  const w = grouped(wanted / unitScale, decimalsFor(tolerance / unitScale));
  return withUnit(`${w} ± ${toleranceText(tolerance, undefined, unitScale)}`, units);
}
