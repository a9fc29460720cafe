/**
 * The two checks of the open document, each run on demand in its own analysis worker (so a
 * long stability run does not hold up a game-step check, and neither holds up the n-body
 * analyses of analysis/store.ts):
 * - game: the game-step check of the plan, its time-step sweep and "Retarget for my game" (the
 *   plan's burns retargeted for the game's physics; one at a time). A result
 *   belongs to the document revision it was run for; after an edit it is stale (shown as such,
 *   and its error lanes and path leave the Timeline and the System view) until run again.
 * - stability: the system stability check, and the estimate of how long a run takes. A result
 *   belongs to the system it was run for (plan edits do not touch the system).
 * A new document cancels running jobs and clears the results. Errors from the core arrive as
 * their messages and are shown in the panel's words (checkErrors.ts); a failed run leaves the
 * previous result in place beside its error.
 */
import type { GamePhysicsInput, GameStepResult } from '../../../core/gamestep/index.ts';
import type { SweepResult } from '../../../core/gamestep/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { StabilityResult } from '../../../core/checks/index.ts';
import type { DocumentSnapshot } from '../state/document.ts';
import type { EvaluationState } from '../state/evaluation.ts';
import { Observable, type Readable } from '../state/observable.ts';
import type { AnalysisClient } from './client.ts';
import { checkError, type CheckError } from './checkErrors.ts';
import type { GameStepJobOptions, RetargetJobOptions, RetargetOutput, StabilityEstimate, StabilityJobOptions } from './checkJobs.ts';
import type { AnalysisJob, AnalysisOutput } from './protocol.ts';

export interface CheckSlot<T, I> {
  value: T | null;
  /** What it was run with. */
  input: I | null;
  /** Document revision and generation, and the system, it was run for. */
  revision: number;
  generation: number;
  system: StarSystem | null;
  /** Wall time of the run in the worker, ms. */
  ms: number;
  error: CheckError | null;
}

export interface SweepInput {
  physics: GamePhysicsInput;
  tolerance?: number;
  energyTolerance?: number;
}

export interface JobLane<K extends string> {
  running: K | null;
  progress: number;
  note: string;
  /** Performance-clock time the running job started, ms (for the elapsed time shown). */
  startedAt: number;
}

export interface ChecksState {
  game: JobLane<'gamestep' | 'sweep' | 'retarget'> & {
    check: CheckSlot<GameStepResult, GameStepJobOptions>;
    sweep: CheckSlot<SweepResult, SweepInput>;
    retarget: CheckSlot<RetargetOutput, RetargetJobOptions>;
  };
  stability: JobLane<'stability' | 'stability-estimate'> & {
    result: CheckSlot<StabilityResult, StabilityJobOptions>;
    /** The run-time estimate for `estimateFor`. */
    estimate: StabilityEstimate | null;
    estimateFor: StarSystem | null;
  };
  revision: number;
  generation: number;
  system: StarSystem | null;
}

const emptySlot = <T, I>(): CheckSlot<T, I> => ({ value: null, input: null, revision: -1, generation: -1, system: null, ms: 0, error: null });
const idle = { running: null, progress: 0, note: '', startedAt: 0 };

/** A game-step result or sweep is current while the document is at the revision it was run for. */
export function isCurrentForPlan(s: ChecksState, slot: CheckSlot<unknown, unknown>): boolean {
  return slot.value !== null && slot.revision === s.revision && slot.generation === s.generation;
}

/** A stability result is current while the document's system is the one it was run for. */
export function isCurrentForSystem(s: ChecksState, slot: CheckSlot<unknown, unknown>): boolean {
  return slot.value !== null && slot.system === s.system && slot.generation === s.generation;
}

type Lane = 'game' | 'stability';

export class CheckStore implements Readable<ChecksState> {
  #seq: Record<Lane, number> = { game: 0, stability: 0 };
  #out: Observable<ChecksState>;
  readonly #unsubscribe: () => void;

  constructor(
    private readonly doc: Readable<DocumentSnapshot>,
    private readonly evaluation: Readable<EvaluationState>,
    private readonly clients: Record<Lane, AnalysisClient>,
    private readonly now: () => number = () => (typeof performance !== 'undefined' ? performance.now() : Date.now()),
  ) {
    this.#out = new Observable<ChecksState>({
      game: { ...idle, check: emptySlot(), sweep: emptySlot(), retarget: emptySlot() },
      stability: { ...idle, result: emptySlot(), estimate: null, estimateFor: null },
      revision: -1,
      generation: -1,
      system: null,
    });
    this.#unsubscribe = doc.subscribe((d) => {
      const s = this.#out.get();
      if (s.generation !== d.generation && s.generation !== -1) {
        this.clients.game.cancel();
        this.clients.stability.cancel();
        this.#seq.game++;
        this.#seq.stability++;
        this.#out.set({
          game: { ...idle, check: emptySlot(), sweep: emptySlot(), retarget: emptySlot() },
          stability: {
            ...idle,
            result: emptySlot(),
            estimate: s.stability.estimateFor === d.system ? s.stability.estimate : null,
            estimateFor: s.stability.estimateFor === d.system ? d.system : null,
          },
          revision: d.revision,
          generation: d.generation,
          system: d.system,
        });
      } else this.#out.set({ ...s, revision: d.revision, generation: d.generation, system: d.system });
    });
  }

  subscribe(l: (s: ChecksState) => void): () => void {
    return this.#out.subscribe(l);
  }

  get(): ChecksState {
    return this.#out.get();
  }

  /** Game-step check of the plan with the game's physics. */
  runGameStep(options: GameStepJobOptions): Promise<void> {
    const d = this.doc.get();
    const e = this.evaluation.get();
    if (!e.result || e.stale) return Promise.resolve(this.failGame('check', 'the plan does not evaluate; fix it first'));
    const job: AnalysisJob = { kind: 'gamestep', system: d.system, plan: d.plan, result: e.result, ...options };
    return this.runGame('check', 'gamestep', job, options);
  }

  /** Time-step sweep: per integrator the largest passing step, from physics.dt upwards in powers of two. */
  runSweep(input: SweepInput): Promise<void> {
    const d = this.doc.get();
    const e = this.evaluation.get();
    if (!e.result || e.stale) return Promise.resolve(this.failGame('sweep', 'the plan does not evaluate; fix it first'));
    const job: AnalysisJob = { kind: 'sweep', system: d.system, plan: d.plan, result: e.result, ...input };
    return this.runGame('sweep', 'sweep', job, input);
  }

  /** "Retarget for my game": the plan's burns retargeted for the game's physics, and the runtime data of the schedule. */
  runRetarget(options: RetargetJobOptions): Promise<void> {
    const d = this.doc.get();
    const e = this.evaluation.get();
    if (!e.result || e.stale) return Promise.resolve(this.failGame('retarget', 'the plan does not evaluate; fix it first'));
    const job: AnalysisJob = { kind: 'retarget', system: d.system, plan: d.plan, ...options };
    return this.runGame('retarget', 'retarget', job, options);
  }

  cancelGame(): void {
    this.clients.game.cancel();
  }

  /** Stability check of the document's system. */
  async runStability(options: StabilityJobOptions): Promise<void> {
    const d = this.doc.get();
    const job: AnalysisJob = { kind: 'stability', system: d.system, ...options };
    const run = await this.start('stability', 'stability', job);
    if (!run) return;
    const s = this.#out.get();
    const base = { revision: d.revision, generation: d.generation, system: d.system, input: options };
    if ('error' in run) this.#out.set({ ...s, stability: { ...s.stability, ...idle, result: { ...s.stability.result, error: run.error } } });
    else if (run.output.kind === 'stability') {
      const r = run.output.stability;
      // the run itself is the best measure of the step rate: the estimate takes it over
      let estimate = s.stability.estimate;
      if (estimate && s.stability.estimateFor === d.system && run.ms > 200 && r.steps > 0) {
        const mode = { h: r.h, stepsPerSecond: (1000 * r.steps) / run.ms };
        estimate =
          r.mergedMoons && estimate.hasMoons ? { ...estimate, merged: mode } : { ...estimate, moons: mode, ...(estimate.hasMoons ? {} : { merged: mode }) };
      }
      this.#out.set({ ...s, stability: { ...s.stability, ...idle, estimate, result: { ...base, value: r, ms: run.ms, error: null } } });
    }
  }

  /** Measures the step rate of this system's stability run (once per system). */
  async estimateStability(): Promise<void> {
    const d = this.doc.get();
    const s0 = this.#out.get();
    if ((s0.stability.estimateFor === d.system && s0.stability.estimate) || s0.stability.running) return;
    const run = await this.start('stability', 'stability-estimate', { kind: 'stability-estimate', system: d.system });
    if (!run) return;
    const s = this.#out.get();
    if ('error' in run) this.#out.set({ ...s, stability: { ...s.stability, ...idle } });
    else if (run.output.kind === 'stability-estimate')
      this.#out.set({ ...s, stability: { ...s.stability, ...idle, estimate: run.output.estimate, estimateFor: d.system } });
  }

  cancelStability(): void {
    this.clients.stability.cancel();
  }

  dispose(): void {
    this.#unsubscribe();
    this.clients.game.dispose();
    this.clients.stability.dispose();
  }

  private async runGame(
    slot: 'check' | 'sweep' | 'retarget',
    kind: 'gamestep' | 'sweep' | 'retarget',
    job: AnalysisJob,
    input: GameStepJobOptions | SweepInput | RetargetJobOptions,
  ): Promise<void> {
    const d = this.doc.get();
    const run = await this.start('game', kind, job);
    if (!run) return;
    const s = this.#out.get();
    const base = { revision: d.revision, generation: d.generation, system: d.system };
    if ('error' in run) {
      // the last result stays (with its own revision, so staleness still shows) beside the error
      this.#out.set({ ...s, game: { ...s.game, ...idle, [slot]: { ...s.game[slot], error: run.error } } });
      return;
    }
    const o = run.output;
    if (o.kind === 'gamestep')
      this.#out.set({ ...s, game: { ...s.game, ...idle, check: { ...base, input: input as GameStepJobOptions, value: o.check, ms: run.ms, error: null } } });
    else if (o.kind === 'sweep')
      this.#out.set({ ...s, game: { ...s.game, ...idle, sweep: { ...base, input: input as SweepInput, value: o.sweep, ms: run.ms, error: null } } });
    else if (o.kind === 'retarget') {
      const value: RetargetOutput = { retarget: o.retarget, runtime: o.runtime };
      this.#out.set({ ...s, game: { ...s.game, ...idle, retarget: { ...base, input: input as RetargetJobOptions, value, ms: run.ms, error: null } } });
    }
  }

  /**
   * Runs a job on a lane: null when cancelled or overtaken by a later job (the lane is then
   * left to that job, or set idle with note 'cancelled'), else the output or the error.
   */
  private async start<K extends string>(lane: Lane, kind: K, job: AnalysisJob): Promise<{ output: AnalysisOutput; ms: number } | { error: CheckError } | null> {
    const seq = ++this.#seq[lane];
    this.setLane(lane, { running: kind, progress: 0, note: '', startedAt: this.now() });
    try {
      const done = await this.clients[lane].run(job, (progress, note) => {
        if (seq === this.#seq[lane]) this.setLane(lane, { progress, note });
      });
      if (seq !== this.#seq[lane]) return null;
      if (!done) {
        this.setLane(lane, { ...idle, note: 'cancelled' });
        return null;
      }
      return done;
    } catch (err) {
      if (seq !== this.#seq[lane]) return null;
      return { error: checkError(err instanceof Error ? err.message : String(err)) };
    }
  }

  private setLane(lane: Lane, patch: Partial<JobLane<string>>): void {
    const s = this.#out.get();
    if (lane === 'game') this.#out.set({ ...s, game: { ...s.game, ...(patch as Partial<ChecksState['game']>) } });
    else this.#out.set({ ...s, stability: { ...s.stability, ...(patch as Partial<ChecksState['stability']>) } });
  }

  private failGame(slot: 'check' | 'sweep' | 'retarget', message: string): void {
    const s = this.#out.get();
    this.#out.set({ ...s, game: { ...s.game, [slot]: { ...s.game[slot], error: { message, detail: message } } } });
  }
}
