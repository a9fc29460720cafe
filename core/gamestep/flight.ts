/**
 * Flies a craft the way a game's physics loop does: fixed steps of one integrator in the game's
 * precision, burns applied at step boundaries, sphere-of-influence switches when a step ends
 * past the boundary, and an optional floating origin.
 *
 * - Time runs on the game's step grid t_k = t_start + k·h (h rounded to the game's precision;
 *   the clock itself is double, as game engines keep it). A flight may change h between calls
 *   to `fly` (a long-step coast).
 * - Impulsive burns: the inertial Δv (from guidance.ts, solved from the game's own
 *   state or the plan's) is added to the velocity between steps, at the grid time nearest the
 *   burn's centre. Spread burns: from the step nearest the burn's start, each step holds the
 *   thrust acceleration F/m (m falling with the propellant flow) along the Δv direction, until
 *   |Δv| is delivered (the last step at part throttle), as a game's autopilot cuts the engine
 *   when the Δv is reached.
 * - 'central' gravity: only the central body pulls and the state is relative to it. After each
 *   step the craft leaves the SOI if it is beyond the SOI radius, and enters a child's SOI if it
 *   is within the child's radius (checked at times chosen so the craft cannot have crossed in
 *   between: half the gap over the sum of the speeds); the state is then re-expressed about the
 *   new body with the conic ephemeris, in the game's precision.
 * - 'all' gravity: the star and every body pull, in the star frame (the game's world frame),
 *   with the star's own acceleration towards the bodies subtracted (the indirect term, one
 *   vector per time: kernelF64.ts `bodiesGravity`) — the physics of the reference and of the
 *   n-body verification (core/dynamics/shipForces.ts). A game that flies the plan with
 *   all-body gravity in a star-centred frame adds this one term to fly the same physics.
 * - Floating origin (`rebase`): when |p| exceeds `distance`, the origin is moved to the craft
 *   (p = 0) and, with `velocity`, its velocity set to the craft's (u = 0); see
 *   kernel.ts.
 * A flight whose state becomes non-finite stops with status 'diverged'.
 */
import { InputError } from '../math/index.ts';
import { bodyState, bodyStateRelativeToParent } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import { noRound } from './float32.ts';
import { burnDv, type GameGuidance } from './guidance.ts';
import { GameCraft, kernelFor, type GameIntegrator, type GameKernel, type GamePrecision } from './kernel.ts';
import { absolutePositions, treeOrder, type GameBurn, type GameBurnModel, type GameGravity } from './reference.ts';

/** Floating-origin rebasing: re-centre when |p| > distance (m); velocity: also re-centre the velocity. */
export interface GameRebase {
  distance: number;
  velocity: boolean;
}

export interface GameFlightSetup {
  system: StarSystem;
  gravity: GameGravity;
  integrator: GameIntegrator;
  precision: GamePrecision;
  rebase: GameRebase | null;
  burnModel: GameBurnModel;
  burns: GameBurn[];
  guidance: GameGuidance;
}

export interface FlyHooks {
  /** A check (onCheck) every this many steps (≥ 1), and after the last step. */
  checkEvery: number;
  /** Times at which a check is forced: at the first step at or after each. */
  checkpoints?: readonly number[];
  onCheck?: (t: number) => void;
  /**
   * Land on tEnd exactly: the last step is shortened (or stretched by less than a rounding) to
   * end there. For ends that are not physical events (the plan's end, a comparison window).
   */
  land?: boolean;
  /** Called after each batch of steps with the number of steps in it. */
  onSteps?: (steps: number) => void;
  signal?: { aborted: boolean };
}

export type FlyStatus = 'done' | 'cancelled' | 'diverged';

/** Relative slack when counting steps up to an end time. */
const GRID_SLACK = 1e-9;
/** Safety factor on the time to the next SOI-entry check (half the gap over the closing-speed bound). */
const ENTRY_CHECK_FACTOR = 0.5;

const WAITING = 0;
const ACTIVE = 1;
const DONE = 2;

const b6 = new Float64Array(6);

export class GameFlight {
  /** Game time, s. */
  t = 0;
  /** Central body ('central' gravity) or 0 (the star frame of 'all'). */
  central = 0;
  readonly craft: GameCraft;
  steps = 0;
  rebases = 0;
  soiChanges = 0;
  private readonly kernel: GameKernel;
  private readonly R: (x: number) => number;
  private readonly phase: Int8Array;
  private readonly remaining: Float64Array;
  private readonly mass: Float64Array;
  private readonly dir: Float64Array;
  private readonly dvNow: [number, number, number] = [0, 0, 0];
  private readonly abs6 = new Float64Array(6);
  /** Ids of burns whose solve failed (flown with the plan's Δv). */
  readonly solveFailures: string[] = [];
  /**
   * Impulses flown so far as [a, b): between the game's application time and the burn's planned
   * time the game and an exact flight are on opposite sides of the impulse.
   */
  readonly impulseWindows: { a: number; b: number }[] = [];
  private entryBodies: number[] = [];
  private entryAt: number[] = [];
  private readonly order: number[];
  private readonly mus: Float64Array;
  private readonly rel6 = new Float64Array(6);

  constructor(readonly setup: GameFlightSetup) {
    if (setup.rebase && !(setup.rebase.distance > 0 && Number.isFinite(setup.rebase.distance))) {
      throw new InputError('rebase.distance', 'must be a finite number > 0 (m)', setup.rebase.distance);
    }
    this.kernel = kernelFor(setup.precision);
    this.R = setup.precision === 'float32' ? Math.fround : noRound;
    this.craft = new GameCraft(this.R);
    const n = setup.burns.length;
    this.phase = new Int8Array(n);
    this.remaining = new Float64Array(n);
    this.mass = new Float64Array(n);
    this.dir = new Float64Array(3 * n);
    this.order = treeOrder(setup.system);
    this.mus = Float64Array.from(setup.system.bodies.map((b) => b.mu));
  }

  /** Step h as the game holds it (rounded to its precision). */
  gameStep(h: number): number {
    return this.R(h);
  }

  /** Starts (or restarts) the flight at t from an absolute (star-frame) state about `central`. */
  reset(t: number, abs6: ArrayLike<number>, central: number): void {
    const s = this.setup;
    const c = this.craft;
    const R = this.R;
    this.t = t;
    this.central = s.gravity === 'central' ? central : 0;
    bodyState(s.system, this.central, t, b6);
    const rel = [0, 0, 0, 0, 0, 0];
    for (let i = 0; i < 6; i++) rel[i] = abs6[i] - b6[i];
    c.tOrigin = t;
    c.tx = c.ty = c.tz = 0;
    c.gValid = false;
    if (s.rebase) {
      c.ox = rel[0];
      c.oy = rel[1];
      c.oz = rel[2];
      c.px = c.py = c.pz = 0;
      if (s.rebase.velocity) {
        c.wx = rel[3];
        c.wy = rel[4];
        c.wz = rel[5];
        c.ux = c.uy = c.uz = 0;
      } else {
        c.wx = c.wy = c.wz = 0;
        c.ux = R(rel[3]);
        c.uy = R(rel[4]);
        c.uz = R(rel[5]);
      }
      c.rebase2 = s.rebase.distance * s.rebase.distance;
    } else {
      c.ox = c.oy = c.oz = c.wx = c.wy = c.wz = 0;
      c.px = R(rel[0]);
      c.py = R(rel[1]);
      c.pz = R(rel[2]);
      c.ux = R(rel[3]);
      c.uy = R(rel[4]);
      c.uz = R(rel[5]);
      c.rebase2 = Infinity;
    }
    s.burns.forEach((b, i) => {
      const past = s.burnModel === 'spread' && b.duration > 0 ? b.tStart < t : b.t < t;
      this.phase[i] = past ? DONE : WAITING;
      this.remaining[i] = b.dvMag;
      this.mass[i] = b.mass0;
    });
    this.setCentral(this.central);
  }

  /** Absolute (star-frame) state in double, into out6. */
  state(out6: Float64Array): Float64Array {
    this.relState(out6);
    bodyState(this.setup.system, this.central, this.t, b6);
    for (let i = 0; i < 6; i++) out6[i] += b6[i];
    return out6;
  }

  /** State relative to the frame centre (the central body, or the star for 'all'), into out6. */
  relState(out6: Float64Array): Float64Array {
    const c = this.craft;
    const s = this.t - c.tOrigin;
    out6[0] = c.ox + c.wx * s + c.px;
    out6[1] = c.oy + c.wy * s + c.py;
    out6[2] = c.oz + c.wz * s + c.pz;
    out6[3] = c.wx + c.ux;
    out6[4] = c.wy + c.uy;
    out6[5] = c.wz + c.uz;
    return out6;
  }

  /** Whether the stored state is finite. */
  finite(): boolean {
    const c = this.craft;
    return Number.isFinite(c.px + c.py + c.pz + c.ux + c.uy + c.uz);
  }

  /**
   * Flies steps of h (rounded to the game's precision) from the current time to the first grid
   * time at or after tEnd.
   */
  fly(tEnd: number, h: number, hooks: FlyHooks): FlyStatus {
    const hs = this.R(h);
    if (!(hs > 0) || !Number.isFinite(hs)) throw new InputError('h', 'must be a finite number > 0 (s)', h);
    const every = Math.max(1, Math.floor(hooks.checkEvery));
    const tg = this.t;
    const N = Math.max(0, Math.ceil((tEnd - tg) / hs - GRID_SLACK));
    const cps: number[] = [];
    for (const tc of hooks.checkpoints ?? []) {
      const kc = Math.ceil((tc - tg) / hs - GRID_SLACK);
      if (kc >= 1 && kc <= N) cps.push(kc);
    }
    cps.sort((a, b) => a - b);
    let cp = 0;
    const s = this.setup;
    const c = this.craft;
    const burns = s.burns;
    let k = 0;
    let nextCheck = Math.min(every, N);
    while (k < N) {
      if (hooks.signal?.aborted) return 'cancelled';
      let t = tg + k * hs;
      // burns due now; the step count to the next one due
      const toBurn = this.burnsDue(k, t, tg, hs);
      const active = this.activeBurn();
      let n = Math.min(N - k, nextCheck - k, toBurn);
      while (cp < cps.length && cps[cp] <= k) cp++;
      if (cp < cps.length) n = Math.min(n, cps[cp] - k);
      if (this.entryBodies.length > 0) {
        let tNext = Infinity;
        for (const te of this.entryAt) tNext = Math.min(tNext, te);
        n = Math.min(n, Math.max(1, Math.ceil((tNext - t) / hs - GRID_SLACK)));
      }
      let dvStep = 0;
      let accel = 0;
      if (active >= 0) {
        n = 1;
        const b = burns[active];
        accel = b.mdot > 0 && b.mass0 > b.mass1 ? b.thrust / this.mass[active] : b.duration > 0 ? b.dvMag / b.duration : 0;
        dvStep = Math.min(accel * hs, this.remaining[active]);
        const f = dvStep / hs;
        c.tx = this.R(this.dir[3 * active] * f);
        c.ty = this.R(this.dir[3 * active + 1] * f);
        c.tz = this.R(this.dir[3 * active + 2] * f);
      } else {
        c.tx = c.ty = c.tz = 0;
      }
      n = Math.max(1, n);
      // landing: the last step of the flight is tEnd − t_{N−1}
      const landing = hooks.land === true && k + n === N;
      let done: number;
      if (landing && n > 1) {
        done = this.kernel.advance(c, s.integrator, t, hs, n - 1);
      } else if (landing) {
        const hl = this.R(tEnd - t);
        done = hl > 0 ? this.kernel.advance(c, s.integrator, t, hl, 1) : 1;
      } else {
        done = this.kernel.advance(c, s.integrator, t, hs, n);
      }
      k += done;
      this.steps += done;
      t = hooks.land === true && k === N ? tEnd : tg + k * hs;
      this.t = t;
      if (active >= 0) {
        const b = burns[active];
        this.remaining[active] -= dvStep;
        if (accel > 0) this.mass[active] -= b.mdot * hs * (dvStep / (accel * hs));
        if (this.remaining[active] <= 1e-12 * (b.dvMag + 1) || dvStep === 0) this.phase[active] = DONE;
        c.tx = c.ty = c.tz = 0;
      }
      if (!this.finite()) return 'diverged';
      // the kernel stops after the step that crosses a threshold, which may be the batch's last
      this.stopped(t);
      if (this.entryBodies.length > 0) this.checkEntries(t, hs);
      hooks.onSteps?.(done);
      const isCp = cp < cps.length && cps[cp] === k;
      if (k >= nextCheck || isCp || k === N) {
        this.burnsDue(k, t, tg, hs); // a check sees the impulses of its own step
        hooks.onCheck?.(t);
        if (k >= nextCheck) nextCheck = Math.min(N, k + every);
      }
    }
    return 'done';
  }

  // Starts the burns due at step k (time t) of a fly from tg; returns the steps to the next one due.
  private burnsDue(k: number, t: number, tg: number, hs: number): number {
    const s = this.setup;
    const burns = s.burns;
    let toBurn = Infinity;
    for (let i = 0; i < burns.length; i++) {
      if (this.phase[i] !== WAITING) continue;
      const b = burns[i];
      const spread = s.burnModel === 'spread' && b.duration > 0;
      const tb = spread ? b.tStart : b.t;
      const kb = Math.floor((tb - 0.5 * hs - tg) / hs) + 1; // first step with t_k > tb − h/2
      if (kb > k) {
        toBurn = Math.min(toBurn, kb - k);
        continue;
      }
      const dv = this.resolve(b, t, spread);
      if (spread) {
        const m = Math.hypot(dv[0], dv[1], dv[2]);
        this.remaining[i] = m;
        for (let j = 0; j < 3; j++) this.dir[3 * i + j] = m > 0 ? dv[j] / m : 0;
        this.phase[i] = m > 0 ? ACTIVE : DONE;
      } else {
        this.impulse(dv);
        this.phase[i] = DONE;
        this.impulseWindows.push({ a: Math.min(t, b.t), b: Math.max(t, b.t) });
      }
    }
    return toBurn;
  }

  private activeBurn(): number {
    for (let i = 0; i < this.phase.length; i++) if (this.phase[i] === ACTIVE) return i;
    return -1;
  }

  /** Whether time t lies between an impulse's application by the game and its planned time. */
  inImpulseWindow(t: number): boolean {
    const w = this.impulseWindows;
    for (let i = w.length - 1; i >= 0 && i >= w.length - 4; i--) if (t >= w[i].a && t < w[i].b) return true;
    return false;
  }

  // The burn's Δv now, from the guidance (see guidance.ts).
  private resolve(b: GameBurn, t: number, atStart: boolean): [number, number, number] {
    this.state(this.abs6);
    if (!burnDv(this.setup.system, b, this.setup.guidance, t, this.abs6, atStart, this.dvNow)) this.solveFailures.push(b.id);
    return this.dvNow;
  }

  private impulse(dv: ArrayLike<number>): void {
    const R = this.R;
    const c = this.craft;
    c.ux = R(c.ux + R(dv[0]));
    c.uy = R(c.uy + R(dv[1]));
    c.uz = R(c.uz + R(dv[2]));
  }

  // The kernel stopped early: an SOI exit or the floating-origin threshold.
  private stopped(t: number): void {
    const c = this.craft;
    if (c.exit2 !== Infinity) {
      const s = t - c.tOrigin;
      const qx = c.ox + c.wx * s + c.px;
      const qy = c.oy + c.wy * s + c.py;
      const qz = c.oz + c.wz * s + c.pz;
      if (qx * qx + qy * qy + qz * qz > c.exit2) this.switchCentral(this.setup.system.bodies[this.central].parentIndex, t);
    }
    if (c.px * c.px + c.py * c.py + c.pz * c.pz > c.rebase2) this.rebaseAt(t);
  }

  /** Moves the origin to the craft at time t (floating-origin rebase). */
  rebaseAt(t: number): void {
    const c = this.craft;
    const s = t - c.tOrigin;
    c.ox += c.wx * s + c.px;
    c.oy += c.wy * s + c.py;
    c.oz += c.wz * s + c.pz;
    c.tOrigin = t;
    c.px = c.py = c.pz = 0;
    if (this.setup.rebase?.velocity) {
      c.wx += c.ux;
      c.wy += c.uy;
      c.wz += c.uz;
      c.ux = c.uy = c.uz = 0;
    }
    c.gValid = false;
    this.rebases++;
  }

  private checkEntries(t: number, hs: number): void {
    const system = this.setup.system;
    const bodies = system.bodies;
    const rel = this.relState(this.rel6);
    const vs = Math.hypot(rel[3], rel[4], rel[5]);
    for (let i = 0; i < this.entryBodies.length; i++) {
      if (this.entryAt[i] > t) continue;
      const k = this.entryBodies[i];
      bodyStateRelativeToParent(system, k, t, b6);
      const d = Math.hypot(rel[0] - b6[0], rel[1] - b6[1], rel[2] - b6[2]);
      const gap = d - bodies[k].derived.soiRadius;
      if (gap < 0) {
        this.switchCentral(k, t);
        return;
      }
      const vk = Math.hypot(b6[3], b6[4], b6[5]);
      this.entryAt[i] = t + Math.max(hs, (ENTRY_CHECK_FACTOR * gap) / (vs + vk + 1e-9));
    }
  }

  private switchCentral(to: number, t: number): void {
    const system = this.setup.system;
    const from = this.central;
    const up = system.bodies[from].parentIndex === to;
    bodyStateRelativeToParent(system, up ? from : to, t, b6);
    const sg = up ? 1 : -1;
    const c = this.craft;
    const R = this.R;
    if (this.setup.rebase) {
      const s = t - c.tOrigin;
      c.ox += c.wx * s + sg * b6[0];
      c.oy += c.wy * s + sg * b6[1];
      c.oz += c.wz * s + sg * b6[2];
      c.tOrigin = t;
      if (this.setup.rebase.velocity) {
        c.wx += sg * b6[3];
        c.wy += sg * b6[4];
        c.wz += sg * b6[5];
      } else {
        c.ux = R(c.ux + R(sg * b6[3]));
        c.uy = R(c.uy + R(sg * b6[4]));
        c.uz = R(c.uz + R(sg * b6[5]));
      }
    } else {
      c.px = R(c.px + R(sg * b6[0]));
      c.py = R(c.py + R(sg * b6[1]));
      c.pz = R(c.pz + R(sg * b6[2]));
      c.ux = R(c.ux + R(sg * b6[3]));
      c.uy = R(c.uy + R(sg * b6[4]));
      c.uz = R(c.uz + R(sg * b6[5]));
    }
    this.soiChanges++;
    this.setCentral(to);
  }

  private setCentral(k: number): void {
    const s = this.setup;
    const system = s.system;
    const c = this.craft;
    this.central = k;
    c.gValid = false;
    if (s.gravity === 'all') {
      c.accel = this.kernel.bodiesGravity(c, this.mus, (t, out) => absolutePositions(system, this.order, t, out));
      c.exit2 = Infinity;
      this.entryBodies = [];
      this.entryAt = [];
      return;
    }
    const b = system.bodies[k];
    c.accel = this.kernel.centralGravity(c, b.mu);
    c.exit2 = k === 0 ? Infinity : b.derived.soiRadius * b.derived.soiRadius;
    this.entryBodies = [...b.children];
    this.entryAt = this.entryBodies.map(() => -Infinity);
  }
}
