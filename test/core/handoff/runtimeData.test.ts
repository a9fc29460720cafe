/**
 * Runtime data of a plan for a game: the ship's Chebyshev track against the path it was fitted to
 * (the plan's burns flown by the reference dynamics, RK45 at rtol 1e-12, flown again here) and the bodies' tracks against the system's ephemeris, read through
 * the standalone reader after a JSON round trip; the burns' velocity jumps survive the fit.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { gameRuntimeData } from '../../../core/handoff/index.ts';
import { flyReference, prepareGameStep, ReferenceTrack } from '../../../core/gamestep/index.ts';
import { encodeRuntimeJson, openRuntimeEphemeris } from '../../../core/runtime/index.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { bodyState } from '../../../core/system/index.ts';
import { stream } from '../../../core/math/index.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';

const { system } = parseSystemFile(readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8'));

describe('runtime data for the demo plan', () => {
  const data = gameRuntimeData(system, demoPlan, { gravity: 'central', burns: 'impulsive' });
  const prep = prepareGameStep(system, demoPlan, { guidance: 'open-loop' });
  const reader = openRuntimeEphemeris(JSON.parse(JSON.stringify(encodeRuntimeJson(data))));
  const ship = reader.trackIndex('ship');
  const shipTrack = data.tracks.find((t) => t.name === 'ship');

  it('states a ship error within its 10 m tolerance and a body error within 1 m', () => {
    expect(shipTrack?.maxError).toBeLessThanOrEqual(10);
    for (const t of data.tracks.filter((x) => x.kind === 'body')) expect(t.maxError).toBeLessThanOrEqual(1);
  });

  it('puts the ship where the plan flies it, at random times, within the stated error', () => {
    // the plan's path flown again here: its burns in the reference dynamics (RK45, rtol 1e-12)
    const burns = prep.burns.map((b) => ({ ...b, event: null }));
    const track = new ReferenceTrack(
      system,
      flyReference({ ...prep.settings, burns, guidance: 'open-loop' }, prep.t0, prep.start.abs, prep.start.central, prep.t1, true),
    );
    const rng = stream(15, 0);
    const rand = () => rng.next();
    const a6 = new Float64Array(6);
    const p = [0, 0, 0];
    let worst = 0;
    for (let i = 0; i < 2000; i++) {
      const t = prep.t0 + rand() * (prep.t1 - prep.t0);
      track.at(t, a6);
      reader.absolutePosition(ship, t, p);
      worst = Math.max(worst, Math.hypot(p[0] - a6[0], p[1] - a6[1], p[2] - a6[2]));
    }
    // the stated error, plus the absolute sum's rounding at 1.5e11 m (≈ 3e-5 m)
    expect(worst).toBeLessThanOrEqual((shipTrack?.maxError ?? 0) + 1e-3);
    expect(worst).toBeGreaterThan(0);
  });

  it('keeps each burn as a velocity jump equal to its Δv', () => {
    const v0 = [0, 0, 0];
    const v1 = [0, 0, 0];
    for (const b of prep.burns) {
      reader.velocity(ship, b.t - 1e-3, v0);
      reader.velocity(ship, b.t + 1e-3, v1);
      const jump = Math.hypot(v1[0] - v0[0] - b.dv[0], v1[1] - v0[1] - b.dv[1], v1[2] - v0[2] - b.dv[2]);
      // 2 ms of gravity (≤ 10 m/s² near a planet → 0.02 m/s) plus the velocity error of the fit
      expect(jump).toBeLessThan(0.05);
    }
  });

  it('puts the bodies where the ephemeris does', () => {
    const rng = stream(16, 0);
    const rand = () => rng.next();
    const b6 = new Float64Array(6);
    const p = [0, 0, 0];
    for (let k = 1; k < system.bodies.length; k++) {
      const name = reader.names[k - 1];
      // the body's stated error plus its parent's (a moon's track is relative to its planet), plus the rounding of 1e11 m sums
      const parent = system.bodies[k].parentIndex;
      const bound = data.tracks[k - 1].maxError + (parent > 0 ? data.tracks[parent - 1].maxError : 0) + 1e-3;
      for (let i = 0; i < 200; i++) {
        const t = data.t0 + rand() * (data.t1 - data.t0);
        bodyState(system, k, t, b6);
        reader.absolutePosition(name, t, p);
        expect(Math.hypot(p[0] - b6[0], p[1] - b6[1], p[2] - b6[2])).toBeLessThanOrEqual(bound);
      }
    }
  });
});
