/**
 * Routes from intent (core/route planRoute) targeted in n-body on the demo system — the checks too
 * slow for the test suite (5–15 s each).
 *
 * Figures: the verdict, the route's Δv in n-body and the wall time. Reference, measured in the
 * same run: the same intent targeted in patched conics (its Δv); the ratio n-body / patched
 * conics is near 1 for a route that is met (the n-body corrections are small), and a route not
 * met is named with the leg that failed (planRoute.ts module comment).
 */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import type { Vehicle } from '../../core/plan/index.ts';
import { planRoute, type RouteIntent } from '../../core/route/index.ts';
import { printTable } from './table.ts';

const DAY = 86400;
/** The heavy test ship of test/core/route/planRoute.test.ts (≈ 19 km/s). */
const heavy: Vehicle = {
  name: 'Heavy test ship',
  payloadMass: 1500,
  stages: [
    { name: 'Departure stage', dryMass: 30000, propellantMass: 900000, isp: 450, thrust: 8e6 },
    { name: 'Cruise stage', dryMass: 8000, propellantMass: 200000, isp: 380, thrust: 100e3 },
  ],
};

export async function run(): Promise<void> {
  const system = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
  const cases: [string, string, number, number, number][] = [
    ['tessel', 'quill', 300e3, 100e3, 20],
    ['skerry', 'lough', 100e3, 200e3, 40],
    ['quill', 'tessel', 100e3, 400e3, 400],
    ['tessel', 'skerry', 300e3, 500e3, 400],
  ];
  const rows: (string | number)[][] = [];
  for (const [from, to, alt, target, days] of cases) {
    const intent: RouteIntent = {
      from: { body: from, altitude: alt },
      to: { body: to, periapsisAltitude: target },
      departAfter: 0,
      departBefore: days * DAY,
      vehicle: heavy,
    };
    const conic = planRoute(system, intent);
    const t0 = performance.now();
    const nbody = planRoute(system, { ...intent, truthModel: 'nbody' });
    const ms = performance.now() - t0;
    const failed = nbody.target.legs.find((l) => l.status !== 'converged');
    rows.push([
      `${from} → ${to}`,
      nbody.target.status + (failed ? ` (${failed.name}: ${failed.failure})` : ''),
      nbody.target.dv.after,
      conic.target.dv.after,
      nbody.target.dv.after / conic.target.dv.after,
      nbody.target.flights,
      ms,
    ]);
  }
  printTable(['route', 'n-body verdict', 'n-body Δv m/s', 'conic Δv m/s', 'ratio', 'flights', 'ms'], rows);
}
