/**
 * The ship force model: the one model of the ship's motion used by every flight that is not an
 * analytic conic — n-body verification, correction and dispersion (core/nbody), the game-step
 * reference (core/gamestep/reference.ts) and finite burns (core/conic/finiteBurn.ts).
 *
 * Definition (restricted n-body problem; Battin, An Introduction to the Mathematics and Methods
 * of Astrodynamics, §8.4; Montenbruck & Gill, Satellite Orbits, §3.3):
 * - the star and the bodies pull on the ship as point masses; the ship pulls on nothing;
 * - the bodies move on their conic ephemerides (core/system/ephemeris.ts: each body on a conic
 *   about its parent with orbitMu = μ_parent + μ_body), whatever the ship does;
 * - axes are non-rotating, centred on the star. In that frame the ship's acceleration is
 *     a_S(X, t) = −μ_0 X/|X|³ + Σ_{k pulling, k≠star} μ_k [ (R_k − X)/|R_k − X|³ − R_k/|R_k|³ ],
 *   R_k body k relative to the star. The last term is the star's own acceleration towards the
 *   bodies (the indirect term): it makes the star-centred frame agree with the planets'
 *   star-centred conics, which use μ_star + μ_planet.
 * - For precision the state is integrated relative to an origin body o, x = X − R_o(t):
 *     ẍ = a_S(R_o + x, t) − R̈_o(t),
 *   with R̈_o the origin's acceleration as its ephemeris moves it: the sum along its chain of
 *   parents of the conic accelerations −orbitMu_j c_j/|c_j|³ (c_j body j relative to its
 *   parent); R̈ = 0 for the star. So the flight is the same whichever body is the origin (up to
 *   integration and rounding error), and a change of origin is a change of coordinates only.
 * - `pull` restricts the pulling bodies; the indirect term then runs over the pulling bodies
 *   too, and the origin still moves on its ephemeris (a body that does not pull on the ship
 *   still accelerates a frame that follows a body it pulls).
 *
 * Two-body (patched-conic) mode: only the origin body pulls and the frame is that body,
 * ẍ = −μ_o x/|x|³ — finite burns in the patched-conic evaluation and the game-step 'central'
 * gravity. `ShipForces.centralBody(μ)` is this mode about a lone body of given μ (no system).
 *
 * Thrust, in every mode: constant thrust F from t0 with the mass falling linearly,
 * m(t) = m0 − (F/c)(t − t0); held along a fixed inertial direction or at fixed VNB components
 * of the state relative to the origin (the VNB frame from core/math/frames.ts).
 *
 * Evaluation (allocation-free): body positions are kept relative to the origin, summed along
 * the tree from the conic of each body about its parent (so nearby bodies are exact short
 * sums), and terms that nearly cancel are grouped: the pull of each ancestor p of the origin
 * with the frame's conic acceleration towards p (a tidal difference), the star's indirect term
 * for a body with the frame's acceleration towards it, and each other body's pull with its
 * indirect term. A grouped difference g(a) − g(b), g(r) = r/|r|³, is computed from d = a − b
 * (Battin §8.4's Encke-type form, as here: d/|a|³ + b(|b|³ − |a|³)/(|a|³|b|³)) when |d| < |b|/2.
 *
 * Limits: no oblateness, drag or radiation pressure; the bodies do not feel each other beyond
 * their conics; the ship's mass matters only to thrust.
 */
import { InputError, requireFinite, vnbToInertial } from '../math/index.ts';
import { bodyPosition, findBodyIndex, type StarSystem } from '../system/index.ts';

export type Vec3Tuple = [number, number, number];

/** 'n-body': the definition above; 'two-body': only the origin body pulls, frame = that body. */
export type ShipGravity = 'n-body' | 'two-body';

export interface ShipForcesOptions {
  /** Default 'n-body'. */
  gravity?: ShipGravity;
  /** Ids of the bodies whose gravity acts ('n-body' only; default: the star and every body). */
  pull?: readonly string[];
}

/** One stage phase of a finite burn: constant thrust, mass falling at thrust/exhaust. */
export interface ThrustPhase {
  duration: number;
  thrust: number;
  /** Exhaust velocity, m/s (Infinity: no mass flow, a constant acceleration thrust/mass0). */
  exhaust: number;
  mass0: number;
}

/** A grouped difference g(a) − g(b) is taken from d = a − b when |d|² < this × |b|². */
const DIFFERENCE_FORM_LIMIT = 0.25;

/** The ship force model of one system (reuse it across flights): see the module comment. */
export class ShipForces {
  readonly system: StarSystem | null;
  readonly gravity: ShipGravity;
  readonly count: number;
  /** μ of each body as it pulls on the ship (0: not pulling). */
  readonly mu: Float64Array;
  /** The acceleration x'' = a(t, x, v) relative to the origin, for core/integrate. */
  readonly accel: (t: number, x: Float64Array, v: Float64Array, out: Float64Array) => void;
  /** The same as a first-order system y' = (v, a) on y = [x, v], for RK45 directly. */
  readonly deriv: (t: number, y: Float64Array, dydt: Float64Array) => void;

  /** μ of every body (the ephemeris's), whether or not it pulls. */
  private readonly bodyMu: Float64Array;
  private readonly orbitMu: Float64Array;
  private readonly parent: Int32Array;
  /** Bodies other than the star, parents before children. */
  private readonly order: Int32Array;
  /** Each body relative to its parent (c_j), relative to the star (R_j), relative to the origin (P_j); 3 per body. */
  private readonly C: Float64Array;
  private readonly R: Float64Array;
  private readonly P: Float64Array;
  private tC = NaN;
  private tP = NaN;
  private originIndex = 0;
  /** Chain of the origin: the bodies from the origin up to (not including) the star. */
  private links: Int32Array = new Int32Array(0);
  private readonly onChain: Uint8Array;
  private readonly tmp3 = new Float64Array(3);
  // acceleration accumulator of one evaluation
  private ax = 0;
  private ay = 0;
  private az = 0;
  // thrust of the current phase
  private thrust = 0;
  private thrustT0 = 0;
  private thrustMass0 = 1;
  private thrustMdot = 0;
  private readonly thrustU = new Float64Array(3);
  private readonly thrustL = new Float64Array(3);
  private thrustVnb = false;
  private readonly r3 = new Float64Array(3);
  private readonly v3 = new Float64Array(3);
  private readonly u3 = new Float64Array(3);

  /** Two-body mode about a lone body of gravitational parameter mu at the origin (no system). */
  static centralBody(mu: number): ShipForces {
    requireFinite('mu', mu);
    if (!(mu >= 0)) throw new InputError('mu', 'must be >= 0', mu);
    return new ShipForces(null, { gravity: 'two-body' }, mu);
  }

  constructor(system: StarSystem, options?: ShipForcesOptions);
  constructor(system: StarSystem | null, options: ShipForcesOptions, loneMu: number);
  constructor(system: StarSystem | null, options: ShipForcesOptions = {}, loneMu = 0) {
    this.system = system;
    const gravity = options.gravity ?? 'n-body';
    if (gravity !== 'n-body' && gravity !== 'two-body') throw new InputError('options.gravity', "must be 'n-body' or 'two-body'", gravity);
    this.gravity = gravity;
    const n = system ? system.bodies.length : 1;
    this.count = n;
    this.mu = new Float64Array(n);
    this.bodyMu = new Float64Array(n);
    this.orbitMu = new Float64Array(n);
    this.parent = new Int32Array(n).fill(-1);
    if (system) {
      system.bodies.forEach((b, k) => {
        this.bodyMu[k] = b.mu;
        this.orbitMu[k] = b.derived.orbitMu;
        this.parent[k] = b.parentIndex;
      });
    } else {
      this.bodyMu[0] = loneMu;
    }
    if (options.pull !== undefined) {
      if (gravity !== 'n-body') throw new InputError('options.pull', "applies to 'n-body' gravity only", options.pull);
      if (!Array.isArray(options.pull)) throw new InputError('options.pull', 'must be an array of body ids', options.pull);
      for (const id of options.pull) {
        const k = system ? findBodyIndex(system, id) : -1;
        if (k < 0) throw new InputError('options.pull', `names no body of the system ("${id}")`, id);
        this.mu[k] = this.bodyMu[k];
      }
    } else {
      this.mu.set(this.bodyMu);
    }
    const others: number[] = [];
    if (system) {
      for (const b of system.bodies) if (b.index !== 0) others.push(b.index);
      others.sort((a, b) => system.bodies[a].derived.depth - system.bodies[b].derived.depth);
    }
    this.order = Int32Array.from(others);
    this.C = new Float64Array(3 * n);
    this.R = new Float64Array(3 * n);
    this.P = new Float64Array(3 * n);
    this.onChain = new Uint8Array(n);
    this.setChain(0);
    this.accel = (t, x, v, out) => {
      this.evaluate(t, x[0], x[1], x[2], v[0], v[1], v[2]);
      out[0] = this.ax;
      out[1] = this.ay;
      out[2] = this.az;
    };
    this.deriv = (t, y, d) => {
      this.evaluate(t, y[0], y[1], y[2], y[3], y[4], y[5]);
      d[0] = y[3];
      d[1] = y[4];
      d[2] = y[5];
      d[3] = this.ax;
      d[4] = this.ay;
      d[5] = this.az;
    };
  }

  /** The origin body of the equations (index); setting it is a change of coordinates only. */
  get origin(): number {
    return this.originIndex;
  }

  set origin(o: number) {
    if (o === this.originIndex) return;
    if (!(Number.isInteger(o) && o >= 0 && o < this.count)) throw new InputError('origin', `must be a body index in [0, ${this.count - 1}]`, o);
    this.setChain(o);
  }

  private setChain(o: number): void {
    this.originIndex = o;
    this.onChain.fill(0);
    const chain: number[] = [];
    for (let j = o; j > 0; j = this.parent[j]) {
      chain.push(j);
      this.onChain[j] = 1;
    }
    this.onChain[0] = 1;
    this.links = Int32Array.from(chain);
    this.tP = NaN;
  }

  /** Fills C, R (per time) and P (per time and origin). */
  private update(t: number): void {
    const C = this.C;
    const R = this.R;
    const P = this.P;
    if (t !== this.tC) {
      const sys = this.system as StarSystem;
      const tmp = this.tmp3;
      const order = this.order;
      for (let q = 0; q < order.length; q++) {
        const j = order[q];
        const p = this.parent[j];
        bodyPosition(sys, j, t, tmp, p);
        C[3 * j] = tmp[0];
        C[3 * j + 1] = tmp[1];
        C[3 * j + 2] = tmp[2];
        R[3 * j] = R[3 * p] + tmp[0];
        R[3 * j + 1] = R[3 * p + 1] + tmp[1];
        R[3 * j + 2] = R[3 * p + 2] + tmp[2];
      }
      this.tC = t;
      this.tP = NaN;
    }
    if (t !== this.tP) {
      // up the origin's chain: P_parent = P_j − c_j; then every other body from its parent
      const o = this.originIndex;
      P[3 * o] = P[3 * o + 1] = P[3 * o + 2] = 0;
      const links = this.links;
      for (let i = 0; i < links.length; i++) {
        const j = links[i];
        const p = this.parent[j];
        P[3 * p] = P[3 * j] - C[3 * j];
        P[3 * p + 1] = P[3 * j + 1] - C[3 * j + 1];
        P[3 * p + 2] = P[3 * j + 2] - C[3 * j + 2];
      }
      const order = this.order;
      for (let q = 0; q < order.length; q++) {
        const j = order[q];
        if (this.onChain[j]) continue;
        const p = this.parent[j];
        P[3 * j] = P[3 * p] + C[3 * j];
        P[3 * j + 1] = P[3 * p + 1] + C[3 * j + 1];
        P[3 * j + 2] = P[3 * p + 2] + C[3 * j + 2];
      }
      this.tP = t;
    }
  }

  /** Adds m·r/|r|³ to the accumulator. */
  private addG(m: number, rx: number, ry: number, rz: number): void {
    const r2 = rx * rx + ry * ry + rz * rz;
    const k = m / (r2 * Math.sqrt(r2));
    this.ax += k * rx;
    this.ay += k * ry;
    this.az += k * rz;
  }

  /** Adds m·(g(a) − g(b)), g(r) = r/|r|³, given d = a − b (see the module comment). */
  private addPair(m: number, axx: number, ayy: number, azz: number, bx: number, by: number, bz: number, dx: number, dy: number, dz: number): void {
    const a2 = axx * axx + ayy * ayy + azz * azz;
    const b2 = bx * bx + by * by + bz * bz;
    const d2 = dx * dx + dy * dy + dz * dz;
    const ra = Math.sqrt(a2);
    const rb = Math.sqrt(b2);
    const ia3 = 1 / (a2 * ra);
    if (d2 < DIFFERENCE_FORM_LIMIT * b2) {
      const ib3 = 1 / (b2 * rb);
      // |b|³ − |a|³ = (|b| − |a|)(|a|² + |a||b| + |b|²), |b| − |a| = −d·(a + b)/(|a| + |b|)
      const s = dx * (axx + bx) + dy * (ayy + by) + dz * (azz + bz);
      const w = (-s / (ra + rb)) * (a2 + ra * rb + b2) * ia3 * ib3;
      this.ax += m * (dx * ia3 + bx * w);
      this.ay += m * (dy * ia3 + by * w);
      this.az += m * (dz * ia3 + bz * w);
    } else {
      const ib3 = 1 / (b2 * rb);
      this.ax += m * (axx * ia3 - bx * ib3);
      this.ay += m * (ayy * ia3 - by * ib3);
      this.az += m * (azz * ia3 - bz * ib3);
    }
  }

  /** Gravity of the n-body mode at time t, ship at x relative to the origin, into the accumulator. */
  private nbodyGravity(t: number, x0: number, x1: number, x2: number): void {
    this.update(t);
    const mu = this.mu;
    const C = this.C;
    const R = this.R;
    const P = this.P;
    const o = this.originIndex;
    // the origin's own pull
    if (mu[o] > 0) this.addG(-mu[o], x0, x1, x2);
    // the chain: each ancestor's pull with the frame's acceleration towards it
    const links = this.links;
    for (let i = 0; i < links.length; i++) {
      const j = links[i];
      const p = this.parent[j];
      const cx = C[3 * j],
        cy = C[3 * j + 1],
        cz = C[3 * j + 2];
      const mp = this.bodyMu[p];
      if (mu[p] > 0) {
        // μ_p [g(P_p − x) − g(−c_j)], d = P_j − x
        this.addPair(mp, P[3 * p] - x0, P[3 * p + 1] - x1, P[3 * p + 2] - x2, -cx, -cy, -cz, P[3 * j] - x0, P[3 * j + 1] - x1, P[3 * j + 2] - x2);
      } else if (mp > 0) {
        this.addG(mp, cx, cy, cz);
      }
      // the rest of the frame's conic acceleration, (orbitMu_j − μ_p) g(c_j), with j's indirect term
      const rest = this.orbitMu[j] - mp;
      if (mu[j] > 0 && p === 0) {
        const k = rest - mu[j]; // R_j = c_j: the two cancel (to the rounding of orbitMu)
        if (k !== 0) this.addG(k, cx, cy, cz);
      } else {
        if (rest !== 0) this.addG(rest, cx, cy, cz);
        if (mu[j] > 0) this.addG(-mu[j], R[3 * j], R[3 * j + 1], R[3 * j + 2]);
      }
    }
    // every other pulling body: its pull with its indirect term, d = P_star − x
    const sx = P[0] - x0,
      sy = P[1] - x1,
      sz = P[2] - x2;
    const order = this.order;
    for (let q = 0; q < order.length; q++) {
      const k = order[q];
      if (this.onChain[k] || !(mu[k] > 0)) continue;
      this.addPair(mu[k], P[3 * k] - x0, P[3 * k + 1] - x1, P[3 * k + 2] - x2, R[3 * k], R[3 * k + 1], R[3 * k + 2], sx, sy, sz);
    }
  }

  /** Gravity and thrust at (t, x, v) relative to the origin, into the accumulator. */
  private evaluate(t: number, x0: number, x1: number, x2: number, v0: number, v1: number, v2: number): void {
    this.ax = 0;
    this.ay = 0;
    this.az = 0;
    if (this.gravity === 'n-body') {
      this.nbodyGravity(t, x0, x1, x2);
    } else {
      const m = this.bodyMu[this.originIndex];
      if (m > 0) this.addG(-m, x0, x1, x2);
    }
    if (this.thrust > 0) {
      const a = this.thrust / (this.thrustMass0 - this.thrustMdot * (t - this.thrustT0));
      let ux = this.thrustU[0],
        uy = this.thrustU[1],
        uz = this.thrustU[2];
      if (this.thrustVnb) {
        const r = this.r3;
        const v = this.v3;
        r[0] = x0;
        r[1] = x1;
        r[2] = x2;
        v[0] = v0;
        v[1] = v1;
        v[2] = v2;
        const u = vnbToInertial(r, v, this.thrustL, this.u3);
        ux = u[0];
        uy = u[1];
        uz = u[2];
      }
      this.ax += a * ux;
      this.ay += a * uy;
      this.az += a * uz;
    }
  }

  /**
   * Turns a thrust phase on (from t0: mass phase.mass0 at t0) or off (phase null): along the
   * unit inertial direction u, or — with vnb — at those fixed VNB components of the state
   * relative to the origin.
   */
  setThrust(phase: ThrustPhase | null, t0: number, u: ArrayLike<number>, vnb: ArrayLike<number> | null): void {
    if (!phase || !(phase.thrust > 0)) {
      this.thrust = 0;
      return;
    }
    requireFinite('phase.thrust', phase.thrust);
    requireFinite('phase.mass0', phase.mass0);
    if (!(phase.mass0 > 0)) throw new InputError('phase.mass0', 'must be > 0 (kg)', phase.mass0);
    if (!(phase.exhaust > 0)) throw new InputError('phase.exhaust', 'must be > 0 (m/s; Infinity for no mass flow)', phase.exhaust);
    this.thrust = phase.thrust;
    this.thrustT0 = t0;
    this.thrustMass0 = phase.mass0;
    this.thrustMdot = phase.thrust / phase.exhaust;
    this.thrustU[0] = u[0];
    this.thrustU[1] = u[1];
    this.thrustU[2] = u[2];
    this.thrustVnb = vnb !== null;
    if (vnb) {
      this.thrustL[0] = vnb[0];
      this.thrustL[1] = vnb[1];
      this.thrustL[2] = vnb[2];
    }
  }

  /** Position of body k relative to body o at time t (conics summed along the tree), into out. */
  relative(k: number, o: number, t: number, out: Float64Array): Float64Array {
    if (!this.system) {
      out[0] = out[1] = out[2] = 0;
      return out;
    }
    if (o === this.originIndex) {
      this.update(t);
      out[0] = this.P[3 * k];
      out[1] = this.P[3 * k + 1];
      out[2] = this.P[3 * k + 2];
      return out;
    }
    bodyPosition(this.system, k, t, out, o);
    return out;
  }

  /**
   * The origin's acceleration as its ephemeris moves it, R̈_o = Σ_chain −orbitMu_j c_j/|c_j|³
   * (0 for the star, and in the two-body mode, whose frame is the origin body), into out.
   */
  frameAcceleration(t: number, out: Float64Array): Float64Array {
    out[0] = out[1] = out[2] = 0;
    if (!this.system || this.gravity !== 'n-body') return out;
    this.update(t);
    for (let i = 0; i < this.links.length; i++) {
      const j = this.links[i];
      const cx = this.C[3 * j],
        cy = this.C[3 * j + 1],
        cz = this.C[3 * j + 2];
      const r2 = cx * cx + cy * cy + cz * cz;
      const k = -this.orbitMu[j] / (r2 * Math.sqrt(r2));
      out[0] += k * cx;
      out[1] += k * cy;
      out[2] += k * cz;
    }
    return out;
  }

  /** The star's own acceleration towards the pulling bodies, Σ_{k≠star} μ_k R_k/|R_k|³ (the indirect term is its negative), into out. */
  starAcceleration(t: number, out: Float64Array): Float64Array {
    out[0] = out[1] = out[2] = 0;
    if (!this.system || this.gravity !== 'n-body') return out;
    this.update(t);
    for (let q = 0; q < this.order.length; q++) {
      const k = this.order[q];
      if (!(this.mu[k] > 0)) continue;
      const rx = this.R[3 * k],
        ry = this.R[3 * k + 1],
        rz = this.R[3 * k + 2];
      const r2 = rx * rx + ry * ry + rz * rz;
      const f = this.mu[k] / (r2 * Math.sqrt(r2));
      out[0] += f * rx;
      out[1] += f * ry;
      out[2] += f * rz;
    }
    return out;
  }
}
