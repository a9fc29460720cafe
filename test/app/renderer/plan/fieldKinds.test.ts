import { describe, expect, it } from 'vitest';
import { boundInUnit, numberKind } from '../../../../app/renderer/plan/fieldKinds.ts';
import { UNITS } from '../../../../app/renderer/plan/fieldText.ts';

describe('field kinds: a rule in the field’s words and units', () => {
  it('a bound of the file (SI, angles in degrees) is written in the unit the field shows', () => {
    expect(numberKind('Stage 1 dry mass', UNITS.t).explain('must be >= 0')).toBe('Stage 1 dry mass must be at least 0 t');
    // 1e12 kg is 1e9 t
    expect(numberKind('Stage 1 propellant', UNITS.t).explain('must be <= 1e12')).toBe('Stage 1 propellant must be at most 1,000,000,000 t');
    expect(numberKind('Inclination', UNITS.deg).explain('must be <= 180')).toBe('Inclination must be at most 180°');
    expect(numberKind('Reserve percent', UNITS.percent).explain('must be <= 100')).toBe('Reserve percent must be at most 100%');
    expect(numberKind('Thrust', UNITS.kN).explain('must be > 0')).toBe('Thrust must be more than 0 kN');
    expect(numberKind('Periapsis altitude', UNITS.km).explain('must be >= -1e13')).toBe('Periapsis altitude must be at least -10,000,000,000 km');
    expect(boundInUnit('must be < 1', UNITS.none)).toBe('must be less than 1');
  });

  it('any other rule is kept as written', () => {
    expect(numberKind('Isp', UNITS.isp).explain('must be a number')).toBe('Isp must be a number');
    expect(boundInUnit('must be >= target.periapsis_altitude_m (400000 m)', UNITS.km)).toBe('must be >= target.periapsis_altitude_m (400000 m)');
  });
});
