/**
 * The game-step loops and gravity in float64 arithmetic (see kernel.ts for the methods,
 * the floating origin and the stops). kernelF64.ts and kernelF32.ts are the
 * same code apart from the rounding line below (tested); two modules, so that each call of R is
 * monomorphic and inlined by the JavaScript engine.
 */
import type { GameAccel, GameCraft, GameIntegrator } from './craft.ts';
import { noRound } from './float32.ts';
/** Rounding applied after every arithmetic operation. */
const R = noRound;

/**
 * Point-mass gravity of the body at the frame centre, as seen from the origin: the body sits at
 * −O(t) (rounded to the game's precision), the craft at p; a = −μ d/|d|³ with d = p − b
 * (Newton's law of gravitation; Vallado, Fundamentals of Astrodynamics and Applications, 4th
 * ed., §1.3). In float64 with O = 0 this is `spacecraftAccel` of one source at the origin.
 */
export function centralGravity(c: GameCraft, mu: number): GameAccel {
  const m = R(mu);
  return (t, px, py, pz, out) => {
    const s = t - c.tOrigin;
    const bx = R(-(c.ox + c.wx * s));
    const by = R(-(c.oy + c.wy * s));
    const bz = R(-(c.oz + c.wz * s));
    const dx = R(px - bx);
    const dy = R(py - by);
    const dz = R(pz - bz);
    const r2 = R(R(R(dx * dx) + R(dy * dy)) + R(dz * dz));
    const k = R(-m / R(r2 * R(Math.sqrt(r2))));
    out[0] = R(k * dx);
    out[1] = R(k * dy);
    out[2] = R(k * dz);
  };
}

/**
 * Point-mass gravity of several bodies whose positions relative to the frame centre come from
 * `positions(t, out)` (3 per body, double; evaluated once per distinct t). Body 0 is the star
 * at the frame centre (the star-centred world frame); the others pull on it, so the frame
 * accelerates by A(t) = Σ_{j≥1} μ_j P_j/|P_j|³ and the craft's acceleration relative to it is
 * its gravity minus A (the indirect term; the physics of core/dynamics/shipForces.ts, whose
 * bodies move on their conics about the star with μ_star + μ_body). A is one vector per time,
 * computed in the game's precision with the positions. Each body's position relative to the
 * origin is rounded to the game's precision, as a game stores it; contributions are summed in
 * body order, then A is subtracted.
 */
export function bodiesGravity(c: GameCraft, mus: ArrayLike<number>, positions: (t: number, out: Float64Array) => void): GameAccel {
  const n = mus.length;
  const m = new Float64Array(n);
  for (let j = 0; j < n; j++) m[j] = R(mus[j]);
  const P = new Float64Array(3 * n);
  let tCached = NaN;
  let fx = 0;
  let fy = 0;
  let fz = 0;
  return (t, px, py, pz, out) => {
    if (t !== tCached) {
      positions(t, P);
      tCached = t;
      // the star's own acceleration towards the bodies, once per time
      fx = 0;
      fy = 0;
      fz = 0;
      for (let j = 1; j < n; j++) {
        const qx = R(P[3 * j]);
        const qy = R(P[3 * j + 1]);
        const qz = R(P[3 * j + 2]);
        const q2 = R(R(R(qx * qx) + R(qy * qy)) + R(qz * qz));
        const k = R(m[j] / R(q2 * R(Math.sqrt(q2))));
        fx = R(fx + R(k * qx));
        fy = R(fy + R(k * qy));
        fz = R(fz + R(k * qz));
      }
    }
    const s = t - c.tOrigin;
    const Ox = c.ox + c.wx * s;
    const Oy = c.oy + c.wy * s;
    const Oz = c.oz + c.wz * s;
    let ax = 0;
    let ay = 0;
    let az = 0;
    for (let j = 0; j < n; j++) {
      const dx = R(px - R(P[3 * j] - Ox));
      const dy = R(py - R(P[3 * j + 1] - Oy));
      const dz = R(pz - R(P[3 * j + 2] - Oz));
      const r2 = R(R(R(dx * dx) + R(dy * dy)) + R(dz * dz));
      const k = R(-m[j] / R(r2 * R(Math.sqrt(r2))));
      ax = R(ax + R(k * dx));
      ay = R(ay + R(k * dy));
      az = R(az + R(k * dz));
    }
    out[0] = R(ax - fx);
    out[1] = R(ay - fy);
    out[2] = R(az - fz);
  };
}

/**
 * Advances the craft by up to n steps of h from time t0 with the given method; returns the
 * number of steps taken (fewer than n when a stop threshold was crossed).
 */
export function advance(c: GameCraft, method: GameIntegrator, t0: number, h: number, n: number): number {
  switch (method) {
    case 'symplectic-euler':
      return advanceSymplecticEuler(c, t0, h, n);
    case 'verlet':
      return advanceVerlet(c, t0, h, n);
    case 'explicit-euler':
      return advanceExplicitEuler(c, t0, h, n);
    case 'rk4':
      return advanceRk4(c, t0, h, n);
  }
}

// Whether the state at time t (after a step) crosses a stop threshold.
function mustStop(c: GameCraft, t: number, px: number, py: number, pz: number): boolean {
  if (px * px + py * py + pz * pz > c.rebase2) return true;
  if (c.exit2 !== Infinity) {
    const s = t - c.tOrigin;
    const qx = c.ox + c.wx * s + px;
    const qy = c.oy + c.wy * s + py;
    const qz = c.oz + c.wz * s + pz;
    if (qx * qx + qy * qy + qz * qz > c.exit2) return true;
  }
  return false;
}

function advanceSymplecticEuler(c: GameCraft, t0: number, h: number, n: number): number {
  const acc = c.accel;
  const A = c.a;
  const tx = c.tx,
    ty = c.ty,
    tz = c.tz;
  let px = c.px,
    py = c.py,
    pz = c.pz;
  let ux = c.ux,
    uy = c.uy,
    uz = c.uz;
  let k = 0;
  while (k < n) {
    acc(t0 + k * h, px, py, pz, A);
    ux = R(ux + R(h * R(A[0] + tx)));
    uy = R(uy + R(h * R(A[1] + ty)));
    uz = R(uz + R(h * R(A[2] + tz)));
    px = R(px + R(h * ux));
    py = R(py + R(h * uy));
    pz = R(pz + R(h * uz));
    k++;
    if (mustStop(c, t0 + k * h, px, py, pz)) break;
  }
  c.px = px;
  c.py = py;
  c.pz = pz;
  c.ux = ux;
  c.uy = uy;
  c.uz = uz;
  c.gValid = false;
  c.evals += k;
  return k;
}

function advanceVerlet(c: GameCraft, t0: number, h: number, n: number): number {
  const acc = c.accel;
  const A = c.a;
  const hh = R(0.5 * h);
  const tx = c.tx,
    ty = c.ty,
    tz = c.tz;
  let px = c.px,
    py = c.py,
    pz = c.pz;
  let ux = c.ux,
    uy = c.uy,
    uz = c.uz;
  let gx = c.gx,
    gy = c.gy,
    gz = c.gz;
  if (n > 0 && !c.gValid) {
    acc(t0, px, py, pz, A);
    gx = A[0];
    gy = A[1];
    gz = A[2];
    c.evals++;
  }
  let k = 0;
  while (k < n) {
    ux = R(ux + R(hh * R(gx + tx)));
    uy = R(uy + R(hh * R(gy + ty)));
    uz = R(uz + R(hh * R(gz + tz)));
    px = R(px + R(h * ux));
    py = R(py + R(h * uy));
    pz = R(pz + R(h * uz));
    k++;
    const t1 = t0 + k * h;
    acc(t1, px, py, pz, A);
    gx = A[0];
    gy = A[1];
    gz = A[2];
    ux = R(ux + R(hh * R(gx + tx)));
    uy = R(uy + R(hh * R(gy + ty)));
    uz = R(uz + R(hh * R(gz + tz)));
    if (mustStop(c, t1, px, py, pz)) break;
  }
  c.px = px;
  c.py = py;
  c.pz = pz;
  c.ux = ux;
  c.uy = uy;
  c.uz = uz;
  c.gx = gx;
  c.gy = gy;
  c.gz = gz;
  c.gValid = c.gValid || n > 0;
  c.evals += k;
  return k;
}

function advanceExplicitEuler(c: GameCraft, t0: number, h: number, n: number): number {
  const acc = c.accel;
  const A = c.a;
  const tx = c.tx,
    ty = c.ty,
    tz = c.tz;
  let px = c.px,
    py = c.py,
    pz = c.pz;
  let ux = c.ux,
    uy = c.uy,
    uz = c.uz;
  let k = 0;
  while (k < n) {
    acc(t0 + k * h, px, py, pz, A);
    const ax = R(A[0] + tx);
    const ay = R(A[1] + ty);
    const az = R(A[2] + tz);
    px = R(px + R(h * ux));
    py = R(py + R(h * uy));
    pz = R(pz + R(h * uz));
    ux = R(ux + R(h * ax));
    uy = R(uy + R(h * ay));
    uz = R(uz + R(h * az));
    k++;
    if (mustStop(c, t0 + k * h, px, py, pz)) break;
  }
  c.px = px;
  c.py = py;
  c.pz = pz;
  c.ux = ux;
  c.uy = uy;
  c.uz = uz;
  c.gValid = false;
  c.evals += k;
  return k;
}

function advanceRk4(c: GameCraft, t0: number, h: number, n: number): number {
  const acc = c.accel;
  const A = c.a;
  const hh = R(0.5 * h);
  const h6 = R(h / 6);
  const tx = c.tx,
    ty = c.ty,
    tz = c.tz;
  let px = c.px,
    py = c.py,
    pz = c.pz;
  let ux = c.ux,
    uy = c.uy,
    uz = c.uz;
  let k = 0;
  while (k < n) {
    const t = t0 + k * h;
    acc(t, px, py, pz, A);
    const a1x = R(A[0] + tx),
      a1y = R(A[1] + ty),
      a1z = R(A[2] + tz);
    const v2x = R(ux + R(hh * a1x)),
      v2y = R(uy + R(hh * a1y)),
      v2z = R(uz + R(hh * a1z));
    acc(t + hh, R(px + R(hh * ux)), R(py + R(hh * uy)), R(pz + R(hh * uz)), A);
    const a2x = R(A[0] + tx),
      a2y = R(A[1] + ty),
      a2z = R(A[2] + tz);
    const v3x = R(ux + R(hh * a2x)),
      v3y = R(uy + R(hh * a2y)),
      v3z = R(uz + R(hh * a2z));
    acc(t + hh, R(px + R(hh * v2x)), R(py + R(hh * v2y)), R(pz + R(hh * v2z)), A);
    const a3x = R(A[0] + tx),
      a3y = R(A[1] + ty),
      a3z = R(A[2] + tz);
    const v4x = R(ux + R(h * a3x)),
      v4y = R(uy + R(h * a3y)),
      v4z = R(uz + R(h * a3z));
    acc(t + h, R(px + R(h * v3x)), R(py + R(h * v3y)), R(pz + R(h * v3z)), A);
    const a4x = R(A[0] + tx),
      a4y = R(A[1] + ty),
      a4z = R(A[2] + tz);
    px = R(px + R(h6 * R(R(R(ux + R(2 * v2x)) + R(2 * v3x)) + v4x)));
    py = R(py + R(h6 * R(R(R(uy + R(2 * v2y)) + R(2 * v3y)) + v4y)));
    pz = R(pz + R(h6 * R(R(R(uz + R(2 * v2z)) + R(2 * v3z)) + v4z)));
    ux = R(ux + R(h6 * R(R(R(a1x + R(2 * a2x)) + R(2 * a3x)) + a4x)));
    uy = R(uy + R(h6 * R(R(R(a1y + R(2 * a2y)) + R(2 * a3y)) + a4y)));
    uz = R(uz + R(h6 * R(R(R(a1z + R(2 * a2z)) + R(2 * a3z)) + a4z)));
    k++;
    if (mustStop(c, t0 + k * h, px, py, pz)) break;
  }
  c.px = px;
  c.py = py;
  c.pz = pz;
  c.ux = ux;
  c.uy = uy;
  c.uz = uz;
  c.gValid = false;
  c.evals += 4 * k;
  return k;
}
