import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/index.ts';
import { checkIntent, type RouteIntent } from '../../../core/route/intent.ts';
import { planRoute } from '../../../core/route/index.ts';
import { greyTern } from '../../fixtures/skerryPlan.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
const DAY = 86400;

function intent(edit: (i: RouteIntent) => void = () => {}): RouteIntent {
  const i: RouteIntent = {
    from: { body: 'tessel', altitude: 300e3 },
    to: { body: 'skerry', periapsisAltitude: 500e3 },
    departAfter: 0,
    departBefore: 400 * DAY,
    vehicle: structuredClone(greyTern),
  };
  edit(i);
  return i;
}

function refusal(edit: (i: RouteIntent) => void): InputError {
  try {
    planRoute(sys, intent(edit));
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('the intent was accepted');
}

describe('route intent checks', () => {
  it('fills in the defaults: circular target, safe altitudes, 5 % + 50 m/s reserve, patched conics', () => {
    const c = checkIntent(
      sys,
      intent((i) => {
        i.to.periapsisAltitude = undefined as unknown as number;
      }),
    );
    expect(c.periapsisAltitude).toBe(sys.bodies[sys.indexById.skerry].safeAlt);
    expect(c.apoapsisAltitude).toBe(c.periapsisAltitude);
    expect(c.apoapsisGiven).toBe(false);
    expect(c.truthModel).toBe('conic');
    expect(c.reserve).toEqual({ percent: 5, absolute: 50 });
    expect(c.links.map((l) => l.kind)).toEqual(['siblings', 'to-moon']);
  });

  it('the same body twice names to.body', () => {
    const e = refusal((i) => {
      i.to.body = 'tessel';
    });
    expect(e.field).toBe('to.body');
    expect(e.rule).toMatch(/differ/);
  });

  it('the star names the field and says it is the star', () => {
    const e = refusal((i) => {
      i.from.body = 'ilmar';
    });
    expect(e.field).toBe('from.body');
    expect(e.rule).toMatch(/not the star Ilmar/);
  });

  it("an altitude below the body's safe altitude says which body and how high", () => {
    const e = refusal((i) => {
      i.to.periapsisAltitude = 2e3;
    });
    expect(e.field).toBe('to.periapsisAltitude');
    expect(e.rule).toBe("must be at least Skerry's safe altitude 8 km");
    const f = refusal((i) => {
      i.from.altitude = 50e3;
    });
    expect(f.field).toBe('from.altitude');
    expect(f.rule).toBe("must be at least Tessel's safe altitude 90 km");
  });

  it('an apoapsis below the periapsis, an inclination out of range', () => {
    expect(
      refusal((i) => {
        i.to.apoapsisAltitude = 400e3;
      }).field,
    ).toBe('to.apoapsisAltitude');
    expect(
      refusal((i) => {
        i.to.inclination = 4;
      }).field,
    ).toBe('to.inclination');
  });

  it('an empty date range names departBefore', () => {
    const e = refusal((i) => {
      i.departBefore = i.departAfter;
    });
    expect(e.field).toBe('departBefore');
    expect(e.rule).toMatch(/empty date range/);
  });

  it('a vehicle without stages names the vehicle field', () => {
    const e = refusal((i) => {
      i.vehicle = { ...i.vehicle, stages: [] };
    });
    expect(e.field.startsWith('vehicle')).toBe(true);
  });
});
