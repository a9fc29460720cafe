import { describe, expect, it } from 'vitest';
import { bodyPosition } from '../../../../core/system/ephemeris.ts';
import { trackPaths } from '../../../../app/renderer/gamestep/trackPaths.ts';
import { demoCheck, plan, planResult, system } from './fixture.ts';

describe("the game-step paths for the System view, in each span's central-body frame", () => {
  it('starts on the parking orbit: the first point is the plan start, at the parking radius from the home world', () => {
    const r = demoCheck();
    const paths = trackPaths(system, r);
    const seg = planResult.segments.find((s) => s.t1 > s.t0)!;
    expect(paths[0].central).toBe(seg.central);
    for (let c = 0; c < 3; c++) {
      expect(paths[0].game[c]).toBeCloseTo(seg.state0[c], -1); // metres, within 5 m
      expect(paths[0].reference[c]).toBeCloseTo(seg.state0[c], -1);
    }
    // every point of the first span (a circular parking orbit) at R + altitude from the planet
    const home = system.bodies[seg.central];
    const start = plan.start as { periapsisAltitude: number };
    const radius = home.radius + start.periapsisAltitude;
    const g = paths[0].game;
    for (let k = 0; k < g.length; k += 3) expect(Math.hypot(g[k], g[k + 1], g[k + 2]) / radius - 1).toBeLessThan(1e-4);
  });

  it("subtracts the central body's position at each sample time and joins neighbouring spans", () => {
    const r = demoCheck();
    const paths = trackPaths(system, r);
    expect(paths.length).toBe(r.spans.length);
    const b = [0, 0, 0];
    // the second span's first point is the first span's last sample, re-expressed about its own central body
    const first = r.series.span.indexOf(1);
    const k = first - 1;
    bodyPosition(system, paths[1].central, r.track.t[k], b);
    for (let c = 0; c < 3; c++) expect(paths[1].game[c]).toBe(r.track.game[3 * k + c] - b[c]);
  });

  it('cuts a diverged tail (the core marks it with the largest double) instead of drawing it', () => {
    const r = demoCheck();
    const game = Float64Array.from(r.track.game);
    const n = r.track.t.length;
    const cut = Math.floor(n / 2);
    for (let k = 3 * cut; k < game.length; k++) game[k] = Number.MAX_VALUE;
    const paths = trackPaths(system, { ...r, track: { ...r.track, game } });
    const points = paths.reduce((a, p) => a + p.game.length / 3, 0);
    expect(points).toBeLessThan(cut + r.spans.length);
    for (const p of paths) for (const v of p.game) expect(Math.abs(v)).toBeLessThan(1e13);
  });
});
