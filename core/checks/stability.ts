/**
 * System stability check: the mutual point-mass gravity of the star and every body, flown with
 * a symplectic fixed-step method for a long span (default 10,000 years of the home world), and
 * what happened to each orbit.
 *
 * Method: the Wisdom–Holman map (default; Wisdom & Holman, AJ 102 (1991) 1528,
 * wisdomHolman.ts: Jacobi coordinates, star then planets outward, each planet's flown moons
 * after it) with symplectic correctors (Wisdom, Holman & Touma 1996, wisdomHolmanRun.ts;
 * h = shortest period / DEFAULT_WH_STEPS_PER_PERIOD) — with flown moons the uncorrected map at
 * DEFAULT_WH_MOON_STEPS_PER_PERIOD —, or, as the cross-check,
 * Yoshida's 4th-order composition of leapfrog (Yoshida, Phys. Lett. A 150 (1990) 262,
 * core/integrate/yoshida4.ts) or leapfrog itself on `mutualAccel` (core/integrate/gravity.ts), from the barycentric epoch states of `initialStates`
 * (nbodyEphemeris.ts: each conic read as the orbit of its body's subsystem barycentre).
 * Symplectic methods keep the energy error bounded over long runs (Hairer, Lubich & Wanner,
 * Geometric Numerical Integration, 2nd ed., ch. X); the run's relative energy error is
 * reported so the reader can judge the run.
 * Step (Yoshida, leapfrog): h = min over the flown bodies of T·(1 − e)^{3/2} / stepsPerOrbit
 * (the periapsis passage sets the time scale of an eccentric orbit). Wisdom–Holman integrates
 * the Kepler part exactly, so its step is a fraction of the shortest period.
 *
 * Moons make the step small. With mergeMoons (default 'auto': when the run with moons would
 * need more than maxSteps steps, or with Wisdom–Holman more than WH_MOON_STEP_FACTOR × the
 * planets' steps — a moon flown by the map follows its planet through the interaction term,
 * at leapfrog accuracy for the same step) each planet and everything orbiting it fly as one body at the
 * subsystem's barycentre with the subsystem's μ; the result says so and why.
 *
 * Reported, per body: osculating a, e, i about its parent (planets: the subsystem barycentre
 * about the star, μ = μ_star + μ_subsystem; moons: about their planet, μ = μ_planet + μ_moon;
 * stateToElements, core/orbit/elements.ts), their ranges and sampled histories. Per pair of
 * siblings (same parent): the mutual Hill radius R_H = ((μ₁ + μ₂)/(3μ_parent))^{1/3}·(a₁ + a₂)/2
 * from the epoch elements (Gladman, "Dynamics of systems of two close planets", Icarus 106
 * (1993) 247), the epoch spacing Δa/R_H and the closest approach in units of R_H (checked after
 * every step).
 * Flags:
 * - 'hill-criterion' (warning): siblings with Δa < 2√3·R_H at the epoch, Gladman's criterion
 *   for Hill stability of two planets on circular, coplanar orbits;
 * - 'close-encounter' (warning): siblings closer than CLOSE_ENCOUNTER_HILL (3) mutual Hill radii;
 * - 'crossing-orbits' (warning): at a sample, the outer sibling's periapsis inside the inner
 *   one's apoapsis (osculating);
 * - 'ejection' (error): e ≥ 1 about the parent, or a planet beyond ejectionFactor × the largest
 *   epoch apoapsis of the planets, or a moon beyond its planet's Hill radius;
 * - 'collision' (error): two bodies closer than the sum of their radii (checked after every
 *   step); the run stops there.
 * Limits: point masses only (no tides, no relativity, no collisions' outcome); close approaches
 * are found at the step times (between steps a pass may come a little closer).
 */
import { InputError, SolverError, WaymarkError, requireFinite } from '../math/index.ts';
import { fixedStepper } from '../integrate/index.ts';
import { mutualAccel } from '../integrate/index.ts';
import { stateToElements } from '../orbit/index.ts';
import { wisdomHolmanStepper } from './wisdomHolman.ts';
import { wisdomHolmanRun } from './wisdomHolmanRun.ts';
import type { StarSystem } from '../system/index.ts';
import { initialStates } from '../system/index.ts';
import { MAX_STABILITY_BODIES, MAX_STABILITY_SAMPLES, MAX_STABILITY_STEPS, MAX_STABILITY_WORK, requireWithinLimit } from '../system/index.ts';

export type StabilityMethod = 'wisdom-holman' | 'yoshida4' | 'verlet';

export interface StabilityOptions {
  /** Span in years of the system's calendar (default DEFAULT_YEARS). */
  years?: number;
  /** Span, s (overrides years). */
  span?: number;
  method?: StabilityMethod;
  /**
   * Steps per orbit of the fastest flown body: for 'wisdom-holman' per period (default
   * DEFAULT_WH_STEPS_PER_PERIOD, h = shortest period / 10; DEFAULT_WH_MOON_STEPS_PER_PERIOD when
   * moons are flown), for 'yoshida4' and 'verlet' per
   * periapsis time scale T·(1 − e)^{3/2} (default DEFAULT_STEPS_PER_ORBIT).
   */
  stepsPerOrbit?: number;
  /** Merge moons into their planets: true, false or 'auto' (default: merge when the run with moons exceeds maxSteps). */
  mergeMoons?: boolean | 'auto';
  /** Step budget (default DEFAULT_MAX_STEPS, DEFAULT_WH_MAX_STEPS for 'wisdom-holman'); a run that needs more even with moons merged is refused. */
  maxSteps?: number;
  /** Element-history samples (default DEFAULT_SAMPLES, ≥ 2). */
  samples?: number;
  /** A planet farther from the star than this × the largest epoch apoapsis of the planets counts as ejected (default 10). */
  ejectionFactor?: number;
  onProgress?: (fraction: number) => void;
  signal?: { aborted: boolean };
}

export const DEFAULT_YEARS = 10_000;
export const DEFAULT_STEPS_PER_ORBIT = 200;
/**
 * Wisdom–Holman steps per shortest period. The map integrates the Kepler part exactly; common
 * practice without correctors is 1/20 to 1/30 of the shortest period. With the correctors, 1/10
 * gives the demo system 1/50 of the uncorrected 1/20 map's energy error and the same
 * eccentricity drifts (within 0.1 % of a Yoshida 4 run at 400 steps per periapsis time scale;
 * test/core/checks/wisdomHolman.test.ts), at half the steps.
 */
export const DEFAULT_WH_STEPS_PER_PERIOD = 10;
export const DEFAULT_METHOD: StabilityMethod = 'wisdom-holman';
/**
 * Wisdom–Holman steps per shortest period when moons are flown: the map without the corrector
 * at common practice's 1/20. A flown moon orbits the barycentre of everything inside it in
 * Jacobi coordinates, so its planet's pull is in the interaction term (not small) and the
 * corrector's premise fails: on the demo over 100 years, the corrected map at period/10 moved
 * the moons' eccentricity drifts hundreds of times further from a Yoshida 4 run (400 steps per
 * periapsis time scale) than the kick–drift–kick map at period/20, which is kept for them.
 */
export const DEFAULT_WH_MOON_STEPS_PER_PERIOD = 20;
/** With 'wisdom-holman' and mergeMoons 'auto', moons are merged when flying them needs more than this × the steps of the planets alone. */
export const WH_MOON_STEP_FACTOR = 4;
/** Step budget of 'wisdom-holman' (one force evaluation per step; 1,000,000 years of the demo, moons merged, take 3.1e7 steps). */
export const DEFAULT_WH_MAX_STEPS = 100_000_000;
export const DEFAULT_MAX_STEPS = 20_000_000;
export const DEFAULT_SAMPLES = 1000;
export const DEFAULT_EJECTION_FACTOR = 10;
/** Close-encounter threshold in mutual Hill radii. */
export const CLOSE_ENCOUNTER_HILL = 3;
/** Gladman's (1993) Hill-stability spacing for two planets on circular, coplanar orbits, in mutual Hill radii. */
export const GLADMAN_SPACING = 2 * Math.sqrt(3);
/** Steps between cancellation checks. */
const CANCEL_CHECK_STEPS = 2000;

export interface Range {
  initial: number;
  min: number;
  max: number;
}

export interface StabilityBody {
  /** Index in StarSystem.bodies. */
  index: number;
  id: string;
  name: string;
  /** Parent's index in StarSystem.bodies. */
  parent: number;
  /** Moons flown inside this body (merged), as system indices. */
  merged: number[];
  /** Semi-major axis (m), eccentricity and inclination (rad) over the span (samples where the orbit is bound). */
  a: Range;
  e: Range;
  i: Range;
  /** Sampled histories at StabilityResult.t (a: negative once unbound). */
  history: { a: Float64Array; e: Float64Array; i: Float64Array };
}

export interface StabilityPair {
  /** System indices of the two siblings. */
  a: number;
  b: number;
  /** Mutual Hill radius at the epoch, m. */
  mutualHill: number;
  /** Epoch |Δa| in mutual Hill radii. */
  spacing: number;
  /** Closest approach over the run, m and in mutual Hill radii, and when. */
  minDistance: number;
  minHill: number;
  tMin: number;
}

export type StabilityFlagCode = 'hill-criterion' | 'close-encounter' | 'crossing-orbits' | 'ejection' | 'collision';

export interface StabilityFlag {
  code: StabilityFlagCode;
  severity: 'warning' | 'error';
  /** System indices of the bodies concerned. */
  bodies: number[];
  /** When it was first seen, s (null for the epoch criterion). */
  t: number | null;
  message: string;
}

export interface StabilityResult {
  /** Span flown, s, and in calendar years. */
  span: number;
  years: number;
  method: StabilityMethod;
  /** Step, s, steps taken, acceleration evaluations. */
  h: number;
  steps: number;
  fevals: number;
  /** Whether moons were merged into their planets, and why. */
  mergedMoons: boolean;
  mergeReason: string | null;
  /** Sample times, s. */
  t: Float64Array;
  bodies: StabilityBody[];
  pairs: StabilityPair[];
  flags: StabilityFlag[];
  energy: {
    /** Total energy over G at the epoch (m⁵/s⁴). */
    initial: number;
    /** Largest and final |E − E₀|/|E₀| over the samples. */
    maxRelativeError: number;
    finalRelativeError: number;
    /** Relative error (E − E₀)/|E₀| at each sample. */
    history: Float64Array;
  };
  /** 'done', or 'collision' (the run stopped at the first collision). */
  status: 'done' | 'collision';
  notes: string[];
}

interface Particle {
  /** System index this particle stands for. */
  index: number;
  mu: number;
  radius: number;
  /** Index of its parent particle (−1 for the star). */
  parent: number;
  merged: number[];
}

function posInt(field: string, v: number | undefined, dflt: number, min: number): number {
  const x = v ?? dflt;
  if (!Number.isInteger(x) || x < min) throw new InputError(field, `must be an integer >= ${min}`, x);
  return x;
}

/** Descendants of body k (children, grandchildren ...). */
function descendants(system: StarSystem, k: number): number[] {
  const out: number[] = [];
  const visit = (i: number): void => {
    for (const c of system.bodies[i].children) {
      out.push(c);
      visit(c);
    }
  };
  visit(k);
  return out;
}

/** Step for a set of bodies (system indices, star excluded). */
function stepFor(system: StarSystem, indices: number[], stepsPerOrbit: number, perPeriod: boolean): number {
  let h = Infinity;
  for (const k of indices) {
    const b = system.bodies[k];
    if (!b.elements) continue;
    h = Math.min(h, (b.derived.period * (perPeriod ? 1 : (1 - b.elements.e) ** 1.5)) / stepsPerOrbit);
  }
  return h;
}

/** Runs the stability check (see the module comment). */
export function checkStability(system: StarSystem, options: StabilityOptions = {}): StabilityResult {
  if (!system || !Array.isArray(system.bodies) || system.bodies.length < 2) {
    throw new InputError('system', 'must have a star and at least one body');
  }
  const bodies = system.bodies;
  const yearLength = system.calendar.yearLength;
  let span: number;
  if (options.span !== undefined) {
    span = requireFinite('span', options.span);
    if (!(span > 0)) throw new InputError('span', 'must be > 0 (s)', span);
  } else {
    const years = requireFinite('years', options.years ?? DEFAULT_YEARS);
    if (!(years > 0)) throw new InputError('years', 'must be > 0', years);
    span = years * yearLength;
  }
  const method = options.method ?? DEFAULT_METHOD;
  if (method !== 'wisdom-holman' && method !== 'yoshida4' && method !== 'verlet') {
    throw new InputError('method', "must be 'wisdom-holman', 'yoshida4' or 'verlet'", method);
  }
  const wh = method === 'wisdom-holman';
  const stepsPerOrbit = posInt('stepsPerOrbit', options.stepsPerOrbit, wh ? DEFAULT_WH_STEPS_PER_PERIOD : DEFAULT_STEPS_PER_ORBIT, 4);
  // flown moons: the uncorrected map at its usual step (see DEFAULT_WH_MOON_STEPS_PER_PERIOD)
  const moonStepsPerOrbit = wh ? (options.stepsPerOrbit ?? DEFAULT_WH_MOON_STEPS_PER_PERIOD) : stepsPerOrbit;
  const maxSteps = requireWithinLimit(
    'maxSteps',
    posInt('maxSteps', options.maxSteps, wh ? DEFAULT_WH_MAX_STEPS : DEFAULT_MAX_STEPS, 1),
    MAX_STABILITY_STEPS,
    'steps',
  );
  const nSamples = requireWithinLimit('samples', posInt('samples', options.samples, DEFAULT_SAMPLES, 2), MAX_STABILITY_SAMPLES, 'samples');
  const ejectionFactor = requireFinite('ejectionFactor', options.ejectionFactor ?? DEFAULT_EJECTION_FACTOR);
  if (!(ejectionFactor > 1)) throw new InputError('ejectionFactor', 'must be > 1', ejectionFactor);
  const merge = options.mergeMoons ?? 'auto';
  if (merge !== true && merge !== false && merge !== 'auto') throw new InputError('mergeMoons', "must be true, false or 'auto'", merge);

  const planets = bodies[0].children;
  const all = bodies.slice(1).map((b) => b.index);
  const hasMoons = all.length > planets.length;
  const hAll = stepFor(system, all, hasMoons ? moonStepsPerOrbit : stepsPerOrbit, wh);
  const hPlanets = stepFor(system, planets, stepsPerOrbit, wh);
  // the work of a run: steps × force evaluations per step × body pairs (the star counts)
  const evalsPerStep = method === 'yoshida4' ? 3 : 1; // Wisdom–Holman: one, plus the Kepler drifts
  const pairsOf = (flown: number): number => ((flown + 1) * flown) / 2;
  const workOf = (steps: number, flown: number): number => steps * evalsPerStep * pairsOf(flown);
  let merged = merge === true && hasMoons;
  let mergeReason: string | null = merged ? 'moons merged into their planets on request' : null;
  if (merge === 'auto' && hasMoons) {
    const stepsAll = Math.ceil(span / hAll);
    const stepsPlanets = Math.ceil(span / hPlanets);
    if (wh && stepsAll > WH_MOON_STEP_FACTOR * stepsPlanets) {
      merged = true;
      mergeReason = `moons merged into their planets: flying them needs ${stepsAll.toExponential(2)} steps, ${(stepsAll / stepsPlanets).toFixed(0)} × the planets' ${stepsPlanets.toExponential(2)} (Wisdom–Holman flies moons only at leapfrog accuracy; pass mergeMoons: false to fly them)`;
    } else if (stepsAll > maxSteps) {
      merged = true;
      mergeReason = `moons merged into their planets: flying them needs ${stepsAll.toExponential(2)} steps, more than the budget of ${maxSteps.toExponential(2)}`;
    } else if (workOf(stepsAll, all.length) > MAX_STABILITY_WORK || all.length > MAX_STABILITY_BODIES) {
      merged = true;
      mergeReason = `moons merged into their planets: flying all ${all.length} bodies needs ${workOf(stepsAll, all.length).toExponential(2)} body-pair force evaluations, more than the ${MAX_STABILITY_WORK.toExponential(0)} a stability run may take`;
    }
  }
  const flown = merged ? planets.length : all.length;
  requireWithinLimit('system.bodies', flown, MAX_STABILITY_BODIES, merged ? 'planets to fly (moons merged)' : 'bodies to fly');
  const h0 = merged ? hPlanets : hAll;
  const nSteps = Math.max(1, Math.ceil(span / h0 - 1e-9));
  if (nSteps > maxSteps) {
    throw new InputError(
      'span',
      `needs ${nSteps} steps (more than maxSteps = ${maxSteps}${merged ? ', with moons merged' : ''}); shorten the span or raise maxSteps`,
      span,
    );
  }
  const work = workOf(nSteps, flown);
  if (work > MAX_STABILITY_WORK) {
    throw new InputError(
      'span',
      `needs ${work.toExponential(2)} body-pair force evaluations (${nSteps} steps of ${pairsOf(flown)} pairs${merged ? ', moons merged' : ''}), more than the ${MAX_STABILITY_WORK.toExponential(0)} Waymark runs in one stability check; shorten the span${hasMoons && !merged ? ', merge the moons' : ''} or lower stepsPerOrbit`,
      span,
    );
  }
  const h = span / nSteps;

  // particles: the star, then planets (with their subsystems merged, or not), then moons
  const { x0: xAll, v0: vAll, mus: muAll } = initialStates(system);
  const parts: Particle[] = [];
  const idx = new Map<number, number>();
  const add = (k: number, parent: number, mergedInto: number[]): void => {
    idx.set(k, parts.length);
    let mu = muAll[k];
    for (const m of mergedInto) mu += muAll[m];
    parts.push({ index: k, mu, radius: bodies[k].radius, parent, merged: mergedInto });
  };
  add(0, -1, []);
  for (const p of planets) add(p, 0, merged ? descendants(system, p) : []);
  if (!merged) for (const k of all) if (!idx.has(k)) add(k, idx.get(bodies[k].parentIndex) as number, []);
  const N = parts.length;
  const x = new Float64Array(3 * N);
  const v = new Float64Array(3 * N);
  parts.forEach((q, j) => {
    const group = [q.index, ...q.merged];
    let m = 0;
    for (const k of group) {
      m += muAll[k];
      for (let c = 0; c < 3; c++) {
        x[3 * j + c] += muAll[k] * xAll[3 * k + c];
        v[3 * j + c] += muAll[k] * vAll[3 * k + c];
      }
    }
    for (let c = 0; c < 3; c++) {
      x[3 * j + c] /= m;
      v[3 * j + c] /= m;
    }
  });
  const mus = Float64Array.from(parts.map((q) => q.mu));

  // sibling pairs and their mutual Hill radii; collision radii for every pair
  const pairs: (StabilityPair & { i: number; j: number })[] = [];
  for (let i = 1; i < N; i++) {
    for (let j = i + 1; j < N; j++) {
      if (parts[i].parent !== parts[j].parent) continue;
      const ei = bodies[parts[i].index].elements!;
      const ej = bodies[parts[j].index].elements!;
      const muP = mus[parts[i].parent];
      const rh = Math.cbrt((mus[i] + mus[j]) / (3 * muP)) * 0.5 * (ei.a + ej.a);
      pairs.push({
        i,
        j,
        a: parts[i].index,
        b: parts[j].index,
        mutualHill: rh,
        spacing: Math.abs(ej.a - ei.a) / rh,
        minDistance: Infinity,
        minHill: Infinity,
        tMin: 0,
      });
    }
  }
  const flags: StabilityFlag[] = [];
  const name = (j: number): string => bodies[parts[j].index].name;
  for (const p of pairs) {
    if (p.spacing < GLADMAN_SPACING) {
      flags.push({
        code: 'hill-criterion',
        severity: 'warning',
        bodies: [p.a, p.b],
        t: null,
        message: `${name(p.i)} and ${name(p.j)} are ${p.spacing.toFixed(2)} mutual Hill radii apart at the epoch, under Gladman's 2√3 ≈ 3.46 for Hill stability`,
      });
    }
  }
  let maxApo = 0;
  for (const k of planets) maxApo = Math.max(maxApo, bodies[k].derived.apoapsis);
  const ejectR = ejectionFactor * maxApo;

  // histories
  const tS = new Float64Array(nSamples);
  const hist = parts.map(() => ({ a: new Float64Array(nSamples), e: new Float64Array(nSamples), i: new Float64Array(nSamples) }));
  const ranges = parts.map(() => ({ a: emptyRange(), e: emptyRange(), i: emptyRange() }));
  const energyHist = new Float64Array(nSamples);
  const ejected = new Set<number>();
  const crossed = new Set<string>();
  const rel = new Float64Array(6);
  const groups = subsystems(parts);
  const sample = (s: number, t: number): void => {
    tS[s] = t;
    for (let j = 1; j < N; j++) {
      const el = osculating(parts, groups[j], j, x, v, mus, rel);
      const H = hist[j];
      H.a[s] = el ? el.a : 0;
      H.e[s] = el ? el.e : 0;
      H.i[s] = el ? el.i : 0;
      if (el && el.e < 1) {
        grow(ranges[j].a, el.a, s === 0);
        grow(ranges[j].e, el.e, s === 0);
        grow(ranges[j].i, el.i, s === 0);
      }
      const r = Math.hypot(rel[0], rel[1], rel[2]);
      const parent = parts[j].parent;
      const limit = parent === 0 ? ejectR : bodies[parts[parent].index].derived.hillRadius;
      if (!ejected.has(j) && ((el && el.e >= 1) || r > limit)) {
        ejected.add(j);
        flags.push({
          code: 'ejection',
          severity: 'error',
          bodies: [parts[j].index],
          t,
          message: `${name(j)} ${el && el.e >= 1 ? `is on an escape orbit (e = ${el.e.toFixed(3)})` : `is ${(r / limit).toFixed(1)} × the ejection distance from ${name(parent)}`} at ${years(t, yearLength)} years`,
        });
      }
    }
    for (const p of pairs) {
      const key = `${p.i}-${p.j}`;
      if (crossed.has(key)) continue;
      const ai = hist[p.i].a[s],
        aj = hist[p.j].a[s];
      const ei = hist[p.i].e[s],
        ej = hist[p.j].e[s];
      if (!(ai > 0 && aj > 0 && ei < 1 && ej < 1)) continue;
      const [inner, outer] = ai <= aj ? [p.i, p.j] : [p.j, p.i];
      const Qin = hist[inner].a[s] * (1 + hist[inner].e[s]);
      const qout = hist[outer].a[s] * (1 - hist[outer].e[s]);
      if (qout < Qin) {
        crossed.add(key);
        flags.push({
          code: 'crossing-orbits',
          severity: 'warning',
          bodies: [parts[inner].index, parts[outer].index],
          t,
          message: `${name(outer)}'s periapsis falls inside ${name(inner)}'s apoapsis at ${years(t, yearLength)} years: the orbits cross`,
        });
      }
    }
    energyHist[s] = totalEnergy(x, v, mus);
  };

  sample(0, 0);
  // Wisdom–Holman keeps its own (Jacobi) state: positions every step in run.x (at the middle of
  // the step, run.xLag before its end), the corrected state read at samples
  // (flown moons: the kick–drift–kick stepper on the caller's state, see DEFAULT_WH_MOON_STEPS_PER_PERIOD)
  const moonsFlown = hasMoons && !merged;
  const run = wh && !moonsFlown ? wisdomHolmanRun(mus, x, v, h, { order: jacobiOrder(parts, bodies) }) : null;
  const stepper = run
    ? null
    : wh
      ? wisdomHolmanStepper(mus, jacobiOrder(parts, bodies))
      : fixedStepper(method as Exclude<StabilityMethod, 'wisdom-holman'>, mutualAccel(mus), 3 * N);
  const xs = run ? run.x : x;
  // every pair as flat lists (offsets 3i, 3j, contact distance squared, index in pairs if siblings
  // or −1); closest approaches kept squared (a square root only at the end)
  const nPairs = (N * (N - 1)) / 2;
  const pairAllI = new Int32Array(nPairs);
  const pairAllJ = new Int32Array(nPairs);
  const pairContact2 = new Float64Array(nPairs);
  const pairSibling = new Int32Array(nPairs).fill(-1);
  for (let i = 0, q = 0; i < N; i++) {
    for (let j = i + 1; j < N; j++, q++) {
      pairAllI[q] = 3 * i;
      pairAllJ[q] = 3 * j;
      pairContact2[q] = (parts[i].radius + parts[j].radius) ** 2;
    }
  }
  pairs.forEach((p, sib) => {
    pairSibling[p.i * N - (p.i * (p.i + 1)) / 2 + (p.j - p.i - 1)] = sib;
  });
  const pairMin2 = new Float64Array(pairs.length).fill(Infinity);
  const pairTMin = new Float64Array(pairs.length);
  const E0 = energyHist[0];
  const sampleAt = (s: number): number => Math.round((s * nSteps) / (nSamples - 1));
  let nextSample = 1;
  let nextSampleStep = sampleAt(nextSample);
  let fevals = 0;
  let status: StabilityResult['status'] = 'done';
  const notes: string[] = [];
  let k = 0;
  for (k = 0; k < nSteps; k++) {
    if (k % CANCEL_CHECK_STEPS === 0 && options.signal?.aborted) {
      throw new SolverError('stability', 'cancelled', `cancelled at ${years(k * h, yearLength)} years`, { t: k * h });
    }
    if (run) run.advance();
    else fevals += (stepper as NonNullable<typeof stepper>).step(k * h, h, x, v);
    const t = (k + 1) * h;
    const tx = run ? t - run.xLag : t; // the time of the positions xs
    // closest approaches of siblings and collisions of any pair, in one pass over the pairs
    let hit = -1;
    for (let q = 0; q < pairAllI.length; q++) {
      const i = pairAllI[q],
        j = pairAllJ[q];
      const dx = xs[j] - xs[i],
        dy = xs[j + 1] - xs[i + 1],
        dz = xs[j + 2] - xs[i + 2];
      const d2 = dx * dx + dy * dy + dz * dz;
      const sib = pairSibling[q];
      if (sib >= 0 && d2 < pairMin2[sib]) {
        pairMin2[sib] = d2;
        pairTMin[sib] = tx;
      }
      if (d2 < pairContact2[q] && hit < 0) hit = q;
    }
    if (!Number.isFinite(xs[0] + xs[3 * N - 1] + (run ? 0 : v[0] + v[3 * N - 1]))) {
      throw new SolverError('stability', 'non-finite', `the state became non-finite at ${years(t, yearLength)} years`, { t });
    }
    while (nextSample < nSamples && k + 1 >= nextSampleStep) {
      if (run) {
        run.read(x, v);
        if (!Number.isFinite(v[0] + v[3 * N - 1])) {
          throw new SolverError('stability', 'non-finite', `the state became non-finite at ${years(t, yearLength)} years`, { t });
        }
      }
      sample(nextSample, t);
      nextSample++;
      nextSampleStep = sampleAt(nextSample);
      options.onProgress?.((k + 1) / nSteps);
    }
    if (hit >= 0) {
      const hitI = pairAllI[hit] / 3,
        hitJ = pairAllJ[hit] / 3;
      flags.push({
        code: 'collision',
        severity: 'error',
        bodies: [parts[hitI].index, parts[hitJ].index],
        t: tx,
        message: `${name(hitI)} and ${name(hitJ)} collide at ${years(tx, yearLength)} years; the run stops there`,
      });
      status = 'collision';
      k++;
      break;
    }
  }
  const stepsDone = Math.min(k, nSteps);
  const nDone = status === 'done' ? nSamples : nextSample;
  if (status === 'collision' && nDone < nSamples) notes.push(`the run stopped at the collision, ${years(stepsDone * h, yearLength)} years in`);
  if (run) fevals = run.fevals;
  pairs.forEach((p, q) => {
    p.minDistance = Math.sqrt(pairMin2[q]);
    p.tMin = pairTMin[q];
  });
  for (const p of pairs) {
    p.minHill = p.minDistance / p.mutualHill;
    if (p.minHill < CLOSE_ENCOUNTER_HILL) {
      flags.push({
        code: 'close-encounter',
        severity: 'warning',
        bodies: [p.a, p.b],
        t: p.tMin,
        message: `${name(p.i)} and ${name(p.j)} come within ${p.minHill.toFixed(2)} mutual Hill radii (${(p.minDistance / 1e3).toExponential(3)} km) at ${years(p.tMin, yearLength)} years`,
      });
    }
  }
  flags.sort((a, b) => (a.t ?? -1) - (b.t ?? -1));
  const eRel = new Float64Array(nDone);
  let eMax = 0;
  for (let s = 0; s < nDone; s++) {
    eRel[s] = (energyHist[s] - E0) / Math.abs(E0);
    eMax = Math.max(eMax, Math.abs(eRel[s]));
  }
  if (merged) notes.push(mergeReason as string);
  return {
    span: stepsDone * h,
    years: (stepsDone * h) / yearLength,
    method,
    h,
    steps: stepsDone,
    fevals,
    mergedMoons: merged,
    mergeReason,
    t: tS.slice(0, nDone),
    bodies: parts.slice(1).map((q, jj) => {
      const j = jj + 1;
      const R = ranges[j];
      return {
        index: q.index,
        id: bodies[q.index].id,
        name: bodies[q.index].name,
        parent: parts[q.parent].index,
        merged: q.merged,
        a: finishRange(R.a),
        e: finishRange(R.e),
        i: finishRange(R.i),
        history: { a: hist[j].a.slice(0, nDone), e: hist[j].e.slice(0, nDone), i: hist[j].i.slice(0, nDone) },
      };
    }),
    pairs: pairs.map(({ i: _i, j: _j, ...p }) => p),
    flags,
    energy: { initial: E0, maxRelativeError: eMax, finalRelativeError: Math.abs(eRel[nDone - 1]), history: eRel },
    status,
    notes,
  };
}

/**
 * Jacobi order for the Wisdom–Holman map: the star, then the planets outward by epoch semi-major
 * axis, each followed by its flown moons (moons then orbit the barycentre of everything inside
 * them; see wisdomHolman.ts for what that costs).
 */
function jacobiOrder(parts: Particle[], bodies: StarSystem['bodies']): Int32Array {
  const out: number[] = [0];
  const planetsOut = parts
    .map((_, j) => j)
    .filter((j) => j > 0 && parts[j].parent === 0)
    .sort((a, b) => (bodies[parts[a].index].elements?.a ?? 0) - (bodies[parts[b].index].elements?.a ?? 0));
  const visit = (j: number): void => {
    out.push(j);
    for (let q = 1; q < parts.length; q++) if (parts[q].parent === j) visit(q);
  };
  for (const p of planetsOut) visit(p);
  return Int32Array.from(out);
}

function emptyRange(): Range {
  return { initial: 0, min: Infinity, max: -Infinity };
}

function grow(r: Range, x: number, first: boolean): void {
  if (first) r.initial = x;
  if (x < r.min) r.min = x;
  if (x > r.max) r.max = x;
}

function finishRange(r: Range): Range {
  return Number.isFinite(r.min) ? r : { initial: r.initial, min: r.initial, max: r.initial };
}

function years(t: number, yearLength: number): string {
  return (t / yearLength).toFixed(1);
}

/**
 * The particles each particle's osculating elements are taken from: a planet's flown
 * subsystem (itself and the particles whose parent chain leads to it), a moon alone. Found once,
 * in time linear in the particles times the depth of the hierarchy.
 */
function subsystems(parts: Particle[]): Int32Array[] {
  const lists: number[][] = parts.map((_, j) => [j]);
  for (let q = 1; q < parts.length; q++) {
    for (let r = parts[q].parent; r > 0; r = parts[r].parent) if (parts[r].parent === 0) lists[r].push(q);
  }
  return lists.map((l, j) => Int32Array.from(j > 0 && parts[j].parent !== 0 ? [j] : l));
}

/**
 * Osculating elements of particle j about its parent (planets: the barycentre of the planet's
 * flown subsystem `group` about the star); writes the relative state into rel. Null when undefined.
 */
function osculating(
  parts: Particle[],
  group: Int32Array,
  j: number,
  x: Float64Array,
  v: Float64Array,
  mus: Float64Array,
  rel: Float64Array,
): { a: number; e: number; i: number } | null {
  const p = parts[j].parent;
  let m = 0;
  const c = [0, 0, 0, 0, 0, 0];
  for (const q of group) {
    m += mus[q];
    for (let k = 0; k < 3; k++) {
      c[k] += mus[q] * x[3 * q + k];
      c[3 + k] += mus[q] * v[3 * q + k];
    }
  }
  for (let k = 0; k < 3; k++) {
    rel[k] = c[k] / m - x[3 * p + k];
    rel[3 + k] = c[3 + k] / m - v[3 * p + k];
  }
  try {
    const el = stateToElements(mus[p] + m, [rel[0], rel[1], rel[2]], [rel[3], rel[4], rel[5]]);
    return { a: el.a, e: el.e, i: el.i };
  } catch (e) {
    if (e instanceof WaymarkError) return null;
    throw e;
  }
}

/** Total energy over G: Σ ½ μ_i v_i² − Σ_{i<j} μ_i μ_j / r_ij (m⁵/s⁴). */
export function totalEnergy(x: Float64Array, v: Float64Array, mus: Float64Array): number {
  const N = mus.length;
  let kin = 0;
  let pot = 0;
  for (let i = 0; i < N; i++) {
    kin += 0.5 * mus[i] * (v[3 * i] ** 2 + v[3 * i + 1] ** 2 + v[3 * i + 2] ** 2);
    for (let j = i + 1; j < N; j++) {
      pot -= (mus[i] * mus[j]) / Math.hypot(x[3 * j] - x[3 * i], x[3 * j + 1] - x[3 * i + 1], x[3 * j + 2] - x[3 * i + 2]);
    }
  }
  return kin + pot;
}
