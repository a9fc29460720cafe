/**
 * The checks as worker jobs: the message round trip (jobs and outputs survive the structured
 * clone of postMessage, typed arrays included), and the check store run against an in-thread
 * worker: results current for the plan revision, stale after an edit, cancel, and the core's
 * errors in the panel's words.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { InputError, SolverError } from '../../../../core/math/errors.ts';
import { normalizePhysics } from '../../../../core/gamestep/check.ts';
import { AnalysisClient, type AnalysisWorkerLike } from '../../../../app/renderer/analysis/client.ts';
import { checkError } from '../../../../app/renderer/analysis/checkErrors.ts';
import type { CheckJob } from '../../../../app/renderer/analysis/checkJobs.ts';
import { CheckStore, isCurrentForPlan, isCurrentForSystem } from '../../../../app/renderer/analysis/checkStore.ts';
import type { FromAnalysisWorker, ToAnalysisWorker } from '../../../../app/renderer/analysis/protocol.ts';
import { runAnalysisJob } from '../../../../app/renderer/analysis/runJob.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';
import { Session } from '../../../../app/renderer/state/session.ts';
import { fakeHost } from '../state/fakeHost.ts';
import { plan, planResult, system } from './fixture.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const demoText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');

/** A "worker" that clones messages both ways as postMessage does and runs the job in this thread. */
function inThreadWorker(): AnalysisWorkerLike {
  const w: AnalysisWorkerLike = {
    onmessage: null,
    postMessage(m: ToAnalysisWorker) {
      const msg = structuredClone(m);
      setTimeout(() => {
        const send = (x: FromAnalysisWorker) => w.onmessage?.({ data: structuredClone(x) } as MessageEvent<FromAnalysisWorker>);
        try {
          const output = runAnalysisJob(msg.job, (fraction, note) => send({ type: 'progress', id: msg.id, fraction, note }));
          send({ type: 'done', id: msg.id, output, ms: 1 });
        } catch (e) {
          send({ type: 'error', id: msg.id, message: (e as Error).message });
        }
      }, 0);
    },
    terminate() {},
  };
  return w;
}

async function setup() {
  const session = await Session.create({
    host: fakeHost(),
    evaluate: (s, p) => evaluate(s, p),
    bundledSystems: { 'ilmar.system.json': systemText },
    demo: { name: 'tessel-to-ochre.plan.json', text: demoText },
    ask: async () => 'cancel',
    autosaveMs: 0,
  });
  const checks = new CheckStore(session.doc, session.evaluation, { game: new AnalysisClient(inThreadWorker), stability: new AnalysisClient(inThreadWorker) });
  return { session, checks };
}

const coarse = { physics: { integrator: 'verlet' as const, dt: 30 } };

describe('the checks as worker jobs', () => {
  it('a game-step job and its output survive the structured clone, typed arrays and all', () => {
    const job: CheckJob = { kind: 'gamestep', system, plan, result: planResult, ...coarse, samplesPerSpan: 20 };
    const progress: number[] = [];
    const out = runAnalysisJob(structuredClone(job), (f) => progress.push(f));
    expect(out.kind).toBe('gamestep');
    if (out.kind !== 'gamestep') return;
    const back = structuredClone(out);
    expect(back.check.series.t).toBeInstanceOf(Float64Array);
    expect(back.check.series.basis).toBeInstanceOf(Uint8Array);
    expect(back.check.series.span).toBeInstanceOf(Int32Array);
    expect(back).toEqual(out);
    expect(back.check.physics).toEqual(normalizePhysics(coarse.physics));
    expect(progress.length).toBeGreaterThan(0);
    expect(Math.max(...progress)).toBeLessThanOrEqual(1);
  });

  it('the stability estimate measures the step the core takes and a positive step rate', () => {
    const out = runAnalysisJob({ kind: 'stability-estimate', system }, () => {});
    if (out.kind !== 'stability-estimate') throw new Error(out.kind);
    const e = out.estimate;
    expect(e.hasMoons).toBe(true);
    expect(e.yearLength).toBe(system.calendar.yearLength);
    expect(e.moons.stepsPerSecond).toBeGreaterThan(0);
    expect(e.merged.h).toBeGreaterThan(e.moons.h); // moons set the short step
    const run = runAnalysisJob({ kind: 'stability', system, years: 2, mergeMoons: false }, () => {});
    if (run.kind !== 'stability') throw new Error(run.kind);
    expect(Math.abs(run.stability.h / e.moons.h - 1)).toBeLessThan(1e-3);
    expect(structuredClone(run)).toEqual(run);
  });
});

describe('the check store', () => {
  it('runs the game-step check for the current revision; an edit makes it stale, the stability result stays current', async () => {
    const { session, checks } = await setup();
    await checks.runGameStep({ ...coarse, samplesPerSpan: 20 });
    let s = checks.get();
    expect(s.game.running).toBeNull();
    expect(s.game.check.error).toBeNull();
    expect(s.game.check.value!.spans.length).toBeGreaterThan(0);
    expect(isCurrentForPlan(s, s.game.check)).toBe(true);
    await checks.runStability({ years: 5, mergeMoons: 'auto' });
    s = checks.get();
    expect(isCurrentForSystem(s, s.stability.result)).toBe(true);
    session.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 7 }));
    s = checks.get();
    expect(isCurrentForPlan(s, s.game.check)).toBe(false);
    expect(isCurrentForSystem(s, s.stability.result)).toBe(true);
    checks.dispose();
  });

  it('cancel leaves no result and says so', async () => {
    const { checks } = await setup();
    const running = checks.runGameStep(coarse);
    expect(checks.get().game.running).toBe('gamestep');
    checks.cancelGame();
    await running;
    const s = checks.get();
    expect(s.game.running).toBeNull();
    expect(s.game.note).toBe('cancelled');
    expect(s.game.check.value).toBeNull();
  });

  it("shows the core's InputError in the panel's words, the last result staying beside it", async () => {
    const { checks } = await setup();
    await checks.runGameStep({ ...coarse, samplesPerSpan: 10 });
    const before = checks.get().game.check.value;
    expect(before).not.toBeNull();
    await checks.runGameStep({ physics: { integrator: 'verlet', dt: 1e-46, precision: 'float32' } });
    expect(checks.get().game.check.value).toBe(before);
    const e = checks.get().game.check.error!;
    expect(e.message).toBe('Step must be representable in float32 (> 1.4e-45 s) (got 1e-46)');
    expect(e.detail).toMatch(/^physics\.dt /);
    await checks.runStability({ years: -3, mergeMoons: 'auto' });
    expect(checks.get().stability.result.error!.message).toBe('Years must be > 0 (got -3)');
  });
});

describe("the core's errors in the panel's words", () => {
  it('names known fields and solvers, and passes anything else through', () => {
    expect(checkError(new InputError('physics.rebase.distance', 'must be > 0 (m)', 0).message).message).toBe(
      'Floating-origin distance must be > 0 (m) (got 0)',
    );
    expect(checkError(new SolverError('game-step', 'cancelled', 'cancelled at t = 5 s').message).message).toBe(
      'The game-step flight was cancelled: cancelled at t = 5 s',
    );
    expect(checkError(new SolverError('game-step reference', 'step-budget', 'too many pieces').message).message).toBe(
      'The reference flight (DOP853) ran out of its step budget: too many pieces',
    );
    expect(checkError(new InputError('span', 'needs 3e7 steps', 1).message).message).toBe('Span needs 3e7 steps (got 1)');
    expect(checkError('something odd happened')).toEqual({ message: 'something odd happened', detail: 'something odd happened' });
    expect(checkError('').message).toBe('unknown error');
  });
});
