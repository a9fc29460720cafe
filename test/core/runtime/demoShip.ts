/**
 * A test-only ship source: the demo plan's patched-conic flight (core/conic evaluate on
 * test/fixtures/demoPlan.ts) as the generic arcs of core/runtime/ship.ts. Consecutive segments
 * about the same body make one arc; its state at t is the state of the segment flown at t
 * (core/conic shipState.ts: segmentIndexAt, then segmentStateAt, which is what shipStateAt does),
 * with the segment clamped to the arc, so at an SOI crossing each arc keeps its own centre. The
 * breaks are every segment boundary (burns, and the coasts' ends); the fine windows are 10 minutes
 * either side of each burn and each periapsis passage the flight reports.
 */
import { readFileSync } from 'node:fs';
import { evaluate } from '../../../core/conic/index.ts';
import { segmentIndexAt, segmentStateAt } from '../../../core/conic/shipState.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import type { PlanResult } from '../../../core/plan/index.ts';
import type { ShipArcInput, ShipInput } from '../../../core/runtime/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';

/** Half-width of the fine windows around burns and periapses, s. */
export const FINE_HALF_WIDTH = 600;

export function ilmar(): StarSystem {
  return parseSystemFile(readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
}

/** The demo plan flown in the patched-conic model. */
export function demoFlight(system: StarSystem): PlanResult {
  return evaluate(system, demoPlan);
}

/** The flight's arcs (one per run of segments about one body). */
export function shipArcs(result: PlanResult): ShipArcInput[] {
  const segs = result.segments;
  const arcs: ShipArcInput[] = [];
  let first = 0;
  for (let k = 1; k <= segs.length; k++) {
    if (k < segs.length && segs[k].central === segs[first].central) continue;
    const lo = first;
    const hi = k - 1;
    arcs.push({
      t0: segs[lo].t0,
      t1: segs[hi].t1,
      center: segs[lo].central,
      sample: (t, out6) => {
        const j = Math.min(hi, Math.max(lo, segmentIndexAt(segs, t)));
        segmentStateAt(segs, j, t, out6);
      },
    });
    first = k;
  }
  return arcs;
}

/** The ship input of the flight: arcs, breaks at every segment boundary, fine windows around burns and periapses. */
export function demoShipInput(result: PlanResult, extra: Partial<ShipInput> = {}): ShipInput {
  const breaks = result.segments.slice(1).map((s) => s.t0);
  const fine = result.events.filter((e) => e.kind === 'burn' || e.kind === 'periapsis').map((e) => ({ t0: e.t - FINE_HALF_WIDTH, t1: e.t + FINE_HALF_WIDTH }));
  return { name: 'long-patience', arcs: shipArcs(result), breaks, fine, ...extra };
}
