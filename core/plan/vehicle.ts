/**
 * Vehicle bookkeeping: stage-by-stage Δv, mass across staging, Δv left, thrust-to-weight.
 *
 * Stages fire in order (stages[0] first). The mass of the vehicle is the payload plus, for the
 * active stage and every stage above it, its dry mass and the propellant it still holds. Each
 * stage obeys the rocket equation of core/plan/rocket.ts (Tsiolkovsky, g0·Isp·ln(m0/mf)); a
 * sequence of stages is the classic serial-staging sum (Curtis, Orbital Mechanics for Engineering
 * Students, §11.6): each stage's Δv is computed with everything above it as its payload.
 *
 * Staging rules
 * - A stage whose propellant is spent stays attached until the next burn needs thrust; that burn
 *   drops it first (an automatic staging, reported like any other) and fires the next stage.
 * - When a stage runs dry during a burn, it is dropped at that instant and the next stage
 *   completes the burn ("stage dry mid-burn"); burn time and propellant add up across stages.
 * - The last stage is never dropped automatically (it is the ship's own structure); only a
 *   'stage' plan event drops it.
 * - A 'stage' plan event drops the active stage with whatever propellant it has left.
 * - When no stage is left, the rest of the requested Δv is missing ("out of propellant").
 *
 * The state is a small mutable record so the evaluation can run without allocating; copy it with
 * `copyVehicleState` to try a burn without committing it.
 */
import { InputError, requireFinite } from '../math/index.ts';
import type { Body } from '../system/index.ts';
import type { Vehicle } from './plan.ts';
import { G0 } from './rocket.ts';

export interface VehicleState {
  /** Index of the active stage; `stages.length` when every stage has been dropped. */
  stage: number;
  /** Propellant left in each stage, kg (0 for dropped stages). */
  propellant: Float64Array;
  /** Current total mass, kg. */
  mass: number;
}

/**
 * The outcome of one burn's propellant accounting. Phase k ran stage `phaseStage[k]` for
 * `phaseDuration[k]` seconds starting at mass `phaseMass0[k]`; stages were dropped (dry) after
 * the phases listed in `dropAfterPhase` (automatic drops before the first phase have index −1).
 */
export interface BurnBook {
  /** Δv asked for, m/s. */
  requested: number;
  /** Δv the propellant delivered, m/s (≤ requested). */
  delivered: number;
  /** requested − delivered, m/s (0 unless out of propellant). */
  missing: number;
  propellantUsed: number;
  /** Total firing time across stages, s. */
  duration: number;
  massBefore: number;
  massAfter: number;
  /** Indices of the stages that fired, in order. */
  stagesFired: number[];
  /** Stages dropped during (or at the start of) this burn, with the time offset from burn start, s. */
  dropped: { stage: number; offset: number; dry: boolean }[];
  /** A stage ran out of propellant while Δv was still needed and the next stage took over. */
  dryMidBurn: boolean;
  /** Number of firing phases (one per stage that fired). */
  phases: number;
  phaseStage: Int32Array;
  phaseDuration: Float64Array;
  phaseMass0: Float64Array;
  /** Thrust (N) and exhaust velocity (m/s) of each phase. */
  phaseThrust: Float64Array;
  phaseExhaust: Float64Array;
}

/**
 * Smallest stage thrust accepted, N (a micro-newton, below any real thruster): burn durations
 * m·v_e/F stay finite for every mass and exhaust velocity the plan file allows.
 */
export const MIN_STAGE_THRUST = 1e-6;

/**
 * Smallest burnout mass (payload plus the last stage's dry mass) as a fraction of the full
 * vehicle's mass: below it m0 − m_propellant loses every digit (a burnout mass of 1e-300 kg
 * under 20 kg of propellant came out as 0 and the Δv capacity as Infinity). A mass ratio of 1e9
 * is far past any rocket (Δv ≈ 20.7 exhaust velocities).
 */
export const MIN_BURNOUT_FRACTION = 1e-9;

/** Throws InputError (field path under `path`) unless the vehicle is well formed. */
export function checkVehicle(vehicle: Vehicle, path = 'vehicle'): void {
  if (!vehicle || typeof vehicle !== 'object') throw new InputError(path, 'must be a vehicle object', vehicle);
  if (typeof vehicle.name !== 'string') throw new InputError(`${path}.name`, 'must be a string', vehicle.name);
  requireNonNeg(`${path}.payloadMass`, vehicle.payloadMass);
  if (!Array.isArray(vehicle.stages) || vehicle.stages.length === 0) {
    throw new InputError(`${path}.stages`, 'must list at least one stage', vehicle.stages);
  }
  vehicle.stages.forEach((s, k) => {
    const sp = `${path}.stages[${k}]`;
    if (!s || typeof s !== 'object') throw new InputError(sp, 'must be a stage object', s);
    if (typeof s.name !== 'string') throw new InputError(`${sp}.name`, 'must be a string', s.name);
    requireNonNeg(`${sp}.dryMass`, s.dryMass);
    requireNonNeg(`${sp}.propellantMass`, s.propellantMass);
    requirePos(`${sp}.isp`, s.isp);
    requirePos(`${sp}.thrust`, s.thrust);
    if (!(s.thrust >= MIN_STAGE_THRUST)) throw new InputError(`${sp}.thrust`, `must be at least ${MIN_STAGE_THRUST} N`, s.thrust);
  });
  const last = vehicle.stages[vehicle.stages.length - 1];
  if (!(vehicle.payloadMass + last.dryMass > 0)) {
    throw new InputError(`${path}.payloadMass`, 'plus the last stage dry mass must be > 0 (the burnout mass)', vehicle.payloadMass);
  }
  const total = vehicle.stages.reduce((m, s) => m + s.dryMass + s.propellantMass, vehicle.payloadMass);
  if (!(vehicle.payloadMass + last.dryMass >= MIN_BURNOUT_FRACTION * total)) {
    throw new InputError(
      `${path}.payloadMass`,
      `plus the last stage dry mass must be at least ${MIN_BURNOUT_FRACTION} of the total mass ${total} kg (a smaller burnout mass is lost to rounding)`,
      vehicle.payloadMass,
    );
  }
}

function requireNonNeg(field: string, x: number): void {
  requireFinite(field, x);
  if (!(x >= 0)) throw new InputError(field, 'must be >= 0', x);
}

function requirePos(field: string, x: number): void {
  requireFinite(field, x);
  if (!(x > 0)) throw new InputError(field, 'must be > 0', x);
}

/** Full vehicle before any burn. */
export function createVehicleState(vehicle: Vehicle): VehicleState {
  const n = vehicle.stages.length;
  const propellant = new Float64Array(n);
  let mass = vehicle.payloadMass;
  for (let k = 0; k < n; k++) {
    propellant[k] = vehicle.stages[k].propellantMass;
    mass += vehicle.stages[k].dryMass + vehicle.stages[k].propellantMass;
  }
  return { stage: 0, propellant, mass };
}

/** Copies src into out (allocating when omitted). */
export function copyVehicleState(src: VehicleState, out?: VehicleState): VehicleState {
  if (!out) return { stage: src.stage, propellant: Float64Array.from(src.propellant), mass: src.mass };
  out.stage = src.stage;
  out.propellant.set(src.propellant);
  out.mass = src.mass;
  return out;
}

/** Mass from the state's stage and propellant (what `state.mass` tracks), kg. */
export function vehicleMass(vehicle: Vehicle, state: VehicleState): number {
  let m = vehicle.payloadMass;
  for (let k = state.stage; k < vehicle.stages.length; k++) m += vehicle.stages[k].dryMass + state.propellant[k];
  return m;
}

/**
 * Δv of each stage of the full vehicle, m/s: stage k burns all its propellant with the stages
 * above it (full) and the payload on top (serial staging, Curtis §11.6).
 */
export function stageDeltaVs(vehicle: Vehicle): number[] {
  const out: number[] = [];
  let m = vehicle.payloadMass;
  for (const s of vehicle.stages) m += s.dryMass + s.propellantMass;
  for (const s of vehicle.stages) {
    const mf = m - s.propellantMass;
    out.push(s.propellantMass > 0 ? G0 * s.isp * Math.log(m / mf) : 0);
    m = mf - s.dryMass;
  }
  return out;
}

/** Δv the vehicle can still deliver from `state` (the full vehicle when omitted), m/s. */
export function deltaVLeft(vehicle: Vehicle, state?: VehicleState): number {
  const st = state ?? createVehicleState(vehicle);
  let m = st.mass;
  let dv = 0;
  for (let k = st.stage; k < vehicle.stages.length; k++) {
    const s = vehicle.stages[k];
    const p = st.propellant[k];
    if (p > 0) dv += G0 * s.isp * Math.log(m / (m - p));
    m -= p + s.dryMass;
  }
  return dv;
}

/** Drops the active stage (with any propellant left). Returns the dropped index, or −1 when none was left. */
export function dropStage(vehicle: Vehicle, state: VehicleState): number {
  const k = state.stage;
  if (k >= vehicle.stages.length) return -1;
  state.mass -= vehicle.stages[k].dryMass + state.propellant[k];
  state.propellant[k] = 0;
  state.stage = k + 1;
  if (state.stage >= vehicle.stages.length) state.mass = vehicle.payloadMass;
  return k;
}

/** An empty book sized for the vehicle (reuse it across burns). */
export function createBurnBook(vehicle: Vehicle): BurnBook {
  const n = Math.max(1, vehicle.stages.length);
  return {
    requested: 0,
    delivered: 0,
    missing: 0,
    propellantUsed: 0,
    duration: 0,
    massBefore: 0,
    massAfter: 0,
    stagesFired: [],
    dropped: [],
    dryMidBurn: false,
    phases: 0,
    phaseStage: new Int32Array(n),
    phaseDuration: new Float64Array(n),
    phaseMass0: new Float64Array(n),
    phaseThrust: new Float64Array(n),
    phaseExhaust: new Float64Array(n),
  };
}

/**
 * Spends the propellant for a burn of `dv` m/s from `state` (mutated), stage by stage, and
 * writes the accounting into `book` (allocated when omitted). Per stage: Δv available
 * c·ln(m/(m − p)); propellant for a Δv m·(1 − e^(−Δv/c)); firing time propellant/ṁ with
 * ṁ = F/c (rocket.ts).
 */
export function spendBurn(vehicle: Vehicle, state: VehicleState, dv: number, book?: BurnBook): BurnBook {
  requireFinite('dv', dv);
  if (!(dv >= 0)) throw new InputError('dv', 'must be >= 0', dv);
  const b = book ?? createBurnBook(vehicle);
  b.requested = dv;
  b.massBefore = state.mass;
  b.stagesFired = [];
  b.dropped = [];
  b.dryMidBurn = false;
  b.phases = 0;
  b.duration = 0;
  b.propellantUsed = 0;
  let rem = dv;
  const n = vehicle.stages.length;
  while (rem > 0) {
    const k = state.stage;
    if (k >= n) break;
    const s = vehicle.stages[k];
    const p = state.propellant[k];
    if (!(p > 0)) {
      // spent stage still attached: drop it before firing the next (the last stage stays)
      if (k + 1 >= n) break;
      dropStage(vehicle, state);
      b.dropped.push({ stage: k, offset: b.duration, dry: true });
      continue;
    }
    const c = G0 * s.isp;
    const mdot = s.thrust / c;
    const m = state.mass;
    const avail = c * Math.log(m / (m - p));
    const ph = b.phases++;
    b.phaseStage[ph] = k;
    b.phaseMass0[ph] = m;
    b.phaseThrust[ph] = s.thrust;
    b.phaseExhaust[ph] = c;
    b.stagesFired.push(k);
    let used: number;
    if (rem <= avail) {
      used = Math.min(p, m * -Math.expm1(-rem / c));
      rem = 0;
      state.propellant[k] = p - used;
      state.mass = m - used;
    } else {
      used = p;
      rem -= avail;
      state.propellant[k] = 0;
      state.mass = m - p;
      if (k + 1 < n) b.dryMidBurn = true;
    }
    const dur = used / mdot;
    b.phaseDuration[ph] = dur;
    b.duration += dur;
    b.propellantUsed += used;
    if (rem > 0 && k + 1 < n) {
      dropStage(vehicle, state);
      b.dropped.push({ stage: k, offset: b.duration, dry: true });
    }
  }
  b.missing = rem > 0 ? rem : 0;
  b.delivered = dv - b.missing;
  b.massAfter = state.mass;
  return b;
}

/**
 * Thrust-to-weight ratio of the active stage at the surface of `body` (g = μ/R²), for the
 * current mass. 0 when no stage is left.
 */
export function thrustToWeightAt(vehicle: Vehicle, state: VehicleState, body: Body): number {
  if (state.stage >= vehicle.stages.length) return 0;
  const g = body.mu / (body.radius * body.radius);
  return vehicle.stages[state.stage].thrust / (state.mass * g);
}
