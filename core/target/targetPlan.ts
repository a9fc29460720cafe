/**
 * Targeting a whole plan in a model: the loop from "this plan, roughly right" to "this plan
 * arrives in the model it is flown in".
 *
 * 1. The reference flight: the plan's patched-conic evaluation with every burn impulsive (where its
 *    Lambert arcs and solved burns aim: the designer's intent). Its legs (legs.ts) give each leg's goals and the burns it varies.
 * 2. The working plan: for 'nbody' a timed burn schedule (modelFlight.ts freezeSchedule); for the
 *    patched-conic models the plan itself.
 * 3. Leg by leg in order: the leg's burns become controls — their three Δv components in the
 *    burn's own frame, starting from the vector the model's flight resolved — and the solver
 *    (solve.ts, bounded Levenberg–Marquardt) meets the leg's goals in the model. n-body trials
 *    start from the state just before the leg's first burn (the flight before it never changes).
 * 4. The targeted plan: the controlled burns fixed at the solved vectors, `truthModel` set to the
 *    model; its Δv, margin and goals re-flown for the report (n-body: the schedule's own budget,
 *    scheduleBudget.ts, every burn counted whatever its patched-conic reading does).
 *
 * Failures say which goal was not met and why, in the designer's words: no burn moves it (no
 * sensitivity), a control at its bound, a burn short of propellant, the flight does not arrive.
 */
import { InputError, SolverError, type WaymarkError } from '../math/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';
import type { Budget, BurnEvent, Plan, PlanResult, TruthModel } from '../plan/index.ts';
import { planTruthModel } from '../plan/index.ts';
import { evaluate } from '../conic/index.ts';
import { NBodyModel, type NBodyModelOptions } from '../nbody/index.ts';
import { applyControls, timeControl, type BurnDvControl, type EventTimeControl, type PlanControl } from './controls.ts';
import { DEFAULT_TARGET_TOLERANCES, planLegs, type Leg, type TargetTolerances } from './legs.ts';
import { measure, type FlightGoal } from './measure.ts';
import { flyModel, freezeSchedule, isSchedule, planForModel, type ModelFlight } from './modelFlight.ts';
import { scheduleBudget } from './scheduleBudget.ts';
import { solveTargets, type GoalOutcome, type SolveStatus } from './solve.ts';

export interface TargetProgress {
  /** 1-based leg being targeted and the number of legs. */
  leg: number;
  legs: number;
  legName: string;
  /** Flights flown so far (all legs). */
  flights: number;
  /** Best residual norm of this leg so far (goal misses in tolerance units; ≤ 1 per goal is met). */
  residual: number;
}

export interface TargetOptions extends NBodyModelOptions {
  /** Model to target in; default the plan's truth model. */
  model?: TruthModel;
  /** How close each kind of goal must come (defaults DEFAULT_TARGET_TOLERANCES). */
  tolerance?: Partial<TargetTolerances>;
  /** Iterations per leg at most (default 30). */
  maxIterations?: number;
  /** Flights per leg at most (default 400). */
  maxFlights?: number;
  /**
   * Hold each arrival's periapsis time as the reference flies it, within the time tolerance
   * (default true). Off: the arrival may come earlier or later (cheaper in Δv) and a timed
   * schedule is shifted to match — a moon or a planet further on is then elsewhere in its orbit.
   */
  arrivalTime?: boolean;
  /**
   * Timing controls added to the leg they act on (the first leg with a burn at or after the event):
   * a burn's time, a transfer burn's arrival time (patched-conic models only), a duration coast's length.
   */
  timeControls?: { kind: EventTimeControl['kind']; eventId: string }[];
  /**
   * Goals named by the designer at an arrival (a body the plan arrives at and burns at): its
   * periapsis altitude (the closest approach) or inclination — these replace that arrival's B-plane
   * point, the one not named keeping its reference value — or its SOI entry time, which replaces
   * the periapsis time. SI values (m, rad, s from the epoch); tolerances default to `tolerance`'s.
   */
  goals?: ArrivalGoal[];
  /** Largest change of any Δv component from its starting value, m/s (default unbounded). */
  maxChange?: number;
  onProgress?: (p: TargetProgress) => void;
  signal?: { aborted: boolean };
}

/** A goal the designer names at an arrival (see TargetOptions.goals). */
export interface ArrivalGoal {
  kind: 'periapsis-altitude' | 'inclination' | 'soi-entry-time';
  /** Body id. */
  body: string;
  wanted: number;
  tolerance?: number;
}

export type FailureReason = 'no-sensitivity' | 'bound' | 'propellant' | 'no-arrival' | 'iterations';

export interface ControlChange {
  name: string;
  /** The plan event it acts on (a burn, or a coast for a duration). */
  burnId: string;
  kind: PlanControl['kind'];
  /** SI values (m/s or s); `units` with `unitScale` for display. */
  before: number;
  after: number;
  units: string;
  unitScale: number;
}

export interface LegReport {
  name: string;
  kind: 'arrival' | 'final';
  status: SolveStatus;
  /** The solver's words: what was met, what was not and why. */
  message: string;
  /** Each goal at the leg's end; `value` null when the flight never gave one (it failed at the start). */
  goals: (Omit<GoalOutcome, 'value'> & { value: number | null; units?: string; unitScale?: number })[];
  controls: ControlChange[];
  iterations: number;
  flights: number;
  /** n-body arrival legs: how far the later schedule moved with the arrival's periapsis time, s (0 otherwise). */
  shift: number;
  /** Residual norm after each accepted step (tolerance units). */
  residuals: number[];
  /** Why the leg failed, when it did. */
  failure: FailureReason | null;
}

export interface TargetResult {
  /** 'met': every leg's goals within tolerance. */
  status: 'met' | 'not-met';
  model: TruthModel;
  /** The targeted plan (truthModel = model). */
  plan: Plan;
  legs: LegReport[];
  iterations: number;
  flights: number;
  /** Total Δv of the plan flown in the model before and after, m/s; added = after − before. */
  dv: { before: number; after: number; added: number };
  margin: { before: number; after: number };
  /** One paragraph for the designer. */
  message: string;
}

const DEG = Math.PI / 180;
const DEFAULT_MAX_ITERATIONS = 30;
const DEFAULT_MAX_FLIGHTS = 400;
/** Finite-difference step on Δv components, m/s: above the n-body integration's noise (rtol 1e-10 over a year ≈ tens of metres at arrival), far below any useful change. */
const FD_STEP = 1e-3;
/**
 * Initial damping τ (λ₀ = τ·max diag JᵀJ): small, as Madsen, Nielsen & Tingleff advise when the
 * start is believed good (1e-6). An arrival's B-plane is thousands of times more sensitive to the
 * burns than its time is, so a larger τ damps the time's directions for many iterations.
 */
const DAMPING = 1e-6;
/** Δv components are measured in steps of this size, m/s. */
const DV_SCALE = 1;

const AXES: Record<BurnEvent['frame'], [string, string, string]> = {
  vnb: ['prograde', 'normal', 'binormal'],
  rtn: ['radial', 'transverse', 'normal'],
  inertial: ['x', 'y', 'z'],
};

function legControls(plan: Plan, flight: PlanResult, ids: string[], maxChange: number | undefined): { controls: PlanControl[]; x0: number[] } {
  const controls: PlanControl[] = [];
  const x0: number[] = [];
  for (const id of ids) {
    const burn = plan.events.find((e) => e.id === id);
    if (burn?.type !== 'burn') continue;
    const row = flight.budget.rows.find((r) => r.planEventId === id);
    const start = row ? row.dvFrame : burn.dv;
    for (const component of [0, 1, 2] as const) {
      const v = start[component];
      const c: BurnDvControl = {
        kind: 'burn-dv',
        burnId: id,
        component,
        name: `${burn.name} Δv ${AXES[burn.frame][component]}`,
        scale: DV_SCALE,
        step: FD_STEP,
        units: 'm/s',
      };
      if (maxChange !== undefined) {
        c.lower = v - maxChange;
        c.upper = v + maxChange;
      }
      controls.push(c);
      x0.push(v);
    }
  }
  return { controls, x0 };
}

/** Why a leg that did not converge failed, from the solver's result and the last flight. */
function failureOf(status: SolveStatus, atBound: string[], lastFlight: PlanResult | null, error: WaymarkError | undefined): FailureReason {
  if (lastFlight?.budget.rows.some((r) => (r.dvMissing ?? 0) > 1e-6)) return 'propellant';
  if (status === 'flight-failed' || (error && error instanceof SolverError && error.reason === 'no-solution')) return 'no-arrival';
  if (atBound.length > 0) return 'bound';
  if (status === 'stalled') return 'no-sensitivity';
  return 'iterations';
}

const FAILURE_WORDS: Record<FailureReason, string> = {
  'no-sensitivity': 'no change of the burns moves the goals any closer (the burns chosen cannot reach them, or a local minimum)',
  bound: 'a burn is held at the largest change allowed',
  propellant: 'a burn is short of propellant',
  'no-arrival': 'the flight does not arrive where the goal is measured',
  iterations: 'the iteration budget ran out',
};

/** Targets `plan` in a model (see the module comment). Throws SolverError('target', 'cancelled') when cancelled. */
export function targetPlan(system: StarSystem, plan: Plan, options: TargetOptions = {}): TargetResult {
  if (!plan || typeof plan !== 'object') throw new InputError('plan', 'must be a plan', plan);
  const model = options.model ?? planTruthModel(plan);
  if (model !== 'conic' && model !== 'finite' && model !== 'nbody') throw new InputError('model', 'must be "conic", "finite" or "nbody"', model);
  const tol: TargetTolerances = { ...DEFAULT_TARGET_TOLERANCES, ...options.tolerance };
  for (const [k, v] of Object.entries(tol)) {
    if (!(typeof v === 'number' && v > 0 && Number.isFinite(v))) throw new InputError(`tolerance.${k}`, 'must be a finite number > 0', v);
  }
  const maxIterations = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  const maxFlights = options.maxFlights ?? DEFAULT_MAX_FLIGHTS;
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new InputError('maxIterations', 'must be a whole number >= 1', maxIterations);
  if (!Number.isInteger(maxFlights) || maxFlights < 1) throw new InputError('maxFlights', 'must be a whole number >= 1', maxFlights);
  if (options.maxChange !== undefined && !(options.maxChange > 0 && Number.isFinite(options.maxChange))) {
    throw new InputError('maxChange', 'must be a finite number of m/s > 0', options.maxChange);
  }
  // the designer's intent: the plan with every burn impulsive (its solved burns aim there)
  const reference = evaluate(system, impulsive(plan), { samplesPerSegment: 0 });
  const legs = withArrivalGoals(system, planLegs(system, plan, reference, tol, options.arrivalTime ?? true), options.goals ?? [], tol);
  const nbody = model === 'nbody' ? new NBodyModel(system, options) : undefined;
  let work: Plan = model === 'nbody' ? freezeSchedule(system, plan, evaluate(system, plan, { samplesPerSegment: 0 })) : plan;
  // n-body: the schedule's own budget, every burn counted (its patched-conic reading may end before the last)
  const budgetOf = (p: Plan): Budget => {
    const res = evaluate(system, planForModel(p, model), { samplesPerSegment: 0 });
    return model === 'nbody' && isSchedule(p) ? scheduleBudget(p, res) : res.budget;
  };
  const before = budgetOf(work);
  const reports: LegReport[] = [];
  // each timing control joins the first leg with a burn at or after its event
  const timing = new Map<number, { kind: EventTimeControl['kind']; eventId: string }[]>();
  for (const tc of options.timeControls ?? []) {
    const at = plan.events.findIndex((e) => e.id === tc.eventId);
    if (at < 0) throw new InputError('timeControls', `names no event of the plan: "${tc.eventId}"`, tc.eventId);
    if (model === 'nbody' && tc.kind === 'transfer-arrival') {
      throw new InputError(
        'timeControls',
        'cannot vary a transfer arrival in n-body (the plan flies there as a burn schedule); vary the burn times instead',
        tc.eventId,
      );
    }
    const li = legs.findIndex((l) => l.burns.some((id) => plan.events.findIndex((e) => e.id === id) >= at));
    if (li < 0) throw new InputError('timeControls', `"${tc.eventId}" comes after the last burn: it changes no goal`, tc.eventId);
    timing.set(li, [...(timing.get(li) ?? []), tc]);
  }
  let flightsAll = 0;
  let iterationsAll = 0;

  let shifted = 0; // how far the schedule has moved so far (n-body): later legs' probes move with it
  legs.forEach((original: Leg, li: number) => {
    const leg = shifted === 0 ? original : shiftLeg(original, shifted);
    const current = evaluate(system, planForModel(work, model), { samplesPerSegment: 0 });
    const { controls, x0 } = legControls(work, current, leg.burns, options.maxChange);
    for (const tc of timing.get(li) ?? []) {
      const { control, x0: v } = timeControl(work, tc.kind, tc.eventId, current);
      controls.push(control);
      x0.push(v);
    }
    // n-body trials start just before the leg's first burn
    let from: ReturnType<typeof startBefore> | undefined;
    if (nbody) from = startBefore(system, work, current, leg.burns, nbody, options.signal);
    // an arrival leg's goals are read at its probe: nothing after it needs flying
    const until = leg.kind === 'arrival' && leg.probes.length > 0 ? Math.max(...leg.probes) : undefined;
    let best = Number.POSITIVE_INFINITY;
    let lastFlight: PlanResult | null = null;
    const solveOptions = { maxIterations, maxFlights, damping: DAMPING, jacobianUpdate: model === 'nbody' ? ('broyden' as const) : ('difference' as const) };
    /**
     * The flight that reads `goals` at the controls' values: flown in the model from the leg's start,
     * counted and reported; `track` also keeps the leg's best residual and its last flight (the
     * goals the leg reports), which the coarse and halfway stages leave alone.
     */
    const flightOn =
      (goals: readonly FlightGoal[], track: boolean) =>
      (x: Float64Array, out: Float64Array): void => {
        const f: ModelFlight = flyModel(system, applyControls(work, controls, x), model, { probes: leg.probes, from, nbody, signal: options.signal, until });
        flightsAll++;
        let sum = 0;
        for (let i = 0; i < goals.length; i++) {
          out[i] = measure(system, f, goals[i]);
          const r = (out[i] - goals[i].wanted) / goals[i].tolerance;
          sum += r * r;
        }
        if (track) {
          lastFlight = f.conic;
          best = Math.min(best, Math.sqrt(sum));
        }
        options.onProgress?.({ leg: li + 1, legs: legs.length, legName: leg.name, flights: flightsAll, residual: best });
      };
    // a coarse aim first when the flight starts far off (see legs.ts), then the leg's goals from there
    let start: ArrayLike<number> = x0;
    let coarseIterations = 0;
    let coarseFlights = 0;
    if (leg.coarse.length > 0) {
      const c = solveTargets(controls, leg.coarse, flightOn(leg.coarse, false), { ...solveOptions, x0 });
      coarseIterations = c.iterations;
      coarseFlights = c.flights;
      if (c.status === 'converged') start = c.x;
    }
    // the leg's goals; an n-body arrival instead reads its approach just before the periapsis (the
    // late probe), aimed from the flight's own v∞ and asymptote: the star's pull bends an approach
    // through a large sphere of influence after the halfway point, so goals met there can still
    // miss (the moon demo's Moravel periapsis by 15,700 km)
    const ref = leg.reference;
    let goalsShown = leg.goals;
    if (model === 'nbody' && leg.kind === 'arrival' && ref) {
      const aim = leg.aim ?? { altitude: ref.altitude, i: ref.i, side: ref.side, tolerance: ref.bTol };
      const body = system.bodies[leg.body];
      const words = `(aim: periapsis ${(aim.altitude / 1000).toFixed(3)} km, inclination ${(aim.i / DEG).toFixed(3)}°)`;
      const base = { body: leg.body, at: ref.late, aim, tolerance: aim.tolerance, wanted: 0, units: 'km', unitScale: 1000 };
      goalsShown = [
        { ...base, kind: 'arrival-aim-t', name: `B-plane miss along T at ${body.name} ${words}` },
        { ...base, kind: 'arrival-aim-r', name: `B-plane miss along R at ${body.name} ${words}` },
        ...leg.goals.filter((g) => g.kind === 'soi-entry-time'),
        ...leg.goals.filter((g) => g.kind === 'arrival-periapsis-time').map((g) => ({ ...g, at: ref.late })),
      ];
    }
    const shown = goalsShown;
    const flight = flightOn(shown, true);
    let solved = solveTargets(controls, shown, flight, { ...solveOptions, x0: start });
    if (shown !== leg.goals && solved.status !== 'converged') {
      // the late reading alone found no way from the coarse aim (a long approach through a large
      // sphere, e.g. Moravel's): meet the halfway reading first, then the late one from there
      const mid = solveTargets(controls, leg.goals, flightOn(leg.goals, false), { ...solveOptions, x0: start });
      coarseIterations += solved.iterations + mid.iterations;
      coarseFlights += solved.flights + mid.flights;
      if (mid.status === 'converged') solved = solveTargets(controls, shown, flight, { ...solveOptions, x0: mid.x });
    }
    const res = { ...solved, iterations: solved.iterations + coarseIterations, flights: solved.flights + coarseFlights };
    iterationsAll += res.iterations;
    if (res.history.length > 0 || res.status === 'converged') work = applyControls(work, controls, res.x);
    // a timed schedule follows the arrival: later burns and timed coasts move with its periapsis time
    let shift = 0;
    if (model === 'nbody' && leg.timeGoal && res.status === 'converged') {
      const f = flyModel(system, work, model, { probes: leg.probes, from, nbody, signal: options.signal, until });
      flightsAll++;
      shift = measure(system, f, { ...leg.timeGoal, at: leg.reference?.late ?? leg.timeGoal.at }) - leg.timeGoal.wanted;
      work = shiftAfter(work, leg.burns[leg.burns.length - 1], shift);
      shifted += shift;
    }
    const failure = res.status === 'converged' ? null : failureOf(res.status, res.atBound, lastFlight, res.error);
    reports.push({
      name: leg.name,
      kind: leg.kind,
      status: res.status,
      message: failure ? `${res.message} Why: ${FAILURE_WORDS[failure]}.` : res.message,
      goals: res.goals.map((g, i) => ({
        ...g,
        value: res.flown ? g.value : null,
        units: goalsShown[i].units,
        unitScale: goalsShown[i].unitScale,
      })),
      controls: controls.map((c, j) => ({
        name: c.name,
        burnId: c.kind === 'burn-dv' ? c.burnId : c.eventId,
        kind: c.kind,
        before: x0[j],
        after: res.x[j],
        units: c.units ?? 'm/s',
        unitScale: c.unitScale ?? 1,
      })),
      iterations: res.iterations,
      flights: res.flights,
      shift,
      residuals: res.history.map((h) => h.residualNorm),
      failure,
    });
  });

  const targeted: Plan = { ...work, truthModel: model };
  const after = budgetOf(targeted);
  const met = reports.every((r) => r.status === 'converged');
  const dv = { before: before.total, after: after.total, added: after.total - before.total };
  const failed = reports.find((r) => r.status !== 'converged');
  const message = met
    ? `Every goal met in the ${modelWords(model)} model: ${reports.length} leg${reports.length === 1 ? '' : 's'}, ${iterationsAll} iterations, ${flightsAll} flights; Δv ${signed(dv.added)} m/s.`
    : `Not every goal met in the ${modelWords(model)} model: ${failed?.name}: ${failed?.message}`;
  return {
    status: met ? 'met' : 'not-met',
    model,
    plan: targeted,
    legs: reports,
    iterations: iterationsAll,
    flights: flightsAll,
    dv,
    margin: { before: before.margin, after: after.margin },
    message,
  };
}

/** The legs with the designer's arrival goals in place of the defaults they replace (see TargetOptions.goals). */
function withArrivalGoals(system: StarSystem, legs: Leg[], extra: readonly ArrivalGoal[], tol: TargetTolerances): Leg[] {
  if (extra.length === 0) return legs;
  const out = legs.map((l) => ({ ...l, goals: l.goals.map((g) => ({ ...g })) }));
  const aims = new Map<Leg, { altitude?: number; altTol?: number; i?: number; iTol?: number }>();

  extra.forEach((g, j) => {
    const field = `goals[${j + 1}]`; // 1-based, the designer's count
    const k = findBodyIndex(system, g.body);
    if (k < 0) throw new InputError(field, 'must name a body of the system', g.body);
    if (!Number.isFinite(g.wanted)) throw new InputError(field, 'must have a finite wanted value', g.wanted);
    if (g.tolerance !== undefined && !(g.tolerance > 0 && Number.isFinite(g.tolerance)))
      throw new InputError(field, 'must have a tolerance that is a finite number > 0', g.tolerance);
    const leg = out.find((l) => l.kind === 'arrival' && l.body === k);
    const name = system.bodies[k].name;
    if (!leg?.reference)
      throw new InputError(
        field,
        `must name a body the plan arrives at and burns at (${
          out
            .filter((l) => l.kind === 'arrival')
            .map((l) => system.bodies[l.body].name)
            .join(', ') || 'none'
        })`,
        g.body,
      );
    if (g.kind === 'soi-entry-time') {
      leg.goals = leg.goals.filter((x) => x.kind !== 'arrival-periapsis-time');
      leg.goals.push({
        kind: 'soi-entry-time',
        body: k,
        name: `SOI entry time at ${name}`,
        wanted: g.wanted,
        tolerance: g.tolerance ?? tol.time,
        units: 'days',
        unitScale: 86400,
      });
      return;
    }
    if (g.kind !== 'periapsis-altitude' && g.kind !== 'inclination')
      throw new InputError(field, 'must be of kind "periapsis-altitude", "inclination" or "soi-entry-time"', g.kind);
    if (g.kind === 'periapsis-altitude') aims.set(leg, { ...(aims.get(leg) ?? {}), altitude: g.wanted, altTol: g.tolerance });
    else aims.set(leg, { ...(aims.get(leg) ?? {}), i: g.wanted, iTol: g.tolerance });
  });
  // an arrival's periapsis altitude and inclination, aimed as the B-plane point that gives them
  // with the reference approach's v∞ and asymptote (B-plane goals stay nearly linear in the burns;
  // the altitude and inclination themselves fold): |B| = √(r_p² + 2μ r_p/v∞²), and with T̂ in the
  // reference plane and R̂ = Ŝ × T̂, cos i = −cos θ · R̂_z for B = |B|(cos θ T̂ + sin θ R̂), θ taken on
  // the side of the reference's θ (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed.,
  // §12.4, from memory)
  for (const [leg, aim] of aims) {
    const bt = leg.goals.find((x) => x.kind === 'arrival-bt');
    const br = leg.goals.find((x) => x.kind === 'arrival-br');
    const ref = leg.reference;
    if (!bt || !br || !ref || !bt.axes) continue;
    const body = system.bodies[leg.body];
    const alt = aim.altitude ?? ref.altitude;
    const inc = aim.i ?? ref.i;
    if (!(alt > -body.radius)) throw new InputError('goals', `periapsis altitude at ${body.name} must be above its centre`, alt);
    const rp = body.radius + alt;
    const v2 = ref.vinf * ref.vinf;
    const B = Math.sqrt(rp * rp + (2 * body.mu * rp) / v2);
    const Rz = bt.axes.R[2];
    const c = -Math.cos(inc) / Rz;
    if (!(Math.abs(c) <= 1)) {
      const lowest = Math.acos(Math.min(1, Math.abs(Rz)));
      throw new InputError(
        'goals',
        `inclination ${(inc / DEG).toFixed(3)}° at ${body.name} cannot be reached from this approach (${(lowest / DEG).toFixed(3)}° to ${(180 - lowest / DEG).toFixed(3)}° can)`,
        inc,
      );
    }
    const thRef = Math.atan2(br.wanted, bt.wanted);
    const sn = Math.sqrt(Math.max(0, 1 - c * c));
    const up = Math.atan2(sn, c);
    const down = Math.atan2(-sn, c);
    const th = Math.abs(wrap(up - thRef)) <= Math.abs(wrap(down - thRef)) ? up : down;
    const dBdrp = (rp + body.mu / v2) / B;
    const tolB = Math.min((aim.altTol ?? tol.altitude) * dBdrp, B * (aim.iTol ?? tol.i)); // dθ ≈ di near a usable approach
    const words = `(aim: periapsis ${(alt / 1000).toFixed(3)} km, inclination ${(inc / DEG).toFixed(3)}°)`;
    const goalAim = { altitude: alt, i: inc, side: Math.sin(th) >= 0 ? (1 as const) : (-1 as const) };
    // misses from the aim point, recomputed each flight from its own approach
    leg.aim = { ...goalAim, tolerance: tolB };
    Object.assign(bt, { kind: 'arrival-aim-t', wanted: 0, tolerance: tolB, aim: goalAim, name: `B-plane miss along T at ${body.name} ${words}` });
    Object.assign(br, { kind: 'arrival-aim-r', wanted: 0, tolerance: tolB, aim: goalAim, name: `B-plane miss along R at ${body.name} ${words}` });
  }
  return out;
}

function wrap(a: number): number {
  return Math.atan2(Math.sin(a), Math.cos(a));
}

/** The leg with its probe times (and a periapsis-time goal's wanted value) moved by dt seconds. */
function shiftLeg(leg: Leg, dt: number): Leg {
  const move = (g: Leg['goals'][number]) => ({
    ...g,
    at: g.at === undefined ? undefined : g.at + dt,
    wanted: g.kind === 'arrival-periapsis-time' ? g.wanted + dt : g.wanted,
  });
  const goals = leg.goals.map(move);
  const timeGoal = leg.timeGoal ? (goals[leg.goals.indexOf(leg.timeGoal)] ?? move(leg.timeGoal)) : null;
  const reference = leg.reference ? { ...leg.reference, t: leg.reference.t + dt, late: leg.reference.late + dt } : null;
  return { ...leg, goals, coarse: leg.coarse.map(move), timeGoal, reference, probes: leg.probes.map((t) => t + dt) };
}

/** The plan with every timed burn and timed coast after burn `afterId` moved by dt seconds (and its end, if set). */
function shiftAfter(plan: Plan, afterId: string, dt: number): Plan {
  if (dt === 0) return plan;
  const k = plan.events.findIndex((e) => e.id === afterId);
  const events = plan.events.map((e, j) => {
    if (j <= k) return e;
    if (e.type === 'burn' && e.t !== null) return { ...e, t: e.t + dt };
    if (e.type === 'coast' && e.until.kind === 'time') return { ...e, until: { kind: 'time' as const, t: e.until.t + dt } };
    return e;
  });
  return { ...plan, events, end: plan.end === null ? null : plan.end + dt };
}

/** The plan with every burn impulsive. */
function impulsive(plan: Plan): Plan {
  return { ...plan, events: plan.events.map((e) => (e.type === 'burn' && e.mode !== 'impulsive' ? { ...e, mode: 'impulsive' as const } : e)) };
}

function modelWords(m: TruthModel): string {
  return m === 'nbody' ? 'n-body' : m === 'finite' ? 'finite-burn' : 'patched-conic';
}

function signed(x: number): string {
  return `${x >= 0 ? '+' : '−'}${Math.abs(x).toFixed(1)}`;
}

/** The n-body state just before the first of `burns` (its start, for a finite burn), or undefined when it is the plan's start. */
function startBefore(system: StarSystem, work: Plan, current: PlanResult, burns: string[], nbody: NBodyModel, signal?: { aborted: boolean }) {
  let t = Number.POSITIVE_INFINITY;
  for (const id of burns) {
    const row = current.budget.rows.find((r) => r.planEventId === id);
    if (row) t = Math.min(t, row.tStart - 1); // a second early: the burn's own start is never cut off by rounding
  }
  if (!Number.isFinite(t) || t <= current.t0) return undefined;
  return flyModel(system, work, 'nbody', { nbody, signal, checkpoints: [t] }).checkpoint(t) ?? undefined;
}
