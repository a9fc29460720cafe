/**
 * Lambert solver throughput on porkchop-like geometry (heliocentric, both points within a few
 * degrees of the ecliptic, 0.6–1.8 AU, 30–630 days).
 *
 * Reference, measured in the same run: a plain universal-variable Lambert solver with bisection
 * on z (Bate, Mueller & White, Fundamentals of Astrodynamics, section 5.3; Curtis, Orbital
 * Mechanics for Engineering Students, Algorithm 5.2; bisection bracket as in Vallado,
 * Fundamentals of Astrodynamics and Applications, Algorithm 58), written here, independent of
 * core/orbit/lambert.ts. The two are also compared for agreement.
 *
 * C reference, also in the same run when gcc is present: the same method as
 * core/orbit/lambert.ts written plainly in C (test/bench/c/lambert.c), built with gcc -O2, on
 * the same cases; its answers are compared with the TypeScript ones.
 */
import { lambertAll, lambertSingleRev, solveLambert } from '../../core/orbit/lambert.ts';
import { buildC, runC } from './cref.ts';
import { printTable, timeMedian } from './table.ts';

const MU_SUN = 1.32712440018e20;
const AU = 1.495978707e11;
const DAY = 86400;

/** Deterministic geometry (a small linear congruential generator, so runs compare). */
function makeCases(n: number, seed: number, tofMinDays: number, tofSpanDays: number): Float64Array {
  let s = seed >>> 0;
  const rnd = (): number => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
  const P = new Float64Array(n * 7);
  for (let i = 0; i < n; i++) {
    const a = AU * (0.6 + 1.2 * rnd());
    const b = AU * (0.6 + 1.2 * rnd());
    const t1 = 2 * Math.PI * rnd();
    const t2 = 2 * Math.PI * rnd();
    const i1 = 0.05 * (rnd() - 0.5);
    const i2 = 0.05 * (rnd() - 0.5);
    P[7 * i] = a * Math.cos(t1) * Math.cos(i1);
    P[7 * i + 1] = a * Math.sin(t1) * Math.cos(i1);
    P[7 * i + 2] = a * Math.sin(i1);
    P[7 * i + 3] = b * Math.cos(t2) * Math.cos(i2);
    P[7 * i + 4] = b * Math.sin(t2) * Math.cos(i2);
    P[7 * i + 5] = b * Math.sin(i2);
    P[7 * i + 6] = DAY * (tofMinDays + tofSpanDays * rnd());
  }
  return P;
}

// --- Reference: universal variables, bisection on z ------------------------------------------

function stumpffC(z: number): number {
  if (z > 1e-8) return (1 - Math.cos(Math.sqrt(z))) / z;
  if (z < -1e-8) return (Math.cosh(Math.sqrt(-z)) - 1) / -z;
  return 0.5 - z / 24;
}
function stumpffS(z: number): number {
  if (z > 1e-8) {
    const q = Math.sqrt(z);
    return (q - Math.sin(q)) / (q * q * q);
  }
  if (z < -1e-8) {
    const q = Math.sqrt(-z);
    return (Math.sinh(q) - q) / (q * q * q);
  }
  return 1 / 6 - z / 120;
}

let refIterations = 0;

/** Universal-variable Lambert, single revolution, prograde about +z; returns false on failure. */
function lambertUniversal(mu: number, P: Float64Array, j: number, o1: Float64Array, o2: Float64Array): boolean {
  const x1 = P[j],
    y1 = P[j + 1],
    z1 = P[j + 2];
  const x2 = P[j + 3],
    y2 = P[j + 4],
    z2 = P[j + 5];
  const dt = P[j + 6];
  const r1 = Math.sqrt(x1 * x1 + y1 * y1 + z1 * z1);
  const r2 = Math.sqrt(x2 * x2 + y2 * y2 + z2 * z2);
  const cz = x1 * y2 - y1 * x2;
  let dtheta = Math.acos(Math.max(-1, Math.min(1, (x1 * x2 + y1 * y2 + z1 * z2) / (r1 * r2))));
  if (cz < 0) dtheta = 2 * Math.PI - dtheta;
  const A = Math.sin(dtheta) * Math.sqrt((r1 * r2) / (1 - Math.cos(dtheta)));
  const smu = Math.sqrt(mu);
  // Time of flight at z, or −1 where y(z) < 0 (no solution there: z too small).
  const tofAt = (zz: number): number => {
    const C = stumpffC(zz);
    const yy = r1 + r2 + (A * (zz * stumpffS(zz) - 1)) / Math.sqrt(C);
    if (yy < 0) return -1;
    const chi = Math.sqrt(yy / C);
    return (chi * chi * chi * stumpffS(zz) + A * Math.sqrt(yy)) / smu;
  };
  let lo = -4 * Math.PI * Math.PI;
  let hi = 4 * Math.PI * Math.PI;
  let it = 0;
  // Short, strongly hyperbolic arcs need z below the usual bracket: widen it.
  while (tofAt(lo) > dt && it < 60) {
    hi = lo;
    lo *= 2;
    it++;
  }
  let z = 0;
  let y = 0;
  for (; it < 200; it++) {
    z = (lo + hi) / 2;
    const C = stumpffC(z);
    const S = stumpffS(z);
    y = r1 + r2 + (A * (z * S - 1)) / Math.sqrt(C);
    if (A > 0 && y < 0) {
      lo = z;
      continue;
    }
    const chi = Math.sqrt(y / C);
    const t = (chi * chi * chi * S + A * Math.sqrt(y)) / smu;
    if (Math.abs(t - dt) < 1e-11 * dt) break;
    if (t < dt) lo = z;
    else hi = z;
  }
  refIterations += it + 1;
  if (!(y > 0)) return false;
  const f = 1 - y / r1;
  const g = A * Math.sqrt(y / mu);
  const gd = 1 - y / r2;
  o1[0] = (x2 - f * x1) / g;
  o1[1] = (y2 - f * y1) / g;
  o1[2] = (z2 - f * z1) / g;
  o2[0] = (gd * x2 - x1) / g;
  o2[1] = (gd * y2 - y1) / g;
  o2[2] = (gd * z2 - z1) / g;
  return true;
}

// ---------------------------------------------------------------------------------------------

export async function run(): Promise<void> {
  const n = 8192;
  const single = makeCases(n, 12345, 30, 600);
  const o1 = new Float64Array(3);
  const o2 = new Float64Array(3);
  const w1 = new Float64Array(3);
  const w2 = new Float64Array(3);

  // Agreement between the two solvers, and failures.
  let maxDiff = 0;
  let failIzzo = 0;
  let failRef = 0;
  for (let i = 0; i < n; i++) {
    const j = 7 * i;
    const a = lambertSingleRev(MU_SUN, single[j], single[j + 1], single[j + 2], single[j + 3], single[j + 4], single[j + 5], single[j + 6], false, o1, o2);
    const b = lambertUniversal(MU_SUN, single, j, w1, w2);
    if (a < 0) failIzzo++;
    if (!b) failRef++;
    if (a >= 0 && b) {
      const d = Math.hypot(o1[0] - w1[0], o1[1] - w1[1], o1[2] - w1[2]) / Math.hypot(w1[0], w1[1], w1[2]);
      if (d > maxDiff) maxDiff = d;
    }
  }

  const reps = 2_000_000;
  let izzoIterations = 0;
  const tIzzo = timeMedian(
    () => {
      izzoIterations = 0;
      for (let k = 0; k < reps; k++) {
        const j = 7 * (k & (n - 1));
        izzoIterations += lambertSingleRev(
          MU_SUN,
          single[j],
          single[j + 1],
          single[j + 2],
          single[j + 3],
          single[j + 4],
          single[j + 5],
          single[j + 6],
          false,
          o1,
          o2,
        );
      }
    },
    5,
    1,
  );
  const refReps = 200_000;
  let refIter = 0;
  const tRef = timeMedian(
    () => {
      refIterations = 0;
      for (let k = 0; k < refReps; k++) lambertUniversal(MU_SUN, single, 7 * (k & (n - 1)), w1, w2);
      refIter = refIterations;
    },
    3,
    1,
  );
  const izzoRate = reps / (tIzzo.median / 1000);

  // The same method in C (-O2) on the same cases and repetitions.
  let cRate: number | string = '—';
  let cRatio: number | string = '—';
  let cDiff: number | string = '—';
  let cIterSame: number | string = '—';
  const bin = buildC('lambert');
  const c = bin ? runC(bin, single, reps) : null;
  if (c) {
    cRate = c.figures[0];
    cRatio = c.figures[0] / izzoRate;
    let worst = 0;
    let same = 0;
    for (let i = 0; i < n; i++) {
      const j = 7 * i;
      const it = lambertSingleRev(MU_SUN, single[j], single[j + 1], single[j + 2], single[j + 3], single[j + 4], single[j + 5], single[j + 6], false, o1, o2);
      if (it === c.out[j + 6]) same++;
      if (it < 0 || c.out[j + 6] < 0) continue;
      const s1 = Math.hypot(o1[0], o1[1], o1[2]);
      const s2 = Math.hypot(o2[0], o2[1], o2[2]);
      for (let k = 0; k < 3; k++) worst = Math.max(worst, Math.abs(o1[k] - c.out[j + k]) / s1, Math.abs(o2[k] - c.out[j + 3 + k]) / s2);
    }
    cDiff = worst;
    cIterSame = same;
  }
  const refRate = refReps / (tRef.median / 1000);

  // Multi-revolution: up to 3 revolutions, flights of 1–5 years so that several counts exist.
  const multi = makeCases(n, 777, 365, 4 * 365);
  const maxRevs = 3;
  const V1 = new Float64Array(3 * (2 * maxRevs + 1));
  const V2 = new Float64Array(3 * (2 * maxRevs + 1));
  const R = new Int32Array(2 * maxRevs + 1);
  const r1 = new Float64Array(3);
  const r2 = new Float64Array(3);
  const mreps = 200_000;
  let solutions = 0;
  const tMulti = timeMedian(
    () => {
      solutions = 0;
      for (let k = 0; k < mreps; k++) {
        const j = 7 * (k & (n - 1));
        r1[0] = multi[j];
        r1[1] = multi[j + 1];
        r1[2] = multi[j + 2];
        r2[0] = multi[j + 3];
        r2[1] = multi[j + 4];
        r2[2] = multi[j + 5];
        solutions += lambertAll(MU_SUN, r1, r2, multi[j + 6], maxRevs, false, V1, V2, R);
      }
    },
    5,
    1,
  );
  const multiRate = mreps / (tMulti.median / 1000);
  // Average iterations per multi-revolution solution, from the allocating front door.
  let mIter = 0;
  let mSol = 0;
  for (let i = 0; i < 2000; i++) {
    const j = 7 * i;
    const sols = solveLambert(MU_SUN, multi.subarray(j, j + 3), multi.subarray(j + 3, j + 6), multi[j + 6], { revs: maxRevs });
    for (const s of sols) {
      mIter += s.iterations;
      mSol++;
    }
  }

  printTable(
    ['figure', 'TypeScript', 'C -O2, same method (test/bench/c/lambert.c)', 'ratio TS time / C time'],
    [
      ['single-revolution solves / s', izzoRate, cRate, cRatio],
      ['max |Δv| / |v| per component, TS vs C', cDiff, '—', '—'],
      [`cases with the same iteration count (of ${n})`, cIterSame, '—', '—'],
    ],
  );
  printTable(
    ['figure', 'Izzo (core/orbit/lambert.ts)', 'reference (universal variables, bisection)', 'ratio'],
    [
      ['single-revolution solves / s (lambertSingleRev)', izzoRate, refRate, izzoRate / refRate],
      ['iterations per single-revolution solve', izzoIterations / reps, refIter / refReps, refIter / refReps / (izzoIterations / reps)],
      ['multi-revolution problems / s (lambertAll, ≤ 3 revs)', multiRate, '—', '—'],
      ['solutions per multi-revolution problem', solutions / mreps, '—', '—'],
      ['multi-revolution solutions / s', (solutions / mreps) * multiRate, '—', '—'],
      ['iterations per multi-revolution solution', mIter / mSol, '—', '—'],
      ['max |Δv1| / |v1| between the two solvers', maxDiff, '—', '—'],
      [`failed solves (of ${n})`, failIzzo, failRef, '—'],
    ],
  );
}
