import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { sequencePlan } from '../../../../app/renderer/windows/sequencePlan.ts';
import { evaluate } from '../../../../core/conic/index.ts';
import { parsePlanFile } from '../../../../core/io/index.ts';
import { searchSequence } from '../../../../core/search/index.ts';
import { demoSystem } from '../../../core/search/fixtures.ts';

const system = demoSystem();
// the flyby demo's vehicle (its tanks carry the Δv of a trip to Fennick)
const base = parsePlanFile(readFileSync(new URL('../../../../assets/plans/tessel-moravel-fennick.plan.json', import.meta.url), 'utf8'), { system }).plan;
const ends = { parkingAltitude: 300e3, captureAltitude: 104e3 };

describe('"Make a plan from this": a sequence solution as plan events', () => {
  for (const powered of [true, false]) {
    it(`${powered ? 'powered' : 'unpowered'}: the plan flies past Moravel and reaches the target orbit at Fennick in patched conics`, () => {
      const r = searchSequence(system, {
        bodies: ['tessel', 'moravel', 'fennick'],
        departFrom: base.start.epoch,
        departTo: base.start.epoch + 283 * 86400,
        departAltitude: ends.parkingAltitude,
        arriveAltitude: ends.captureAltitude,
        arriveE: 0,
        keep: 1,
        powered,
      });
      const sol = r.solutions[0];
      const plan = sequencePlan(system, sol, base, { ...ends, captureE: 0, powered });
      // unpowered: no burn between the pass and leaving Moravel's sphere
      const k = plan.events.findIndex((e) => e.type === 'flyby');
      expect(plan.events[k + 1].type).toBe(powered ? 'burn' : 'coast');
      expect(plan.vehicle).toEqual(base.vehicle);
      expect(plan.events.filter((e) => e.type === 'flyby').map((e) => (e as { body: string }).body)).toEqual(['moravel']);
      const res = evaluate(system, plan);
      // nothing fails in flight (the margin may: the demo's tanks are sized for its own powered route)
      expect(res.flags.filter((f) => f.severity === 'error' && f.code !== 'negative-margin')).toEqual([]);
      expect(res.target?.reached).toBe(true);
      expect(res.target?.body).toBe(system.indexById.fennick);
      // the pass happens at the solution's Moravel date to within the time to cross Moravel's sphere
      // of influence at v∞ (the Lambert leg aims at the body's centre; the patched conic meets the
      // sphere's edge and turns inside it)
      const moravel = system.bodies[system.indexById.moravel];
      const fly = res.flybys![0];
      expect(Math.abs(fly.tPeriapsis - sol.legs[0].arrive)).toBeLessThan(moravel.derived.soiRadius / sol.flybys[0].vInfIn);
      // never below Moravel's minimum safe altitude
      expect(fly.periapsisAltitude).toBeGreaterThanOrEqual(system.bodies[system.indexById.moravel].safeAlt);
    });
  }
});
