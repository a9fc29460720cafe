/**
 * "Retarget for my game" as an analysis-worker job: the job and its output survive the
 * structured clone of postMessage (typed arrays of the curves and the runtime tracks included),
 * its progress only moves forward within 0..1, and the runtime data is of the retargeted
 * schedule. Velocity Verlet at 1 s with the verification's long coasts extrapolated keeps the run
 * to a few seconds.
 */
import { describe, expect, it } from 'vitest';
import type { CheckJob } from '../../../../app/renderer/analysis/checkJobs.ts';
import { runAnalysisJob } from '../../../../app/renderer/analysis/runJob.ts';
import { trackIndex, trackPosition } from '../../../../core/runtime/index.ts';
import { plan, system } from '../gamestep/fixture.ts';

describe('the retargeting as a worker job', () => {
  it('survives the structured clone both ways; progress moves forward; the runtime ship starts where the schedule does', () => {
    const job: CheckJob = { kind: 'retarget', system, plan, physics: { integrator: 'verlet', dt: 1 }, tolerance: { altitude: 2000 }, verify: 'extrapolated' };
    const progress: number[] = [];
    const out = runAnalysisJob(structuredClone(job), (f) => progress.push(f));
    if (out.kind !== 'retarget') throw new Error(out.kind);
    const back = structuredClone(out);
    expect(back).toEqual(out);
    expect(back.retarget.curves.after.t).toBeInstanceOf(Float64Array);
    expect(back.retarget.curves.after.extrapolated).toBeInstanceOf(Uint8Array);
    expect(back.runtime.tracks[0].arcs[0].coefficients).toBeInstanceOf(Float64Array);
    // the tolerance set is the one used, the others the core's defaults
    expect(back.retarget.tolerance.altitude).toBe(2000);
    expect(back.retarget.verification.mode).toBe('extrapolated');
    for (let k = 1; k < progress.length; k++) expect(progress[k]).toBeGreaterThanOrEqual(progress[k - 1]);
    expect(Math.min(...progress)).toBeGreaterThanOrEqual(0);
    expect(progress[progress.length - 1]).toBe(1);
    // the runtime data is of this schedule: its ship track starts at the schedule's start state, within the track's tolerance
    const s = back.retarget.schedule;
    const ship = trackIndex(back.runtime, 'ship');
    const p = trackPosition(back.runtime, ship, s.t0, [0, 0, 0]);
    const d = Math.hypot(p[0] - s.start.state[0], p[1] - s.start.state[1], p[2] - s.start.state[2]);
    expect(d).toBeLessThanOrEqual(back.runtime.tracks[ship].tolerance);
  });
});
