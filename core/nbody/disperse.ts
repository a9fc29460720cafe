/**
 * Dispersion run: Monte Carlo over burn execution errors, each sample flown with patched conics
 * (evaluate, no drawing samples).
 *
 * Error model (per burn, 1σ values global or per burn):
 * - magnitude: |Δv| scaled by (1 + ε), ε ~ N(0, (σ_mag/100)²) — σ_mag in percent;
 * - pointing: the direction tilted by two independent small angles α, β ~ N(0, σ_point²) about two
 *   axes perpendicular to it (the tilt θ = √(α² + β²) is then Rayleigh-distributed with scale
 *   σ_point, and E[θ²] = 2σ²), applied as an exact rotation: Δv' = (1 + ε)(cos θ Δv + |Δv| sin θ ê),
 *   ê the unit vector of the tilt in the plane perpendicular to Δv. This is the usual
 *   independent "magnitude and pointing" execution-error model (common practice).
 * Every sample draws 3 normals per burn, in plan order, whatever the σ values (so one burn's σ
 * never shifts another's draws); sample k uses random stream k of the seed (core/math/random.ts
 * `stream(seed, k)`), so a sample's errors do not depend on how samples are spread over workers.
 *
 * How burns are flown (`resolve`):
 * - 'frozen' (default): the plan is first frozen into a burn schedule — every burn 'fixed'
 *   inertial at its nominal time with its nominal resolved vector, condition coasts turned into
 *   timed coasts (correct.ts freezePlan) — and the errors act on those vectors: open-loop
 *   execution, no later burn reacts to an earlier error.
 * - 'retarget': solved burns keep their solve, so a mid-course 'transfer' burn re-solves after the
 *   perturbed departure (closed-loop, as flown with navigation), and a capture re-solves at the
 *   perturbed arrival. The error of each burn is applied as the additive vector (perturbed −
 *   nominal) of its nominal resolved Δv, written in the burn's own frame at the nominal state and
 *   added to its `dv` components — so for a re-solved burn the error scales with the nominal
 *   vector, not the re-solved one (an approximation of second order in the error).
 *
 * Outputs per sample: the margin, the arrival periapsis altitude at the target (the first
 * periapsis after entering its SOI, nbody.ts conicArrival; +Infinity when the sample never
 * arrives) and the outcome: flown, not evaluated (a WaymarkError), ended by an impact, or never
 * reaching the target. A sample that does not complete its flight fails, whatever its budget
 * says: P(margin ≥ 0) counts only the samples that are flown to the end without an impact and
 * (with a target) arrive. Summary: that probability, P(arrives with periapsis altitude ≥ the
 * target's minimum safe altitude), P(arrives), the counts of failed samples by cause, and the
 * 5/50/95 % percentiles of margin (over the samples that evaluate) and (over the samples that
 * arrive) periapsis altitude, by linear interpolation between order statistics (Hyndman & Fan,
 * "Sample quantiles in statistical packages", The American Statistician 50(4), 1996, type 7).
 */
import { InputError, SolverError, WaymarkError, requireFinite } from '../math/index.ts';
import { stream, type Seed } from '../math/index.ts';
import { findBodyIndex, MAX_DISPERSION_SAMPLES, requireWithinLimit, type StarSystem } from '../system/index.ts';
import { inertialToBurn } from '../plan/index.ts';
import { freezePlan } from './correct.ts';
import { evaluate } from '../conic/index.ts';
import { conicArrival } from './verify.ts';
import type { BurnEvent, Plan } from '../plan/index.ts';
import type { PlanResult } from '../plan/index.ts';
import { propagateKepler } from '../orbit/index.ts';

export interface BurnSigma {
  /** 1σ magnitude error, percent of |Δv|. */
  magnitudeSigma?: number;
  /** 1σ pointing error per axis, degrees. */
  pointingSigma?: number;
}

export interface DispersionOptions extends BurnSigma {
  samples: number;
  /** Seed of the random streams (default 1). */
  seed?: Seed;
  /** Per-burn σ overrides by burn id (unset fields fall back to the global σ). */
  perBurn?: Record<string, BurnSigma>;
  resolve?: 'frozen' | 'retarget';
}

const DEG = Math.PI / 180;

/** What every chunk of a run shares: the checked options, the nominal flight, the sample template. */
export interface PreparedDispersion {
  system: StarSystem;
  plan: Plan;
  samples: number;
  seed: Seed;
  resolve: 'frozen' | 'retarget';
  nominal: PlanResult;
  /** The plan each sample edits (frozen, or the plan itself). */
  template: Plan;
  /** Event indices of the burns in `template`, in plan order, with their σ (fractions and radians). */
  burns: { eventIndex: number; id: string; mag: number; point: number; nominal: [number, number, number]; frameR: number[]; frameV: number[] }[];
  target: number;
  safeAltitude: number;
  nominalMargin: number;
  nominalPeriapsis: number;
}

function sigma(field: string, x: number | undefined): number {
  if (x === undefined) return 0;
  requireFinite(field, x);
  if (!(x >= 0)) throw new InputError(field, 'must be >= 0', x);
  return x;
}

/** Checks the options and flies the nominal plan. Throws InputError on bad options. */
export function prepareDispersion(system: StarSystem, plan: Plan, options: DispersionOptions): PreparedDispersion {
  if (!options || typeof options !== 'object') throw new InputError('options', 'must be an object', options);
  const n = options.samples;
  if (!Number.isInteger(n) || n < 1) throw new InputError('options.samples', 'must be an integer >= 1', n);
  requireWithinLimit('options.samples', n, MAX_DISPERSION_SAMPLES, 'samples');
  const seed = options.seed ?? 1;
  if (!(typeof seed === 'bigint' || Number.isSafeInteger(seed))) throw new InputError('options.seed', 'must be a safe integer or a bigint', seed);
  const resolve = options.resolve ?? 'frozen';
  if (resolve !== 'frozen' && resolve !== 'retarget') throw new InputError('options.resolve', "must be 'frozen' or 'retarget'", resolve);
  const gMag = sigma('options.magnitudeSigma', options.magnitudeSigma);
  const gPoint = sigma('options.pointingSigma', options.pointingSigma);
  const per = options.perBurn ?? {};
  if (typeof per !== 'object' || per === null) throw new InputError('options.perBurn', 'must be an object of burn ids', per);
  for (const id of Object.keys(per)) {
    if (!plan.events.some((e) => e.type === 'burn' && e.id === id)) throw new InputError(`options.perBurn.${id}`, 'names no burn of the plan', id);
  }
  const nominal = evaluate(system, plan, { samplesPerSegment: 0 });
  const template = resolve === 'frozen' ? freezePlan(system, plan, nominal, [], 0, -1) : structuredClone(plan);
  const rows = new Map(nominal.budget.rows.map((r) => [r.planEventId, r]));
  const burns: PreparedDispersion['burns'] = [];
  template.events.forEach((ev, eventIndex) => {
    if (ev.type !== 'burn') return;
    const row = rows.get(ev.id);
    if (!row) return; // never flown nominally: flown as planned
    const o = per[ev.id] ?? {};
    const mag = sigma(`options.perBurn.${ev.id}.magnitudeSigma`, o.magnitudeSigma ?? gMag) / 100;
    const point = sigma(`options.perBurn.${ev.id}.pointingSigma`, o.pointingSigma ?? gPoint) * DEG;
    // nominal state at the burn (for writing a retarget-mode error in the burn's frame)
    let frameR = [0, 0, 0];
    let frameV = [0, 0, 0];
    if (resolve === 'retarget' && ev.frame !== 'inertial') {
      // the coast that ends at (or covers) the burn: the state the burn frame is built on
      const seg =
        nominal.segments.find((s) => s.kind === 'coast' && s.t0 < row.t && s.t1 >= row.t) ??
        nominal.segments.find((s) => s.kind === 'coast' && s.t0 <= row.t && s.t1 >= row.t);
      const st = seg ? propagateKepler(seg.mu, seg.state0, row.t - seg.t0) : null;
      if (st) {
        frameR = [st[0], st[1], st[2]];
        frameV = [st[3], st[4], st[5]];
      }
    }
    burns.push({ eventIndex, id: ev.id, mag, point, nominal: [row.dvInertial[0], row.dvInertial[1], row.dvInertial[2]], frameR, frameV });
  });
  const target = plan.target ? findBodyIndex(system, plan.target.body) : -1;
  const arr = conicArrival(system, plan, nominal);
  return {
    system,
    plan,
    samples: n,
    seed,
    resolve,
    nominal,
    template,
    burns,
    target,
    safeAltitude: target >= 0 ? system.bodies[target].safeAlt : 0,
    nominalMargin: nominal.budget.margin,
    nominalPeriapsis: arr ? arr.periapsisAltitude : Infinity,
  };
}

/** Per-sample results of samples [first, first + count). */
export interface SampleBlock {
  first: number;
  count: number;
  margin: Float64Array;
  /** Arrival periapsis altitude, m (+Infinity: the sample never reaches the target). */
  periapsisAltitude: Float64Array;
  /** Applied errors, count × burns (burn-major within a sample): ε (fraction) and tilt θ (rad). */
  magnitudeError: Float64Array;
  pointingError: Float64Array;
  /** Samples whose evaluation failed (a WaymarkError): margin −Infinity, not arrived. */
  failed: number;
  /** Per sample: SAMPLE_FLOWN, SAMPLE_NOT_EVALUATED, SAMPLE_IMPACT or SAMPLE_NO_ARRIVAL. */
  outcome: Uint8Array;
}

/** Outcome of a sample: flown to the end (no impact; arrived, when the plan has a target). */
export const SAMPLE_FLOWN = 0;
/** Outcome of a sample: its evaluation failed (margin −Infinity). */
export const SAMPLE_NOT_EVALUATED = 1;
/** Outcome of a sample: its flight ended in an impact. */
export const SAMPLE_IMPACT = 2;
/** Outcome of a sample: it flew without impact but never reached the target. */
export const SAMPLE_NO_ARRIVAL = 3;

export interface SampleOptions {
  onProgress?: (done: number, total: number) => void;
  signal?: { aborted: boolean };
  /** Progress is reported every this many samples (default 64). */
  progressEvery?: number;
}

const u3 = [0, 0, 0];
const e3 = [0, 0, 0];
const d3 = [0, 0, 0];

/** The perturbed vector (see the module comment) of dv with errors ε, α, β, into out. */
export function perturbBurn(dv: ArrayLike<number>, eps: number, alpha: number, beta: number, out: number[]): number[] {
  const m = Math.hypot(dv[0], dv[1], dv[2]);
  const th = Math.hypot(alpha, beta);
  if (m === 0 || th === 0) {
    const f = 1 + eps;
    out[0] = f * dv[0];
    out[1] = f * dv[1];
    out[2] = f * dv[2];
    return out;
  }
  u3[0] = dv[0] / m;
  u3[1] = dv[1] / m;
  u3[2] = dv[2] / m;
  // two axes perpendicular to u: e1 = u × (axis least aligned with u), e2 = u × e1
  const ax = Math.abs(u3[0]),
    ay = Math.abs(u3[1]),
    az = Math.abs(u3[2]);
  let px = 0,
    py = 0,
    pz = 0;
  if (ax <= ay && ax <= az) px = 1;
  else if (ay <= az) py = 1;
  else pz = 1;
  let e1x = u3[1] * pz - u3[2] * py,
    e1y = u3[2] * px - u3[0] * pz,
    e1z = u3[0] * py - u3[1] * px;
  const n1 = Math.hypot(e1x, e1y, e1z);
  e1x /= n1;
  e1y /= n1;
  e1z /= n1;
  const e2x = u3[1] * e1z - u3[2] * e1y,
    e2y = u3[2] * e1x - u3[0] * e1z,
    e2z = u3[0] * e1y - u3[1] * e1x;
  const ca = alpha / th,
    cb = beta / th;
  e3[0] = ca * e1x + cb * e2x;
  e3[1] = ca * e1y + cb * e2y;
  e3[2] = ca * e1z + cb * e2z;
  const c = Math.cos(th),
    s = Math.sin(th);
  const f = 1 + eps;
  out[0] = f * (c * dv[0] + m * s * e3[0]);
  out[1] = f * (c * dv[1] + m * s * e3[1]);
  out[2] = f * (c * dv[2] + m * s * e3[2]);
  return out;
}

/** Flies samples [first, first + count) of a prepared run (any split gives the same samples). */
export function runSamples(p: PreparedDispersion, first: number, count: number, options: SampleOptions = {}): SampleBlock {
  if (!Number.isInteger(first) || first < 0) throw new InputError('first', 'must be an integer >= 0', first);
  if (!Number.isInteger(count) || count < 0 || first + count > p.samples)
    throw new InputError('count', `must be an integer with first + count <= ${p.samples}`, count);
  const B = p.burns.length;
  const margin = new Float64Array(count);
  const peri = new Float64Array(count);
  const magErr = new Float64Array(count * B);
  const pointErr = new Float64Array(count * B);
  const outcome = new Uint8Array(count);
  const work: Plan = structuredClone(p.template);
  const evs = p.burns.map((b) => work.events[b.eventIndex] as BurnEvent);
  const baseDv = evs.map((ev) => [ev.dv[0], ev.dv[1], ev.dv[2]] as [number, number, number]);
  const every = Math.max(1, options.progressEvery ?? 64);
  const rng0 = stream(p.seed, first);
  let failed = 0;
  for (let j = 0; j < count; j++) {
    if (options.signal?.aborted) throw new SolverError('disperse', 'cancelled', `dispersion cancelled after ${j} of ${count} samples`, { done: j });
    const rng = rng0.clone();
    rng0.jump();
    for (let b = 0; b < B; b++) {
      const burn = p.burns[b];
      const eps = rng.normal() * burn.mag;
      const alpha = rng.normal() * burn.point;
      const beta = rng.normal() * burn.point;
      magErr[j * B + b] = eps;
      pointErr[j * B + b] = Math.hypot(alpha, beta);
      const ev = evs[b];
      if (p.resolve === 'frozen') {
        perturbBurn(burn.nominal, eps, alpha, beta, d3);
        ev.dv[0] = d3[0];
        ev.dv[1] = d3[1];
        ev.dv[2] = d3[2];
      } else {
        perturbBurn(burn.nominal, eps, alpha, beta, d3);
        d3[0] -= burn.nominal[0];
        d3[1] -= burn.nominal[1];
        d3[2] -= burn.nominal[2];
        if (ev.frame !== 'inertial' && (d3[0] !== 0 || d3[1] !== 0 || d3[2] !== 0)) {
          try {
            inertialToBurn(ev.frame, burn.frameR, burn.frameV, d3, d3);
          } catch (e) {
            if (!(e instanceof WaymarkError)) throw e;
          }
        }
        ev.dv[0] = baseDv[b][0] + d3[0];
        ev.dv[1] = baseDv[b][1] + d3[1];
        ev.dv[2] = baseDv[b][2] + d3[2];
      }
    }
    try {
      const r = evaluate(p.system, work, { samplesPerSegment: 0 });
      margin[j] = r.budget.margin;
      const arr = p.target >= 0 ? conicArrival(p.system, work, r) : null;
      peri[j] = arr ? arr.periapsisAltitude : Infinity;
      outcome[j] = r.flags.some((f) => f.code === 'impact') ? SAMPLE_IMPACT : p.target >= 0 && !arr ? SAMPLE_NO_ARRIVAL : SAMPLE_FLOWN;
    } catch (e) {
      if (!(e instanceof WaymarkError)) throw e;
      margin[j] = -Infinity;
      peri[j] = Infinity;
      outcome[j] = SAMPLE_NOT_EVALUATED;
      failed++;
    }
    if ((j + 1) % every === 0 || j + 1 === count) options.onProgress?.(j + 1, count);
  }
  return { first, count, margin, periapsisAltitude: peri, magnitudeError: magErr, pointingError: pointErr, failed, outcome };
}

export interface Percentiles {
  p5: number;
  p50: number;
  p95: number;
}

export interface DispersionResult {
  samples: number;
  seed: string;
  resolve: 'frozen' | 'retarget';
  /** Fraction of samples flown to the end (no impact; arrived, with a target) whose margin is ≥ 0. */
  pMarginHolds: number;
  /** Fraction that reach the target with periapsis altitude ≥ its minimum safe altitude (null without a target). */
  pPeriapsisSafe: number | null;
  /** Fraction that reach the target at all (null without a target). */
  pArrive: number | null;
  margin: Percentiles & { mean: number; min: number; max: number };
  /** Over the samples that arrive (null when none does, or without a target). */
  periapsisAltitude: Percentiles | null;
  safeAltitude: number | null;
  nominal: { margin: number; periapsisAltitude: number | null };
  /** Samples that failed, by cause: not evaluated, ended by an impact, never reached the target. */
  failed: number;
  impacts: number;
  missed: number;
  /** Per-sample values in sample order. */
  perSample: SampleBlock;
}

/** Quantile q ∈ [0, 1] of sorted values (Hyndman & Fan type 7). */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0) throw new InputError('sorted', 'must hold at least one value');
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** Joins blocks (any order) into one block in sample order; they must tile [0, samples). */
export function mergeBlocks(blocks: SampleBlock[], samples: number, burns: number): SampleBlock {
  const sorted = [...blocks].sort((a, b) => a.first - b.first);
  const out: SampleBlock = {
    first: 0,
    count: samples,
    margin: new Float64Array(samples),
    periapsisAltitude: new Float64Array(samples),
    magnitudeError: new Float64Array(samples * burns),
    pointingError: new Float64Array(samples * burns),
    failed: 0,
    outcome: new Uint8Array(samples),
  };
  let next = 0;
  for (const b of sorted) {
    if (b.first !== next) throw new InputError('blocks', `must tile the samples: expected a block at ${next}, got ${b.first}`, b.first);
    out.margin.set(b.margin, b.first);
    out.periapsisAltitude.set(b.periapsisAltitude, b.first);
    out.magnitudeError.set(b.magnitudeError, b.first * burns);
    out.pointingError.set(b.pointingError, b.first * burns);
    out.outcome.set(b.outcome, b.first);
    out.failed += b.failed;
    next += b.count;
  }
  if (next !== samples) throw new InputError('blocks', `must cover ${samples} samples (got ${next})`, next);
  return out;
}

/** The summary of a whole run from its merged per-sample block. */
export function summarizeDispersion(p: PreparedDispersion, all: SampleBlock): DispersionResult {
  const n = all.count;
  let holds = 0;
  let safe = 0;
  let arrive = 0;
  let impacts = 0;
  let missed = 0;
  let sum = 0;
  const finiteMargins: number[] = [];
  const alts: number[] = [];
  for (let k = 0; k < n; k++) {
    const m = all.margin[k];
    const o = all.outcome[k];
    if (o === SAMPLE_IMPACT) impacts++;
    else if (o === SAMPLE_NO_ARRIVAL) missed++;
    // a sample that does not complete its flight fails, whatever its budget says
    if (o === SAMPLE_FLOWN && m >= 0) holds++;
    if (Number.isFinite(m)) {
      finiteMargins.push(m);
      sum += m;
    }
    const a = all.periapsisAltitude[k];
    if (Number.isFinite(a)) {
      arrive++;
      alts.push(a);
      if (a >= p.safeAltitude) safe++;
    }
  }
  finiteMargins.sort((a, b) => a - b);
  alts.sort((a, b) => a - b);
  const hasTarget = p.target >= 0;
  const margin =
    finiteMargins.length > 0
      ? {
          p5: quantileSorted(finiteMargins, 0.05),
          p50: quantileSorted(finiteMargins, 0.5),
          p95: quantileSorted(finiteMargins, 0.95),
          mean: sum / finiteMargins.length,
          min: finiteMargins[0],
          max: finiteMargins[finiteMargins.length - 1],
        }
      : null;
  if (!margin) throw new SolverError('disperse', 'no-solution', `every one of the ${n} samples failed to evaluate`, { failed: all.failed });
  return {
    samples: n,
    seed: String(p.seed),
    resolve: p.resolve,
    pMarginHolds: holds / n,
    pPeriapsisSafe: hasTarget ? safe / n : null,
    pArrive: hasTarget ? arrive / n : null,
    margin,
    periapsisAltitude:
      hasTarget && alts.length > 0 ? { p5: quantileSorted(alts, 0.05), p50: quantileSorted(alts, 0.5), p95: quantileSorted(alts, 0.95) } : null,
    safeAltitude: hasTarget ? p.safeAltitude : null,
    nominal: { margin: p.nominalMargin, periapsisAltitude: Number.isFinite(p.nominalPeriapsis) ? p.nominalPeriapsis : null },
    failed: all.failed,
    impacts,
    missed,
    perSample: all,
  };
}

/** A whole dispersion run in this thread (the command line spreads runSamples over workers instead). */
export function disperse(system: StarSystem, plan: Plan, options: DispersionOptions & SampleOptions): DispersionResult {
  const p = prepareDispersion(system, plan, options);
  const block = runSamples(p, 0, p.samples, options);
  return summarizeDispersion(p, block);
}
