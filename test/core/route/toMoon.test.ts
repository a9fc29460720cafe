/**
 * The 'to-moon' hop from every departure date: Tessel (300 km) to Quill (100 km) from 40 starts of
 * the departure range spread over a year and, finely, over one Quill period, in patched conics.
 * Each route must be met and its transfer burn must stay near the coplanar Hohmann burn from the
 * parking orbit to Quill's distance at arrival (Curtis, Orbital Mechanics for Engineering
 * Students, eq. 6.2 — from memory: Δv₁ = √(μ/r₁)(√(2r₂/(r₁+r₂)) − 1)): the search once took a
 * nearly 180° arc whose plane the aim offset swung (a 10 km/s burn, the ship's tanks emptied, the
 * route failing).
 */
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/index.ts';
import type { Vehicle } from '../../../core/plan/index.ts';
import { planRoute } from '../../../core/route/index.ts';
import { bodyPosition } from '../../../core/system/index.ts';
import { demoSystem } from '../plan/helpers.ts';

const DAY = 86400;
const sys = demoSystem();
/** An invented ship carrying about 9 km/s: enough for the hop with its reserve, not for a wrong plane. */
const ship: Vehicle = { name: 'Test tug', payloadMass: 2000, stages: [{ name: 'Main', dryMass: 3000, propellantMass: 45000, isp: 380, thrust: 200e3 }] };

describe('to-moon hop: Tessel to Quill from 40 departure-range starts', () => {
  const tessel = sys.bodies[sys.indexById.tessel];
  const quill = sys.bodies[sys.indexById.quill];
  const period = 2 * Math.PI * Math.sqrt((quill.elements?.a ?? 0) ** 3 / tessel.mu);
  // 20 starts over one Quill period from day 50 (where the failures were), 20 over a year
  const starts = [
    ...Array.from({ length: 20 }, (_, k) => 50 * DAY + (k * period) / 20),
    ...Array.from({ length: 20 }, (_, k) => (k * 365 * DAY) / 20 + 3.3 * DAY),
  ];

  it('every start gives a met route whose transfer burn is near the Hohmann burn', () => {
    const p = new Float64Array(3);
    for (const t0 of starts) {
      const r = planRoute(sys, {
        from: { body: 'tessel', altitude: 300e3 },
        to: { body: 'quill', periapsisAltitude: 100e3 },
        departAfter: t0,
        departBefore: t0 + 30 * DAY,
        vehicle: ship,
      });
      const day = (t0 / DAY).toFixed(2);
      expect(r.target.status, `start day ${day}: ${r.message}`).toBe('met');
      const rows = evaluate(sys, r.plan, { samplesPerSegment: 0 }).budget.rows;
      const transfer = rows.find((row) => row.name === 'Transfer to Quill');
      bodyPosition(sys, sys.indexById.quill, r.hops[0].arrive, p, sys.indexById.tessel);
      const r1 = tessel.radius + 300e3;
      const r2 = Math.hypot(p[0], p[1], p[2]);
      const hohmann = Math.sqrt(tessel.mu / r1) * (Math.sqrt((2 * r2) / (r1 + r2)) - 1);
      // measured 0.8 % to 2.1 % above it (a grid of 48 coast × 32 flight times and an arc kept
      // short of 180°, PLANE_SWING); 3 % holds that and refuses any other plane (≈ +300 % here)
      expect(transfer, `start day ${day}`).toBeDefined();
      expect((transfer?.dv ?? 0) / hohmann - 1, `start day ${day}`).toBeGreaterThan(0);
      expect((transfer?.dv ?? 0) / hohmann - 1, `start day ${day}`).toBeLessThan(0.03);
    }
  });
});
