import { describe, expect, it } from 'vitest';
import type { RetargetGoal, RetargetResult } from '../../../../core/handoff/index.ts';
import {
  FAILURE_WORDS,
  goalFlightValue,
  goalTolerance,
  goalValue,
  recommendedFix,
  retargetView,
  stepFieldText,
} from '../../../../app/renderer/handoff/retargetView.ts';
import { compactDate } from '../../../../app/renderer/format/format.ts';
import { system } from '../gamestep/fixture.ts';

const cal = system.calendar;
const DEG = Math.PI / 180;
const km = (name: string, wanted: number, after: number | null, before: number | null = null): RetargetGoal => ({
  leg: 'final orbit about Ochre',
  name,
  wanted,
  tolerance: 1000,
  before,
  after,
  met: after !== null && Math.abs(after - wanted) <= 1000,
  units: 'km',
  unitScale: 1000,
});
const time: RetargetGoal = {
  leg: 'arrival at Ochre',
  name: 'periapsis time at Ochre',
  wanted: 34_813_276,
  tolerance: 60,
  before: 34_813_276 - 1424,
  after: 34_813_276 + 1.2,
  met: true,
  units: 'days',
  unitScale: 86400,
};
const incl: RetargetGoal = { ...km('inclination about Ochre', 30 * DEG, 29.9993 * DEG), tolerance: 0.01 * DEG, units: '°', unitScale: DEG, met: true };

/** A result with only what the view reads, as the core shapes it. */
function result(over: Partial<RetargetResult> = {}): RetargetResult {
  return {
    status: 'met',
    failure: null,
    message: 'The game flies the retargeted schedule to every goal.',
    goals: [time, km('periapsis altitude about Ochre', 400e3, 400_488), incl],
    schedule: {
      burns: [
        {
          id: 'a',
          name: 'Departure',
          step: 420_018,
          t: 13_996_800,
          dv: [0, 0, 0],
          dvMag: 3632.1192,
          dvBurnFrame: [3632.1192, 0.0013, -0.0012],
          change: [0.003, 0.004, 0],
          central: 'Tessel',
          thrust: null,
        },
      ],
    },
    verification: { mode: 'extrapolated', steps: 66_503_370, regions: [{ t0: 0, t1: 229.4 * 86400, how: 'scaled' }], impact: null, divergedAt: null },
    recommendation: null,
    notes: ["burns moved to the game's step grid by up to 8.314 ms"],
    ...over,
  } as unknown as RetargetResult;
}

describe('the retargeting in words', () => {
  it('goals: values in their units with the decimals their tolerance needs; a time wanted as a date, the flights as offsets from it', () => {
    const v = retargetView(cal, result());
    expect(v.met).toBe(true);
    expect(v.word).toBe('Met');
    const [t, alt, i] = v.goals;
    expect(t.wanted).toBe(compactDate(cal, time.wanted, true));
    expect(t.before).toBe('\u221223 min 44 s');
    expect(t.after).toBe('+1.20 s');
    expect(t.afterTitle).toBe(compactDate(cal, time.after!, true));
    expect(t.tolerance).toBe('± 60 s');
    expect(alt.wanted).toBe('400.0 km');
    expect(alt.after).toBe('400.5 km');
    expect(alt.before).toBe('—');
    expect(alt.tolerance).toBe('± 1 km');
    expect(alt.missInTolerances).toBeCloseTo(0.488, 12);
    expect(i.after).toBe('29.999°'); // a tenth of the 0.01° tolerance
    expect(i.tolerance).toBe('± 0.01°');
    expect(JSON.stringify(v)).not.toMatch(/NaN|undefined|Infinity/);
  });

  it('burns: step and calendar time, Δv in VNB and the size of the change in m/s; the verification in a line', () => {
    const v = retargetView(cal, result());
    expect(v.burns).toEqual([
      {
        n: 1,
        name: 'Departure',
        step: '420\u202f018',
        time: compactDate(cal, 13_996_800, true),
        v: '3632.119',
        nrm: '0.001',
        b: '-0.001',
        mag: '3632.119',
        change: '0.005',
      },
    ]);
    expect(v.verification).toBe('66\u202f503\u202f370 game steps flown; 1 long coast (229.4 d) extrapolated by step scaling');
    expect(retargetView(cal, result({ verification: { mode: 'every-step', steps: 10, regions: [], impact: null, divergedAt: null } })).verification).toBe(
      '10 game steps flown — every step of the plan',
    );
  });

  it('not met: the reason in words and the recommendation as one click that fills the physics form', () => {
    const step = result({
      status: 'not-met',
      failure: 'goals',
      recommendation: { reason: 'step', text: 'The largest step found that meets every goal is 1/240 s.', precision: null, dt: 1 / 240 },
    });
    const v = retargetView(cal, step);
    expect(v.word).toBe('Not met');
    expect(v.reason).toBe(FAILURE_WORDS.goals);
    expect(v.recommendation).toMatch(/1\/240 s/);
    expect(v.fix).toEqual({ label: 'Use a step of 4.17 ms', dt: 1 / 240, precision: null });
    expect(stepFieldText(v.fix!.dt!)).toBe('1/240');
    expect(stepFieldText(0.3)).toBe('0.3');
    const f32 = result({ status: 'not-met', failure: 'goals', recommendation: { reason: 'float32', text: 'float64', precision: 'float64', dt: null } });
    expect(recommendedFix(f32)).toEqual({ label: 'Use float64', dt: null, precision: 'float64' });
    const none = result({ status: 'not-met', failure: 'diverged', recommendation: { reason: 'step', text: 'No step works', precision: null, dt: null } });
    expect(recommendedFix(none)).toBeNull();
    expect(retargetView(cal, none).reason).toBe(FAILURE_WORDS.diverged);
  });

  it('a missing value is "—", never NaN', () => {
    expect(goalValue(cal, time, null)).toBe('—');
    expect(goalFlightValue(cal, time, Number.NaN)).toBe('—');
    expect(goalTolerance({ ...time, tolerance: Number.NaN })).toBe('—');
  });
});
