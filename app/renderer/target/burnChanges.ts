/**
 * The targeter's control changes as the panel lists them: Δv components grouped by burn (each
 * burn's Δv vector in its own frame before and after, its magnitude before and after, and the size
 * of the change |after − before|), and every other control (a burn's time, a transfer's arrival, a
 * coast's length) on its own. A control varied in more than one leg keeps its first "before" and
 * its last "after".
 */
import type { ControlChange, LegReport } from '../../../core/target/index.ts';

export interface BurnChange {
  burnId: string;
  /** The components as the targeter named them ("Mid-course Δv prograde"), before and after, m/s. */
  components: { name: string; before: number; after: number }[];
  /** |Δv| before and after, m/s. */
  before: number;
  after: number;
  /** |Δv after − Δv before|, m/s. */
  change: number;
}

export function burnChanges(legs: readonly LegReport[]): BurnChange[] {
  const byBurn = new Map<string, Map<string, { name: string; before: number; after: number }>>();
  for (const leg of legs) {
    for (const c of leg.controls) {
      if (c.kind !== 'burn-dv') continue;
      let m = byBurn.get(c.burnId);
      if (!m) {
        m = new Map();
        byBurn.set(c.burnId, m);
      }
      const had = m.get(c.name);
      m.set(c.name, { name: c.name, before: had ? had.before : c.before, after: c.after });
    }
  }
  return [...byBurn].map(([burnId, m]) => {
    const components = [...m.values()];
    let b = 0;
    let a = 0;
    let d = 0;
    for (const c of components) {
      b += c.before * c.before;
      a += c.after * c.after;
      d += (c.after - c.before) ** 2;
    }
    return { burnId, components, before: Math.sqrt(b), after: Math.sqrt(a), change: Math.sqrt(d) };
  });
}

/** The controls that are not Δv components (times, durations), SI, one per control name. */
export function otherChanges(legs: readonly LegReport[]): ControlChange[] {
  const byName = new Map<string, ControlChange>();
  for (const leg of legs) {
    for (const c of leg.controls) {
      if (c.kind === 'burn-dv') continue;
      const had = byName.get(c.name);
      byName.set(c.name, { ...c, before: had ? had.before : c.before });
    }
  }
  return [...byName.values()];
}
